// Inputs of one contact: user options (CLI flags or library call) + materials library -> resolved SI values with provenance.
import { InputError, requireInRange } from '../errors.js';
import type { InputProvenance, MaterialsLibrary, MetalRecord, PropertyValue, SupportRecord } from '../materials/types.js';
import { findMetal, findSupport, provenanceOf, resolveLibrary, formatCitation } from '../materials/load.js';
import { estimateElectronAffinity } from '../materials/estimate.js';
import { parseQuantity, type QuantityInput } from './units.js';
import {
  frozenInDonorDensity,
  oxygenPressureFromHydrogenWater,
  vacancyDonorDensity,
  HYDROGEN_CAUTIONS,
} from './pretreatment.js';
import type { BarrierModel, GeometryKind, PretreatmentInfo, Statistics } from '../types.js';
import type { DonorKind } from '../bulk/equilibrium.js';

/** Options of one contact calculation; mirrors the `bandbend contact` flags (camelCase). */
export interface ContactOptions {
  metal?: string;
  workFunction?: QuantityInput;
  /** shift added to the metal work function (adsorbates, small-particle effects), eV */
  workFunctionShift?: QuantityInput;
  /** where the shift comes from (recorded in provenance) */
  workFunctionShiftSource?: string;
  support?: string;
  /** composition for estimating the electron affinity of an unlisted oxide, e.g. "Ce0.8Zr0.2O2" */
  supportFormula?: string;
  electronAffinity?: QuantityInput;
  bandGap?: QuantityInput;
  permittivity?: QuantityInput;
  opticalPermittivity?: QuantityInput;
  electronMass?: QuantityInput;
  holeMass?: QuantityInput;
  /** donor defect density (a double donor releases up to two electrons) */
  donors?: QuantityInput;
  /** depth of the donor (0/+) level below E_C */
  donorLevel?: QuantityInput;
  /** depth of the (+/2+) level of a double donor below E_C */
  donorLevel2?: QuantityInput;
  donorType?: DonorKind;
  acceptors?: QuantityInput;
  /** height of the acceptor level above E_V */
  acceptorLevel?: QuantityInput;
  temperature?: QuantityInput;
  barrierModel?: BarrierModel;
  pinningFactor?: QuantityInput;
  neutralLevel?: QuantityInput;
  barrier?: QuantityInput;
  geometry?: GeometryKind;
  particleDiameter?: QuantityInput;
  /** areal particle density (per cm^2 for bare numbers) for the particle-array geometry */
  particleDensity?: QuantityInput;
  supportThickness?: QuantityInput;
  statistics?: Statistics;
  /** reduction pretreatment: temperature at which vacancies equilibrate (frozen in at the reaction temperature) */
  reductionTemperature?: QuantityInput;
  oxygenPressure?: QuantityInput;
  /** pH2/pH2O of the reducing gas */
  hydrogenToWater?: QuantityInput;
  reductionEnthalpy?: QuantityInput;
  /** reduction entropy in units of k_B */
  reductionEntropy?: QuantityInput;
  oxygenSites?: QuantityInput;
  /** materials library, or extra materials files to load on top of the built-in one */
  materials?: MaterialsLibrary | string[];
  /** mesh refinement (1 = default accuracy) */
  refinement?: number;
  /** Monte Carlo samples over the published ranges of the material inputs (0 = off) */
  uncertainty?: number | string;
  /** seed of the Monte Carlo sampling */
  seed?: number | string;
}

export interface ResolvedSupport {
  name: string;
  electronAffinity_eV: number;
  bandGap_eV: number;
  permittivity: number;
  opticalPermittivity: number;
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
}

export interface ResolvedMetal {
  name: string;
  workFunction_eV: number;
  density_g_cm3: number | undefined;
  molarMass_g_mol: number | undefined;
  metallicRadius_pm: number | undefined;
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
  pretreatment: PretreatmentInfo;
  inputs: InputProvenance[];
  cautions: string[];
  /** materials the sampling in uncertainty studies may vary: field -> [min, max] */
  ranges: Map<keyof SampledFields, [number, number]>;
}

