// Inputs of one contact: user options (CLI flags, study fields or library call) + materials library -> SI values
// with provenance. A loop over the parameter table (inputs/parameters.ts) plus the real cross-field rules.
import { InputError, requireInRange } from '../errors.js';
import type { InputProvenance, MaterialsLibrary, PropertyValue } from '../materials/types.js';
import { findMetal, findSupport, provenanceOf, resolveLibrary, formatCitation } from '../materials/load.js';
import { estimateElectronAffinity } from '../materials/estimate.js';
import { donorsForFermiLevel } from '../derived/fermiLevel.js';
import { formatNumber } from '../output/format.js';
import { parseQuantity } from './units.js';
import { frozenInDonorDensity, oxygenPressureFromHydrogenWater, vacancyDonorDensity } from './pretreatment.js';
import type { VacancySource } from '../bulk/atmosphere.js';
import { NO_DEFECTS, atmosphereDonors, overlayerDonors, reductionThermo, required, type DefectDonors } from './defectInputs.js';
import {
  PARAMETERS,
  OPTION_NAMES,
  checkLimits,
  closestName,
  displayUnitOf,
  flagName,
  fromDisplay,
  hasOverlayer,
  hasPretreatment,
  hasReactionGas,
  hasReductionGas,
  isArrayGeometry,
  row,
  toDisplay,
  type ContactOptions,
  type LibraryRecords,
  type OptionName,
  type ParameterRow,
  type RowContext,
  type SampledField,
} from './parameters.js';
import type { BarrierModel, DefectsInfo, GeometryKind, PretreatmentInfo, Statistics } from '../types.js';
import type { DonorKind, SupportElectronic } from '../bulk/equilibrium.js';

export type { ContactOptions } from './parameters.js';
export { withVacancyDonors } from './defectInputs.js';

export interface ResolvedSupport {
  name: string;
  electronAffinity_eV: number;
  bandGap_eV: number;
  permittivity: number;
  opticalPermittivity: number;
  /** quartic Landau coefficient of the support's lattice polarisation, V m^5 C^-3 (0: linear dielectric) */
  permittivityNonlinearity_V_m5_per_C3: number;
  electronMass_me: number;
  holeMass_me: number;
  donorKind: DonorKind;
  donors_m3: number;
  donorLevel1_eV: number | undefined;
  donorLevel2_eV: number | undefined;
  acceptors_m3: number;
  acceptorLevel_eV: number | undefined;
  neutralLevel_eV: number | undefined;
  pinningFactor: number | undefined;
  /** interface-states model: charge-neutrality level above E_V, eV */
  neutralLevelAboveValence_eV: number | undefined;
  /** interface-states model: D_it per eV per m^2 (undefined = from the pinning factor and the layer) */
  interfaceStateDensity_per_eV_m2: number | undefined;
  interfaceLayerThickness_m: number | undefined;
  interfaceLayerPermittivity: number | undefined;
  /** interface-states model: donor-like surface states per m^2 (0: none) and their depth below E_C, eV */
  surfaceDonors_m2: number;
  surfaceDonorLevel_eV: number | undefined;
  /** localised (small-polaron) electron sites per m^3 and their depth below E_C, eV */
  localisedSites_m3: number | undefined;
  localisedLevel_eV: number | undefined;
  /** reduction enthalpy (eV) and entropy (k_B) per vacancy, when a reduction or reaction gas sets the donors */
  reductionEnthalpy_eV?: number | undefined;
  reductionEntropy_kB?: number | undefined;
}

export interface ResolvedMetal {
  name: string;
  workFunction_eV: number;
  density_g_cm3: number | undefined;
  molarMass_g_mol: number | undefined;
  metallicRadius_pm: number | undefined;
  /** density of states at E_F per atom per eV (finite-particle quantum capacitance) */
  densityOfStates_per_eV_atom: number | undefined;
  /** alpha of the size-dependent ionisation potential IP = W + alpha e^2/(4 pi eps0 R) */
  sizeWorkFunctionCoefficient: number | undefined;
}

