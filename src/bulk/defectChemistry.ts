// Oxygen-vacancy defect chemistry of an oxide support: vacancies in equilibrium with a gas (H2/H2O, CO/CO2 or O2)
// with the Fermi level solved self-consistently, frozen-in vacancies after cooling, the re-equilibration time from a
// diffusion coefficient, a pretreatment history, and the defect state of a thin oxide overlayer on a metal.
//
// Conventions. Concentrations per cm^3 in and out (as materials/*.json and src/inputs/pretreatment.ts); the charge
// model of src/bulk/equilibrium.ts works in m^-3 inside. xi = (E_F - E_C)/kT. Donor levels are depths below E_C:
// donorLevel1_eV for (0/+), donorLevel2_eV for (+/2+). Degeneracies V_O^0 : V_O^+ : V_O^2+ = 1 : 2 : 1, the same as
// the double donor of src/bulk/equilibrium.ts. Vacancies are dilute (ideal mixing): beyond DILUTE_LIMIT_SITE_FRACTION
// of the oxygen sites the results are refused or flagged.
// References for the mass-action laws and their Brouwer limits: F. A. Kröger, The Chemistry of Imperfect Crystals
// (North-Holland, 1964; 2nd ed. 1973-74); D. M. Smyth, The Defect Chemistry of Metal Oxides (Oxford University
// Press, 2000). Diffusion solutions: J. Crank, The Mathematics of Diffusion, 2nd ed. (Clarendon Press, 1975).
import { K_BOLTZMANN_EV_PER_K, R_GAS_J_PER_MOL_K, thermalEnergy_eV } from '../constants.js';
import { InputError, requireInRange } from '../errors.js';
import type { Statistics } from '../types.js';
import { makeChargeModel, solveBulkNeutrality, type ChargeModel } from './equilibrium.js';

/**
 * Largest vacancy site fraction for which the ideal-dilute mass-action law is trusted. Beyond about 10 % of
 * oxygen sites, vacancies interact and order, and the oxide may transform to another phase.
 */
export const DILUTE_LIMIT_SITE_FRACTION = 0.1;

const M3_PER_CM3 = 1e6;
const LN2 = Math.LN2;

// ---------------------------------------------------------------------------------------------------------------
// Gas thermochemistry: NIST-JANAF standard Gibbs energies of formation
// ---------------------------------------------------------------------------------------------------------------

export type GasSpecies = 'H2O' | 'CO' | 'CO2';

/**
 * Standard Gibbs energies of formation delta-f G° (kJ/mol, 1 bar) of H2O(g), CO(g) and CO2(g) from the NIST-JANAF
 * Thermochemical Tables, 4th ed. (M. W. Chase, J. Phys. Chem. Ref. Data Monograph 9, 1998), tables H-064 (H2O),
 * C-093 (CO) and C-095 (CO2), column delta-f G°. Not read in the monograph itself: every row was matched against
 * public transcriptions of the tables found with the project's search tool (H2O to 1500 K: every row matched at least
 * one transcription to the last digit, most two or three; one other transcription differs by up to 0.011 kJ/mol at
 * 800, 900 and 1400 K, a CRC-Handbook-derived table by up to 0.05 kJ/mol above 800 K. H2O 1600-2100 K: a complete
 * copy of table H-064 and a transcription labelled by table number. CO and CO2: a transcription labelled by JANAF table number
 * at 300, 500, ..., 2100 K, and a second at 800-1800 K in 100 K steps; CO2 400 and 600 K and CO 298.15 K from one
 * transcription only). The 1000 K rows (H2O -192.590, CO -200.275, CO2 -395.886 kJ/mol) agree in every copy seen
 * and with the tables' log Kf column (10.060, 10.461, 20.679). CO has no row at 400 and 600 K here (no copy seen):
 * linear interpolation over the 200 K gaps errs by about 0.03 kJ/mol (checked against the 400 K value remembered
 * from the table, -146.341 kJ/mol). Verify against the printed monograph before relying on the third decimal.
 */
export const JANAF_GIBBS_FORMATION_KJ_MOL: Readonly<Record<GasSpecies, ReadonlyArray<readonly [temperature_K: number, deltaG_kJ_mol: number]>>> = {
  H2O: [
    [298.15, -228.582],
    [300, -228.5],
    [400, -223.901],
    [500, -219.051],
    [600, -214.007],
    [700, -208.812],
    [800, -203.496],
    [900, -198.083],
    [1000, -192.59],
    [1100, -187.033],
    [1200, -181.425],
    [1300, -175.774],
    [1400, -170.089],
    [1500, -164.376],
    [1600, -158.639],
    [1700, -152.883],
    [1800, -147.111],
    [1900, -141.325],
    [2000, -135.528],
    [2100, -129.721],
  ],
  CO: [
    [298.15, -137.163],
    [300, -137.328],
    [500, -155.414],
    [700, -173.518],
    [800, -182.497],
    [900, -191.416],
    [1000, -200.275],
    [1100, -209.075],
    [1200, -217.819],
    [1300, -226.509],
    [1400, -235.149],
    [1500, -243.74],
    [1600, -252.284],
    [1700, -260.784],
    [1800, -269.242],
    [1900, -277.658],
    [2000, -286.034],
    [2100, -294.372],
  ],
  CO2: [
    [298.15, -394.359],
    [300, -394.394],
    [400, -394.675],
    [500, -394.939],
    [600, -395.182],
    [700, -395.398],
    [800, -395.586],
    [900, -395.748],
    [1000, -395.886],
    [1100, -396.001],
    [1200, -396.098],
    [1300, -396.177],
    [1400, -396.24],
    [1500, -396.288],
    [1600, -396.323],
    [1700, -396.344],
    [1800, -396.353],
    [1900, -396.349],
    [2100, -396.304],
  ],
};

/** Lowest temperature accepted: 298 K, so "298 K" from a user is not rejected for 0.15 K. */
export const GAS_TABLE_MIN_K = 298;
export const GAS_TABLE_MAX_K = 2100;

