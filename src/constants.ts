// Physical constants (CODATA 2018 exact / recommended values), taken from mathjs so there is one source.
import { create, all } from 'mathjs';

const math = create(all) as unknown as Record<string, unknown>;

function si(quantity: unknown): number {
  // mathjs constants are Unit objects; toSI().value gives the SI magnitude.
  const q = quantity as { value: number | null; toSI?: () => { value: number } };
  if (typeof q.toSI === 'function') return q.toSI().value;
  if (typeof q.value === 'number') return q.value;
  throw new Error('mathjs constant without a numeric value');
}

export const K_BOLTZMANN_J_PER_K = si(math['boltzmann']);
export const Q_ELEMENTARY_C = si(math['elementaryCharge']);
export const H_PLANCK_J_S = si(math['planckConstant']);
export const M_ELECTRON_KG = si(math['electronMass']);
export const EPS0_F_PER_M = si(math['electricConstant']);
export const N_AVOGADRO_PER_MOL = si(math['avogadro']);
export const R_GAS_J_PER_MOL_K = si(math['gasConstant']);
export const K_BOLTZMANN_EV_PER_K = K_BOLTZMANN_J_PER_K / Q_ELEMENTARY_C;

/** Thermal energy kT in eV. */
export function thermalEnergy_eV(temperature_K: number): number {
  return K_BOLTZMANN_EV_PER_K * temperature_K;
}

export const CM3_PER_M3 = 1e-6; // multiply a per-m^3 density by this to get per-cm^3
export const M3_PER_CM3 = 1e6; // multiply a per-cm^3 density by this to get per-m^3