export interface ResolvedContact {
  metal: ResolvedMetal;
  support: ResolvedSupport;
  temperature_K: number;
  barrierModel: BarrierModel;
  givenBarrier_eV: number | undefined;
  geometry: GeometryKind;
  particleDiameter_m: number;
  particleDensity_m2: number | undefined;
  supportThickness_m: number | undefined;
  statistics: Statistics;
  refinement: number;
  /** Monte Carlo samples (0 = off) and their seed */
  uncertaintySamples: number;
  seed: number;
  pretreatment: PretreatmentInfo;
  /** oxygen vacancies in the reaction atmosphere (history 'none' without a reaction gas) */
  defects: DefectsInfo;
  /** where the vacancy donors come from, with the nominal reduction enthalpy and entropy (null: donors not from a gas) */
  vacancySource: { source: VacancySource; enthalpy_eV: number; entropy_kB: number } | null;
  inputs: InputProvenance[];
  cautions: string[];
  /** materials the sampling in uncertainty studies may vary: field -> [min, max] in SI */
  ranges: Map<SampledField, [number, number]>;
}

/** Inputs an uncertainty study may vary within their published ranges. */
export type SampledFields = Record<SampledField, number>;

/** The values of the table rows as resolved so far (SI numbers, chosen names). */
class Resolution implements RowContext {
  readonly values = new Map<OptionName, number | string>();
  readonly inputs: InputProvenance[] = [];
  readonly cautions: string[] = [];
  readonly ranges = new Map<SampledField, [number, number]>();
  /** set when a reduction pretreatment gave the donors */
  pretreatment: PretreatmentInfo | undefined;
  /** set when a reduction or a reaction gas gave the donors */
  vacancySource: ResolvedContact['vacancySource'] = null;
  defects: DefectsInfo | undefined;
  constructor(
    readonly options: ContactOptions,
    readonly lib: MaterialsLibrary,
    readonly records: LibraryRecords,
  ) {}
  value(option: OptionName): number | string | undefined {
    return this.values.get(option);
  }
  given(option: OptionName): boolean {
    return this.options[option] !== undefined;
  }
  num(option: OptionName): number | undefined {
    return this.values.get(option) as number | undefined;
  }
}

/** Inputs computed from others when the user does not give them (tried before the library value). */
const DERIVED: Partial<Record<OptionName, (c: Resolution) => number | undefined>> = {
  electronAffinity: electronAffinityFromFormula,
  permittivity: curieWeissPermittivity,
  donors: (c) => (hasPretreatment(c) ? defectDonors(c) : undefined),
};

