// Study files: a base contact, one or more sweep axes and the outputs to tabulate.
//
// The format is ours (JSON or YAML):
//
//   name: vacancy-sweep-demo
//   description: optional free text
//   base: { metal: Pt, support: TiO2-anatase, temperature: 473 K }   # any ContactOptions fields
//   sweep:
//     mode: product            # product (default: every combination) or zip (axes side by side)
//     axes:
//       - { field: donors, log: { from: 1e16, to: 1e19, points: 13 }, unit: cm^-3 }
//       - { field: particleDiameter, values: [1, 2, 5, 10], unit: nm }
//       - { field: metal, values: [Pt, Au] }        # categorical axis
//   outputs: [bandBending_eV, barrierHeight_eV, direction, exchange.equilibrationTimeLog10_s]
//
// Every problem is an InputError naming the file and the path inside it, e.g.
// "study.yaml: sweep.axes[0].log.points: expected an integer >= 2".
import { dirname, extname, isAbsolute, resolve } from 'node:path';
import { parse as parseYaml } from 'yaml';
import { z, type ZodErrorMap, type ZodIssue } from 'zod';
import { InputError } from '../errors.js';
import { MAX_INPUT_FILE_BYTES, readTextFile } from '../inputs/files.js';
import { PARAMETERS, checkLimits, closestName, parameterOf, type ContactOptions, type ParameterRow } from '../inputs/parameters.js';
import { defaultUnitOf, parseQuantity, parseUnit, type QuantityKind } from '../inputs/units.js';
import type { ContactResult, Warning } from '../types.js';

/** Largest study file read, bytes (counted while reading, before parsing): the one input-file limit. */
export const MAX_STUDY_FILE_BYTES = MAX_INPUT_FILE_BYTES;
/** Largest number of points in one study. */
export const MAX_STUDY_POINTS = 1_000_000;

// ---------------------------------------------------------------------------------------------
// the ContactOptions fields a study may set

export type FieldSpec =
  | { kind: 'quantity'; quantity: QuantityKind }
  | { kind: 'number' }
  | { kind: 'text'; categorical: boolean }
  | { kind: 'choice'; choices: readonly string[] }
  | { kind: 'materials' };

/** The study field of a parameter-table row. */
function fieldSpecOfRow(p: ParameterRow): FieldSpec {
  switch (p.kind) {
    case 'quantity':
      return { kind: 'quantity', quantity: p.quantity! };
    case 'integer':
      return { kind: 'quantity', quantity: 'dimensionless' };
    case 'choice':
      return { kind: 'choice', choices: p.choices! };
    case 'text':
      return { kind: 'text', categorical: p.categorical === true };
    case 'materials':
      return { kind: 'materials' };
  }
}

/** Every ContactOptions field, generated from the parameter table. */
export const CONTACT_FIELDS: Readonly<Record<keyof ContactOptions, FieldSpec>> = Object.fromEntries(
  PARAMETERS.map((p) => [p.option, fieldSpecOfRow(p)]),
) as Record<keyof ContactOptions, FieldSpec>;

const FIELD_NAMES = Object.keys(CONTACT_FIELDS) as (keyof ContactOptions)[];

export function fieldSpec(field: string): FieldSpec | undefined {
  return Object.hasOwn(CONTACT_FIELDS, field) ? CONTACT_FIELDS[field as keyof ContactOptions] : undefined;
}

/** A field swept with numbers (quantities and refinement). */
export function isNumericField(field: string): boolean {
  const spec = fieldSpec(field);
  return spec?.kind === 'quantity' || spec?.kind === 'number';
}

/** A field swept with a list of names (metal, support, supportFormula, and the option choices). */
export function isCategoricalField(field: string): boolean {
  const spec = fieldSpec(field);
  return (spec?.kind === 'text' && spec.categorical) || spec?.kind === 'choice';
}

// ---------------------------------------------------------------------------------------------
// outputs: dotted paths into ContactResult