/**
 * delta-f G°(species, T) by linear interpolation in T of the JANAF rows. Linear is enough: delta-f G is nearly
 * straight in T (slowly varying delta-f S); the error h^2 |G''|/8 = h^2 |delta-f Cp|/(8T) is below 0.03 kJ/mol for
 * the 100 K steps (0.05 kJ/mol for the 200 K gaps of CO), i.e. a few per cent in pO2 at 500 K. 298-298.15 K uses the
 * first segment extended.
 */
export function gasGibbsFormation_kJ_mol(species: GasSpecies, temperature_K: number): number {
  requireInRange('temperature_K', temperature_K, GAS_TABLE_MIN_K, GAS_TABLE_MAX_K, 'K');
  const table = JANAF_GIBBS_FORMATION_KJ_MOL[species];
  let index = 0;
  while (index < table.length - 2 && temperature_K > table[index + 1]![0]) index++;
  const [t0, g0] = table[index]!;
  const [t1, g1] = table[index + 1]!;
  return g0 + ((g1 - g0) * (temperature_K - t0)) / (t1 - t0);
}

/** The gas that sets the oxygen chemical potential. Ratios are partial-pressure ratios (dimensionless). */
export type ReactionGas =
  | { kind: 'O2'; oxygenPressure_bar: number }
  | { kind: 'H2/H2O'; hydrogenToWater: number }
  | { kind: 'CO/CO2'; monoxideToDioxide: number };

export interface OxygenActivity {
  /** ln(pO2 / 1 bar); finite even when pO2 itself underflows */
  lnOxygenPressure: number;
  log10OxygenPressure_bar: number;
  /** pO2 in bar (0 only if it underflows a double, below ~1e-308 bar) */
  oxygenPressure_bar: number;
  /** Delta mu_O = (1/2) kT ln(pO2/p°): oxygen chemical potential relative to 1/2 O2 at 1 bar and the same T, eV */
  oxygenChemicalPotential_eV: number;
  /** standard Gibbs energy of the buffer reaction (H2 + 1/2 O2 = H2O or CO + 1/2 O2 = CO2), kJ/mol; null for O2 */
  bufferReactionGibbs_kJ_mol: number | null;
}

function describeGas(gas: ReactionGas): string {
  if (gas.kind === 'O2') return `pO2 = ${gas.oxygenPressure_bar} bar`;
  if (gas.kind === 'H2/H2O') return `H2/H2O = ${gas.hydrogenToWater}`;
  return `CO/CO2 = ${gas.monoxideToDioxide}`;
}

/**
 * Equilibrium oxygen partial pressure of the gas at temperature_K (ideal gas, gas equilibrated with itself, which
 * holds over a metal at pretreatment temperatures):
 *   H2 + 1/2 O2 = H2O(g):  pO2 = (pH2O/pH2)^2 exp(2 delta-f G°(H2O)/RT)
 *   CO + 1/2 O2 = CO2:     pO2 = (pCO2/pCO)^2 exp(2 [delta-f G°(CO2) - delta-f G°(CO)]/RT)
 * (mass-action law with JANAF delta-f G°, Chase 1998).
 */
export function oxygenActivity(gas: ReactionGas, temperature_K: number): OxygenActivity {
  requireInRange('temperature_K', temperature_K, 200, 2500, 'K');
  let lnP: number;
  let reactionGibbs: number | null = null;
  const twoOverRT = 2e3 / (R_GAS_J_PER_MOL_K * temperature_K);
  switch (gas.kind) {
    case 'O2':
      requireInRange('oxygenPressure_bar', gas.oxygenPressure_bar, 1e-300, 1e3, 'bar');
      lnP = Math.log(gas.oxygenPressure_bar);
      break;
    case 'H2/H2O':
      requireInRange('hydrogenToWater', gas.hydrogenToWater, 1e-8, 1e8, '(pH2/pH2O)');
      reactionGibbs = gasGibbsFormation_kJ_mol('H2O', temperature_K);
      lnP = -2 * Math.log(gas.hydrogenToWater) + twoOverRT * reactionGibbs;
      break;
    case 'CO/CO2':
      requireInRange('monoxideToDioxide', gas.monoxideToDioxide, 1e-8, 1e8, '(pCO/pCO2)');
      reactionGibbs = gasGibbsFormation_kJ_mol('CO2', temperature_K) - gasGibbsFormation_kJ_mol('CO', temperature_K);
      lnP = -2 * Math.log(gas.monoxideToDioxide) + twoOverRT * reactionGibbs;
      break;
    default:
      throw new InputError('gas', `unknown gas kind "${String((gas as { kind: unknown }).kind)}"`, "'O2', 'H2/H2O', 'CO/CO2'");
  }
  return {
    lnOxygenPressure: lnP,
    log10OxygenPressure_bar: lnP / Math.LN10,
    oxygenPressure_bar: Math.exp(lnP),
    oxygenChemicalPotential_eV: 0.5 * thermalEnergy_eV(temperature_K) * lnP,
    bufferReactionGibbs_kJ_mol: reactionGibbs,
  };
}

// ---------------------------------------------------------------------------------------------------------------
// The vacancy system and its self-consistent equilibrium
// ---------------------------------------------------------------------------------------------------------------

/**
 * How the vacancy population is tied to the gas.
 * - 'neutral': O_O = V_O^0 + 1/2 O2(g), [V_O^0] = N_O exp(S/k) exp(-H/kT) pO2^(-1/2) (H, S per vacancy relative to
 *   1/2 O2 at 1 bar); the charged states follow from the (0/+) and (+/2+) levels and E_F. Levels required.
 * - 'reduction': O_O = V_O^2+ + 2e' + 1/2 O2(g) with the site-fraction constant of src/inputs/pretreatment.ts and
 *   materials/*.json (`reduction`): [V_O^2+]/N_O * (n/N_O)^2 * pO2^(1/2) = exp(S/k) exp(-H/kT), the electron activity
 *   written with E_F, n/N_O -> (N_C/N_O) exp(xi) (exact for Boltzmann electrons). Levels optional: without them every
 *   vacancy is doubly ionised.
 */
