// Physical constants, CODATA 2018 (E. Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)); SI units.
// Written out here so start-up does not load a units library; test/core.test.ts checks them against
// mathjs's built-in physical constants.

export const K_BOLTZMANN_J_PER_K = 1.380649e-23; // exact
export const Q_ELEMENTARY_C = 1.602176634e-19; // exact
export const H_PLANCK_J_S = 6.62607015e-34; // exact
export const M_ELECTRON_KG = 9.1093837015e-31;
export const EPS0_F_PER_M = 8.8541878128e-12;
export const N_AVOGADRO_PER_MOL = 6.02214076e23; // exact
export const R_GAS_J_PER_MOL_K = K_BOLTZMANN_J_PER_K * N_AVOGADRO_PER_MOL;
export const K_BOLTZMANN_EV_PER_K = K_BOLTZMANN_J_PER_K / Q_ELEMENTARY_C;

/** Thermal energy kT in eV. */
export function thermalEnergy_eV(temperature_K: number): number {
  return K_BOLTZMANN_EV_PER_K * temperature_K;
}

export const CM3_PER_M3 = 1e-6; // multiply a per-m^3 density by this to get per-cm^3
export const M3_PER_CM3 = 1e6; // multiply a per-cm^3 density by this to get per-m^3
