// The parameter table: every input of one contact, once. The CLI flags and help (cli/options.ts), the
// study-file fields and their validation (study/studyFile.ts), the limits, the provenance labels, the
// library defaults and the --uncertainty sampling are all generated from ROWS below; resolveContact
// (inputs/contactInput.ts) is a loop over it plus the cross-field rules.
//
// Row format (one object per ContactOptions field, in help order; the key is the option name, never renamed):
//   flag       CLI flag with its value name, e.g. '--donors <N>' (choices get their list from `choices`)
//   help       help text; `defaultText` is appended as "(default: ...)" and must match the @default tag of
//              the ContactOptions field (test/parameters.test.ts compares them)
//   kind       'quantity' (a number with a unit), 'integer', 'choice', 'text', 'materials'
//   quantity   for quantities: the unit kind parsed by inputs/units.ts (bare numbers take its default unit)
//   unit       unit shown in provenance and messages when it differs from the kind's display unit ('m_e', 'k_B')
//   limits     [min, max] in SI (eV for energies); checked for user and library values alike
//   label      provenance label (InputProvenance.field)
//   library    which MetalRecord / SupportRecord property supplies the default (in the display unit)
//   fallback   value used when neither the user nor the library gives one, with its provenance note
//   choices    allowed values of a categorical input
//   sampling   how --uncertainty samples the library range: 'uniform' or 'log-uniform', into `sampledAs`
//   categorical  text inputs that a study may sweep with a list of names
//
// Adding a numeric input: add the field (with @default) to ContactOptions, add its row, and use its SI value
// (`values.get('yourOption')`) in the physics. Flag, help, study field, limits, provenance and sampling follow.
import { requireInRange } from '../errors.js';
import { DEFAULT_INTERFACE_LAYER_PERMITTIVITY, DEFAULT_INTERFACE_LAYER_THICKNESS_M, neutralLevelRange_eV } from '../interface/interfaceStates.js';
import type { MetalRecord, PropertyValue, SupportRecord } from '../materials/types.js';
import type { MaterialsLibrary } from '../materials/types.js';
import type { QuantityInput, QuantityKind } from './units.js';
import type { BarrierModel, GeometryKind, Statistics } from '../types.js';
import type { DonorKind } from '../bulk/equilibrium.js';