export type VacancyFormation =
  | { kind: 'neutral'; enthalpy_eV: number; entropy_kB: number; donorLevel1_eV: number; donorLevel2_eV: number }
  | { kind: 'reduction'; enthalpy_eV: number; entropy_kB: number; donorLevel1_eV?: number | undefined; donorLevel2_eV?: number | undefined };

export interface BandModel {
  bandGap_eV: number;
  electronMass_me: number;
  holeMass_me: number;
  /** default 'fermi-dirac' */
  statistics?: Statistics | undefined;
}

/** Fixed (non-vacancy) dopants: a single donor and an acceptor, fully ionised unless a level is given. */
export interface BackgroundDopants {
  donors_cm3?: number | undefined;
  /** depth of the donor level below E_C, eV */
  donorLevel_eV?: number | undefined;
  acceptors_cm3?: number | undefined;
  /** height of the acceptor level above E_V, eV */
  acceptorLevel_eV?: number | undefined;
}

export interface VacancySystem {
  formation: VacancyFormation;
  /** oxygen lattice sites per cm^3 (N_O) */
  oxygenSites_cm3: number;
  band: BandModel;
  background?: BackgroundDopants | undefined;
}

export interface DiluteOptions {
  /** what to do when the vacancy site fraction exceeds DILUTE_LIMIT_SITE_FRACTION; default 'throw' */
  beyondDiluteLimit?: 'throw' | 'flag';
}

export interface VacancyPopulations {
  neutral_cm3: number;
  singlyIonised_cm3: number;
  doublyIonised_cm3: number;
  total_cm3: number;
  /** log10 of total_cm3, finite even when the total underflows; null when there are no vacancies at all */
  log10Total_cm3: number | null;
}

export interface DefectState {
  /** 'equilibrated': vacancies exchange oxygen with the gas at temperature_K; 'frozen': their number is fixed */
  mode: 'equilibrated' | 'frozen';
  temperature_K: number;
  /** log10 pO2 of the gas the vacancies are in equilibrium with (null when frozen: no exchange) */
  log10OxygenPressure_bar: number | null;
  vacancies: VacancyPopulations;
  vacancySiteFraction: number;
  /** positive charge of the vacancies per cm^3, [V+] + 2 [V2+] */
  vacancyCharge_cm3: number;
  electrons_cm3: number;
  holes_cm3: number;
  ionisedBackgroundDonors_cm3: number;
  ionisedBackgroundAcceptors_cm3: number;
  /** E_C - E_F in the bulk, eV */
  fermiLevelBelowConduction_eV: number;
  /** (E_F - E_C)/kT */
  reducedFermiLevel: number;
  beyondDiluteLimit: boolean;
}

function logSumExp(values: number[]): number {
  let max = -Infinity;
  for (const v of values) if (v > max) max = v;
  if (max === -Infinity) return -Infinity;
  let sum = 0;
  for (const v of values) sum += Math.exp(v - max);
  return max + Math.log(sum);
}

function validateSystem(system: VacancySystem): void {
  const f = system.formation;
  if (f.kind !== 'neutral' && f.kind !== 'reduction') {
    throw new InputError('formation.kind', `unknown formation kind "${String((f as { kind: unknown }).kind)}"`, "'neutral', 'reduction'");
  }
  requireInRange('formation.enthalpy_eV', f.enthalpy_eV, -5, 20, 'eV');
  requireInRange('formation.entropy_kB', f.entropy_kB, -100, 100, 'k');
  const gap = requireInRange('band.bandGap_eV', system.band.bandGap_eV, 0.05, 15, 'eV');
  const hasL1 = f.donorLevel1_eV !== undefined;
  const hasL2 = f.donorLevel2_eV !== undefined;
  if (f.kind === 'neutral' && !(hasL1 && hasL2)) {
    throw new InputError('formation.donorLevel1_eV', "a 'neutral' formation needs both vacancy levels (0/+) and (+/2+)", 'depths below E_C in eV');
  }
  if (hasL1 !== hasL2) {
    throw new InputError('formation.donorLevel2_eV', 'give both vacancy levels (0/+) and (+/2+) or neither', 'both or neither');
  }
  // levels may lie above E_C (negative depth: the state autoionises) but not beyond the gap
  if (hasL1) requireInRange('formation.donorLevel1_eV', f.donorLevel1_eV!, -2, gap, 'eV');
  if (hasL2) requireInRange('formation.donorLevel2_eV', f.donorLevel2_eV!, -2, gap, 'eV');
  requireInRange('oxygenSites_cm3', system.oxygenSites_cm3, 1e20, 1e24, 'cm^-3');
  requireInRange('band.electronMass_me', system.band.electronMass_me, 0.01, 100, 'm_e');
  requireInRange('band.holeMass_me', system.band.holeMass_me, 0.01, 100, 'm_e');
  const bg = system.background;
  if (bg !== undefined) {
    if (bg.donors_cm3 !== undefined) requireInRange('background.donors_cm3', bg.donors_cm3, 0, 1e23, 'cm^-3');
    if (bg.acceptors_cm3 !== undefined) requireInRange('background.acceptors_cm3', bg.acceptors_cm3, 0, 1e23, 'cm^-3');
    if (bg.donorLevel_eV !== undefined) requireInRange('background.donorLevel_eV', bg.donorLevel_eV, 0, gap, 'eV');
    if (bg.acceptorLevel_eV !== undefined) requireInRange('background.acceptorLevel_eV', bg.acceptorLevel_eV, 0, gap, 'eV');
  }
}

/**
 * The vacancy population as a function of xi: either open (exchanging oxygen with the gas: ln[V2+] = B - 2 xi) or
 * closed (a fixed total shared among the charge states). Log-weights of V2+, V+, V0 relative to V2+:
 *   0, ln 2 + xi + e2, 2 xi + e1 + e2          (e = level depth / kT; Fermi-Dirac occupancy of a double donor)
 */
export type VacancyReservoir = { kind: 'open'; lnDoubly_m3_atXiZero: number } | { kind: 'closed'; total_m3: number };