type Scalar = string | number | boolean | null | undefined;
/** Dotted paths to the scalar leaves of T (arrays excluded). */
type ScalarPaths<T> = {
  [K in keyof T & string]: NonNullable<T[K]> extends Scalar
    ? K
    : NonNullable<T[K]> extends readonly unknown[]
      ? never
      : `${K}.${ScalarPaths<NonNullable<T[K]>>}`;
}[keyof T & string];

/**
 * Output paths a study may ask for: the scalar leaves of ContactResult, plus `warnings` (in results.jsonl the same
 * array of {code, message} as in `contact --json`; in results.csv the codes joined by ";").
 */
export const OUTPUT_PATHS = [
  'metal',
  'support',
  'temperature_K',
  'geometry',
  'statistics',
  'barrierModel',
  'barrierCarrier',
  'barrierHeight_eV',
  'electronBarrier_eV',
  'metalWorkFunction_eV',
  'bandBending_eV',
  'fermiLevelBelowConduction_eV',
  'supportWorkFunction_eV',
  'direction',
  'spaceCharge_C_per_m2',
  'chargeEquivalentWidth_nm',
  'depletionWidthApprox_nm',
  'depletionWidthApproxIsPlanar',
  'sphericalDepletionWidth_nm',
  'width_nm',
  'widthDefinition',
  'debyeLength_nm',
  'interfaceField_V_per_m',
  'interfacePermittivity',
  'permittivityNonlinearity_V_m5_per_C3',
  'imageForceLowering_eV',
  'imageForceMaximum_nm',
  'imageForceContinuumValid',
  'electronsPerParticle',
  'donorDensity_cm3',
  'acceptorDensity_cm3',
  'pinningFactor',
  'chargeDepth90_nm',
  'supportFullyDepleted',
  'bulk.electronDensity_cm3',
  'bulk.holeDensity_cm3',
  'bulk.ionizedDonors_cm3',
  'bulk.ionizedAcceptors_cm3',
  'bulk.conductionDensityOfStates_cm3',
  'bulk.valenceDensityOfStates_cm3',
  'bulk.intrinsicDensityLog10_cm3',
  'bulk.localisedElectrons_cm3',
  'particleWorkFunction_eV',
  'interfaceStates.stateDensity_per_eV_cm2',
  'interfaceStates.neutralLevelAboveValence_eV',
  'interfaceStates.layerThickness_nm',
  'interfaceStates.layerPermittivity',
  'interfaceStates.interfaceStateCharge_C_per_m2',
  'interfaceStates.metalCharge_C_per_m2',
  'interfaceStates.layerDrop_eV',
  'interfaceStates.electronsFromInterfaceStates',
  'interfaceStates.electronsFromSpaceCharge',
  'capacitanceBarrier.barrier_eV',
  'capacitanceBarrier.rSquared',
  'interfaceStates.surfaceDonors_per_cm2',
  'interfaceStates.surfaceDonorLevel_eV',
  'interfaceStates.surfaceDonorCharge_C_per_m2',
  'interfaceStates.surfaceDonorsIonisedFraction',
  'interfaceStates.electronsFromSurfaceDonors',
  'interfaceStates.evaluations',
  'photoemission.observedBandBending_eV',
  'photoemission.inelasticMeanFreePath_nm',
  'photoemission.photonEnergy_eV',
  'photoemission.coreLevel',
  'photoemission.emissionAngle_deg',
  'particle.diameter_nm',
  'particle.atoms',
  'particle.surfaceAtoms',
  'particle.dispersion',
  'particle.electronsPerSurfaceAtom',
  'particle.chargingEnergy_eV',
  'particle.chargingEnergyOverKT',
  'particle.particleDensity_cm2',
  'particle.meanSpacing_nm',
  'particle.zonesOverlap',
  'exchange.richardsonConstant_A_per_cm2_K2',
  'exchange.exchangeCurrentDensity_A_per_cm2',
  'exchange.exchangeCurrentLog10_A_per_cm2',
  'exchange.equilibrationTime_s',
  'exchange.equilibrationTimeLog10_s',
  'exchange.slow',
  'exchange.profileExchangeCurrentLog10_A_per_cm2',
  'exchange.tunnellingEnhancement',
  'exchange.relaxationTime99_s',
  'exchange.relaxationTime99Log10_s',
  'exchange.historyTemperature_K',
  'exchange.historyRelaxationTime99_s',
  'exchange.historyRelaxationTime99Log10_s',
  'pretreatment.mode',
  'pretreatment.reductionTemperature_K',
  'pretreatment.oxygenPressure_Pa',
  'pretreatment.hydrogenToWater',
  'pretreatment.vacancyDensity_cm3',
  'pretreatment.equilibrationTemperature_K',
  'defects.history',
  'defects.reactionGas',
  'defects.reactionGasValue',
  'defects.oxygenPartialPressure_bar',
  'defects.log10OxygenPartialPressure_bar',
  'defects.vacancies_cm3',
  'defects.equilibriumVacancies_cm3',
  'defects.reequilibrationTime_s',
  'defects.equilibratedFraction',
  'defects.timeOnStream_s',
  'defects.grainSize_nm',
  'defects.overlayerThickness_nm',
  'defects.annealTemperature_K',
  'solver.converged',
  'solver.iterations',
  'solver.meshPoints',
  'solver.domainLength_nm',
  'solver.chargeErrorEstimate',
  'solver.chargeErrorBound',
  'solver.meetsTolerance',
  // only with base.uncertainty > 0 (null otherwise)
  'uncertainty.samples',
  'uncertainty.seed',
  'uncertainty.failed',
  'uncertainty.directionProbability.support-to-metal',
  'uncertainty.directionProbability.metal-to-support',
  'uncertainty.directionProbability.none',
  'uncertainty.barrierHeight_eV.p05',
  'uncertainty.barrierHeight_eV.p50',
  'uncertainty.barrierHeight_eV.p95',
  'uncertainty.bandBending_eV.p05',
  'uncertainty.bandBending_eV.p50',
  'uncertainty.bandBending_eV.p95',
  'uncertainty.electronsPerParticle.p05',
  'uncertainty.electronsPerParticle.p50',
  'uncertainty.electronsPerParticle.p95',
  'warnings',
] as const satisfies readonly (ScalarPaths<ContactResult> | 'warnings')[];