/** Inputs an uncertainty study may vary within their published ranges. */
export interface SampledFields {
  workFunction_eV: number;
  electronAffinity_eV: number;
  bandGap_eV: number;
  permittivity: number;
  donors_m3: number;
  donorLevel1_eV: number;
}

export const LIMITS = {
  temperature_K: [50, 1500],
  bandGap_eV: [0.1, 10],
  workFunction_eV: [1, 8],
  electronAffinity_eV: [0, 7],
  permittivity: [1, 1e5],
  mass_me: [0.01, 50],
  density_cm3: [0, 1e23],
  level_eV: [0, 10],
  particleDiameter_nm: [0.2, 1000],
  particleDensity_cm2: [1e6, 1e15],
  supportThickness_nm: [0.5, 1e6],
  pinningFactor: [0, 1],
} as const;

interface Collector {
  lib: MaterialsLibrary;
  inputs: InputProvenance[];
}

/** CLI flag of each provenance field, so parse errors name what the user typed. */
const FLAG_OF: Readonly<Record<string, string>> = {
  'metal work function': '--work-function',
  'band gap': '--band-gap',
  'electron affinity': '--electron-affinity',
  'static permittivity': '--permittivity',
  'optical permittivity': '--optical-permittivity',
  'electron mass': '--electron-mass',
  'hole mass': '--hole-mass',
  'donor density': '--donors',
  'acceptor density': '--acceptors',
  'charge-neutrality level': '--neutral-level',
  'pinning factor': '--pinning-factor',
  'reduction enthalpy': '--reduction-enthalpy',
  'reduction entropy': '--reduction-entropy',
  'oxygen site density': '--oxygen-sites',
};

/** A value the user gave, or the library's, or none; records its provenance. */
function pick(
  c: Collector,
  field: string,
  user: QuantityInput | undefined,
  kind: Parameters<typeof parseQuantity>[2],
  library: PropertyValue | undefined,
  unit: string,
  toWorking: (v: number) => number = (v) => v,
  fromWorking: (v: number) => number = (v) => v,
): number | undefined {
  if (user !== undefined && user !== null && user !== '') {
    const v = parseQuantity(FLAG_OF[field] ?? field, user, kind);
    c.inputs.push({ field, value: fromWorking(v), unit, origin: 'user' });
    return v;
  }
  if (library !== undefined) {
    c.inputs.push(provenanceOf(c.lib, field, library, unit));
    return toWorking(library.value);
  }
  return undefined;
}

function required<T>(value: T | undefined, field: string, hint: string): T {
  if (value === undefined) throw new InputError(field, 'missing', hint);
  return value;
}