/** Refusals that need several options at once (the single-option ones are the `when` of each row). */
const CROSS_RULES: { option: OptionName; refuse: (o: ContactOptions, c: Resolution) => boolean; message: string; allowed?: string }[] = [
  {
    option: 'donors',
    refuse: (o, c) => o.donors !== undefined && hasPretreatment(c),
    message: 'cannot be combined with a pretreatment (the pretreatment sets the donor density)',
    allowed: 'either --donors or reduction conditions',
  },
  {
    option: 'reactionCoToCo2',
    refuse: (_o, c) => hasReactionGas(c) && hasReductionGas(c) && !c.given('reductionTemperature'),
    message: 'a reduction gas and a reaction gas at the same temperature: give --reduction-temperature for the reduction',
    allowed: '--reduction-temperature T with --oxygen-pressure / --hydrogen-to-water, or the reaction gas alone',
  },
  {
    option: 'timeOnStream',
    refuse: (o, c) => c.value('vacancyHistory') === 'kinetic' && o.timeOnStream === undefined,
    message: 'missing',
    allowed: 'the kinetic vacancy history needs a time on stream, e.g. "5 h"',
  },
  {
    option: 'oxygenDiffusionActivation',
    refuse: (_o, c) =>
      (c.value('vacancyHistory') === 'kinetic' && c.value('oxygenDiffusionPrefactor') === undefined) ||
      (c.value('oxygenDiffusionPrefactor') !== undefined && c.value('oxygenDiffusionActivation') === undefined),
    message: 'missing: the kinetic history needs a chemical diffusion coefficient of oxygen (prefactor and activation energy), and the library has none for this support',
    allowed: '--oxygen-diffusion-prefactor D0 and --oxygen-diffusion-activation E, or --vacancy-history frozen|equilibrated',
  },
  {
    option: 'overlayerVacancies',
    refuse: (o, c) => hasOverlayer(c) && o.overlayerVacancies === undefined,
    message: 'missing',
    allowed: 'the overlayer needs its as-deposited vacancy density, e.g. "1e20 cm^-3" (MO_x: N_O (x_ideal - x)/x_ideal)',
  },
  {
    option: 'annealTime',
    refuse: (_o, c) => c.value('annealTemperature') !== undefined && (c.value('oxygenDiffusionPrefactor') === undefined || c.value('oxygenDiffusionActivation') === undefined),
    message: 'an anneal needs the diffusion coefficient of oxygen in the overlayer to tell how far it re-oxidises, and the library has none for this support',
    allowed: '--oxygen-diffusion-prefactor D0 and --oxygen-diffusion-activation E',
  },
  {
    option: 'donorLevel2',
    refuse: (o, c) => o.donorLevel !== undefined && c.value('donorType') === 'double' && o.donorLevel2 === undefined,
    message: 'missing',
    allowed: 'a double donor needs both level depths below E_C',
  },
  {
    option: 'barrier',
    refuse: (o, c) => c.value('barrierModel') === 'given' && o.barrier === undefined,
    message: 'missing',
    allowed: 'the given barrier model needs --barrier E',
  },
  {
    option: 'neutralLevelAboveValence',
    refuse: (_o, c) => c.value('barrierModel') === 'interface-states' && c.value('neutralLevelAboveValence') === undefined,
    message: 'missing: --barrier-model interface-states needs a charge-neutrality level, and the library has none for this support',
    allowed: 'an energy above E_V, or --barrier-model ideal|pinned|given',
  },
  {
    option: 'supportThickness',
    refuse: (o, c) => hasOverlayer(c) && o.supportThickness !== undefined,
    message: 'cannot be combined with --overlayer-thickness (the overlayer is the support)',
    allowed: 'either --support-thickness or --overlayer-thickness',
  },
  {
    option: 'geometry',
    refuse: (_o, c) => hasOverlayer(c) && c.value('geometry') !== 'planar',
    message: 'an oxide overlayer on a metal is a planar film',
    allowed: 'planar (the default) with --overlayer-thickness',
  },
  {
    option: 'particleDensity',
    refuse: (o, c) => isArrayGeometry(c.value('geometry')) && o.particleDensity === undefined,
    message: 'the array geometries need a particle density',
    allowed: `${row('particleDensity').limits!.map((v) => toDisplay(row('particleDensity'), v)).join(' to ')} cm^-2`,
  },
];

export function resolveContact(options: ContactOptions): ResolvedContact {
  checkOptionNames(options);
  const lib = resolveLibrary(options.materials);
  const records: LibraryRecords = {
    metal: options.metal !== undefined ? findMetal(lib, textOf(row('metal'), options.metal)) : undefined,
    support: options.support !== undefined ? findSupport(lib, textOf(row('support'), options.support)) : undefined,
  };
  const c = new Resolution(options, lib, records);
  for (const p of PARAMETERS) {
    resolveRow(c, p);
    for (const rule of CROSS_RULES) {
      if (rule.option === p.option && rule.refuse(options, c)) throw new InputError(flagName(p), rule.message, rule.allowed);
    }
  }
  return assembleResolved(c);
}