/** Options of one contact calculation (library call, study `base`, CLI flags in camelCase). */
export interface ContactOptions {
  /** metal from the materials library @default none (give workFunction instead) */
  metal?: string;
  /** metal work function, eV if bare @default library value of the metal */
  workFunction?: QuantityInput;
  /** shift added to the metal work function (adsorbates, small-particle effects), eV @default 0 eV */
  workFunctionShift?: QuantityInput;
  /** where the shift comes from (recorded in provenance) @default none */
  workFunctionShiftSource?: string;
  /** support oxide from the materials library @default none (give its properties instead) */
  support?: string;
  /** composition for estimating the electron affinity of an unlisted oxide, e.g. "Ce0.8Zr0.2O2" @default none */
  supportFormula?: string;
  /** support electron affinity, eV @default library value of the support */
  electronAffinity?: QuantityInput;
  /** support band gap, eV @default library value of the support */
  bandGap?: QuantityInput;
  /** measured support work function (Kelvin probe, photoemission, Mott–Schottky): fixes E_C - E_F = Phi_s - chi @default none (the donors fix it) */
  supportWorkFunction?: QuantityInput;
  /** static relative permittivity @default library value of the support */
  permittivity?: QuantityInput;
  /** high-frequency relative permittivity @default library value, else the static permittivity */
  opticalPermittivity?: QuantityInput;
  /** quartic Landau coefficient beta of a field-dependent (paraelectric) support, E = alpha P + beta P^3, V m^5 C^-3 (0 = linear dielectric) @default library value of the support, else 0 (linear) */
  permittivityNonlinearity?: QuantityInput;
  /** electron density-of-states mass, m_e @default library value, else 1 m_e */
  electronMass?: QuantityInput;
  /** hole density-of-states mass, m_e @default library value, else 1 m_e */
  holeMass?: QuantityInput;
  /** donor defect density, cm^-3 if bare (a double donor releases up to two electrons) @default library typical density of an n-type support, else 0 */
  donors?: QuantityInput;
  /** depth of the donor (0/+) level below E_C @default library donor level, else fully ionised */
  donorLevel?: QuantityInput;
  /** depth of the (+/2+) level of a double donor below E_C @default library donor level, else fully ionised */
  donorLevel2?: QuantityInput;
  /** single or double donor @default library donor type, else single */
  donorType?: DonorKind;
  /** acceptor density, cm^-3 if bare @default library typical density of a p-type support, else 0 */
  acceptors?: QuantityInput;
  /** height of the acceptor level above E_V @default library acceptor level, else fully ionised */
  acceptorLevel?: QuantityInput;
  /** temperature, K if bare @default 300 K */
  temperature?: QuantityInput;
  /** barrier model @default interface-states where the library has a charge-neutrality level for the support (in the gap or up to 2 eV above E_C), else ideal */
  barrierModel?: BarrierModel;
  /** pinning factor S (pinned and interface-states models) @default library value, else empirical from the optical permittivity */
  pinningFactor?: QuantityInput;
  /** charge-neutrality level below vacuum, eV (pinned model only) @default library value of the support */
  neutralLevel?: QuantityInput;
  /** measured barrier for the majority carrier (given model only) @default none */
  barrier?: QuantityInput;
  /** charge-neutrality level of the interface states above the valence-band maximum (interface-states model) @default library value of the support */
  neutralLevelAboveValence?: QuantityInput;
  /** density of interface states, per eV per cm^2 if bare (interface-states model) @default from the pinning factor S and the interfacial layer, D = (1/S - 1) eps_i eps0 / (q^2 delta) */
  interfaceStateDensity?: QuantityInput;
  /** thickness of the interfacial layer, nm if bare (interface-states model) @default library value, else 0.5 nm */
  interfaceLayerThickness?: QuantityInput;
  /** relative permittivity of the interfacial layer (interface-states model) @default library value, else 1 */
  interfaceLayerPermittivity?: QuantityInput;
  /** donor-like defect states at the support surface under the metal (e.g. the Ti3+ of surface O vacancies on reduced TiO2), per cm^2 if bare (interface-states model) @default 0 (a stoichiometric surface) */
  surfaceDonors?: QuantityInput;
  /** thermal depth of the surface donors below E_C @default library localised level of the support */
  surfaceDonorLevel?: QuantityInput;
  /** density of sites for localised (small-polaron) electrons, cm^-3 if bare @default library value of the support, else none */
  localisedSites?: QuantityInput;
  /** thermal (0/-) depth of the localised-electron level below E_C (a photoemission peak lies about twice as deep: src/bulk/polaron.ts) @default library value of the support */
  localisedLevel?: QuantityInput;
  /** contact geometry @default planar */
  geometry?: GeometryKind;
  /** particle diameter, nm if bare @default 2 nm */
  particleDiameter?: QuantityInput;
  /** areal particle density, cm^-2 if bare (array geometry only) @default none */
  particleDensity?: QuantityInput;
  /** support grain thickness, nm if bare @default semi-infinite */
  supportThickness?: QuantityInput;
  /** carrier statistics @default fermi-dirac */
  statistics?: Statistics;
  /** reduction pretreatment temperature at which vacancies equilibrate (frozen in) @default the temperature (equilibrium) */
  reductionTemperature?: QuantityInput;
  /** oxygen pressure of the pretreatment, bar if bare @default none */
  oxygenPressure?: QuantityInput;
  /** pH2/pH2O of the reducing gas @default none */
  hydrogenToWater?: QuantityInput;
  /** vacancy formation (reduction) enthalpy per vacancy, eV @default library value of the support */
  reductionEnthalpy?: QuantityInput;
  /** reduction entropy per vacancy, in units of k_B @default library value of the support */
  reductionEntropy?: QuantityInput;
  /** oxygen lattice site density, cm^-3 if bare @default library value of the support */
  oxygenSites?: QuantityInput;
  /** oxygen partial pressure of the reaction gas at the temperature, bar if bare @default none (no reaction atmosphere) */
  reactionOxygenPressure?: QuantityInput;
  /** pH2/pH2O of the reaction gas at the temperature @default none */
  reactionHydrogenToWater?: QuantityInput;
  /** pCO/pCO2 of the reaction gas at the temperature @default none */
  reactionCoToCo2?: QuantityInput;
  /** vacancies during the reaction: frozen (set by the hottest step), equilibrated with the reaction gas, or kinetic (diffusion over the time on stream) @default equilibrated */
  vacancyHistory?: 'frozen' | 'equilibrated' | 'kinetic';
  /** time on stream in the reaction gas, s if bare ("5 h") @default none (required for the kinetic history) */
  timeOnStream?: QuantityInput;
  /** support grain (crystallite) diameter for vacancy re-equilibration by diffusion, nm if bare @default 20 nm */
  grainSize?: QuantityInput;
  /** prefactor D0 of the chemical diffusion coefficient of oxygen, cm^2/s if bare @default library value of the support */
  oxygenDiffusionPrefactor?: QuantityInput;
  /** activation energy of the chemical diffusion coefficient of oxygen, eV @default library value of the support */
  oxygenDiffusionActivation?: QuantityInput;
  /** inverse catalyst: thickness of the support as an oxide film on the metal, nm if bare (planar; the film is the support) @default none (a support on which the metal sits) */
  overlayerThickness?: QuantityInput;
  /** oxygen vacancies of the overlayer as deposited, cm^-3 if bare (MO_x: N_O (x_ideal - x)/x_ideal) @default none (required with an overlayer) */
  overlayerVacancies?: QuantityInput;
  /** temperature of an oxidising anneal of the overlayer, K if bare @default none (as deposited) */
  annealTemperature?: QuantityInput;
  /** oxygen pressure of the anneal, bar if bare @default 1 bar */
  annealOxygenPressure?: QuantityInput;
  /** duration of the anneal, s if bare ("1 h") @default 1 h */
  annealTime?: QuantityInput;
  /** materials library, or extra materials files to load on top of the built-in one @default the built-in library */
  materials?: MaterialsLibrary | string[];
  /** mesh refinement factor @default 1 */
  refinement?: number | string;
  /** Monte Carlo samples over the published ranges of the material inputs @default 0 (off) */
  uncertainty?: number | string;
  /** seed of the Monte Carlo sampling @default 1 */
  seed?: number | string;
}

export type OptionName = keyof ContactOptions;

/** Library records a row may read its default from. */
export interface LibraryRecords {
  metal: MetalRecord | undefined;
  support: SupportRecord | undefined;
}

/** What a row's `when`, `library` and `fallback` may read: the rows above it, and what the user gave. */
/** Geometries that are one particle's cell of an array: they need --particle-density. */
export function isArrayGeometry(geometry: unknown): boolean {
  return geometry === 'array' || geometry === 'disc-array';
}

export interface RowContext {
  readonly records: LibraryRecords;
  /** resolved value of a row above (SI number, or the chosen name) */
  value(option: OptionName): number | string | undefined;
  /** the user gave this option */
  given(option: OptionName): boolean;
}

