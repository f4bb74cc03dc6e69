// Oxygen vacancies of the support set by the gases it has seen: an optional reduction before use, then the reaction
// atmosphere (H2/H2O, CO/CO2 or O2) at the reaction temperature, with the vacancy history chosen by the user
// (frozen, equilibrated, or kinetic over a time on stream). The donor density of the contact is the result.
// Physics in src/bulk/defectChemistry.ts (mass action with a self-consistent Fermi level; Crank's diffusion
// solutions); the Brouwer closed form of a reduction alone is src/inputs/pretreatment.ts.
import { requireInRange } from '../errors.js';
import { vacancyDonorDensity } from '../inputs/pretreatment.js';
import {
  equilibrateVacancies,
  oxygenActivity,
  vacancyHistory,
  type BandModel,
  type DiffusionCoefficient,
  type HistoryResult,
  type HistoryStep,
  type ReactionGas,
  type VacancySystem,
} from './defectChemistry.js';

export type VacancyHistoryChoice = 'frozen' | 'equilibrated' | 'kinetic';

/** Reduction thermodynamics of the support: O_O = V_O(2+) + 2e' + 1/2 O2, K = exp(S/k - H/kT) (site fractions). */
export interface ReductionThermo {
  enthalpy_eV: number;
  entropy_kB: number;
  oxygenSites_cm3: number;
}

/** The gas history of the support, ending in the reaction atmosphere. */
export interface AtmosphereSpec {
  reactionTemperature_K: number;
  reactionGas: ReactionGas;
  history: VacancyHistoryChoice;
  /** duration of the reaction step, s (required for 'kinetic'; null: not stated) */
  timeOnStream_s: number | null;
  /** reduction before use: the vacancies equilibrated at this temperature and gas (null: none) */
  reduction: { temperature_K: number; gas: ReactionGas } | null;
  /** support grain (crystallite) diameter for re-equilibration by diffusion, m */
  grainSize_m: number;
  /** chemical diffusion coefficient of oxygen (null: none published, no re-equilibration time) */
  diffusion: DiffusionCoefficient | null;
  band: BandModel;
}

export interface AtmosphereDefects {
  history: VacancyHistoryChoice;
  /** vacancies during the reaction, cm^-3 (the double-donor density of the contact) */
  vacancies_cm3: number;
  /** vacancies in equilibrium with the reaction gas at the reaction temperature, cm^-3 */
  equilibriumVacancies_cm3: number;
  oxygenPartialPressure_bar: number;
  log10OxygenPartialPressure_bar: number;
  /** grain^2 / D at the reaction temperature, s; null without a diffusion coefficient */
  reequilibrationTime_s: number | null;
  /** mean approach to the reaction-gas equilibrium during the time on stream; null without D or time */
  equilibratedFraction: number | null;
  notes: string[];
}

/**
 * Vacancies during the reaction. The electron statistics are Boltzmann, the statistics the mass-action law
 * K = [V_O] n^2 pO2^(1/2) assumes (n/N_O = (N_C/N_O) exp(xi) exactly), so that with no other defects the result is
 * the Brouwer closed form [V_O] = (K/4)^(1/3) pO2^(-1/6) of src/inputs/pretreatment.ts (Kröger 1964; Smyth 2000).
 * - 'equilibrated': in equilibrium with the reaction gas at the reaction temperature;
 * - 'frozen': set by the hottest step (the reduction when it was hotter), then fixed;
 * - 'kinetic': from the reduction equilibrium (or the reaction one when there was no reduction) toward the
 *   reaction equilibrium by the mean diffusion fraction F(D t / d^2) of a sphere of diameter d (Crank 1975, eq. 6.20).
 */