export function resolveContact(options: ContactOptions): ResolvedContact {
  const lib = resolveLibrary(options.materials);
  const c: Collector = { lib, inputs: [] };
  const cautions: string[] = [];
  const ranges = new Map<keyof SampledFields, [number, number]>();

  // temperature
  const temperature_K = options.temperature === undefined ? 300 : parseQuantity('--temperature', options.temperature, 'temperature');
  requireInRange('--temperature', temperature_K, LIMITS.temperature_K[0], LIMITS.temperature_K[1], 'K');
  c.inputs.push({ field: 'temperature', value: temperature_K, unit: 'K', origin: options.temperature === undefined ? 'default' : 'user' });

  const metal = resolveMetal(c, options, ranges);
  const support = resolveSupport(c, options, ranges, temperature_K, cautions);

  const barrierModel = options.barrierModel ?? 'ideal';
  if (!['ideal', 'pinned', 'given'].includes(barrierModel)) {
    throw new InputError('--barrier-model', `unknown model "${String(barrierModel)}"`, 'ideal, pinned, given');
  }
  let givenBarrier_eV: number | undefined;
  if (barrierModel === 'given') {
    givenBarrier_eV = parseQuantity('--barrier', required(options.barrier, '--barrier', 'the given barrier model needs --barrier E'), 'energy');
    requireInRange('--barrier', givenBarrier_eV, -5, 12, 'eV');
    c.inputs.push({ field: 'barrier (given)', value: givenBarrier_eV, unit: 'eV', origin: 'user' });
  }

  const geometry = options.geometry ?? 'planar';
  if (!['planar', 'hemisphere', 'array'].includes(geometry)) {
    throw new InputError('--geometry', `unknown geometry "${String(geometry)}"`, 'planar, hemisphere, array');
  }
  const particleDiameter_m = options.particleDiameter === undefined ? 2e-9 : parseQuantity('--particle-diameter', options.particleDiameter, 'length');
  requireInRange('--particle-diameter', particleDiameter_m * 1e9, LIMITS.particleDiameter_nm[0], LIMITS.particleDiameter_nm[1], 'nm');
  c.inputs.push({ field: 'particle diameter', value: particleDiameter_m * 1e9, unit: 'nm', origin: options.particleDiameter === undefined ? 'default' : 'user' });

  let particleDensity_m2: number | undefined;
  if (options.particleDensity !== undefined) {
    particleDensity_m2 = parseQuantity('--particle-density', options.particleDensity, 'arealDensity');
    requireInRange('--particle-density', particleDensity_m2 * 1e-4, LIMITS.particleDensity_cm2[0], LIMITS.particleDensity_cm2[1], 'cm^-2');
    c.inputs.push({ field: 'particle density', value: particleDensity_m2 * 1e-4, unit: 'cm^-2', origin: 'user' });
  }
  if (geometry === 'array' && particleDensity_m2 === undefined) {
    throw new InputError('--particle-density', 'the array geometry needs a particle density', `${LIMITS.particleDensity_cm2[0]} to ${LIMITS.particleDensity_cm2[1]} cm^-2`);
  }
  if (particleDensity_m2 !== undefined) {
    // a particle cannot be wider than its share of the surface
    const spacing = 1 / Math.sqrt(particleDensity_m2);
    if (particleDiameter_m > spacing) {
      throw new InputError('--particle-density', `particles of ${fmt(particleDiameter_m * 1e9)} nm overlap at a mean spacing of ${fmt(spacing * 1e9)} nm`, `below ${fmt(1 / (particleDiameter_m * particleDiameter_m) * 1e-4)} cm^-2 for this diameter`);
    }
  }

  let supportThickness_m: number | undefined;
  if (options.supportThickness !== undefined) {
    supportThickness_m = parseQuantity('--support-thickness', options.supportThickness, 'length');
    requireInRange('--support-thickness', supportThickness_m * 1e9, LIMITS.supportThickness_nm[0], LIMITS.supportThickness_nm[1], 'nm');
    c.inputs.push({ field: 'support thickness', value: supportThickness_m * 1e9, unit: 'nm', origin: 'user' });
  }

  const statistics = options.statistics ?? 'fermi-dirac';
  if (statistics !== 'fermi-dirac' && statistics !== 'boltzmann') {
    throw new InputError('--statistics', `unknown statistics "${String(statistics)}"`, 'fermi-dirac, boltzmann');
  }
  const refinement = options.refinement ?? 1;
  requireInRange('refinement', refinement, 0.25, 16, '');

  return {
    metal,
    support: support.resolved,
    temperature_K,
    barrierModel,
    givenBarrier_eV,
    geometry,
    particleDiameter_m,
    particleDensity_m2,
    supportThickness_m,
    statistics,
    refinement,
    pretreatment: support.pretreatment,
    inputs: c.inputs,
    cautions,
    ranges,
  };
}

function fmt(v: number): string {
  return String(Number(v.toPrecision(3)));
}

