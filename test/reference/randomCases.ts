// Seeded random valid inputs across the documented input space, for statistical accuracy tests.
// Written for the tests; the generator is mulberry32 (public-domain 32-bit PRNG by T. Ettinger), so a seed
// always gives the same cases on every machine.
import { makeChargeModel, solveBulkNeutrality, type SupportElectronic } from '../../src/bulk/equilibrium.js';
import { seededRandom } from '../../src/derived/uncertainty.js';

/** mulberry32, the same generator the uncertainty sampling uses (src/derived/uncertainty.ts). */
export const mulberry32: (seed: number) => () => number = seededRandom;

export interface RandomCase {
  index: number;
  support: SupportElectronic;
  relativePermittivity: number;
  bandBending_eV: number;
  /** reduced bulk Fermi level (E_F - E_C)/kT from the project's bulk solver */
  bulkReducedFermiLevel: number;
  kT_eV: number;
}

/**
 * One random planar case. Documented input space (README / DEVELOPERS): 50-1500 K, donors 1e12-1e21 cm^-3
 * (single or double, levels 0.01-1.5 eV deep or fully ionised), optional acceptors, gaps 1-9 eV, masses
 * 0.1-3 m0, eps_r 3-300, Boltzmann or Fermi-Dirac; the interface Fermi level anywhere in the gap (barrier
 * 0..E_g), band bending clipped to +/-8 eV; one case in eight has |band bending| < 10 meV.
 */
export function randomCase(random: () => number, index: number): RandomCase {
  const logUniform = (lo: number, hi: number): number => lo * Math.pow(hi / lo, random());
  const uniform = (lo: number, hi: number): number => lo + (hi - lo) * random();
  const temperature_K = logUniform(50, 1500);
  const bandGap_eV = uniform(1, 9);
  const double = random() < 0.4;
  const level = (): number | undefined => (random() < 0.25 ? undefined : Math.min(logUniform(0.01, 1.5), 0.9 * bandGap_eV));
  const level1 = level();
  let level2 = double && level1 !== undefined ? level1 + logUniform(0.01, 1.5) : undefined;
  if (level2 !== undefined && level2 > 0.95 * bandGap_eV) level2 = 0.95 * bandGap_eV;
  const donors_m3 = logUniform(1e12, 1e21) * 1e6;
  const acceptors_m3 = random() < 0.3 ? donors_m3 * logUniform(1e-3, 10) : 0;
  const acceptorLevel = random() < 0.3 ? undefined : Math.min(logUniform(0.01, 1.5), 0.9 * bandGap_eV);
  const support: SupportElectronic = {
    temperature_K,
    bandGap_eV,
    electronMass_me: logUniform(0.1, 3),
    holeMass_me: logUniform(0.1, 3),
    donors: double
      ? { density_m3: donors_m3, kind: 'double', level1_eV: level2 === undefined ? undefined : level1, level2_eV: level2 }
      : { density_m3: donors_m3, kind: 'single', level1_eV: level1 },
    acceptors: acceptors_m3 > 0 ? { density_m3: acceptors_m3, level_eV: acceptorLevel } : { density_m3: 0 },
    statistics: random() < 0.5 ? 'boltzmann' : 'fermi-dirac',
  };
  const model = makeChargeModel(support);
  const bulk = solveBulkNeutrality(model);
  const small = random() < 0.125;
  let bandBending_eV: number;
  if (small) {
    bandBending_eV = (random() < 0.5 ? -1 : 1) * logUniform(1e-5, 1e-2);
  } else {
    const barrier = uniform(0, bandGap_eV);
    bandBending_eV = Math.max(-8, Math.min(8, barrier - bulk.fermiLevelBelowConduction_eV));
  }
  return {
    index,
    support,
    relativePermittivity: logUniform(3, 300),
    bandBending_eV,
    bulkReducedFermiLevel: bulk.reducedFermiLevel,
    kT_eV: model.kT_eV,
  };
}

export function randomCases(seed: number, count: number): RandomCase[] {
  const random = mulberry32(seed);
  const out: RandomCase[] = [];
  for (let i = 0; i < count; i++) out.push(randomCase(random, i));
  return out;
}