export type OutputPath = (typeof OUTPUT_PATHS)[number];
/** warnings: the {code, message} array of ContactResult (issue 13 item 7: one shape from contact, screen and study) */
export type OutputValue = number | string | boolean | null | readonly Warning[];

export const DEFAULT_OUTPUTS: readonly OutputPath[] = [
  'bandBending_eV',
  'barrierHeight_eV',
  'direction',
  'electronsPerParticle',
  'chargeEquivalentWidth_nm',
];

const OUTPUT_SET: ReadonlySet<string> = new Set(OUTPUT_PATHS);

export function isOutputPath(path: string): path is OutputPath {
  return OUTPUT_SET.has(path);
}

/** The value of one output of a result: null when a parent is null (e.g. no exchange) or the number is not finite. */
export function readOutput(result: ContactResult, path: string): OutputValue {
  if (path === 'warnings') return result.warnings.map(({ code, message }) => ({ code, message }));
  let node: unknown = result;
  for (const key of path.split('.')) {
    if (node === null || node === undefined || typeof node !== 'object') return null;
    node = (node as Record<string, unknown>)[key];
  }
  if (typeof node === 'number') return Number.isFinite(node) ? node : null;
  if (typeof node === 'string' || typeof node === 'boolean') return node;
  return null;
}

// ---------------------------------------------------------------------------------------------
// the normalised study

export interface Range {
  from: number;
  to: number;
  points: number;
}