/** Inputs an uncertainty study may vary within their published ranges (ResolvedContact field names). */
export type SampledField =
  | 'workFunction_eV' | 'electronAffinity_eV' | 'bandGap_eV' | 'permittivity' | 'donors_m3' | 'donorLevel1_eV'
  // field-dependent permittivity of paraelectric supports (issue 11)
  | 'permittivityNonlinearity_V_m5_per_C3'
  // interface states, localised states and the finite particle (issue 11); the last three have no table row and
  // are sampled in derived/uncertainty.ts from their defaults' published ranges / the metal's library range
  | 'pinningFactor' | 'neutralLevelAboveValence_eV' | 'localisedSites_m3' | 'localisedLevel_eV'
  | 'interfaceLayerThickness_m' | 'interfaceLayerPermittivity' | 'sizeWorkFunctionCoefficient' | 'surfaceDonorLevel_eV'
  // reduction thermodynamics (issue 12)
  | 'reductionEnthalpy_eV' | 'reductionEntropy_kB';

export type ParameterKind = 'quantity' | 'integer' | 'choice' | 'text' | 'materials';

export interface ParameterRow {
  option: OptionName;
  flag: string;
  help: string;
  defaultText?: string;
  kind: ParameterKind;
  quantity?: QuantityKind;
  unit?: string;
  limits?: readonly [number, number];
  label?: string;
  library?: (r: LibraryRecords, c: RowContext) => PropertyValue | undefined;
  /** provenance label of the library value when it differs from `label` */
  libraryLabel?: (r: LibraryRecords) => string;
  fallback?: { value: number | string | ((c: RowContext) => number | string); note?: string };
  /** the input is used only when test() holds: given otherwise it is refused naming `text`; not given, it is skipped */
  when?: { test: (c: RowContext) => boolean; text: string };
  choices?: readonly string[];
  sampling?: 'uniform' | 'log-uniform';
  sampledAs?: SampledField;
  categorical?: boolean;
  /** a property of the named material: a screen refuses to apply it to every row unless asked to */
  identifies?: 'metal' | 'support';
}

/** Display unit of each quantity kind (provenance, messages, library values) and the factors to and from SI. */
export const DISPLAY_UNITS: Readonly<Record<QuantityKind, { unit: string; si: string; toSi: number; fromSi: number }>> = {
  energy: { unit: 'eV', si: 'eV', toSi: 1, fromSi: 1 },
  volumeDensity: { unit: 'cm^-3', si: 'm^-3', toSi: 1e6, fromSi: 1e-6 },
  arealDensity: { unit: 'cm^-2', si: 'm^-2', toSi: 1e4, fromSi: 1e-4 },
  temperature: { unit: 'K', si: 'K', toSi: 1, fromSi: 1 },
  length: { unit: 'nm', si: 'm', toSi: 1e-9, fromSi: 1e9 },
  pressure: { unit: 'bar', si: 'Pa', toSi: 1e5, fromSi: 1e-5 },
  stateDensityPerArea: { unit: 'eV^-1 cm^-2', si: 'eV^-1 m^-2', toSi: 1e4, fromSi: 1e-4 },
  area: { unit: 'cm^2', si: 'm^2', toSi: 1e-4, fromSi: 1e4 },
  time: { unit: 's', si: 's', toSi: 1, fromSi: 1 },
  diffusionCoefficient: { unit: 'cm^2/s', si: 'm^2/s', toSi: 1e-4, fromSi: 1e4 },
  electricField: { unit: 'V/m', si: 'V/m', toSi: 1, fromSi: 1 },
  dimensionless: { unit: '', si: '', toSi: 1, fromSi: 1 },
};

type RowSpec = Omit<ParameterRow, 'option'>;
type Shape = Pick<RowSpec, 'kind' | 'quantity' | 'limits'>;
const energy = (limits: readonly [number, number]): Shape => ({ kind: 'quantity', quantity: 'energy', limits });
const plain = (limits: readonly [number, number]): Shape => ({ kind: 'quantity', quantity: 'dimensionless', limits });
const DENSITY_M3 = [0, 1e29] as const;
const LEVEL_EV = [0, 10] as const;
const MASS_ME = [0.01, 50] as const;
/** the library's charge-neutrality level lies in the range the interface-state model accepts (gap, or up to 2 eV above E_C) */
function neutralLevelUsable(c: RowContext): boolean {
  const level = c.records.support?.chargeNeutralityAboveValence_eV?.value;
  const gap = c.value('bandGap');
  if (level === undefined || typeof gap !== 'number') return false;
  const [lo, hi] = neutralLevelRange_eV(gap);
  return level >= lo && level <= hi;
}
const INTERFACE_STATES = { test: (c: RowContext) => c.value('barrierModel') === 'interface-states', text: 'with --barrier-model interface-states' };
const PERMITTIVITY = [1, 1e5] as const;
const FREE_MASS = { value: 1, note: 'not given: free-electron mass assumed' };
const typicalIf = (p: boolean) => (r: LibraryRecords): PropertyValue | undefined =>
  p === (r.support?.conductionType === 'p') ? r.support?.typicalDensity_cm3 : undefined;
/** a reduction pretreatment gas (--oxygen-pressure or --hydrogen-to-water) */
export const hasReductionGas = (c: RowContext): boolean => c.given('oxygenPressure') || c.given('hydrogenToWater');
/** a reaction atmosphere at the reaction temperature (issue 12) */
export const hasReactionGas = (c: RowContext): boolean =>
  c.given('reactionOxygenPressure') || c.given('reactionHydrogenToWater') || c.given('reactionCoToCo2');