function resolveMetal(c: Collector, options: ContactOptions, ranges: ResolvedContact['ranges']): ResolvedMetal {
  let record: MetalRecord | undefined;
  if (options.metal !== undefined) record = findMetal(c.lib, options.metal);
  if (record === undefined && options.workFunction === undefined) {
    throw new InputError('--metal', 'give a metal name or --work-function', 'a library metal (see `bandbend materials list --kind metal`) or an energy');
  }
  const pv = record?.workFunction_eV;
  let workFunction_eV = required(
    pick(c, 'metal work function', options.workFunction, 'energy', pv, 'eV'),
    '--work-function',
    'an energy, e.g. "5.1 eV"',
  );
  requireInRange('--work-function', workFunction_eV, LIMITS.workFunction_eV[0], LIMITS.workFunction_eV[1], 'eV');
  if (options.workFunction === undefined && pv?.min !== undefined && pv.max !== undefined) ranges.set('workFunction_eV', [pv.min, pv.max]);
  if (options.workFunctionShift !== undefined) {
    const shift = parseQuantity('--work-function-shift', options.workFunctionShift, 'energy');
    requireInRange('--work-function-shift', shift, -3, 3, 'eV');
    c.inputs.push({
      field: 'work-function shift',
      value: shift,
      unit: 'eV',
      origin: 'user',
      ...(options.workFunctionShiftSource ? { note: `source: ${options.workFunctionShiftSource}` } : { note: 'no source given' }),
    });
    workFunction_eV += shift;
    requireInRange('--work-function-shift', workFunction_eV, LIMITS.workFunction_eV[0], LIMITS.workFunction_eV[1], 'eV (shifted work function)');
  }
  const name = record?.name ?? (options.metal ?? 'custom metal');
  const density = record ? pick(c, 'metal density', undefined, 'dimensionless', record.density_g_cm3, 'g/cm^3') : undefined;
  const molar = record ? pick(c, 'metal molar mass', undefined, 'dimensionless', record.molarMass_g_mol, 'g/mol') : undefined;
  const radius = record ? pick(c, 'metallic radius', undefined, 'dimensionless', record.metallicRadius_pm, 'pm') : undefined;
  return { name, workFunction_eV, density_g_cm3: density, molarMass_g_mol: molar, metallicRadius_pm: radius };
}