interface VacancyLogs {
  /** ln of [V0], [V+], [V2+] in m^-3 */
  l0: number;
  l1: number;
  l2: number;
}

function makeVacancyLogs(formation: VacancyFormation, kT_eV: number, reservoir: VacancyReservoir): (xi: number) => VacancyLogs {
  const hasLevels = formation.donorLevel1_eV !== undefined && formation.donorLevel2_eV !== undefined;
  const e1 = hasLevels ? formation.donorLevel1_eV! / kT_eV : 0;
  const e2 = hasLevels ? formation.donorLevel2_eV! / kT_eV : 0;
  const lnTotal = reservoir.kind === 'closed' ? (reservoir.total_m3 > 0 ? Math.log(reservoir.total_m3) : -Infinity) : 0;
  return (xi) => {
    const w1 = hasLevels ? LN2 + xi + e2 : -Infinity;
    const w0 = hasLevels ? 2 * xi + e1 + e2 : -Infinity;
    // open: ln[V2+] = B - 2 xi (mass action); closed: [V_k] = N w_k / sum w
    const l2 = reservoir.kind === 'open' ? reservoir.lnDoubly_m3_atXiZero - 2 * xi : lnTotal - logSumExp([0, w1, w0]);
    return { l2, l1: l2 + w1, l0: l2 + w0 };
  };
}

/**
 * The charge model of the support with oxygen vacancies added to the band carriers and background dopants of
 * makeChargeModel (src/bulk/equilibrium.ts). Everything else of the base model (carrier densities, statistics,
 * later additions) is kept: the vacancy charge is added to donorCharge, netCharge and logChargeBalance.
 */
export function withVacancies(base: ChargeModel, formation: VacancyFormation, reservoir: VacancyReservoir): ChargeModel {
  const logs = makeVacancyLogs(formation, base.kT_eV, reservoir);
  const scratch = new Float64Array(2);
  /** [V+] + 2 [V2+] and its xi-derivative (<= 0) */
  function vacancyCharge(xi: number, out: Float64Array): void {
    const { l0, l1, l2 } = logs(xi);
    const v1 = Math.exp(l1);
    const v2 = Math.exp(l2);
    out[0] = v1 + 2 * v2;
    if (reservoir.kind === 'open') {
      // d[V+]/dxi = -[V+], d[V2+]/dxi = -2[V2+] (mass action with a fixed [V0])
      out[1] = -v1 - 4 * v2;
    } else {
      // closed: d<q>N/dxi = -N Var(q) with q = 0, 1, 2
      const total = Math.exp(l0) + v1 + v2;
      const mean = total > 0 ? out[0] / total : 0;
      out[1] = total > 0 ? -(v1 + 4 * v2 - total * mean * mean) : 0;
    }
  }
  return {
    ...base,
    donorCharge(xi) {
      vacancyCharge(xi, scratch);
      return base.donorCharge(xi) + scratch[0]!;
    },
    netCharge(xi, out) {
      base.netCharge(xi, out);
      vacancyCharge(xi, scratch);
      out[0] = out[0]! + scratch[0]!;
      out[1] = out[1]! + scratch[1]!;
    },
    logChargeBalance(xi) {
      const { l1, l2 } = logs(xi);
      const lnHoles = Math.log(base.valenceDos_m3) + base.statistics.logDensity(-xi - base.reducedGap);
      const lnElectrons = Math.log(base.conductionDos_m3) + base.statistics.logDensity(xi);
      const donors = base.donorCharge(xi);
      const acceptors = base.ionisedAcceptors(xi);
      const positive = logSumExp([lnHoles, donors > 0 ? Math.log(donors) : -Infinity, l1, LN2 + l2]);
      const negative = logSumExp([lnElectrons, acceptors > 0 ? Math.log(acceptors) : -Infinity]);
      return positive - negative;
    },
  };
}

function baseModel(system: VacancySystem, temperature_K: number): ChargeModel {
  const bg = system.background ?? {};
  return makeChargeModel({
    temperature_K,
    bandGap_eV: system.band.bandGap_eV,
    electronMass_me: system.band.electronMass_me,
    holeMass_me: system.band.holeMass_me,
    donors: { density_m3: (bg.donors_cm3 ?? 0) * M3_PER_CM3, kind: 'single', level1_eV: bg.donorLevel_eV },
    acceptors: { density_m3: (bg.acceptors_cm3 ?? 0) * M3_PER_CM3, level_eV: bg.acceptorLevel_eV },
    statistics: system.band.statistics ?? 'fermi-dirac',
  });
}

/**
 * ln[V2+] at xi = 0 (m^-3) of the open system:
 *   'neutral':   ln[V0] = ln N_O + S/k - H/kT - (1/2) ln pO2, and [V2+] = [V0] exp(-(2 xi + e1 + e2))
 *   'reduction': ln[V2+] = ln N_O + S/k - H/kT - (1/2) ln pO2 - 2 (xi + ln(N_C/N_O))
 */
function openReservoir(system: VacancySystem, kT_eV: number, conductionDos_m3: number, lnOxygenPressure: number): VacancyReservoir {
  const f = system.formation;
  const lnSites = Math.log(system.oxygenSites_cm3 * M3_PER_CM3);
  const lnK = lnSites + f.entropy_kB - f.enthalpy_eV / kT_eV - 0.5 * lnOxygenPressure;
  const lnB =
    f.kind === 'neutral'
      ? lnK - (f.donorLevel1_eV + f.donorLevel2_eV) / kT_eV
      : lnK - 2 * (Math.log(conductionDos_m3) - lnSites);
  return { kind: 'open', lnDoubly_m3_atXiZero: lnB };
}