/** inverse catalyst: the support is an oxide overlayer on the metal (issue 12) */
export const hasOverlayer = (c: RowContext): boolean => c.given('overlayerThickness');
/** a reduction pretreatment, a reaction atmosphere or an overlayer's own vacancies set the donors (oxygen vacancies) */
export const hasPretreatment = (c: RowContext): boolean => hasReductionGas(c) || hasReactionGas(c) || hasOverlayer(c);
const PRETREATMENT = {
  test: hasPretreatment,
  text: 'with a reduction pretreatment, a reaction gas or an overlayer (--oxygen-pressure, --hydrogen-to-water, --reaction-..., --overlayer-thickness)',
};
/** a diffusion coefficient is used by a reaction gas (re-equilibration time) and by an overlayer anneal */
const DIFFUSION_USED = (c: RowContext): boolean => hasReactionGas(c) || c.given('annealTemperature');
const OVERLAYER = { test: hasOverlayer, text: 'with --overlayer-thickness' };
const ANNEAL = { test: (c: RowContext) => c.given('annealTemperature'), text: 'with --anneal-temperature' };
const REACTION_GAS = { test: hasReactionGas, text: 'with a reaction gas (--reaction-oxygen-pressure, --reaction-hydrogen-to-water or --reaction-co-to-co2)' };
const positive = (c: RowContext, o: OptionName): boolean => ((c.value(o) as number | undefined) ?? 0) > 0;
/** the library donor applies when its type is the chosen one (a double donor needs both levels) */
const libraryDonor = (r: LibraryRecords, c: RowContext) => {
  const d = r.support?.donor;
  if (d === undefined || !positive(c, 'donors') || c.given('donorLevel') || c.value('donorType') !== d.type) return undefined;
  return d.type === 'double' && d.level2_eV === undefined ? undefined : d;
};

/**
 * The rows, keyed by option name: the Record type makes the compiler check that every option has one.
 * Rows resolve in this order; a row's `when`, `library` and `fallback` may read the rows above it.
 */