/** Unknown keys are refused with the CLI's wording (a misspelt option would otherwise be silently dropped). */
function checkOptionNames(options: ContactOptions): void {
  if (typeof options !== 'object' || options === null) throw new InputError('options', 'expected an object of contact options');
  for (const key of Object.keys(options)) {
    if (OPTION_NAMES.includes(key as OptionName)) continue;
    const guess = closestName(key, OPTION_NAMES);
    throw new InputError(key, `unknown option${guess !== undefined ? ` (did you mean "${guess}"?)` : ''}`, 'the ContactOptions names, see `bandbend contact --help`');
  }
}

function textOf(p: ParameterRow, raw: unknown): string {
  if (typeof raw !== 'string' || raw.trim() === '') throw new InputError(flagName(p), 'expected a non-empty name', p.help);
  return raw.trim();
}

/** One row: the user's value, else a derived one, else the library's, else the fallback; with provenance. */
function resolveRow(c: Resolution, p: ParameterRow): void {
  const raw = c.options[p.option];
  if (p.kind === 'materials' || p.option === 'metal' || p.option === 'support') return;
  if (p.when !== undefined && !p.when.test(c)) {
    if (raw !== undefined) throw new InputError(flagName(p), `only used ${p.when.text}`, `leave out ${flagName(p)}`);
    return;
  }
  if (raw !== undefined) {
    c.values.set(p.option, userValue(c, p, raw));
    return;
  }
  const derived = DERIVED[p.option]?.(c);
  if (derived !== undefined) {
    c.values.set(p.option, checkLimits(p, derived));
    return;
  }
  const pv = p.library?.(c.records, c);
  if (pv !== undefined) {
    c.values.set(p.option, libraryValue(c, p, pv));
    return;
  }
  if (p.fallback === undefined) return;
  const v = typeof p.fallback.value === 'function' ? p.fallback.value(c) : p.fallback.value;
  c.values.set(p.option, v);
  if (p.label !== undefined && typeof v === 'number') {
    c.inputs.push({ field: p.label, value: toDisplay(p, v), unit: displayUnitOf(p).unit, origin: 'default', ...(p.fallback.note ? { note: p.fallback.note } : {}) });
  }
}

function userValue(c: Resolution, p: ParameterRow, raw: unknown): number | string {
  const flag = flagName(p);
  if (p.kind === 'text') return textOf(p, raw);
  if (p.kind === 'choice') {
    if (typeof raw !== 'string' || !p.choices!.includes(raw)) {
      throw new InputError(flag, `unknown ${flag.slice(2).replace(/-/g, ' ')} "${String(raw)}"`, p.choices!.join(', '));
    }
    return raw;
  }
  const v = parseQuantity(flag, raw as number | string, p.quantity ?? 'dimensionless');
  if (p.kind === 'integer' && !Number.isInteger(v)) {
    throw new InputError(flag, `expected a whole number, got ${v}`, `${p.limits![0]} to ${p.limits![1]}`);
  }
  checkLimits(p, v);
  if (p.label !== undefined) {
    const note = p.option === 'workFunctionShift' ? { note: shiftSourceNote(c.options) } : {};
    c.inputs.push({ field: p.label, value: toDisplay(p, v), unit: displayUnitOf(p).unit, origin: 'user', ...note });
  }
  return v;
}

function shiftSourceNote(o: ContactOptions): string {
  return o.workFunctionShiftSource ? `source: ${o.workFunctionShiftSource}` : 'no source given';
}

/** A library value: in the row's display unit, converted like a user value, its published range kept for sampling. */
function libraryValue(c: Resolution, p: ParameterRow, pv: PropertyValue): number {
  const v = checkLimits(p, fromDisplay(p, pv.value));
  const label = p.libraryLabel?.(c.records) ?? p.label ?? p.option;
  c.inputs.push(provenanceOf(c.lib, label, pv, displayUnitOf(p).unit));
  if (p.sampledAs !== undefined && pv.min !== undefined && pv.max !== undefined && pv.max > pv.min) {
    c.ranges.set(p.sampledAs, [fromDisplay(p, pv.min), fromDisplay(p, pv.max)]);
  }
  return v;
}