function assembleState(
  system: VacancySystem,
  model: ChargeModel,
  reservoir: VacancyReservoir,
  temperature_K: number,
  log10OxygenPressure_bar: number | null,
  options: DiluteOptions,
  field: string,
): DefectState {
  const bulk = solveBulkNeutrality(model);
  const xi = bulk.reducedFermiLevel;
  const { l0, l1, l2 } = makeVacancyLogs(system.formation, model.kT_eV, reservoir)(xi);
  const lnTotal = logSumExp([l0, l1, l2]);
  const lnSites = Math.log(system.oxygenSites_cm3 * M3_PER_CM3);
  const fraction = Math.exp(lnTotal - lnSites);
  const beyond = fraction > DILUTE_LIMIT_SITE_FRACTION;
  if (beyond && options.beyondDiluteLimit !== 'flag') {
    throw new InputError(
      field,
      `vacancy site fraction ${fraction.toPrecision(3)} is beyond the dilute limit ${DILUTE_LIMIT_SITE_FRACTION} where the mass-action law holds (raise pO2, lower the temperature, or check the formation enthalpy/entropy)`,
      `conditions giving a vacancy site fraction up to ${DILUTE_LIMIT_SITE_FRACTION}`,
    );
  }
  const perCm3 = (l: number) => Math.exp(l) / M3_PER_CM3;
  const base = baseModel(system, temperature_K);
  const v1 = perCm3(l1);
  const v2 = perCm3(l2);
  return {
    mode: reservoir.kind === 'open' ? 'equilibrated' : 'frozen',
    temperature_K,
    log10OxygenPressure_bar,
    vacancies: {
      neutral_cm3: perCm3(l0),
      singlyIonised_cm3: v1,
      doublyIonised_cm3: v2,
      total_cm3: perCm3(lnTotal),
      log10Total_cm3: lnTotal === -Infinity ? null : (lnTotal - Math.log(M3_PER_CM3)) / Math.LN10,
    },
    vacancySiteFraction: fraction,
    vacancyCharge_cm3: v1 + 2 * v2,
    electrons_cm3: bulk.electronDensity_m3 / M3_PER_CM3,
    holes_cm3: bulk.holeDensity_m3 / M3_PER_CM3,
    ionisedBackgroundDonors_cm3: base.donorCharge(xi) / M3_PER_CM3,
    ionisedBackgroundAcceptors_cm3: base.ionisedAcceptors(xi) / M3_PER_CM3,
    fermiLevelBelowConduction_eV: bulk.fermiLevelBelowConduction_eV,
    reducedFermiLevel: xi,
    beyondDiluteLimit: beyond,
  };
}

/**
 * The charge model (src/bulk/equilibrium.ts interface) of the support with its background dopants and oxygen
 * vacancies at temperature_K, for the bulk neutrality solve or a space-charge (Poisson) solve:
 * - { gas }: vacancies exchanging oxygen with the gas (open; their number follows E_F locally),
 * - { vacancies_cm3 }: a fixed vacancy density whose charge states follow E_F (frozen).
 */
export function vacancyChargeModel(
  system: VacancySystem,
  temperature_K: number,
  population: { gas: ReactionGas } | { vacancies_cm3: number },
): { model: ChargeModel; reservoir: VacancyReservoir; log10OxygenPressure_bar: number | null } {
  validateSystem(system);
  requireInRange('temperature_K', temperature_K, 'gas' in population ? 200 : 1, 2500, 'K');
  const base = baseModel(system, temperature_K);
  if ('gas' in population) {
    const activity = oxygenActivity(population.gas, temperature_K);
    const reservoir = openReservoir(system, base.kT_eV, base.conductionDos_m3, activity.lnOxygenPressure);
    return { model: withVacancies(base, system.formation, reservoir), reservoir, log10OxygenPressure_bar: activity.log10OxygenPressure_bar };
  }
  requireInRange('vacancies_cm3', population.vacancies_cm3, 0, system.oxygenSites_cm3, 'cm^-3');
  const reservoir: VacancyReservoir = { kind: 'closed', total_m3: population.vacancies_cm3 * M3_PER_CM3 };
  return { model: withVacancies(base, system.formation, reservoir), reservoir, log10OxygenPressure_bar: null };
}

export interface EquilibriumConditions {
  temperature_K: number;
  gas: ReactionGas;
}

/**
 * Vacancies in equilibrium with the gas at temperature_K, with E_F from charge neutrality
 *   n + N_A^- = p + N_D^+ + [V+] + 2[V2+]        (electrons and holes from the band model of makeChargeModel)
 * solved by bisection in logs (solveBulkNeutrality), so it holds from metals-like reduced oxides to wide-gap
 * insulators whose carrier densities underflow. Brouwer limits (Kröger 1964; Smyth 2000): [V] ~ pO2^(-1/6) when
 * V2+ and electrons dominate, pO2^(-1/4) for V+ and electrons, pO2^(-1/2) for neutral vacancies or a fixed n.
 */
export function equilibrateVacancies(system: VacancySystem, conditions: EquilibriumConditions, options: DiluteOptions = {}): DefectState {
  const { model, reservoir, log10OxygenPressure_bar } = vacancyChargeModel(system, conditions.temperature_K, { gas: conditions.gas });
  return assembleState(system, model, reservoir, conditions.temperature_K, log10OxygenPressure_bar, options, 'gas');
}

/**
 * Frozen vacancies: a fixed total density (set earlier, e.g. at the reduction temperature) shared among V0, V+, V2+
 * at temperature_K, with E_F from charge neutrality. Electrons redistribute; oxygen does not.
 */
export function freezeVacancies(system: VacancySystem, frozen: { temperature_K: number; vacancies_cm3: number }, options: DiluteOptions = {}): DefectState {
  const { model, reservoir } = vacancyChargeModel(system, frozen.temperature_K, { vacancies_cm3: frozen.vacancies_cm3 });
  return assembleState(system, model, reservoir, frozen.temperature_K, null, options, 'vacancies_cm3');
}

// ---------------------------------------------------------------------------------------------------------------
// Re-equilibration by diffusion
// ---------------------------------------------------------------------------------------------------------------

/** D = D0 exp(-Ea/kT): the coefficient that limits re-equilibration (chemical diffusion coefficient of oxygen). */
export interface DiffusionCoefficient {
  prefactor_m2_s: number;
  activation_eV: number;
}