const ROWS: { readonly [K in OptionName]-?: RowSpec } = {
  materials: {
    flag: '--materials <FILE...>', help: 'extra materials file(s) (JSON/YAML) adding or overriding entries', defaultText: 'the built-in library', kind: 'materials',
  },
  temperature: {
    flag: '--temperature <T>', help: 'temperature (K if bare; "200 degC" works)', defaultText: '300 K',
    kind: 'quantity', quantity: 'temperature', limits: [50, 1500], label: 'temperature', fallback: { value: 300 },
  },
  metal: { flag: '--metal <NAME>', help: 'metal from the materials library (or give --work-function)', kind: 'text', categorical: true },
  workFunction: {
    flag: '--work-function <E>', help: 'metal work function (eV if bare)', defaultText: 'library value of the metal', ...energy([1, 8]),
    label: 'metal work function', library: (r) => r.metal?.workFunction_eV, sampling: 'uniform', sampledAs: 'workFunction_eV', identifies: 'metal',
  },
  workFunctionShift: {
    flag: '--work-function-shift <E>', help: 'shift added to the work function (adsorbates, size effects)', defaultText: '0 eV',
    ...energy([-3, 3]), label: 'work-function shift',
  },
  workFunctionShiftSource: {
    flag: '--work-function-shift-source <TEXT>', help: 'where the shift comes from (recorded in provenance)', kind: 'text',
    when: { test: (c) => c.given('workFunctionShift'), text: 'with --work-function-shift' },
  },
  support: { flag: '--support <NAME>', help: 'support oxide from the materials library (or give its properties)', kind: 'text', categorical: true },
  bandGap: {
    flag: '--band-gap <E>', help: 'support band gap (eV)', defaultText: 'library value of the support', ...energy([0.1, 10]),
    label: 'band gap', library: (r) => r.support?.bandGap_eV, sampling: 'uniform', sampledAs: 'bandGap_eV', identifies: 'support',
  },
  supportFormula: {
    flag: '--support-formula <FORMULA>', help: 'estimate the electron affinity of an unlisted oxide, e.g. Ce0.8Zr0.2O2', kind: 'text', categorical: true,
    when: { test: (c) => !c.given('electronAffinity') && c.records.support === undefined, text: 'without --electron-affinity and --support' },
  },
  electronAffinity: {
    flag: '--electron-affinity <E>', help: 'support electron affinity (eV)', defaultText: 'library value of the support', ...energy([0, 7]),
    label: 'electron affinity', library: (r) => r.support?.electronAffinity_eV, sampling: 'uniform', sampledAs: 'electronAffinity_eV', identifies: 'support',
  },
  supportWorkFunction: {
    flag: '--support-work-function <E>', help: 'measured support work function: sets the bulk Fermi level (E_C - E_F = Phi_s - chi)',
    ...energy([1, 8]), label: 'support work function', when: { test: (c) => !hasPretreatment(c), text: 'without a reduction pretreatment, reaction gas or overlayer' },
  },
  permittivity: {
    flag: '--permittivity <ER>', help: 'static relative permittivity', defaultText: 'library value of the support', ...plain(PERMITTIVITY),
    label: 'static permittivity', library: (r) => r.support?.staticPermittivity, sampling: 'uniform', sampledAs: 'permittivity', identifies: 'support',
  },
  opticalPermittivity: {
    flag: '--optical-permittivity <ER>', help: 'high-frequency permittivity (image force, pinning factor)',
    defaultText: 'library value, else the static permittivity', ...plain(PERMITTIVITY), label: 'optical permittivity',
    library: (r) => r.support?.opticalPermittivity, identifies: 'support',
    fallback: { value: (c) => c.value('permittivity') as number, note: 'not given: static value used' },
  },
  permittivityNonlinearity: {
    flag: '--permittivity-nonlinearity <BETA>',
    help: 'quartic Landau coefficient of a paraelectric support (E = alpha P + beta P^3, V m^5 C^-3): the permittivity falls with the field near the interface (SrTiO3); 0 = linear',
    defaultText: 'library value of the support, else 0 (linear)', kind: 'quantity', quantity: 'dimensionless', limits: [0, 1e13], unit: 'V m^5 C^-3',
    label: 'permittivity nonlinearity', library: (r) => r.support?.permittivityNonlinearity_V_m5_per_C3, identifies: 'support',
    sampling: 'uniform', sampledAs: 'permittivityNonlinearity_V_m5_per_C3',
    fallback: { value: 0, note: 'linear dielectric' },
  },
  electronMass: {
    flag: '--electron-mass <M>', help: 'electron density-of-states mass (m_e)', defaultText: 'library value, else 1 m_e', ...plain(MASS_ME),
    unit: 'm_e', label: 'electron mass', library: (r) => r.support?.electronMass_me, fallback: FREE_MASS, identifies: 'support',
  },
  holeMass: {
    flag: '--hole-mass <M>', help: 'hole density-of-states mass (m_e)', defaultText: 'library value, else 1 m_e', ...plain(MASS_ME),
    unit: 'm_e', label: 'hole mass', library: (r) => r.support?.holeMass_me, fallback: FREE_MASS, identifies: 'support',
  },
  reductionTemperature: {
    flag: '--reduction-temperature <T>', help: 'reduction pretreatment temperature (vacancies frozen in)', defaultText: 'the temperature (equilibrium)',
    kind: 'quantity', quantity: 'temperature', limits: [298, 1500], label: 'reduction temperature',
    when: { test: hasReductionGas, text: 'with a reduction gas (--oxygen-pressure or --hydrogen-to-water)' },
  },
  oxygenPressure: {
    flag: '--oxygen-pressure <P>', help: 'oxygen pressure of the pretreatment (bar if bare, "1e-20 bar")',
    kind: 'quantity', quantity: 'pressure', limits: [1e-55, 1e7], label: 'oxygen pressure',
    when: { test: (c) => !c.given('hydrogenToWater'), text: 'without --hydrogen-to-water (give one gas condition)' },
  },
  hydrogenToWater: { flag: '--hydrogen-to-water <R>', help: 'pH2/pH2O of the reducing gas', ...plain([1e-6, 1e8]), label: 'H2/H2O ratio' },
  reductionEnthalpy: {
    flag: '--reduction-enthalpy <E>', help: 'vacancy formation (reduction) enthalpy per vacancy, eV', defaultText: 'library value of the support',
    ...energy([0, 20]), label: 'reduction enthalpy', library: (r) => r.support?.reduction?.enthalpy_eV, when: PRETREATMENT,
    sampling: 'uniform', sampledAs: 'reductionEnthalpy_eV',
  },
  reductionEntropy: {
    flag: '--reduction-entropy <S>', help: 'reduction entropy per vacancy, in k_B', defaultText: 'library value of the support',
    ...plain([-100, 100]), unit: 'k_B', label: 'reduction entropy', library: (r) => r.support?.reduction?.entropy_kB, when: PRETREATMENT,
    sampling: 'uniform', sampledAs: 'reductionEntropy_kB',
  },
  oxygenSites: {
    flag: '--oxygen-sites <N>', help: 'oxygen lattice site density (cm^-3 if bare)', defaultText: 'library value of the support',
    kind: 'quantity', quantity: 'volumeDensity', limits: [1e26, 1e30], label: 'oxygen site density',
    library: (r) => r.support?.reduction?.oxygenSites_cm3, when: PRETREATMENT,
  },
  reactionOxygenPressure: {
    flag: '--reaction-oxygen-pressure <P>', help: 'O2 partial pressure of the reaction gas at the temperature (bar if bare)',
    kind: 'quantity', quantity: 'pressure', limits: [1e-55, 1e7], label: 'reaction O2 pressure',
  },
  reactionHydrogenToWater: {
    flag: '--reaction-hydrogen-to-water <R>', help: 'pH2/pH2O of the reaction gas at the temperature', ...plain([1e-6, 1e8]), label: 'reaction H2/H2O ratio',
    when: { test: (c) => !c.given('reactionOxygenPressure'), text: 'without --reaction-oxygen-pressure (give one reaction gas)' },
  },
  reactionCoToCo2: {
    flag: '--reaction-co-to-co2 <R>', help: 'pCO/pCO2 of the reaction gas at the temperature', ...plain([1e-6, 1e8]), label: 'reaction CO/CO2 ratio',
    when: { test: (c) => !c.given('reactionOxygenPressure') && !c.given('reactionHydrogenToWater'), text: 'without another reaction gas (give one)' },
  },
  vacancyHistory: {
    flag: '--vacancy-history <KIND>', help: 'vacancies during the reaction: frozen (set by the hottest step), equilibrated with the reaction gas, or kinetic',
    defaultText: 'equilibrated', kind: 'choice', choices: ['frozen', 'equilibrated', 'kinetic'], fallback: { value: 'equilibrated' }, when: REACTION_GAS,
  },
  timeOnStream: {
    flag: '--time-on-stream <T>', help: 'time in the reaction gas (s if bare, "5 h")', defaultText: 'none (required for the kinetic history)',
    kind: 'quantity', quantity: 'time', limits: [0, 1e10], label: 'time on stream', when: REACTION_GAS,
  },
  grainSize: {
    flag: '--grain-size <L>', help: 'support grain diameter for vacancy re-equilibration by diffusion (nm if bare)', defaultText: '20 nm',
    kind: 'quantity', quantity: 'length', limits: [0.5e-9, 1e-3], label: 'support grain size', when: REACTION_GAS,
    fallback: { value: 20e-9, note: 'not given: 20 nm, a crystallite size typical of oxide support powders (common practice, no source)' },
  },
  oxygenDiffusionPrefactor: {
    flag: '--oxygen-diffusion-prefactor <D>', help: 'prefactor D0 of the chemical diffusion coefficient of oxygen (cm^2/s if bare)',
    defaultText: 'library value of the support', kind: 'quantity', quantity: 'diffusionCoefficient', limits: [1e-20, 1e2], label: 'oxygen diffusion prefactor',
    library: (r) => r.support?.reduction?.vacancyDiffusion?.prefactor_cm2_s,
    when: { test: DIFFUSION_USED, text: 'with a reaction gas or --anneal-temperature' },
  },
  oxygenDiffusionActivation: {
    flag: '--oxygen-diffusion-activation <E>', help: 'activation energy of the chemical diffusion coefficient of oxygen', defaultText: 'library value of the support',
    ...energy([0, 10]), label: 'oxygen diffusion activation energy', library: (r) => r.support?.reduction?.vacancyDiffusion?.activation_eV,
    when: { test: (c) => DIFFUSION_USED(c) && c.value('oxygenDiffusionPrefactor') !== undefined, text: 'with --oxygen-diffusion-prefactor (or a library one)' },
  },
  overlayerThickness: {
    flag: '--overlayer-thickness <L>', help: 'inverse catalyst: the support is an oxide film of this thickness on the metal (nm if bare; planar)',
    kind: 'quantity', quantity: 'length', limits: [0.5e-9, 1e-5], label: 'oxide overlayer thickness',
    when: { test: (c) => !hasReactionGas(c) && !hasReductionGas(c), text: 'without a reduction or reaction gas' },
  },
  overlayerVacancies: {
    flag: '--overlayer-vacancies <N>', help: 'oxygen vacancies of the overlayer as deposited (cm^-3 if bare)', defaultText: 'none (required with an overlayer)',
    kind: 'quantity', quantity: 'volumeDensity', limits: DENSITY_M3, label: 'overlayer vacancies (as deposited)', when: OVERLAYER,
  },
  annealTemperature: {
    flag: '--anneal-temperature <T>', help: 'oxidising anneal of the overlayer: temperature', defaultText: 'none (as deposited)',
    kind: 'quantity', quantity: 'temperature', limits: [298, 1500], label: 'anneal temperature', when: OVERLAYER,
  },
  annealOxygenPressure: {
    flag: '--anneal-oxygen-pressure <P>', help: 'oxygen pressure of the anneal (bar if bare)', defaultText: '1 bar',
    kind: 'quantity', quantity: 'pressure', limits: [1e-55, 1e7], label: 'anneal oxygen pressure', when: ANNEAL, fallback: { value: 1e5, note: 'not given: 1 bar O2' },
  },
  annealTime: {
    flag: '--anneal-time <T>', help: 'duration of the anneal (s if bare, "1 h")', defaultText: '1 h',
    kind: 'quantity', quantity: 'time', limits: [0, 1e10], label: 'anneal time', when: ANNEAL, fallback: { value: 3600, note: 'not given: 1 h' },
  },
  donors: {
    flag: '--donors <N>', help: 'donor defect density (cm^-3 if bare)', defaultText: 'library typical density of an n-type support, else 0',
    kind: 'quantity', quantity: 'volumeDensity', limits: DENSITY_M3, label: 'donor density', library: typicalIf(false),
    sampling: 'log-uniform', sampledAs: 'donors_m3',
    when: { test: (c) => !c.given('supportWorkFunction'), text: 'without --support-work-function (both set the bulk Fermi level)' },
  },
  donorType: {
    flag: '--donor-type <KIND>', help: 'single or double donor', defaultText: 'library donor type, else single', kind: 'choice', choices: ['single', 'double'],
    fallback: { value: (c) => (hasPretreatment(c) ? 'double' : !c.given('donorLevel') && c.records.support?.donor ? c.records.support.donor.type : 'single') },
  },
  donorLevel: {
    flag: '--donor-level <E>', help: 'donor (0/+) level depth below E_C', defaultText: 'library donor level, else fully ionised', ...energy(LEVEL_EV),
    label: 'donor level (depth below E_C)', library: (r, c) => libraryDonor(r, c)?.level1_eV,
    libraryLabel: (r) => `donor level (${r.support!.donor!.label})`, sampling: 'uniform', sampledAs: 'donorLevel1_eV',
  },
  donorLevel2: {
    flag: '--donor-level2 <E>', help: 'double donor (+/2+) level depth below E_C', defaultText: 'library donor level, else fully ionised',
    ...energy(LEVEL_EV), label: 'donor level 2 (depth below E_C)', library: (r, c) => libraryDonor(r, c)?.level2_eV,
    libraryLabel: (r) => `donor level 2 (${r.support!.donor!.label})`,
    when: { test: (c) => c.value('donorType') === 'double' && (c.given('donorLevel') || !c.given('donorLevel2')), text: 'with --donor-level and --donor-type double' },
  },
  acceptors: {
    flag: '--acceptors <N>', help: 'acceptor density (cm^-3 if bare)', defaultText: 'library typical density of a p-type support, else 0',
    kind: 'quantity', quantity: 'volumeDensity', limits: DENSITY_M3, label: 'acceptor density', library: typicalIf(true),
  },
  acceptorLevel: {
    flag: '--acceptor-level <E>', help: 'acceptor level height above E_V', defaultText: 'library acceptor level, else fully ionised', ...energy(LEVEL_EV),
    label: 'acceptor level (height above E_V)', library: (r, c) => (positive(c, 'acceptors') ? r.support?.acceptor?.level_eV : undefined),
    libraryLabel: (r) => `acceptor level (${r.support!.acceptor!.label})`,
  },
  barrierModel: {
    flag: '--barrier-model <MODEL>', help: 'barrier model', defaultText: 'interface-states where the library has a charge-neutrality level for the support (in the gap or up to 2 eV above E_C), else ideal',
    kind: 'choice', choices: ['interface-states', 'ideal', 'pinned', 'given'],
    // a level above the CBM (In2O3: King et al. 2008) is accepted up to 2 eV above E_C (src/interface/interfaceStates.ts)
    fallback: { value: (c) => (neutralLevelUsable(c) ? 'interface-states' : 'ideal') },
  },
  pinningFactor: {
    flag: '--pinning-factor <S>', help: 'pinning factor S', defaultText: 'library value, else empirical from the optical permittivity',
    ...plain([0, 1]), label: 'pinning factor', library: (r) => r.support?.pinningFactor, sampling: 'uniform', sampledAs: 'pinningFactor',
    when: {
      test: (c) => c.value('barrierModel') === 'pinned' || (c.value('barrierModel') === 'interface-states' && !c.given('interfaceStateDensity')),
      text: 'with --barrier-model pinned, or interface-states without --interface-state-density',
    },
  },
  neutralLevel: {
    flag: '--neutral-level <E>', help: 'charge-neutrality level below vacuum, eV', defaultText: 'library value of the support',
    ...energy([0, 12]), unit: 'eV below vacuum', label: 'charge-neutrality level', library: (r) => r.support?.neutralLevel_eV,
    when: { test: (c) => c.value('barrierModel') === 'pinned', text: 'with --barrier-model pinned' },
  },
  barrier: {
    flag: '--barrier <E>', help: 'measured barrier for the majority carrier', ...energy([-5, 12]), label: 'barrier (given)',
    when: { test: (c) => c.value('barrierModel') === 'given', text: 'with --barrier-model given' },
  },
  neutralLevelAboveValence: {
    flag: '--neutral-level-above-valence <E>', help: 'charge-neutrality level of the interface states above E_V', defaultText: 'library value of the support',
    ...energy([0, 12]), label: 'charge-neutrality level (above E_V)', library: (r) => r.support?.chargeNeutralityAboveValence_eV,
    sampling: 'uniform', sampledAs: 'neutralLevelAboveValence_eV',
    when: INTERFACE_STATES,
  },
  interfaceStateDensity: {
    flag: '--interface-state-density <D>', help: 'density of interface states (per eV per cm^2 if bare)',
    defaultText: 'from the pinning factor S and the interfacial layer, D = (1/S - 1) eps_i eps0 / (q^2 delta)',
    kind: 'quantity', quantity: 'stateDensityPerArea', limits: [0, 1e21], label: 'interface-state density', when: INTERFACE_STATES,
  },
  interfaceLayerThickness: {
    flag: '--interface-layer-thickness <L>', help: 'interfacial layer thickness (nm if bare)', defaultText: 'library value, else 0.5 nm',
    kind: 'quantity', quantity: 'length', limits: [0, 10e-9], label: 'interfacial layer thickness', library: (r) => r.support?.interfaceLayerThickness_nm,
    sampling: 'uniform', sampledAs: 'interfaceLayerThickness_m',
    fallback: { value: DEFAULT_INTERFACE_LAYER_THICKNESS_M, note: 'Cowley & Sze (1965) / Sze & Ng sec. 3.2 interfacial-layer thickness (from memory, verify)' },
    when: INTERFACE_STATES,
  },
  interfaceLayerPermittivity: {
    flag: '--interface-layer-permittivity <ER>', help: 'interfacial layer relative permittivity', defaultText: 'library value, else 1',
    ...plain([1, 1000]), label: 'interfacial layer permittivity', library: (r) => r.support?.interfaceLayerPermittivity,
    sampling: 'uniform', sampledAs: 'interfaceLayerPermittivity',
    fallback: { value: DEFAULT_INTERFACE_LAYER_PERMITTIVITY, note: 'vacuum-like gap of Cowley & Sze (1965) (from memory, verify)' },
    when: INTERFACE_STATES,
  },
  surfaceDonors: {
    flag: '--surface-donors <N>',
    help: 'donor-like defect states at the support surface under the metal, e.g. the Ti3+ electrons of surface O vacancies on a reduced oxide (per cm^2 if bare)',
    defaultText: '0 (a stoichiometric surface)',
    kind: 'quantity', quantity: 'arealDensity', limits: [0, 1e19], label: 'surface donor density',
    fallback: { value: 0, note: 'not given: a stoichiometric surface without donor states' },
    when: INTERFACE_STATES,
  },
  surfaceDonorLevel: {
    flag: '--surface-donor-level <E>', help: 'thermal depth of the surface donors below E_C', defaultText: 'library localised level of the support',
    ...energy(LEVEL_EV), label: 'surface donor level (depth below E_C)', library: (r) => r.support?.localisedLevel_eV,
    libraryLabel: () => "surface donor level (the support's localised level)",
    sampling: 'uniform', sampledAs: 'surfaceDonorLevel_eV',
    when: { test: (c) => positive(c, 'surfaceDonors'), text: 'with --surface-donors' },
  },
  localisedSites: {
    flag: '--localised-sites <N>', help: 'sites for localised (small-polaron) electrons (cm^-3 if bare)', defaultText: 'library value of the support, else none',
    kind: 'quantity', quantity: 'volumeDensity', limits: DENSITY_M3, label: 'localised-electron sites', library: (r) => r.support?.localisedSiteDensity_cm3,
    sampling: 'log-uniform', sampledAs: 'localisedSites_m3',
  },
  localisedLevel: {
    flag: '--localised-level <E>', help: 'thermal (0/-) depth of the localised-electron level below E_C (a photoemission peak measured from E_C lies about twice as deep)', defaultText: 'library value of the support',
    ...energy(LEVEL_EV), label: 'localised level (depth below E_C)', library: (r) => r.support?.localisedLevel_eV,
    sampling: 'uniform', sampledAs: 'localisedLevel_eV',
    when: { test: (c) => positive(c, 'localisedSites'), text: 'with --localised-sites' },
  },
  geometry: {
    flag: '--geometry <KIND>',
    help: 'planar contact; isolated hemisphere (particle sunk into the support, contact 2 pi r^2); particle array (hemispheres); disc (particle resting on the support, touching it through its flat footprint pi r^2); disc-array (resting particles at --particle-density)',
    defaultText: 'planar', kind: 'choice',
    choices: ['planar', 'hemisphere', 'array', 'disc', 'disc-array'], fallback: { value: 'planar' },
  },
  particleDiameter: {
    flag: '--particle-diameter <D>', help: 'particle diameter (nm if bare)', defaultText: '2 nm',
    kind: 'quantity', quantity: 'length', limits: [0.2e-9, 1000e-9], label: 'particle diameter', fallback: { value: 2e-9 },
  },
  particleDensity: {
    flag: '--particle-density <N>', help: 'particles per area (cm^-2 if bare)', kind: 'quantity', quantity: 'arealDensity', limits: [1e10, 1e19],
    label: 'particle density', when: { test: (c) => isArrayGeometry(c.value('geometry')), text: 'with --geometry array or disc-array' },
  },
  supportThickness: {
    flag: '--support-thickness <L>', help: 'support grain thickness (nm if bare)', defaultText: 'semi-infinite',
    kind: 'quantity', quantity: 'length', limits: [0.5e-9, 1e-3], label: 'support thickness',
  },
  statistics: {
    flag: '--statistics <KIND>', help: 'carrier statistics', defaultText: 'fermi-dirac', kind: 'choice', choices: ['fermi-dirac', 'boltzmann'],
    fallback: { value: 'fermi-dirac' },
  },
  refinement: { flag: '--refinement <F>', help: 'mesh refinement factor', defaultText: '1', ...plain([0.25, 16]), fallback: { value: 1 } },
  uncertainty: {
    flag: '--uncertainty <N>', help: 'Monte Carlo samples over published input ranges', defaultText: '0 (off)', kind: 'integer', limits: [0, 100000],
    fallback: { value: 0 },
  },
  seed: {
    flag: '--seed <S>', help: 'seed for --uncertainty', defaultText: '1', kind: 'integer', limits: [0, 4294967295], fallback: { value: 1 },
    when: { test: (c) => positive(c, 'uncertainty'), text: 'with --uncertainty N > 0' },
  },
};