/** Temperature at which a library static permittivity with a Curie–Weiss temperature is taken as measured, K. */
export const CURIE_WEISS_REFERENCE_K = 300;
/** Lowest temperature of the Curie–Weiss law for SrTiO3 (Neville, Hoeneisen & Mead 1972: satisfied from 60 K up), K */
export const CURIE_WEISS_MIN_K = 60;

/**
 * A paraelectric support's static permittivity at the contact temperature: the library value (at 300 K) carried by
 * the Curie–Weiss law eps(T) = C / (T - T0), i.e. eps(T) = eps(300 K) (300 K - T0) / (T - T0), with T0 from the
 * library (SrTiO3: 30 K, Neville, Hoeneisen & Mead, J. Appl. Phys. 43, 2124 (1972)); held at its 60 K value below
 * 60 K, where SrTiO3 turns quantum paraelectric and the law no longer holds. Its published range is carried the same
 * way for --uncertainty. Undefined (the library value as is) for supports without a Curie–Weiss temperature.
 */
function curieWeissPermittivity(c: Resolution): number | undefined {
  const s = c.records.support;
  const t0 = s?.curieWeissTemperature_K;
  const eps = s?.staticPermittivity;
  if (s === undefined || t0 === undefined || eps === undefined || !(t0.value < CURIE_WEISS_REFERENCE_K)) return undefined;
  const t = Math.max(c.num('temperature')!, CURIE_WEISS_MIN_K);
  const scale = (CURIE_WEISS_REFERENCE_K - t0.value) / (t - t0.value);
  c.inputs.push(provenanceOf(c.lib, 'static permittivity at 300 K', eps, ''));
  c.inputs.push(provenanceOf(c.lib, 'Curie-Weiss temperature', t0, 'K'));
  const held = c.num('temperature')! < CURIE_WEISS_MIN_K ? `; below ${CURIE_WEISS_MIN_K} K held at its ${CURIE_WEISS_MIN_K} K value (quantum paraelectric: the law fails)` : '';
  c.inputs.push({
    field: 'static permittivity',
    value: eps.value * scale,
    unit: '',
    origin: 'derived',
    note: `Curie-Weiss: eps(T) = eps(300 K) (300 K - T0) / (T - T0), T0 = ${t0.value} K${held}`,
  });
  if (eps.min !== undefined && eps.max !== undefined && eps.max > eps.min) c.ranges.set('permittivity', [eps.min * scale, eps.max * scale]);
  return eps.value * scale;
}

function electronAffinityFromFormula(c: Resolution): number | undefined {
  const formula = c.value('supportFormula') as string | undefined;
  if (formula === undefined) return undefined;
  const estimate = estimateElectronAffinity(formula, c.num('bandGap')!);
  c.inputs.push({ ...estimate.provenance, field: 'electron affinity' });
  const { min, max } = estimate.provenance;
  if (min !== undefined && max !== undefined) c.ranges.set('electronAffinity_eV', [min, max]);
  return estimate.electronAffinity_eV;
}

/** Donors from the defect chemistry: an overlayer's own vacancies, a reaction atmosphere (after a reduction), or a reduction alone. */
function defectDonors(c: Resolution): number {
  const adopt = (d: DefectDonors): number => {
    c.defects = d.defects;
    c.vacancySource = d.vacancySource;
    return d.donors_m3;
  };
  if (hasOverlayer(c)) return adopt(overlayerDonors(c));
  if (!hasReactionGas(c)) return pretreatmentDonors(c);
  const reduction = hasReductionGas(c) ? pretreatmentInfo(c) : null;
  if (reduction !== null) c.pretreatment = reduction;
  return adopt(atmosphereDonors(c, reduction));
}