/** D(T) = D0 exp(-Ea/kT) (Arrhenius law); may underflow to 0 at low temperature (then nothing moves). */
export function diffusionCoefficient_m2_s(diffusion: DiffusionCoefficient, temperature_K: number): number {
  requireInRange('diffusion.prefactor_m2_s', diffusion.prefactor_m2_s, 1e-20, 1e2, 'm^2/s');
  requireInRange('diffusion.activation_eV', diffusion.activation_eV, 0, 10, 'eV');
  requireInRange('temperature_K', temperature_K, 1, 2500, 'K');
  return diffusion.prefactor_m2_s * Math.exp(-diffusion.activation_eV / (K_BOLTZMANN_EV_PER_K * temperature_K));
}

/** Largest time reported; a frozen state at room temperature would otherwise give an infinite time. */
export const MAX_REPORTED_TIME_S = 1e300;

/**
 * Re-equilibration time t = L^2 / D for a particle, grain or film of size L (order-of-magnitude criterion: after
 * t the mean approach to equilibrium is 93 % for a film of thickness L exchanging through one face and > 99.9 %
 * for a sphere of diameter L, see equilibratedFraction). Capped at MAX_REPORTED_TIME_S.
 */
export function reequilibrationTime_s(size_m: number, diffusion: DiffusionCoefficient, temperature_K: number): number {
  requireInRange('size_m', size_m, 1e-10, 1, 'm');
  diffusionCoefficient_m2_s(diffusion, temperature_K); // validates the inputs
  // ln t = 2 ln L - ln D0 + Ea/kT, in logs so a frozen low-temperature state does not overflow
  const lnTime = 2 * Math.log(size_m) - Math.log(diffusion.prefactor_m2_s) + diffusion.activation_eV / (K_BOLTZMANN_EV_PER_K * temperature_K);
  return lnTime > Math.log(MAX_REPORTED_TIME_S) ? MAX_REPORTED_TIME_S : Math.exp(lnTime);
}

/**
 * 'slab': a film of thickness L exchanging through one face, the other blocked (a metal underneath) = half of
 * Crank's plane sheet of thickness 2l, l = L. 'sphere': a particle of diameter L (radius a = L/2).
 */
export type DiffusionGeometry = 'slab' | 'sphere';

/**
 * Mean approach to equilibrium M_t/M_inf after time t at constant D, uniform start and a surface held at the new
 * equilibrium, as a function of tau = D t / L^2:
 *   slab:   1 - sum_n 8/((2n+1)^2 pi^2) exp(-(2n+1)^2 pi^2 tau / 4)          (Crank 1975, eq. 4.18, l = L)
 *           short times 2 sqrt(tau/pi)                                    (Crank eq. 4.20, leading term)
 *   sphere: 1 - (6/pi^2) sum_n (1/n^2) exp(-n^2 pi^2 tau_a), tau_a = D t/a^2 = 4 tau  (Crank eq. 6.20)
 *           short times 6 sqrt(tau_a/pi) - 3 tau_a                       (Crank eq. 6.21, leading terms)
 * The short-time forms are used below tau = 1e-4, where their neglected terms are below exp(-1/(4 tau)) ~ 1e-1000.
 */
export function equilibratedFraction(geometry: DiffusionGeometry, tau: number): number {
  if (!Number.isFinite(tau) || tau < 0) throw new RangeError(`equilibratedFraction: tau must be finite and >= 0, got ${tau}`);
  if (tau === 0) return 0;
  const SHORT = 1e-4;
  if (geometry === 'slab') {
    if (tau < SHORT) return 2 * Math.sqrt(tau / Math.PI);
    let sum = 0;
    for (let n = 0; n < 100000; n++) {
      const m = 2 * n + 1;
      const term = (8 / (m * m * Math.PI * Math.PI)) * Math.exp((-m * m * Math.PI * Math.PI * tau) / 4);
      sum += term;
      if (term < 1e-18) break;
    }
    return Math.min(1, Math.max(0, 1 - sum));
  }
  const tauA = 4 * tau;
  if (tauA < SHORT) return 6 * Math.sqrt(tauA / Math.PI) - 3 * tauA;
  let sum = 0;
  for (let n = 1; n < 100000; n++) {
    const term = (6 / (n * n * Math.PI * Math.PI)) * Math.exp(-n * n * Math.PI * Math.PI * tauA);
    sum += term;
    if (term < 1e-18) break;
  }
  return Math.min(1, Math.max(0, 1 - sum));
}

function fractionAfter(geometry: DiffusionGeometry, size_m: number, diffusion: DiffusionCoefficient, temperature_K: number, duration_s: number): number {
  const d = diffusionCoefficient_m2_s(diffusion, temperature_K);
  const tau = (d * duration_s) / (size_m * size_m);
  return equilibratedFraction(geometry, Number.isFinite(tau) ? tau : 1e300);
}

// ---------------------------------------------------------------------------------------------------------------
// Pretreatment and reaction history
// ---------------------------------------------------------------------------------------------------------------

export interface HistoryStep {
  temperature_K: number;
  gas: ReactionGas;
  duration_s: number;
}

export interface HistoryKinetics {
  /** particle diameter or grain size (sphere), or film thickness (slab), m */
  size_m: number;
  geometry: DiffusionGeometry;
  diffusion: DiffusionCoefficient;
}

export interface HistoryOptions extends DiluteOptions {
  /**
   * 'frozen': the vacancies equilibrate only when the temperature exceeds every earlier one (the highest step sets
   * them), then stay fixed; electrons redistribute at the last step's temperature.
   * 'equilibrated': the vacancies are in equilibrium with the last step's gas at its temperature.
   * 'kinetic': each step moves the mean vacancy density toward that step's equilibrium by the fraction
   * equilibratedFraction(D t / L^2) (needs kinetics). This treats re-equilibration as linear diffusion with a
   * constant D and a uniform start in every step (Crank's solutions), a screening estimate: D depends on the
   * vacancy concentration, and a profile left by one step is not uniform at the start of the next.
   */
  mode: 'frozen' | 'equilibrated' | 'kinetic';
  kinetics?: HistoryKinetics | undefined;
  /** kinetic mode: vacancies before the first step; default: in equilibrium with the first step */
  initialVacancies_cm3?: number | undefined;
}

