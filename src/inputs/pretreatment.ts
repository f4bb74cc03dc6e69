// Oxygen-vacancy donor density of a reducible oxide support set by a reducing pretreatment, and the
// oxygen partial pressure of an H2/H2O mixture. Screening estimates for catalyst design, not process data.
import { K_BOLTZMANN_EV_PER_K, R_GAS_J_PER_MOL_K } from '../constants.js';
import { InputError, requireInRange } from '../errors.js';
import { DILUTE_LIMIT_SITE_FRACTION, JANAF_GIBBS_FORMATION_KJ_MOL, gasGibbsFormation_kJ_mol } from '../bulk/defectChemistry.js';

// Shared with the general defect chemistry (src/bulk/defectChemistry.ts), which holds the data.
export { DILUTE_LIMIT_SITE_FRACTION } from '../bulk/defectChemistry.js';

export interface VacancyEquilibriumInput {
  /** reduction enthalpy per vacancy of O_O^x = V_O^(2+) + 2e' + 1/2 O2(g), eV */
  enthalpy_eV: number;
  /** reduction entropy per vacancy, in units of k (dimensionless) */
  entropy_kB: number;
  /** oxygen lattice sites per cm^3 (N_O) */
  oxygenSites_cm3: number;
  /** temperature at which the vacancies equilibrate with the gas, K */
  temperature_K: number;
  /** oxygen partial pressure, bar (activity relative to the 1 bar standard state) */
  oxygenPressure_bar: number;
}

export interface VacancyEquilibriumOptions {
  /** what to do when the site fraction exceeds DILUTE_LIMIT_SITE_FRACTION; default 'throw' */
  beyondDiluteLimit?: 'throw' | 'flag';
}

export interface VacancyEquilibrium {
  /** K(T) = exp(S/k) exp(-H/kT), site-fraction convention */
  massActionConstant: number;
  log10MassActionConstant: number;
  /** [V_O] / N_O */
  vacancySiteFraction: number;
  vacancyDensity_cm3: number;
  /** n = 2 [V_O] (both electrons of each doubly ionised vacancy free) */
  donorDensity_cm3: number;
  log10DonorDensity_cm3: number;
  /** true when the site fraction is beyond the dilute limit (only returned with beyondDiluteLimit: 'flag') */
  beyondDiluteLimit: boolean;
  temperature_K: number;
  oxygenPressure_bar: number;
}

/**
 * Equilibrium oxygen-vacancy donor density in the Brouwer regime n = 2[V_O].
 *
 * Convention: concentrations are site fractions relative to the oxygen sites N_O, and pO2 is in bar, so
 * the mass-action constant of O_O^x = V_O^(2+) + 2e' + 1/2 O2 is dimensionless:
 *   K = [V_O] n^2 pO2^(1/2) = exp(S_red/k) exp(-H_red/(kT))      (mass-action law)
 * With n = 2[V_O] (charge neutrality): 4[V_O]^3 = K pO2^(-1/2), so [V_O] = (K/4)^(1/3) pO2^(-1/6).
 * Computed in logarithms because K spans hundreds of decades between room temperature and 1500 K.
 * Electron site fractions relative to N_O are a bookkeeping choice: fitted H and S must use the same one.
 */