/** Donors from the reduction pretreatment: oxygen vacancies (double donors) from the gas condition. */
function pretreatmentDonors(c: Resolution): number {
  const info = pretreatmentInfo(c);
  c.pretreatment = info;
  const oxygenSites_cm3 = c.num('oxygenSites')! * 1e-6;
  const source: VacancySource = { kind: 'pretreatment', temperature_K: info.equilibrationTemperature_K!, oxygenPressure_bar: info.oxygenPressure_Pa! / 1e5, oxygenSites_cm3 };
  c.vacancySource = { source, enthalpy_eV: c.num('reductionEnthalpy')!, entropy_kB: c.num('reductionEntropy')! };
  c.inputs.push({
    field: 'donor density (oxygen vacancies)',
    value: info.vacancyDensity_cm3!,
    unit: 'cm^-3',
    origin: 'derived',
    note: `from the ${info.mode} pretreatment model`,
  });
  return info.vacancyDensity_cm3! * 1e6;
}

function pretreatmentInfo(c: Resolution): PretreatmentInfo {
  const temperature_K = c.num('temperature')!;
  const frozen = c.given('reductionTemperature');
  const equilibrationTemperature_K = frozen ? c.num('reductionTemperature')! : temperature_K;
  const hydrogenToWater = c.num('hydrogenToWater') ?? null;
  let oxygenPressure_bar: number;
  if (hydrogenToWater === null) oxygenPressure_bar = c.num('oxygenPressure')! / 1e5;
  else {
    const po2 = oxygenPressureFromHydrogenWater({ temperature_K: equilibrationTemperature_K, hydrogenToWater });
    oxygenPressure_bar = po2.oxygenPressure_bar;
    const ref = c.lib.references.get('chase1998');
    c.inputs.push({
      field: 'oxygen pressure (from H2/H2O)',
      value: oxygenPressure_bar,
      unit: 'bar',
      origin: 'derived',
      source: 'chase1998',
      ...(ref !== undefined ? { citation: formatCitation(ref) } : {}),
      note: `water-formation equilibrium, Delta_f G(H2O,g) = ${po2.waterGibbsFormation_kJ_mol.toFixed(2)} kJ/mol at ${equilibrationTemperature_K} K`,
    });
  }
  const vacancyInput = { ...reductionThermo(c), temperature_K: equilibrationTemperature_K, oxygenPressure_bar };
  const result = frozen ? frozenInDonorDensity({ reduction: vacancyInput, reactionTemperature_K: temperature_K }) : vacancyDonorDensity(vacancyInput);
  return {
    mode: frozen ? 'frozen-in' : 'equilibrium',
    reductionTemperature_K: frozen ? equilibrationTemperature_K : null,
    oxygenPressure_Pa: oxygenPressure_bar * 1e5,
    hydrogenToWater,
    vacancyDensity_cm3: result.vacancyDensity_cm3,
    equilibrationTemperature_K,
  };
}

const NO_PRETREATMENT: PretreatmentInfo = {
  mode: 'given',
  reductionTemperature_K: null,
  oxygenPressure_Pa: null,
  hydrogenToWater: null,
  vacancyDensity_cm3: null,
  equilibrationTemperature_K: null,
};

