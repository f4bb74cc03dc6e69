// Donors of the support from its defect chemistry (issue 12), resolved from the parameter-table rows: the reaction
// atmosphere (src/bulk/atmosphere.ts) and the inverse catalyst, an oxide overlayer on the metal with an optional
// oxidising anneal (overlayerDefects, src/bulk/defectChemistry.ts). Called by resolveContact (contactInput.ts).
import { InputError } from '../errors.js';
import { formatCitation } from '../materials/load.js';
import type { InputProvenance, MaterialsLibrary } from '../materials/types.js';
import { formatNumber } from '../output/format.js';
import { vacanciesOfSource, type AtmosphereSpec, type VacancyHistoryChoice, type VacancySource } from '../bulk/atmosphere.js';
import { oxygenActivity, overlayerDefects, type OverlayerInput, type ReactionGas } from '../bulk/defectChemistry.js';
import { flagName, row, type LibraryRecords, type OptionName } from './parameters.js';
import type { DefectsInfo, PretreatmentInfo } from '../types.js';
import type { ResolvedContact } from './contactInput.js';

/** What the defect inputs read of a resolution in progress (contactInput.ts's Resolution). */
export interface DefectContext {
  readonly lib: MaterialsLibrary;
  readonly records: LibraryRecords;
  readonly inputs: InputProvenance[];
  num(option: OptionName): number | undefined;
  value(option: OptionName): number | string | undefined;
}

/** The donors a defect model gives, with what the result reports and what sampling needs to recompute them. */
export interface DefectDonors {
  donors_m3: number;
  defects: DefectsInfo;
  vacancySource: ResolvedContact['vacancySource'];
}

export const NO_DEFECTS: DefectsInfo = {
  history: 'none',
  reactionGas: null,
  reactionGasValue: null,
  oxygenPartialPressure_bar: null,
  log10OxygenPartialPressure_bar: null,
  vacancies_cm3: null,
  equilibriumVacancies_cm3: null,
  reequilibrationTime_s: null,
  equilibratedFraction: null,
  timeOnStream_s: null,
  grainSize_nm: null,
  overlayerThickness_nm: null,
  annealTemperature_K: null,
  notes: [],
};

/** The value of a table row, or an InputError naming its flag ("missing") with the hint of what to give. */
export function required(c: DefectContext, option: OptionName, hint: string): number {
  const v = c.num(option);
  if (v === undefined) throw new InputError(flagName(row(option)), 'missing', hint);
  return v;
}

/** The support's vacancy formation thermodynamics and oxygen-site density (cm^-3), each required. */
export function reductionThermo(c: DefectContext): { enthalpy_eV: number; entropy_kB: number; oxygenSites_cm3: number } {
  const name = c.records.support?.name ?? 'this support';
  return {
    enthalpy_eV: required(c, 'reductionEnthalpy', `an energy per vacancy (the library has no reduction data for ${name})`),
    entropy_kB: required(c, 'reductionEntropy', 'an entropy per vacancy in units of k_B'),
    oxygenSites_cm3: required(c, 'oxygenSites', 'a density of oxygen lattice sites, e.g. "5e22 cm^-3"') * 1e-6,
  };
}

/** The reaction gas as given: its kind, label and value. */
function reactionGasOf(c: DefectContext): { gas: ReactionGas; label: string; value: number } {
  const po2 = c.num('reactionOxygenPressure');
  if (po2 !== undefined) return { gas: { kind: 'O2', oxygenPressure_bar: po2 / 1e5 }, label: 'O2', value: po2 / 1e5 };
  const h2 = c.num('reactionHydrogenToWater');
  if (h2 !== undefined) return { gas: { kind: 'H2/H2O', hydrogenToWater: h2 }, label: 'H2/H2O', value: h2 };
  const co = c.num('reactionCoToCo2')!;
  return { gas: { kind: 'CO/CO2', monoxideToDioxide: co }, label: 'CO/CO2', value: co };
}