export function vacancyDonorDensity(input: VacancyEquilibriumInput, options: VacancyEquilibriumOptions = {}): VacancyEquilibrium {
  requireInRange('enthalpy_eV', input.enthalpy_eV, -5, 20, 'eV');
  requireInRange('entropy_kB', input.entropy_kB, -100, 100, 'k');
  requireInRange('oxygenSites_cm3', input.oxygenSites_cm3, 1e20, 1e24, 'cm^-3');
  requireInRange('temperature_K', input.temperature_K, 200, 2500, 'K');
  requireInRange('oxygenPressure_bar', input.oxygenPressure_bar, 1e-300, 1e3, 'bar');

  const lnK = input.entropy_kB - input.enthalpy_eV / (K_BOLTZMANN_EV_PER_K * input.temperature_K);
  // Brouwer-regime solution [V_O] = (K/4)^(1/3) pO2^(-1/6), in logs.
  const lnFraction = (lnK - Math.log(4)) / 3 - Math.log(input.oxygenPressure_bar) / 6;
  const fraction = Math.exp(lnFraction);
  const beyond = fraction > DILUTE_LIMIT_SITE_FRACTION;
  if (beyond && options.beyondDiluteLimit !== 'flag') {
    throw new InputError(
      'oxygenPressure_bar',
      `vacancy site fraction ${fraction.toPrecision(3)} is beyond the dilute limit ${DILUTE_LIMIT_SITE_FRACTION} where the mass-action law holds (raise pO2, lower the temperature, or check enthalpy_eV/entropy_kB)`,
      `conditions giving a vacancy site fraction up to ${DILUTE_LIMIT_SITE_FRACTION}`,
    );
  }
  const vacancyDensity_cm3 = input.oxygenSites_cm3 * fraction;
  const lnDonor = Math.log(2 * input.oxygenSites_cm3) + lnFraction;
  return {
    massActionConstant: Math.exp(lnK),
    log10MassActionConstant: lnK / Math.LN10,
    vacancySiteFraction: fraction,
    vacancyDensity_cm3,
    donorDensity_cm3: 2 * vacancyDensity_cm3,
    log10DonorDensity_cm3: lnDonor / Math.LN10,
    beyondDiluteLimit: beyond,
    temperature_K: input.temperature_K,
    oxygenPressure_bar: input.oxygenPressure_bar,
  };
}

/**
 * Standard Gibbs energy of formation of H2O(g), kJ/mol, 1 bar standard state, 298.15-1500 K: the rows of NIST-JANAF
 * table H-064 (M. W. Chase, NIST-JANAF Thermochemical Tables, 4th ed., J. Phys. Chem. Ref. Data Monograph 9, 1998)
 * held in src/bulk/defectChemistry.ts (JANAF_GIBBS_FORMATION_KJ_MOL.H2O, which documents how they were checked).
 */
export const WATER_GAS_GIBBS_FORMATION_KJ_MOL: ReadonlyArray<readonly [temperature_K: number, deltaG_kJ_mol: number]> =
  JANAF_GIBBS_FORMATION_KJ_MOL.H2O.filter(([t]) => t <= 1500);

/** Lowest temperature accepted: 298 K, so "298 K" from a user is not rejected for 0.15 K. */
export const WATER_TABLE_MIN_K = 298;
export const WATER_TABLE_MAX_K = 1500;

/**
 * delta-f G°(H2O, g) at T by linear interpolation in T of the JANAF table. Linear is enough: the table is
 * nearly straight (delta-f G ~ delta-f H - T delta-f S with a slowly varying delta-f S), and the 100 K steps
 * keep the interpolation error below 0.03 kJ/mol (h^2 f''/8), about 1 % in pO2 at 500 K. 298–298.15 K uses the first segment extended.
 */
export function waterGibbsFormation_kJ_mol(temperature_K: number): number {
  requireInRange('temperature_K', temperature_K, WATER_TABLE_MIN_K, WATER_TABLE_MAX_K, 'K');
  return gasGibbsFormation_kJ_mol('H2O', temperature_K);
}

export interface HydrogenWaterInput {
  temperature_K: number;
  /** pH2 / pH2O in the gas feed (dimensionless) */
  hydrogenToWater: number;
}

export interface OxygenPressureResult {
  oxygenPressure_bar: number;
  log10OxygenPressure_bar: number;
  waterGibbsFormation_kJ_mol: number;
}

/**
 * Equilibrium pO2 of an H2/H2O mixture through H2 + 1/2 O2 = H2O(g):
 *   K = pH2O / (pH2 pO2^(1/2)) = exp(-delta-f G° / RT)  ->  pO2 = (pH2O/pH2)^2 exp(2 delta-f G° / RT)
 * Assumes the gas reaches equilibrium with itself (true at pretreatment temperatures over a metal) and ideal gas.
 */