/** Checks between resolved values that the rows cannot make alone. */
function checkResolved(c: Resolution): void {
  const gap = c.num('bandGap')!;
  for (const option of ['donorLevel', 'donorLevel2'] as const) {
    const v = c.num(option);
    if (v !== undefined) requireInRange(flagName(row(option)), v, 0, Math.min(10, gap), 'eV (depth below E_C, within the gap)');
  }
  const acceptorLevel = c.num('acceptorLevel');
  if (acceptorLevel !== undefined) requireInRange('--acceptor-level', acceptorLevel, 0, gap, 'eV (height above E_V, within the gap)');
  const shifted = c.num('workFunction')! + (c.num('workFunctionShift') ?? 0);
  requireInRange(c.given('workFunctionShift') ? '--work-function-shift' : '--work-function', shifted, 1, 8, 'eV (shifted work function)');
  const density = c.num('particleDensity');
  const diameter = c.num('particleDiameter')!;
  // a particle cannot be wider than its share of the surface
  if (density !== undefined && diameter > 1 / Math.sqrt(density)) {
    throw new InputError(
      '--particle-density',
      `particles of ${formatNumber(diameter * 1e9)} nm overlap at a mean spacing of ${formatNumber(1e9 / Math.sqrt(density))} nm`,
      `below ${formatNumber((1 / (diameter * diameter)) * 1e-4)} cm^-2 for this diameter`,
    );
  }
}

/** The donors that put the bulk Fermi level where the measured support work function says (E_C - E_F = Phi_s - chi). */
function donorsForWorkFunction(c: Resolution, s: ResolvedSupport, workFunction_eV: number): number {
  // the same electronic description as the contact solve (localised states, Mott criterion), without donors
  const electronic = supportElectronicOf(s, c.num('temperature')!, c.value('statistics') as Statistics, 0);
  const donors_m3 = donorsForFermiLevel(electronic, workFunction_eV - s.electronAffinity_eV);
  c.inputs.push({ field: 'donor density (from the support work function)', value: donors_m3 * 1e-6, unit: 'cm^-3', origin: 'derived', note: 'charge neutrality at E_C - E_F = Phi_s - chi' });
  return donors_m3;
}

/**
 * The support as the bulk charge model sees it: band edges, masses, donors (density donors_m3, default the resolved
 * one), acceptors, localised (small-polaron) states where given, and the Mott criterion (Edwards & Sienko 1978).
 * One place for the contact solve and for the inversion of a measured support work function.
 */
export function supportElectronicOf(s: ResolvedSupport, temperature_K: number, statistics: Statistics, donors_m3: number = s.donors_m3): SupportElectronic {
  return {
    temperature_K,
    bandGap_eV: s.bandGap_eV,
    electronMass_me: s.electronMass_me,
    holeMass_me: s.holeMass_me,
    donors: { density_m3: donors_m3, kind: s.donorKind, level1_eV: s.donorLevel1_eV, level2_eV: s.donorLevel2_eV },
    acceptors: { density_m3: s.acceptors_m3, level_eV: s.acceptorLevel_eV },
    statistics,
    // localised (small-polaron) states hold the donor electrons in reducible oxides (Ce 4f, Ti 3d)
    ...(s.localisedSites_m3 !== undefined && s.localisedSites_m3 > 0 && s.localisedLevel_eV !== undefined
      ? { localised: { siteDensity_m3: s.localisedSites_m3, level_eV: s.localisedLevel_eV } }
      : {}),
    // donors delocalise above the Mott density and their level is lowered below it (Edwards & Sienko 1978)
    mott: { relativePermittivity: s.permittivity },
  };
}