/** Every input, in resolution order. */
export const PARAMETERS: readonly ParameterRow[] = Object.freeze(
  (Object.keys(ROWS) as OptionName[]).map((option) => Object.freeze({ option, ...ROWS[option] })),
);

const BY_OPTION = new Map<string, ParameterRow>(PARAMETERS.map((p) => [p.option, p]));
const BY_SAMPLE = new Map<SampledField, ParameterRow>(PARAMETERS.filter((p) => p.sampledAs).map((p) => [p.sampledAs!, p]));

export const OPTION_NAMES: readonly OptionName[] = PARAMETERS.map((p) => p.option);

/** The row of an option name, or undefined for an unknown name. */
export function parameterOf(option: string): ParameterRow | undefined {
  return BY_OPTION.get(option);
}

/** The row of an option that exists (the compiler checked the name). */
export function row(option: OptionName): ParameterRow {
  return BY_OPTION.get(option)!;
}

/** The row an uncertainty sample field comes from. */
export function rowOfSample(field: SampledField): ParameterRow | undefined {
  return BY_SAMPLE.get(field);
}

/** '--donors' from '--donors <N>'. */
export function flagName(p: ParameterRow): string {
  return p.flag.split(' ')[0]!;
}

/** Help text with the documented default. */
export function helpText(p: ParameterRow): string {
  return p.defaultText === undefined ? p.help : `${p.help} (default: ${p.defaultText})`;
}