export function oxygenPressureFromHydrogenWater(input: HydrogenWaterInput): OxygenPressureResult {
  requireInRange('hydrogenToWater', input.hydrogenToWater, 1e-8, 1e8, '(pH2/pH2O)');
  const deltaG_kJ_mol = waterGibbsFormation_kJ_mol(input.temperature_K);
  const lnPressure =
    -2 * Math.log(input.hydrogenToWater) + (2 * deltaG_kJ_mol * 1e3) / (R_GAS_J_PER_MOL_K * input.temperature_K);
  return {
    oxygenPressure_bar: Math.exp(lnPressure),
    log10OxygenPressure_bar: lnPressure / Math.LN10,
    waterGibbsFormation_kJ_mol: deltaG_kJ_mol,
  };
}

export interface HydrogenReductionInput extends Omit<VacancyEquilibriumInput, 'oxygenPressure_bar'> {
  hydrogenToWater: number;
}

/** Vacancy donors after equilibrating in an H2/H2O mixture at temperature_K (pO2 from the water equilibrium). */
export function vacancyDonorDensityFromHydrogen(
  input: HydrogenReductionInput,
  options: VacancyEquilibriumOptions = {},
): VacancyEquilibrium & { hydrogenToWater: number } {
  const { hydrogenToWater, ...rest } = input;
  const { oxygenPressure_bar } = oxygenPressureFromHydrogenWater({ temperature_K: input.temperature_K, hydrogenToWater });
  return { ...vacancyDonorDensity({ ...rest, oxygenPressure_bar }, options), hydrogenToWater };
}

export interface FrozenInInput {
  /** conditions of the reduction (temperature_K is the reduction temperature) */
  reduction: VacancyEquilibriumInput;
  /** temperature at which the metal/support contact is evaluated, K */
  reactionTemperature_K: number;
}

export interface FrozenInResult extends VacancyEquilibrium {
  mode: 'frozen-in';
  reductionTemperature_K: number;
  reactionTemperature_K: number;
}

/**
 * Frozen-in vacancies: the donor density is the equilibrium value at the reduction temperature, and is
 * carried unchanged to the (lower) reaction temperature. Why: oxygen diffusion in the lattice is too slow
 * after cooling for the vacancy population to re-equilibrate, while electrons still follow the local
 * Fermi level. So this returns the density at T_red; the contact model uses it at reactionTemperature_K.
 */
export function frozenInDonorDensity(input: FrozenInInput, options: VacancyEquilibriumOptions = {}): FrozenInResult {
  requireInRange('reactionTemperature_K', input.reactionTemperature_K, 1, 2500, 'K');
  const atReduction = vacancyDonorDensity(input.reduction, options);
  return {
    ...atReduction,
    mode: 'frozen-in',
    reductionTemperature_K: input.reduction.temperature_K,
    reactionTemperature_K: input.reactionTemperature_K,
  };
}

/**
 * Cautions printed with any hydrogen pretreatment estimate. The numbers are screening values from common
 * safety data (flammability range from memory, checked against several secondary safety pages that give
 * 4–75, 4.1–74.2 and 4–77 vol%); the gas supplier's safety data sheet is the authority.
 */
export const HYDROGEN_CAUTIONS: string[] = [
  'Hydrogen is flammable in air over a wide range, roughly 4–75 vol% H2 (screening value from common safety data; check the supplier safety data sheet).',
  'Hydrogen has a very low ignition energy and burns with a nearly invisible flame; ventilate and remove ignition sources.',
  'Purge the reactor and lines with an inert gas (N2, Ar, He) before introducing hydrogen and again before admitting air.',
  'Hydrogen/oxygen mixtures are explosive: never switch directly between hydrogen and air or oxygen.',
  'Freshly reduced catalysts can be pyrophoric on exposure to air: cool under inert gas and passivate (e.g. with dilute O2 in inert gas) before handling.',
  'Follow local codes, your site safety procedures and licensed engineering practice for gas handling and pressure equipment.',
  'These numbers are screening estimates for catalyst design, not process-safety guidance.',
];