interface AxisCommon {
  field: string;
  /** unit of the numbers on a numeric axis; the field's default unit when absent */
  unit?: string;
}
export type SweepAxis =
  | (AxisCommon & { values: (number | string)[] })
  | (AxisCommon & { linear: Range })
  | (AxisCommon & { log: Range });

export interface Study {
  name: string;
  description?: string;
  /** options shared by every point; an axis value replaces the base value of its field */
  base: ContactOptions;
  sweep: { mode: 'product' | 'zip'; axes: SweepAxis[] };
  outputs: OutputPath[];
}

// ---------------------------------------------------------------------------------------------
// schema (structure); the checks that need several fields follow in checkStudy

const finite = z.number().finite();

const quantity = z.union([finite, z.string().trim().min(1)], {
  errorMap: () => ({ message: 'expected a number or a quantity such as "1e18 cm^-3"' }),
});

function baseFieldSchema(spec: FieldSpec): z.ZodTypeAny {
  switch (spec.kind) {
    case 'quantity':
      return quantity.optional();
    case 'number':
      return finite.optional();
    case 'text':
      return z.string().trim().min(1, 'expected a non-empty string').optional();
    case 'choice':
      return z.enum(spec.choices as [string, ...string[]]).optional();
    case 'materials':
      return z.array(z.string().min(1, 'expected a file name')).optional();
  }
}

const BaseSchema = z
  .object(Object.fromEntries(FIELD_NAMES.map((f) => [f, baseFieldSchema(CONTACT_FIELDS[f])])) as Record<string, z.ZodTypeAny>)
  .strict();

const POINTS_MESSAGE = 'expected an integer >= 2';
const RangeSchema = z
  .object({
    from: finite,
    to: finite,
    points: z
      .number()
      .int(POINTS_MESSAGE)
      .min(2, POINTS_MESSAGE)
      .max(MAX_STUDY_POINTS, `expected at most ${MAX_STUDY_POINTS} points`),
  })
  .strict();

const AxisSchema = z
  .object({
    field: z.string(),
    unit: z.string().trim().optional(),
    values: z.array(z.union([finite, z.string()], { errorMap: () => ({ message: 'expected a number or a name' }) })).min(1).optional(),
    linear: RangeSchema.optional(),
    log: RangeSchema.optional(),
  })
  .strict();

const StudySchema = z
  .object({
    name: z.string().trim().min(1, 'expected a non-empty name').max(200, 'expected at most 200 characters'),
    description: z.string().optional(),
    base: BaseSchema.default({}),
    sweep: z
      .object({
        mode: z.enum(['product', 'zip']).default('product'),
        axes: z.array(AxisSchema).min(1),
      })
      .strict(),
    outputs: z.array(z.string()).min(1).optional(),
  })
  .strict();

type ParsedStudy = z.infer<typeof StudySchema>;

const TYPE_WORDS: Record<string, string> = {
  number: 'a number',
  string: 'a string',
  boolean: 'true or false',
  object: 'an object (a mapping)',
  array: 'a list',
  nan: 'NaN',
};

/** Our wording for zod's default messages (messages set in the schema take precedence). */
const errorMap: ZodErrorMap = (issue, ctx) => {
  switch (issue.code) {
    case 'invalid_type':
      if (issue.received === 'undefined') return { message: 'required field is missing' };
      return { message: `expected ${TYPE_WORDS[issue.expected] ?? issue.expected}, got ${TYPE_WORDS[issue.received] ?? issue.received}` };
    case 'invalid_enum_value':
      return { message: `expected one of ${issue.options.join(', ')}, got ${JSON.stringify(issue.received)}` };
    case 'too_small':
      if (issue.type === 'array') return { message: `expected at least ${String(issue.minimum)} entr${issue.minimum === 1 ? 'y' : 'ies'}` };
      return { message: ctx.defaultError };
    case 'not_finite':
      return { message: 'expected a finite number' };
    default:
      return { message: ctx.defaultError };
  }
};