function resolveSupport(
  c: Collector,
  options: ContactOptions,
  ranges: ResolvedContact['ranges'],
  temperature_K: number,
  cautions: string[],
): { resolved: ResolvedSupport; pretreatment: PretreatmentInfo } {
  let record: SupportRecord | undefined;
  if (options.support !== undefined) record = findSupport(c.lib, options.support);
  const bandGap_eV = required(
    pick(c, 'band gap', options.bandGap, 'energy', record?.bandGap_eV, 'eV'),
    '--band-gap',
    'an energy, e.g. "3.2 eV" (or a library support via --support)',
  );
  requireInRange('--band-gap', bandGap_eV, LIMITS.bandGap_eV[0], LIMITS.bandGap_eV[1], 'eV');
  if (options.bandGap === undefined) setRange(ranges, 'bandGap_eV', record?.bandGap_eV);

  let electronAffinity_eV = pick(c, 'electron affinity', options.electronAffinity, 'energy', record?.electronAffinity_eV, 'eV');
  if (electronAffinity_eV === undefined && options.supportFormula !== undefined) {
    const estimate = estimateElectronAffinity(options.supportFormula, bandGap_eV);
    electronAffinity_eV = estimate.electronAffinity_eV;
    c.inputs.push({ ...estimate.provenance, field: 'electron affinity' });
    if (estimate.provenance.min !== undefined && estimate.provenance.max !== undefined) {
      ranges.set('electronAffinity_eV', [estimate.provenance.min, estimate.provenance.max]);
    }
  }
  electronAffinity_eV = required(electronAffinity_eV, '--electron-affinity', 'an energy, e.g. "4.2 eV", or --support-formula to estimate it');
  requireInRange('--electron-affinity', electronAffinity_eV, LIMITS.electronAffinity_eV[0], LIMITS.electronAffinity_eV[1], 'eV');
  if (options.electronAffinity === undefined) setRange(ranges, 'electronAffinity_eV', record?.electronAffinity_eV);

  const permittivity = required(
    pick(c, 'static permittivity', options.permittivity, 'dimensionless', record?.staticPermittivity, ''),
    '--permittivity',
    'a relative permittivity >= 1',
  );
  requireInRange('--permittivity', permittivity, LIMITS.permittivity[0], LIMITS.permittivity[1], '');
  if (options.permittivity === undefined) setRange(ranges, 'permittivity', record?.staticPermittivity);
  let opticalPermittivity = pick(c, 'optical permittivity', options.opticalPermittivity, 'dimensionless', record?.opticalPermittivity, '');
  if (opticalPermittivity === undefined) {
    opticalPermittivity = permittivity;
    c.inputs.push({ field: 'optical permittivity', value: permittivity, unit: '', origin: 'default', note: 'not given: static value used' });
  }
  requireInRange('--optical-permittivity', opticalPermittivity, LIMITS.permittivity[0], LIMITS.permittivity[1], '');
  const electronMass_me = massOrDefault(c, 'electron mass', options.electronMass, record?.electronMass_me);
  const holeMass_me = massOrDefault(c, 'hole mass', options.holeMass, record?.holeMass_me);

  // pretreatment: vacancies from reduction conditions override the typical donor density
  const pretreatment = resolvePretreatment(c, options, record, temperature_K, cautions);

  // donors
  let donorKind: DonorKind = options.donorType ?? 'single';
  let donors_m3: number;
  let donorLevel1_eV: number | undefined;
  let donorLevel2_eV: number | undefined;
  if (options.donorType !== undefined && options.donorType !== 'single' && options.donorType !== 'double') {
    throw new InputError('--donor-type', `unknown donor type "${String(options.donorType)}"`, 'single, double');
  }
  const useLibraryLevels = options.donorLevel === undefined && record?.donor !== undefined;
  if (pretreatment.vacancyDensity_cm3 !== null) {
    donors_m3 = pretreatment.vacancyDensity_cm3 * 1e6;
    donorKind = 'double';
    c.inputs.push({ field: 'donor density (oxygen vacancies)', value: pretreatment.vacancyDensity_cm3, unit: 'cm^-3', origin: 'derived', note: `from the ${pretreatment.mode} pretreatment model` });
  } else {
    const typical = record?.conductionType !== 'p' ? record?.typicalDensity_cm3 : undefined;
    const d = pick(c, 'donor density', options.donors, 'volumeDensity', typical, 'cm^-3', (v) => v * 1e6, (v) => v * 1e-6);
    donors_m3 = d ?? 0;
    if (d !== undefined && options.donors === undefined && typical?.min !== undefined && typical.max !== undefined) {
      ranges.set('donors_m3', [typical.min * 1e6, typical.max * 1e6]);
    }
    if (useLibraryLevels && options.donorType === undefined) donorKind = record!.donor!.type;
  }
  requireInRange('--donors', donors_m3 * 1e-6, LIMITS.density_cm3[0], LIMITS.density_cm3[1], 'cm^-3');
  if (options.donorLevel !== undefined) {
    donorLevel1_eV = parseQuantity('--donor-level', options.donorLevel, 'energy');
    c.inputs.push({ field: 'donor level (depth below E_C)', value: donorLevel1_eV, unit: 'eV', origin: 'user' });
    if (donorKind === 'double') {
      donorLevel2_eV = parseQuantity('--donor-level2', required(options.donorLevel2, '--donor-level2', 'a double donor needs both level depths below E_C'), 'energy');
      c.inputs.push({ field: 'donor level 2 (depth below E_C)', value: donorLevel2_eV, unit: 'eV', origin: 'user' });
    }
  } else if (record?.donor !== undefined && donors_m3 > 0 && (donorKind === record.donor.type)) {
    donorLevel1_eV = pick(c, `donor level (${record.donor.label})`, undefined, 'energy', record.donor.level1_eV, 'eV');
    if (donorKind === 'double') {
      donorLevel2_eV = record.donor.level2_eV ? pick(c, `donor level 2 (${record.donor.label})`, undefined, 'energy', record.donor.level2_eV, 'eV') : undefined;
      if (donorLevel2_eV === undefined) donorLevel1_eV = undefined;
    }
    if (donorLevel1_eV !== undefined) setRange(ranges, 'donorLevel1_eV', record.donor.level1_eV);
  } else if (options.donorLevel2 !== undefined) {
    throw new InputError('--donor-level2', 'needs --donor-level and --donor-type double', 'both level depths below E_C');
  }
  for (const [field, v] of [['--donor-level', donorLevel1_eV], ['--donor-level2', donorLevel2_eV]] as const) {
    if (v !== undefined) requireInRange(field, v, LIMITS.level_eV[0], Math.min(LIMITS.level_eV[1], bandGap_eV), 'eV (depth below E_C, within the gap)');
  }

  // acceptors
  const typicalAcceptors = record?.conductionType === 'p' ? record.typicalDensity_cm3 : undefined;
  const a = pick(c, 'acceptor density', options.acceptors, 'volumeDensity', typicalAcceptors, 'cm^-3', (v) => v * 1e6, (v) => v * 1e-6);
  const acceptors_m3 = a ?? 0;
  requireInRange('--acceptors', acceptors_m3 * 1e-6, LIMITS.density_cm3[0], LIMITS.density_cm3[1], 'cm^-3');
  let acceptorLevel_eV: number | undefined;
  if (options.acceptorLevel !== undefined) {
    acceptorLevel_eV = parseQuantity('--acceptor-level', options.acceptorLevel, 'energy');
    c.inputs.push({ field: 'acceptor level (height above E_V)', value: acceptorLevel_eV, unit: 'eV', origin: 'user' });
  } else if (record?.acceptor !== undefined && acceptors_m3 > 0) {
    acceptorLevel_eV = pick(c, `acceptor level (${record.acceptor.label})`, undefined, 'energy', record.acceptor.level_eV, 'eV');
  }
  if (acceptorLevel_eV !== undefined) requireInRange('--acceptor-level', acceptorLevel_eV, 0, bandGap_eV, 'eV (height above E_V, within the gap)');

  const neutralLevel_eV = pick(c, 'charge-neutrality level', options.neutralLevel, 'energy', record?.neutralLevel_eV, 'eV below vacuum');
  const pinningFactor = pick(c, 'pinning factor', options.pinningFactor, 'dimensionless', record?.pinningFactor, '');
  if (pinningFactor !== undefined) requireInRange('--pinning-factor', pinningFactor, LIMITS.pinningFactor[0], LIMITS.pinningFactor[1], '');

  return {
    resolved: {
      name: record?.name ?? options.support ?? (options.supportFormula ? `${options.supportFormula} (estimated)` : 'custom support'),
      electronAffinity_eV,
      bandGap_eV,
      permittivity,
      opticalPermittivity,
      electronMass_me,
      holeMass_me,
      donorKind,
      donors_m3,
      donorLevel1_eV,
      donorLevel2_eV,
      acceptors_m3,
      acceptorLevel_eV,
      neutralLevel_eV,
      pinningFactor,
    },
    pretreatment,
  };
}