/** The support's band edges and masses, as the vacancy mass-action law needs them. */
function bandOf(c: DefectContext): { bandGap_eV: number; electronMass_me: number; holeMass_me: number } {
  return { bandGap_eV: c.num('bandGap')!, electronMass_me: c.num('electronMass')!, holeMass_me: c.num('holeMass')! };
}

function diffusionOf(c: DefectContext): AtmosphereSpec['diffusion'] {
  const prefactor = c.num('oxygenDiffusionPrefactor');
  return prefactor === undefined ? null : { prefactor_m2_s: prefactor, activation_eV: c.num('oxygenDiffusionActivation')! };
}

function recordVacancies(c: DefectContext, vacancies_cm3: number, note: string): void {
  c.inputs.push({ field: 'donor density (oxygen vacancies)', value: vacancies_cm3, unit: 'cm^-3', origin: 'derived', note });
}

/** Donors from the reaction atmosphere, after the reduction `reduction` when one was given (src/bulk/atmosphere.ts). */
export function atmosphereDonors(c: DefectContext, reduction: PretreatmentInfo | null): DefectDonors {
  const thermo = reductionThermo(c);
  const reaction = reactionGasOf(c);
  const spec: AtmosphereSpec = {
    reactionTemperature_K: c.num('temperature')!,
    reactionGas: reaction.gas,
    history: c.value('vacancyHistory') as VacancyHistoryChoice,
    timeOnStream_s: c.num('timeOnStream') ?? null,
    reduction: reduction === null ? null : { temperature_K: reduction.reductionTemperature_K!, gas: { kind: 'O2', oxygenPressure_bar: reduction.oxygenPressure_Pa! / 1e5 } },
    grainSize_m: c.num('grainSize')!,
    diffusion: diffusionOf(c),
    band: bandOf(c),
  };
  const source: VacancySource = { kind: 'atmosphere', spec, oxygenSites_cm3: thermo.oxygenSites_cm3 };
  const a = vacanciesOfSource(source, thermo.enthalpy_eV, thermo.entropy_kB).atmosphere!;
  const ref = c.lib.references.get('chase1998');
  c.inputs.push({
    field: 'oxygen pressure (reaction gas)',
    value: a.oxygenPartialPressure_bar,
    unit: 'bar',
    origin: 'derived',
    source: 'chase1998',
    ...(ref !== undefined ? { citation: formatCitation(ref) } : {}),
    note: `${reaction.label} = ${formatNumber(reaction.value)} at ${formatNumber(spec.reactionTemperature_K, 4)} K (NIST-JANAF gas equilibria)`,
  });
  recordVacancies(c, a.vacancies_cm3, `${a.history} vacancies in the reaction gas (mass action with charge neutrality, src/bulk/atmosphere.ts)`);
  return {
    donors_m3: a.vacancies_cm3 * 1e6,
    vacancySource: { source, enthalpy_eV: thermo.enthalpy_eV, entropy_kB: thermo.entropy_kB },
    defects: {
      ...NO_DEFECTS,
      history: a.history,
      reactionGas: reaction.label,
      reactionGasValue: reaction.value,
      oxygenPartialPressure_bar: a.oxygenPartialPressure_bar,
      log10OxygenPartialPressure_bar: a.log10OxygenPartialPressure_bar,
      vacancies_cm3: a.vacancies_cm3,
      equilibriumVacancies_cm3: a.equilibriumVacancies_cm3,
      reequilibrationTime_s: a.reequilibrationTime_s,
      equilibratedFraction: a.equilibratedFraction,
      timeOnStream_s: spec.timeOnStream_s,
      grainSize_nm: spec.grainSize_m * 1e9,
      notes: a.notes,
    },
  };
}

/**
 * Inverse catalyst: the support is an oxide film of the given thickness on the metal, with its as-deposited
 * vacancies, relaxed by an oxidising anneal toward the equilibrium of the support's reduction law in the anneal
 * gas (or toward none, without reduction data) through the free face (overlayerDefects).
 */