// ---------------------------------------------------------------------------------------------
// messages

/** "sweep.axes[0].log.points" for a zod path. */
export function formatPath(path: readonly (string | number)[]): string {
  return path.map((p, i) => (typeof p === 'number' ? `[${p}]` : i === 0 ? p : `.${p}`)).join('');
}

function oneLine(s: string): string {
  return s.replace(/\s+/g, ' ').trim();
}

function fail(label: string, path: readonly (string | number)[] | string, message: string): never {
  const where = typeof path === 'string' ? path : formatPath(path);
  throw new InputError(where ? `${label}: ${where}` : label, oneLine(message));
}

export { closestName };

function didYouMean(name: string, known: readonly string[]): string {
  const guess = closestName(name, known);
  return guess !== undefined ? ` (did you mean "${guess}"?)` : '';
}

const KEYS_AT: Record<string, readonly string[]> = {
  '': Object.keys(StudySchema.shape),
  base: FIELD_NAMES,
  sweep: ['mode', 'axes'],
  axis: Object.keys(AxisSchema.shape),
  range: Object.keys(RangeSchema.shape),
};

function knownKeysAt(path: readonly (string | number)[]): readonly string[] {
  const p = formatPath(path);
  if (p === '' || p === 'base' || p === 'sweep') return KEYS_AT[p]!;
  if (/^sweep\.axes\[\d+\]$/.test(p)) return KEYS_AT['axis']!;
  return KEYS_AT['range']!;
}

function failOnIssue(label: string, issue: ZodIssue, count: number): never {
  const more = count > 1 ? ` (and ${count - 1} more problem${count > 2 ? 's' : ''})` : '';
  if (issue.code === 'unrecognized_keys') {
    const key = issue.keys[0]!;
    const known = knownKeysAt(issue.path);
    const hint = didYouMean(key, known) || (known.length <= 8 ? ` (allowed: ${known.join(', ')})` : '');
    const others = issue.keys.length > 1 ? ` (and ${issue.keys.length - 1} more unknown field${issue.keys.length > 2 ? 's' : ''})` : '';
    return fail(label, [...issue.path, key], `unknown field${hint}${others}`);
  }
  return fail(label, issue.path, issue.message + more);
}

// ---------------------------------------------------------------------------------------------
// semantic checks

function checkBaseQuantities(label: string, base: Record<string, unknown>): void {
  for (const [field, value] of Object.entries(base)) {
    const spec = fieldSpec(field);
    if (spec?.kind !== 'quantity' || value === undefined) continue;
    try {
      checkLimits(parameterOf(field)!, parseQuantity(field, value as number | string, spec.quantity), field);
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      fail(label, ['base', field], err.message.slice(field.length + 2));
    }
  }
}

function checkUnit(label: string, path: (string | number)[], field: string, unit: string | undefined): void {
  const spec = fieldSpec(field)!;
  if (unit === undefined) return;
  if (spec.kind === 'number' || (spec.kind === 'quantity' && spec.quantity === 'dimensionless')) {
    if (unit !== '') fail(label, path, `"${field}" is a plain number: leave out the unit`);
    return;
  }
  if (spec.kind !== 'quantity') fail(label, path, `"${field}" is a categorical axis: it has no unit`);
  if (unit === '') fail(label, path, `expected a unit such as "${defaultUnitOf(spec.quantity)}"`);
  // the default unit needs no check (and no units library at start-up)
  if (unit === defaultUnitOf(spec.quantity)) return;
  try {
    parseUnit(field, unit, spec.quantity);
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    fail(label, path, `"${unit}" is not a unit of ${err.allowed ?? spec.quantity}`);
  }
}