/** Display unit of a row (provenance and messages) and its factors to and from SI. */
export function displayUnitOf(p: ParameterRow): { unit: string; toSi: number; fromSi: number } {
  const d = p.quantity ? DISPLAY_UNITS[p.quantity] : DISPLAY_UNITS.dimensionless;
  return { unit: p.unit ?? d.unit, toSi: d.toSi, fromSi: d.fromSi };
}

/** SI value -> display value, rounded to 12 significant digits so that 2e-9 m shows as 2 nm. */
export function toDisplay(p: ParameterRow, si: number): number {
  return Number((si * displayUnitOf(p).fromSi).toPrecision(12));
}

/** Library value (display unit) -> SI. */
export function fromDisplay(p: ParameterRow, display: number): number {
  return display * displayUnitOf(p).toSi;
}

/** Throw InputError (naming the flag, or `field`) unless the SI value is inside the row's limits; shown in display units. */
export function checkLimits(p: ParameterRow, si: number, field: string = flagName(p)): number {
  if (p.limits === undefined) return si;
  requireInRange(field, toDisplay(p, si), toDisplay(p, p.limits[0]), toDisplay(p, p.limits[1]), displayUnitOf(p).unit);
  return si;
}

// names close to a typo, shared by the option check and the study-file messages
function editDistance(a: string, b: string): number {
  const line = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let diagonal = line[0]!;
    line[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const above = line[j]!;
      line[j] = Math.min(line[j]! + 1, line[j - 1]! + 1, diagonal + (a[i - 1] === b[j - 1] ? 0 : 1));
      diagonal = above;
    }
  }
  return line[b.length]!;
}

/** The closest known name, if it is close enough to be a likely typo. */
export function closestName(name: string, known: readonly string[]): string | undefined {
  const lower = name.toLowerCase();
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const k of known) {
    const d = editDistance(lower, k.toLowerCase());
    if (d < bestDistance) {
      best = k;
      bestDistance = d;
    }
  }
  return best !== undefined && bestDistance <= Math.max(1, Math.floor(name.length / 3)) ? best : undefined;
}