export function overlayerDonors(c: DefectContext): DefectDonors {
  const thickness_m = c.num('overlayerThickness')!;
  const oxygenSites_cm3 = required(c, 'oxygenSites', 'a density of oxygen lattice sites of the overlayer, e.g. "4.4e22 cm^-3"') * 1e-6;
  const asDeposited_cm3 = c.num('overlayerVacancies')! * 1e-6;
  if (asDeposited_cm3 > oxygenSites_cm3) {
    throw new InputError('--overlayer-vacancies', `${formatNumber(asDeposited_cm3)} cm^-3 is more than the oxygen sites`, `up to ${formatNumber(oxygenSites_cm3)} cm^-3`);
  }
  const input: OverlayerInput = { thickness_m, oxygenSites_cm3, asDepositedVacancies_cm3: asDeposited_cm3 };
  const annealT = c.num('annealTemperature');
  let gas: ReactionGas | null = null;
  if (annealT !== undefined) {
    gas = { kind: 'O2', oxygenPressure_bar: c.num('annealOxygenPressure')! / 1e5 };
    input.anneal = { temperature_K: annealT, gas, duration_s: c.num('annealTime')! };
    input.diffusion = diffusionOf(c)!;
    const enthalpy_eV = c.num('reductionEnthalpy');
    const entropy_kB = c.num('reductionEntropy');
    input.annealEquilibrium =
      enthalpy_eV === undefined || entropy_kB === undefined
        ? { vacancies_cm3: 0 }
        : {
            system: {
              formation: { kind: 'reduction', enthalpy_eV, entropy_kB },
              oxygenSites_cm3,
              band: { ...bandOf(c), statistics: 'boltzmann' },
            },
          };
  }
  const o = overlayerDefects(input);
  const activity = gas === null ? null : oxygenActivity(gas, annealT!);
  recordVacancies(c, o.vacancies_cm3, o.annealed ? 'overlayer vacancies after the oxidising anneal (src/bulk/defectChemistry.ts overlayerDefects)' : 'overlayer vacancies as deposited');
  return {
    donors_m3: o.vacancies_cm3 * 1e6,
    vacancySource: null,
    defects: {
      ...NO_DEFECTS,
      history: o.annealed ? 'overlayer-annealed' : 'overlayer-as-deposited',
      reactionGas: gas === null ? null : 'O2',
      reactionGasValue: activity?.oxygenPressure_bar ?? null,
      oxygenPartialPressure_bar: activity?.oxygenPressure_bar ?? null,
      log10OxygenPartialPressure_bar: activity?.log10OxygenPressure_bar ?? null,
      vacancies_cm3: o.vacancies_cm3,
      equilibriumVacancies_cm3: o.equilibriumVacancies_cm3,
      reequilibrationTime_s: o.reequilibrationTime_s,
      equilibratedFraction: o.equilibratedFraction,
      timeOnStream_s: input.anneal?.duration_s ?? null,
      overlayerThickness_nm: thickness_m * 1e9,
      annealTemperature_K: annealT ?? null,
      notes: o.notes,
    },
  };
}

/**
 * The contact with its vacancy donors recomputed for the support's reduction enthalpy and entropy, when these differ
 * from the nominal ones (an --uncertainty sample); otherwise the contact itself.
 */
export function withVacancyDonors(r: ResolvedContact): ResolvedContact {
  const v = r.vacancySource;
  const s = r.support;
  if (v === null || (s.reductionEnthalpy_eV === v.enthalpy_eV && s.reductionEntropy_kB === v.entropy_kB)) return r;
  const sampled = vacanciesOfSource(v.source, s.reductionEnthalpy_eV ?? v.enthalpy_eV, s.reductionEntropy_kB ?? v.entropy_kB);
  const defects =
    sampled.atmosphere === null ? r.defects : { ...r.defects, vacancies_cm3: sampled.vacancies_cm3, equilibriumVacancies_cm3: sampled.atmosphere.equilibriumVacancies_cm3 };
  return { ...r, support: { ...s, donors_m3: sampled.vacancies_cm3 * 1e6 }, defects };
}