function checkAxis(label: string, axis: ParsedStudy['sweep']['axes'][number], i: number): SweepAxis {
  const at = ['sweep', 'axes', i];
  const spec = fieldSpec(axis.field);
  if (spec === undefined) {
    fail(label, [...at, 'field'], `unknown field "${axis.field}"${didYouMean(axis.field, FIELD_NAMES)}`);
  }
  if (!isNumericField(axis.field) && !isCategoricalField(axis.field)) {
    fail(label, [...at, 'field'], `"${axis.field}" cannot be swept`);
  }
  const given = (['values', 'linear', 'log'] as const).filter((k) => axis[k] !== undefined);
  if (given.length !== 1) {
    fail(label, at, given.length === 0 ? 'give one of values, linear, log' : `give only one of values, linear, log (got ${given.join(' and ')})`);
  }
  const kind = given[0]!;
  const categorical = isCategoricalField(axis.field);
  if (categorical && kind !== 'values') {
    fail(label, [...at, kind], `"${axis.field}" is categorical: give a list of names in values`);
  }
  checkUnit(label, [...at, 'unit'], axis.field, axis.unit);
  const unit = axis.unit !== undefined && axis.unit !== '' ? { unit: axis.unit } : {};
  if (kind === 'values') {
    const values = axis.values!;
    values.forEach((v, j) => {
      if (categorical && typeof v !== 'string') fail(label, [...at, 'values', j], `expected a name, got ${typeof v}`);
      if (!categorical && typeof v !== 'number') {
        fail(label, [...at, 'values', j], `expected a number (give the unit once in "unit"), got ${JSON.stringify(v)}`);
      }
      if (spec.kind === 'choice' && !spec.choices.includes(v as string)) {
        fail(label, [...at, 'values', j], `expected one of ${spec.choices.join(', ')}, got ${JSON.stringify(v)}`);
      }
    });
    return { field: axis.field, ...unit, values: [...values] };
  }
  const range = axis[kind]!;
  if (kind === 'log') {
    if (range.from <= 0) fail(label, [...at, 'log', 'from'], 'expected a number > 0 on a log axis');
    if (range.to <= 0) fail(label, [...at, 'log', 'to'], 'expected a number > 0 on a log axis');
    return { field: axis.field, ...unit, log: { ...range } };
  }
  return { field: axis.field, ...unit, linear: { ...range } };
}

export function axisLength(axis: SweepAxis): number {
  if ('values' in axis) return axis.values.length;
  return 'linear' in axis ? axis.linear.points : axis.log.points;
}

/** Number of points of a sweep (may exceed MAX_STUDY_POINTS for a study that is then rejected). */
export function countPoints(sweep: Study['sweep']): number {
  const lengths = sweep.axes.map(axisLength);
  return sweep.mode === 'zip' ? Math.min(...lengths) : lengths.reduce((a, b) => a * b, 1);
}

/** CSV/JSONL column of a swept field: `donors [cm^-3]`, `particleDiameter [nm]`, `metal`, `permittivity`. */
export function sweptColumn(axis: SweepAxis): string {
  const spec = fieldSpec(axis.field);
  if (spec?.kind !== 'quantity' || spec.quantity === 'dimensionless') return axis.field;
  return `${axis.field} [${axis.unit ?? defaultUnitOf(spec.quantity)}]`;
}

/** All columns of the results, in order: index, swept fields, outputs, error. */
export function studyColumns(study: Study): string[] {
  return ['index', ...study.sweep.axes.map(sweptColumn), ...study.outputs, 'error'];
}