function setRange(ranges: ResolvedContact['ranges'], key: keyof SampledFields, pv: PropertyValue | undefined): void {
  if (pv?.min !== undefined && pv.max !== undefined && pv.max > pv.min) ranges.set(key, [pv.min, pv.max]);
}

function massOrDefault(c: Collector, field: string, user: QuantityInput | undefined, library: PropertyValue | undefined): number {
  const m = pick(c, field, user, 'dimensionless', library, 'm_e');
  if (m === undefined) {
    c.inputs.push({ field, value: 1, unit: 'm_e', origin: 'default', note: 'not given: free-electron mass assumed' });
    return 1;
  }
  requireInRange(FLAG_OF[field] ?? field, m, LIMITS.mass_me[0], LIMITS.mass_me[1], 'm_e');
  return m;
}

function resolvePretreatment(
  c: Collector,
  options: ContactOptions,
  record: SupportRecord | undefined,
  temperature_K: number,
  cautions: string[],
): PretreatmentInfo {
  const none: PretreatmentInfo = {
    mode: 'given',
    reductionTemperature_K: null,
    oxygenPressure_Pa: null,
    hydrogenToWater: null,
    vacancyDensity_cm3: null,
    equilibrationTemperature_K: null,
  };
  const hasGas = options.oxygenPressure !== undefined || options.hydrogenToWater !== undefined;
  if (!hasGas) {
    if (options.reductionTemperature !== undefined) {
      throw new InputError('--reduction-temperature', 'needs --oxygen-pressure or --hydrogen-to-water', 'a reducing-gas condition');
    }
    return none;
  }
  if (options.oxygenPressure !== undefined && options.hydrogenToWater !== undefined) {
    throw new InputError('--hydrogen-to-water', 'give either --oxygen-pressure or --hydrogen-to-water, not both', 'one gas condition');
  }
  if (options.donors !== undefined) {
    throw new InputError('--donors', 'cannot be combined with a pretreatment (the pretreatment sets the donor density)', 'either --donors or reduction conditions');
  }
  const frozen = options.reductionTemperature !== undefined;
  const equilibrationTemperature_K = frozen ? parseQuantity('--reduction-temperature', options.reductionTemperature, 'temperature') : temperature_K;
  if (frozen) {
    requireInRange('--reduction-temperature', equilibrationTemperature_K, 298, 1500, 'K');
    c.inputs.push({ field: 'reduction temperature', value: equilibrationTemperature_K, unit: 'K', origin: 'user' });
  }
  let oxygenPressure_bar: number;
  let hydrogenToWater: number | null = null;
  if (options.oxygenPressure !== undefined) {
    oxygenPressure_bar = parseQuantity('--oxygen-pressure', options.oxygenPressure, 'pressure') / 1e5;
    requireInRange('--oxygen-pressure', oxygenPressure_bar, 1e-60, 100, 'bar');
    c.inputs.push({ field: 'oxygen pressure', value: oxygenPressure_bar, unit: 'bar', origin: 'user' });
  } else {
    hydrogenToWater = parseQuantity('--hydrogen-to-water', options.hydrogenToWater, 'dimensionless');
    requireInRange('--hydrogen-to-water', hydrogenToWater, 1e-6, 1e8, '(pH2/pH2O)');
    c.inputs.push({ field: 'H2/H2O ratio', value: hydrogenToWater, unit: '', origin: 'user' });
    const po2 = oxygenPressureFromHydrogenWater({ temperature_K: equilibrationTemperature_K, hydrogenToWater });
    oxygenPressure_bar = po2.oxygenPressure_bar;
    c.inputs.push({
      field: 'oxygen pressure (from H2/H2O)',
      value: oxygenPressure_bar,
      unit: 'bar',
      origin: 'derived',
      source: 'chase1998',
      ...(c.lib.references.has('chase1998') ? { citation: formatCitation(c.lib.references.get('chase1998')!) } : {}),
      note: `water-formation equilibrium, Delta_f G(H2O,g) = ${po2.waterGibbsFormation_kJ_mol.toFixed(2)} kJ/mol at ${equilibrationTemperature_K} K`,
    });
    cautions.push(...HYDROGEN_CAUTIONS);
  }
  const reduction = record?.reduction;
  const enthalpy_eV = required(
    pick(c, 'reduction enthalpy', options.reductionEnthalpy, 'energy', reduction?.enthalpy_eV, 'eV'),
    '--reduction-enthalpy',
    `an energy per vacancy (the library has no reduction data for ${record?.name ?? 'this support'})`,
  );
  const entropy_kB = required(
    pick(c, 'reduction entropy', options.reductionEntropy, 'dimensionless', reduction?.entropy_kB, 'k_B'),
    '--reduction-entropy',
    'an entropy per vacancy in units of k_B',
  );
  const oxygenSites_cm3 = required(
    pick(c, 'oxygen site density', options.oxygenSites, 'volumeDensity', reduction?.oxygenSites_cm3, 'cm^-3', (v) => v * 1e6, (v) => v * 1e-6),
    '--oxygen-sites',
    'a density of oxygen lattice sites, e.g. "5e22 cm^-3"',
  ) * 1e-6;
  const vacancyInput = { enthalpy_eV, entropy_kB, oxygenSites_cm3, temperature_K: equilibrationTemperature_K, oxygenPressure_bar };
  const result = frozen
    ? frozenInDonorDensity({ reduction: vacancyInput, reactionTemperature_K: temperature_K })
    : vacancyDonorDensity(vacancyInput);
  return {
    mode: frozen ? 'frozen-in' : 'equilibrium',
    reductionTemperature_K: frozen ? equilibrationTemperature_K : null,
    oxygenPressure_Pa: oxygenPressure_bar * 1e5,
    hydrogenToWater,
    vacancyDensity_cm3: result.vacancyDensity_cm3,
    equilibrationTemperature_K,
  };
}