export function atmosphereDefects(spec: AtmosphereSpec, thermo: ReductionThermo): AtmosphereDefects {
  requireInRange('grainSize_m', spec.grainSize_m, 1e-10, 1, 'm');
  const system: VacancySystem = {
    formation: { kind: 'reduction', enthalpy_eV: thermo.enthalpy_eV, entropy_kB: thermo.entropy_kB },
    oxygenSites_cm3: thermo.oxygenSites_cm3,
    band: { ...spec.band, statistics: 'boltzmann' },
  };
  const reaction: HistoryStep = { temperature_K: spec.reactionTemperature_K, gas: spec.reactionGas, duration_s: spec.timeOnStream_s ?? 0 };
  const kinetics = spec.diffusion === null ? undefined : { size_m: spec.grainSize_m, geometry: 'sphere' as const, diffusion: spec.diffusion };
  let history: HistoryResult;
  if (spec.history === 'kinetic') {
    const initial = spec.reduction === null ? undefined : equilibrateVacancies(system, spec.reduction).vacancies.total_cm3;
    history = vacancyHistory(system, [reaction], { mode: 'kinetic', kinetics, initialVacancies_cm3: initial });
  } else {
    const steps: HistoryStep[] = spec.reduction === null ? [reaction] : [{ ...spec.reduction, duration_s: 0 }, reaction];
    history = vacancyHistory(system, steps, { mode: spec.history, kinetics });
  }
  const last = history.steps[history.steps.length - 1]!;
  const activity = oxygenActivity(spec.reactionGas, spec.reactionTemperature_K);
  const notes: string[] = [];
  const fraction = spec.timeOnStream_s === null ? null : last.equilibratedFraction;
  // the history chosen contradicts diffusion when more (frozen) or less (equilibrated) than half has relaxed
  if (fraction !== null && spec.history === 'frozen' && fraction > 0.5) {
    notes.push(`frozen vacancies are doubtful: ${(100 * fraction).toPrecision(3)} % would re-equilibrate with the reaction gas during the time on stream; consider --vacancy-history kinetic`);
  }
  if (fraction !== null && spec.history === 'equilibrated' && fraction < 0.5) {
    notes.push(`equilibrated vacancies are doubtful: only ${(100 * fraction).toPrecision(3)} % would re-equilibrate during the time on stream; consider --vacancy-history kinetic`);
  }
  if (spec.history === 'kinetic' && spec.reduction === null) {
    notes.push('kinetic history without a reduction before use: the support starts in equilibrium with the reaction gas, so nothing relaxes');
  }
  return {
    history: spec.history,
    vacancies_cm3: history.state.vacancies.total_cm3,
    equilibriumVacancies_cm3: last.equilibriumVacancies_cm3,
    oxygenPartialPressure_bar: activity.oxygenPressure_bar,
    log10OxygenPartialPressure_bar: activity.log10OxygenPressure_bar,
    reequilibrationTime_s: last.reequilibrationTime_s,
    equilibratedFraction: fraction,
    notes,
  };
}

/**
 * Where the vacancy donors of a contact come from, as plain data, so that a sampled reduction enthalpy or entropy
 * (--uncertainty) recomputes them: a reduction alone ('pretreatment': Brouwer closed form at the equilibration
 * temperature and pO2), or a reaction atmosphere ('atmosphere').
 */
export type VacancySource =
  | { kind: 'pretreatment'; temperature_K: number; oxygenPressure_bar: number; oxygenSites_cm3: number }
  | { kind: 'atmosphere'; spec: AtmosphereSpec; oxygenSites_cm3: number };

/** The vacancy density (cm^-3) of a source for a given reduction enthalpy and entropy, and the atmosphere details. */
export function vacanciesOfSource(
  source: VacancySource,
  enthalpy_eV: number,
  entropy_kB: number,
): { vacancies_cm3: number; atmosphere: AtmosphereDefects | null } {
  const thermo = { enthalpy_eV, entropy_kB, oxygenSites_cm3: source.oxygenSites_cm3 };
  if (source.kind === 'pretreatment') {
    const v = vacancyDonorDensity({ ...thermo, temperature_K: source.temperature_K, oxygenPressure_bar: source.oxygenPressure_bar });
    return { vacancies_cm3: v.vacancyDensity_cm3, atmosphere: null };
  }
  const atmosphere = atmosphereDefects(source.spec, thermo);
  return { vacancies_cm3: atmosphere.vacancies_cm3, atmosphere };
}