export interface HistoryStepRecord {
  temperature_K: number;
  log10OxygenPressure_bar: number;
  equilibriumVacancies_cm3: number;
  /** L^2/D at this step (null without kinetics) */
  reequilibrationTime_s: number | null;
  /** mean approach to this step's equilibrium during the step (null without kinetics) */
  equilibratedFraction: number | null;
  vacanciesAfter_cm3: number;
}

export interface HistoryResult {
  mode: HistoryOptions['mode'];
  /** the state after the last step */
  state: DefectState;
  /** index of the step whose equilibrium set the vacancies (frozen / equilibrated); null for kinetic */
  setByStep: number | null;
  steps: HistoryStepRecord[];
  /** plain-language warnings, e.g. when the frozen assumption contradicts the diffusion time */
  notes: string[];
}

/**
 * The vacancy state after a list of pretreatment/reaction steps ({temperature_K, gas, duration_s}); the last step is
 * the condition the contact is evaluated at. A pure function of its inputs.
 */
export function vacancyHistory(system: VacancySystem, steps: HistoryStep[], options: HistoryOptions): HistoryResult {
  if (!Array.isArray(steps) || steps.length === 0) throw new InputError('steps', 'at least one step is needed', 'a list of {temperature_K, gas, duration_s}');
  if (options.mode !== 'frozen' && options.mode !== 'equilibrated' && options.mode !== 'kinetic') {
    throw new InputError('mode', `unknown mode "${String(options.mode)}"`, "'frozen', 'equilibrated', 'kinetic'");
  }
  const kin = options.kinetics;
  if (options.mode === 'kinetic' && kin === undefined) {
    throw new InputError('kinetics', "mode 'kinetic' needs a particle size and a diffusion coefficient", '{size_m, geometry, diffusion}');
  }
  if (kin !== undefined) requireInRange('kinetics.size_m', kin.size_m, 1e-10, 1, 'm');
  steps.forEach((s, i) => requireInRange(`steps[${i}].duration_s`, s.duration_s, 0, 1e12, 's'));
  const dilute: DiluteOptions = options.beyondDiluteLimit === undefined ? {} : { beyondDiluteLimit: options.beyondDiluteLimit };
  const equilibria = steps.map((s) => equilibrateVacancies(system, s, dilute));
  const records: HistoryStepRecord[] = [];
  const notes: string[] = [];
  let vacancies: number;
  let setByStep: number | null = null;
  let highest = -Infinity;
  if (options.mode === 'kinetic') {
    if (options.initialVacancies_cm3 !== undefined) requireInRange('initialVacancies_cm3', options.initialVacancies_cm3, 0, system.oxygenSites_cm3, 'cm^-3');
    vacancies = options.initialVacancies_cm3 ?? equilibria[0]!.vacancies.total_cm3;
  } else vacancies = 0;
  steps.forEach((step, i) => {
    const eq = equilibria[i]!.vacancies.total_cm3;
    const time = kin === undefined ? null : reequilibrationTime_s(kin.size_m, kin.diffusion, step.temperature_K);
    const fraction = kin === undefined ? null : fractionAfter(kin.geometry, kin.size_m, kin.diffusion, step.temperature_K, step.duration_s);
    if (options.mode === 'kinetic') {
      // mean density relaxes toward this step's equilibrium: c = c_eq + (c_prev - c_eq)(1 - F)  (Crank, linear diffusion)
      vacancies = eq + (vacancies - eq) * (1 - fraction!);
    } else if (options.mode === 'frozen') {
      // running maximum: a step at least as hot as every earlier one re-sets the vacancies (the later of equals wins)
      if (step.temperature_K >= highest) {
        highest = step.temperature_K;
        vacancies = eq;
        setByStep = i;
      }
    } else {
      vacancies = eq;
      setByStep = i;
    }
    records.push({
      temperature_K: step.temperature_K,
      log10OxygenPressure_bar: equilibria[i]!.log10OxygenPressure_bar!,
      equilibriumVacancies_cm3: eq,
      reequilibrationTime_s: time,
      equilibratedFraction: fraction,
      vacanciesAfter_cm3: vacancies,
    });
  });
  const last = steps[steps.length - 1]!;
  const lastRecord = records[records.length - 1]!;
  if (kin !== undefined && lastRecord.reequilibrationTime_s !== null) {
    const t = lastRecord.reequilibrationTime_s;
    if (options.mode === 'frozen' && t < last.duration_s && setByStep !== steps.length - 1) {
      notes.push(
        `frozen vacancies are doubtful: at ${last.temperature_K} K the re-equilibration time L^2/D = ${t.toPrecision(3)} s is shorter than the step (${last.duration_s} s); consider mode 'equilibrated' or 'kinetic'`,
      );
    }
    if (options.mode === 'equilibrated' && t > last.duration_s) {
      notes.push(
        `equilibrated vacancies are doubtful: at ${last.temperature_K} K the re-equilibration time L^2/D = ${t.toPrecision(3)} s is longer than the step (${last.duration_s} s); consider mode 'frozen' or 'kinetic'`,
      );
    }
  }
  let state: DefectState;
  if (options.mode === 'equilibrated') state = equilibria[equilibria.length - 1]!;
  else state = freezeVacancies(system, { temperature_K: last.temperature_K, vacancies_cm3: Math.min(vacancies, system.oxygenSites_cm3) }, dilute);
  return { mode: options.mode, state, setByStep: options.mode === 'kinetic' ? null : setByStep, steps: records, notes };
}

// ---------------------------------------------------------------------------------------------------------------
// Inverse catalyst: an oxide overlayer on a metal
// ---------------------------------------------------------------------------------------------------------------

/**
 * Vacancy density of an oxygen-deficient MO_x film from its composition: (x_ideal - x)/x_ideal of the oxygen sites
 * of the stoichiometric oxide are empty (e.g. SiO_1.8: 10 %).
 */