function checkSweep(label: string, parsed: ParsedStudy['sweep']): Study['sweep'] {
  const axes = parsed.axes.map((a, i) => checkAxis(label, a, i));
  axes.forEach((a, i) => {
    const first = axes.findIndex((b) => b.field === a.field);
    if (first < i) fail(label, ['sweep', 'axes', i, 'field'], `"${a.field}" is already swept by sweep.axes[${first}]`);
  });
  const sweep = { mode: parsed.mode, axes };
  if (sweep.mode === 'zip') {
    const n0 = axisLength(axes[0]!);
    axes.forEach((a, i) => {
      if (axisLength(a) !== n0) {
        fail(label, ['sweep', 'axes', i], `zip mode needs axes of equal length (sweep.axes[0] has ${n0} points, this one ${axisLength(a)})`);
      }
    });
  }
  const count = countPoints(sweep);
  if (count > MAX_STUDY_POINTS) {
    fail(label, 'sweep', `${count > 1e15 ? count.toExponential(2) : count} points exceed the limit of ${MAX_STUDY_POINTS.toLocaleString('en-US')}`);
  }
  return sweep;
}

function checkOutputs(label: string, outputs: readonly string[], sweep: Study['sweep']): OutputPath[] {
  const swept = new Set(sweep.axes.map(sweptColumn));
  return outputs.map((o, i) => {
    if (!isOutputPath(o)) fail(label, ['outputs', i], `unknown output "${o}"${didYouMean(o, OUTPUT_PATHS)}`);
    if (outputs.indexOf(o) < i) fail(label, ['outputs', i], `"${o}" is listed twice`);
    if (swept.has(o)) fail(label, ['outputs', i], `"${o}" clashes with the swept input column of the same name`);
    return o;
  });
}

export interface ParseStudyOptions {
  /** file name used in messages */
  label?: string;
  /** folder that relative materials file names in base.materials are read from */
  baseDir?: string;
}

/** Validate plain data (parsed JSON/YAML or built in code) into a normalised Study. */
export function parseStudy(raw: unknown, options: ParseStudyOptions = {}): Study {
  const label = options.label ?? 'study';
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    fail(label, '', 'expected a study: a mapping with the keys name, base, sweep, outputs');
  }
  const result = StudySchema.safeParse(raw, { errorMap });
  if (!result.success) {
    // an unknown key usually explains the other problems (a misspelt field is also a missing one)
    const issues = result.error.issues;
    failOnIssue(label, issues.find((i) => i.code === 'unrecognized_keys') ?? issues[0]!, issues.length);
  }
  const data = result.data;
  checkBaseQuantities(label, data.base);
  const sweep = checkSweep(label, data.sweep);
  const outputs = checkOutputs(label, data.outputs ?? DEFAULT_OUTPUTS, sweep);
  const base = Object.fromEntries(Object.entries(data.base).filter(([, v]) => v !== undefined)) as ContactOptions;
  if (Array.isArray(base.materials) && options.baseDir !== undefined) {
    const dir = options.baseDir;
    base.materials = base.materials.map((f) => (isAbsolute(f) ? f : resolve(dir, f)));
  }
  return {
    name: data.name,
    ...(data.description !== undefined ? { description: data.description } : {}),
    base,
    sweep,
    outputs,
  };
}

/** Parse the text of a study file (YAML for .yaml/.yml, JSON otherwise). */
export function parseStudyText(text: string, label: string, options: Omit<ParseStudyOptions, 'label'> = {}): Study {
  const ext = extname(label).toLowerCase();
  let raw: unknown;
  if (ext === '.yaml' || ext === '.yml') {
    try {
      raw = parseYaml(text) as unknown;
    } catch (err) {
      // the first line names the problem and its line/column; the rest is a code excerpt
      fail(label, '', `not valid YAML: ${(err as Error).message.split('\n')[0]!.replace(/:\s*$/, '')}`);
    }
  } else {
    try {
      raw = JSON.parse(text) as unknown;
    } catch (err) {
      fail(label, '', `not valid JSON: ${(err as Error).message}`);
    }
  }
  return parseStudy(raw, { ...options, label });
}

/** Read and validate a study file (a regular file of at most 5 MB). */
export function loadStudyFile(path: string): Study {
  const label = path;
  const text = readTextFile(path, label); // regular files of at most 5 MB, size counted while reading
  return parseStudyText(text, label, { baseDir: dirname(resolve(path)) });
}