function assembleResolved(c: Resolution): ResolvedContact {
  if (c.records.metal === undefined && !c.given('workFunction')) {
    throw new InputError('--metal', 'give a metal name or --work-function', 'a library metal (see `bandbend materials list --kind metal`) or an energy');
  }
  required(c, 'bandGap', 'an energy, e.g. "3.2 eV" (or a library support via --support)');
  required(c, 'electronAffinity', 'an energy, e.g. "4.2 eV", or --support-formula to estimate it');
  required(c, 'permittivity', 'a relative permittivity >= 1');
  if ((c.num('surfaceDonors') ?? 0) > 0) required(c, 'surfaceDonorLevel', `an energy below E_C (the library has no localised level for ${c.records.support?.name ?? 'this support'})`);
  checkResolved(c);
  const { metal: m, support: s } = c.records;
  const numbers = (pv: PropertyValue | undefined, field: string, unit: string): number | undefined => {
    if (pv === undefined) return undefined;
    c.inputs.push(provenanceOf(c.lib, field, pv, unit));
    return pv.value;
  };
  const metal: ResolvedMetal = {
    name: m?.name ?? 'custom metal',
    workFunction_eV: c.num('workFunction')! + (c.num('workFunctionShift') ?? 0),
    density_g_cm3: numbers(m?.density_g_cm3, 'metal density', 'g/cm^3'),
    molarMass_g_mol: numbers(m?.molarMass_g_mol, 'metal molar mass', 'g/mol'),
    metallicRadius_pm: numbers(m?.metallicRadius_pm, 'metallic radius', 'pm'),
    densityOfStates_per_eV_atom: numbers(m?.densityOfStatesAtFermi_per_eV_atom, 'metal density of states at E_F', 'eV^-1 atom^-1'),
    sizeWorkFunctionCoefficient: numbers(m?.sizeWorkFunctionCoefficient, 'size coefficient of the work function', ''),
  };
  const formula = c.value('supportFormula') as string | undefined;
  const support: ResolvedSupport = {
    name: s?.name ?? (formula !== undefined ? `${formula} (estimated)` : 'custom support'),
    electronAffinity_eV: c.num('electronAffinity')!,
    bandGap_eV: c.num('bandGap')!,
    permittivity: c.num('permittivity')!,
    opticalPermittivity: c.num('opticalPermittivity')!,
    permittivityNonlinearity_V_m5_per_C3: c.num('permittivityNonlinearity') ?? 0,
    electronMass_me: c.num('electronMass')!,
    holeMass_me: c.num('holeMass')!,
    donorKind: c.value('donorType') as DonorKind,
    donors_m3: c.num('donors') ?? 0,
    donorLevel1_eV: c.num('donorLevel'),
    donorLevel2_eV: c.num('donorLevel2'),
    acceptors_m3: c.num('acceptors') ?? 0,
    acceptorLevel_eV: c.num('acceptorLevel'),
    neutralLevel_eV: c.num('neutralLevel'),
    pinningFactor: c.num('pinningFactor'),
    neutralLevelAboveValence_eV: c.num('neutralLevelAboveValence'),
    interfaceStateDensity_per_eV_m2: c.num('interfaceStateDensity'),
    interfaceLayerThickness_m: c.num('interfaceLayerThickness'),
    interfaceLayerPermittivity: c.num('interfaceLayerPermittivity'),
    surfaceDonors_m2: c.num('surfaceDonors') ?? 0,
    surfaceDonorLevel_eV: c.num('surfaceDonorLevel'),
    localisedSites_m3: c.num('localisedSites'),
    localisedLevel_eV: c.num('localisedLevel'),
    reductionEnthalpy_eV: c.num('reductionEnthalpy'),
    reductionEntropy_kB: c.num('reductionEntropy'),
  };
  const supportWorkFunction = c.num('supportWorkFunction');
  if (supportWorkFunction !== undefined) support.donors_m3 = donorsForWorkFunction(c, support, supportWorkFunction);
  return {
    metal,
    support,
    temperature_K: c.num('temperature')!,
    barrierModel: c.value('barrierModel') as BarrierModel,
    givenBarrier_eV: c.num('barrier'),
    geometry: c.value('geometry') as GeometryKind,
    particleDiameter_m: c.num('particleDiameter')!,
    particleDensity_m2: c.num('particleDensity'),
    supportThickness_m: c.num('supportThickness') ?? c.num('overlayerThickness'),
    statistics: c.value('statistics') as Statistics,
    refinement: c.num('refinement')!,
    uncertaintySamples: c.num('uncertainty')!,
    seed: c.num('seed') ?? 1,
    pretreatment: c.pretreatment ?? NO_PRETREATMENT,
    defects: c.defects ?? NO_DEFECTS,
    vacancySource: c.vacancySource,
    inputs: c.inputs,
    cautions: c.cautions,
    ranges: c.ranges,
  };
}