export function vacanciesFromStoichiometry(oxygenPerCation: number, idealOxygenPerCation: number, oxygenSites_cm3: number): number {
  requireInRange('idealOxygenPerCation', idealOxygenPerCation, 0.5, 4, '');
  requireInRange('oxygenPerCation', oxygenPerCation, 0, idealOxygenPerCation, '');
  requireInRange('oxygenSites_cm3', oxygenSites_cm3, 1e20, 1e24, 'cm^-3');
  return (oxygenSites_cm3 * (idealOxygenPerCation - oxygenPerCation)) / idealOxygenPerCation;
}

export interface OverlayerAnneal {
  temperature_K: number;
  gas: ReactionGas;
  duration_s: number;
}

export interface OverlayerInput {
  /** overlayer thickness, m (e.g. 1-100 nm) */
  thickness_m: number;
  oxygenSites_cm3: number;
  asDepositedVacancies_cm3: number;
  anneal?: OverlayerAnneal | undefined;
  /** needed with an anneal: the chemical diffusion coefficient of oxygen in the overlayer */
  diffusion?: DiffusionCoefficient | undefined;
  /**
   * needed with an anneal: the equilibrium the film tends to, either from a vacancy system (equilibrated at the
   * anneal temperature and gas) or a given density (e.g. 0 for a fully re-oxidised film).
   */
  annealEquilibrium?: { system: VacancySystem } | { vacancies_cm3: number } | undefined;
}

export interface OverlayerDefects {
  /** oxygen vacancies per cm^3 after deposition (and the anneal, if any): the double-donor density */
  vacancies_cm3: number;
  vacancySiteFraction: number;
  /** electrons the vacancies can release, 2 per vacancy, per cm^3 */
  donorDensity_cm3: number;
  annealed: boolean;
  /** thickness^2/D < anneal duration; null without an anneal */
  annealReachedEquilibrium: boolean | null;
  reequilibrationTime_s: number | null;
  /** mean approach to the anneal equilibrium (Crank slab, one face exchanging); null without an anneal */
  equilibratedFraction: number | null;
  equilibriumVacancies_cm3: number | null;
  beyondDiluteLimit: boolean;
  notes: string[];
}

/**
 * Defect state of an oxide overlayer of thickness t on a metal: the as-deposited vacancy density, and after an
 * oxidising anneal (temperature, gas, duration) the mean density relaxed toward the anneal equilibrium through the
 * film's free face (the metal underneath blocks oxygen): c = c_eq + (c_0 - c_eq)(1 - F(D t_anneal / t^2)). The
 * anneal counts as having reached equilibrium when t^2/D < duration. The electrostatics of the film (planar support
 * of finite thickness on the metal) is the contact model's `supportThickness`; this gives the donors.
 */
export function overlayerDefects(input: OverlayerInput): OverlayerDefects {
  requireInRange('thickness_m', input.thickness_m, 1e-10, 1e-5, 'm');
  requireInRange('oxygenSites_cm3', input.oxygenSites_cm3, 1e20, 1e24, 'cm^-3');
  requireInRange('asDepositedVacancies_cm3', input.asDepositedVacancies_cm3, 0, input.oxygenSites_cm3, 'cm^-3');
  const notes: string[] = [];
  let vacancies = input.asDepositedVacancies_cm3;
  let reached: boolean | null = null;
  let time: number | null = null;
  let fraction: number | null = null;
  let equilibrium: number | null = null;
  if (input.anneal !== undefined) {
    const a = input.anneal;
    requireInRange('anneal.temperature_K', a.temperature_K, 200, 2500, 'K');
    requireInRange('anneal.duration_s', a.duration_s, 0, 1e12, 's');
    if (input.diffusion === undefined) {
      throw new InputError('diffusion', 'an anneal needs the oxygen diffusion coefficient of the overlayer to tell whether it equilibrates', '{prefactor_m2_s, activation_eV}');
    }
    if (input.annealEquilibrium === undefined) {
      throw new InputError('annealEquilibrium', 'an anneal needs the equilibrium it tends to: a vacancy system or a density', '{system} or {vacancies_cm3}');
    }
    if ('system' in input.annealEquilibrium) {
      equilibrium = equilibrateVacancies(input.annealEquilibrium.system, { temperature_K: a.temperature_K, gas: a.gas }, { beyondDiluteLimit: 'flag' }).vacancies.total_cm3;
    } else {
      equilibrium = requireInRange('annealEquilibrium.vacancies_cm3', input.annealEquilibrium.vacancies_cm3, 0, input.oxygenSites_cm3, 'cm^-3');
    }
    time = reequilibrationTime_s(input.thickness_m, input.diffusion, a.temperature_K);
    fraction = fractionAfter('slab', input.thickness_m, input.diffusion, a.temperature_K, a.duration_s);
    reached = time < a.duration_s;
    vacancies = equilibrium + (vacancies - equilibrium) * (1 - fraction);
    if (!reached) {
      notes.push(
        `the anneal (${a.duration_s} s at ${a.temperature_K} K in ${describeGas(a.gas)}) is shorter than thickness^2/D = ${time.toPrecision(3)} s: the film is only partly re-equilibrated`,
      );
    }
  }
  const siteFraction = vacancies / input.oxygenSites_cm3;
  const beyond = siteFraction > DILUTE_LIMIT_SITE_FRACTION;
  if (beyond) {
    notes.push(
      `vacancy site fraction ${siteFraction.toPrecision(3)} is beyond the dilute limit ${DILUTE_LIMIT_SITE_FRACTION}: a substoichiometric phase rather than isolated donors; treat the donor density as an upper bound`,
    );
  }
  return {
    vacancies_cm3: vacancies,
    vacancySiteFraction: siteFraction,
    donorDensity_cm3: 2 * vacancies,
    annealed: input.anneal !== undefined,
    annealReachedEquilibrium: reached,
    reequilibrationTime_s: time,
    equilibratedFraction: fraction,
    equilibriumVacancies_cm3: equilibrium,
    beyondDiluteLimit: beyond,
    notes,
  };
}
