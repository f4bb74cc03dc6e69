// The validation gallery: published measurements (validation/*.json) beside the model's predictions, and the
// statistics that summarise the comparison. Nothing here is fitted to the gallery.
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { z } from 'zod';
import { solveContact } from '../contact.js';
import { materialsSchemas, type CslItemEntry } from '../materials/schema.js';
import { isModelFailure } from '../errors.js';
import type { ContactResult, BarrierModel } from '../types.js';
import {
  bandBendingProfile,
  kineticEnergy_eV,
  monolayerThickness_m,
  observedBandBending_eV,
  seahDenchImfpCompound_m,
} from '../derived/photoemission.js';
import { SupportStateSchema, supportStateInputs, unmappedState, usesReductionData, type SupportStateInputs, type SupportStateMapping } from './supportState.js';
import { loadBuiltinLibrary } from '../materials/load.js';
import {
  fractionInsideBand,
  fractionMagnitudeReached,
  fractionSignReached,
  meanBandWidth,
  ObservableMissing,
  rowScatter,
  type RowScatter,
  type ScatterRequest,
} from './scatter.js';
import type { MaterialsLibrary } from '../materials/types.js';

// ------------------------------------------------------------------------------------------ schemas

const num = z.number().finite();
const common = {
  id: z.string().regex(/^[A-Za-z0-9_.-]+$/),
  metal: z.string().min(1),
  /** key of the metals library, null when the contact metal is not in it */
  metalKey: z.string().nullable(),
  support: z.string().min(1),
  /** key of materials/supports.json, null when the support is not in it */
  supportKey: z.string().nullable(),
  method: z.string().min(1),
  citation: z.string().min(1),
  whereSeen: z.string().min(1),
  /** true: the number was read at whereSeen; false: from memory, not seen */
  verified: z.boolean(),
  /** false: kept for the record but outside the model's physics or not comparable */
  inStatistics: z.boolean(),
  note: z.string().nullable().optional(),
};

export const BarrierRowSchema = z
  .object({
    ...common,
    /** electron barrier E_C(0) - E_F, or, for a p-type support, the hole barrier E_F - E_V(0) the paper reports */
    quantity: z.enum(['electronBarrier_eV', 'holeBarrier_eV']),
    /**
     * the measuring technique, read from `method`: current-voltage (thermionic fits) and BEEM see the top of the
     * barrier, lowered by the image force; capacitance-voltage, internal photoemission (thresholds extrapolated to zero
     * field) and photoemission (band bending) see the barrier without it; 'other' for mixed or unstated techniques
     */
    technique: z.enum(['current-voltage', 'capacitance-voltage', 'internal-photoemission', 'photoemission', 'beem', 'other']),
    value: num,
    uncertainty: num.nonnegative().nullable(),
    range: z.tuple([num, num]).nullable(),
    conditions: z
      .object({
        temperature_K: num.positive(),
        donors_cm3: num.positive().nullable(),
        surface: z.string().nullable().optional(),
        /** structured support state read from the paper (src/validation/supportState.ts) */
        pretreatment: SupportStateSchema.nullable().optional(),
      })
      .strict(),
  })
  .strict();

export const ChargeRowSchema = z
  .object({
    ...common,
    quantity: z.literal('electronsPerParticle'),
    /** electrons gained by the metal particle (negative: to the support); null when only the sign or a range is known */
    value: num.nullable(),
    sign: z.enum(['to-metal', 'to-support', 'mixed', 'none']),
    /** measured |electrons per particle| range */
    magnitudeRange: z.tuple([num.nonnegative(), num.nonnegative()]).nullable(),
    electronsPerAtom: num.nullable(),
    conditions: z
      .object({
        temperature_K: num.positive(),
        particleDiameter_nm: num.positive().nullable(),
        particleDiameterNote: z.string().nullable().optional(),
        atoms: num.positive().nullable(),
        supportState: z.string().nullable().optional(),
        /** donor density stated by the paper, cm^-3 */
        donors_cm3: num.positive().nullable().optional(),
        /** structured support state read from the paper (src/validation/supportState.ts) */
        pretreatment: SupportStateSchema.nullable().optional(),
      })
      .strict(),
  })
  .strict();

export const BandBendingRowSchema = z
  .object({
    ...common,
    quantity: z.literal('bandBendingChange_eV'),
    /** change of band bending on metal deposition, eV, positive = bands further up at the surface */
    value: num,
    uncertainty: num.nonnegative().nullable(),
    coreLevel: z.string(),
    coreLevelShift_eV: num,
    coreLevelBindingEnergy_eV: num.nonnegative(),
    photonEnergy_eV: num.positive(),
    photonEnergyNote: z.string().nullable().optional(),
    emissionAngle_deg: num.min(0).max(89),
    /** band bending of the clean surface before deposition, eV (null: not reported, taken as 0) */
    initialBandBending_eV: num.nullable(),
    /** for the information depth (Seah-Dench monolayer thickness) */
    supportMolarMass_g_mol: num.positive(),
    supportDensity_g_cm3: num.positive(),
    atomsPerFormulaUnit: z.number().int().positive(),
    supportDataNote: z.string(),
    conditions: z
      .object({
        temperature_K: num.positive(),
        donors_cm3: num.positive().nullable(),
        surface: z.string().nullable().optional(),
        coverage: z.string().nullable().optional(),
        /** structured support state read from the paper (src/validation/supportState.ts) */
        pretreatment: SupportStateSchema.nullable().optional(),
      })
      .strict(),
  })
  .strict();

const fileSchema = <T extends z.ZodTypeAny>(kind: string, row: T) =>
  z.object({ $comment: z.string().optional(), kind: z.literal(kind), rows: z.array(row) }).strict();

export type BarrierRow = z.infer<typeof BarrierRowSchema>;
export type ChargeRow = z.infer<typeof ChargeRowSchema>;
export type BandBendingRow = z.infer<typeof BandBendingRowSchema>;

export interface Gallery {
  barriers: BarrierRow[];
  charges: ChargeRow[];
  bandBending: BandBendingRow[];
  references: CslItemEntry[];
}

/** Folder of the gallery shipped with the package (works from src/ under vitest and from dist/). */
export const GALLERY_DIR = fileURLToPath(new URL('../../validation/', import.meta.url));

function readJson(path: string): unknown {
  return JSON.parse(readFileSync(path, 'utf8')) as unknown;
}

function parseOrThrow<T>(schema: z.ZodType<T>, data: unknown, label: string): T {
  const r = schema.safeParse(data);
  if (!r.success) {
    const first = r.error.issues[0]!;
    throw new Error(`${label}: ${first.path.join('.')}: ${first.message}`);
  }
  return r.data;
}

/** Load and validate the gallery; every citation must resolve to validation/references.json and ids be unique. */
export function loadGallery(dir: string = GALLERY_DIR): Gallery {
  const barriers = parseOrThrow(fileSchema('barrier', BarrierRowSchema), readJson(join(dir, 'barriers.json')), 'barriers.json').rows;
  const charges = parseOrThrow(fileSchema('charge', ChargeRowSchema), readJson(join(dir, 'charge.json')), 'charge.json').rows;
  const bandBending = parseOrThrow(fileSchema('bandBending', BandBendingRowSchema), readJson(join(dir, 'bandbending.json')), 'bandbending.json').rows;
  const references = parseOrThrow(materialsSchemas().ReferencesFileSchema, readJson(join(dir, 'references.json')), 'references.json');
  const refIds = new Set(references.map((r) => r.id));
  const seen = new Set<string>();
  for (const row of [...barriers, ...charges, ...bandBending]) {
    if (!refIds.has(row.citation)) throw new Error(`gallery row ${row.id}: citation "${row.citation}" is not in references.json`);
    if (seen.has(row.id)) throw new Error(`gallery row id "${row.id}" is used twice`);
    seen.add(row.id);
  }
  return { barriers, charges, bandBending, references };
}

// ------------------------------------------------------------------------------------------ options

/** Particle diameter used for charge rows that report no size, nm (stated in each row's note). */
export const DEFAULT_PARTICLE_DIAMETER_NM = 2;

export type SolveFunction = (options: Record<string, unknown>) => unknown;

/** A barrier model, or 'default': whatever the parameter table picks for each support. */
export type GalleryModel = BarrierModel | 'default';

export interface ModelChoice {
  /** passed as barrierModel; 'default' leaves it to the library default (interface states where data exist) */
  barrierModel: GalleryModel;
  /** further options added to every contact (never tuned to the gallery) */
  extra?: Record<string, unknown>;
}

function base(row: { metalKey: string | null; supportKey: string | null }, T: number, model: ModelChoice): Record<string, unknown> {
  return {
    metal: row.metalKey,
    support: row.supportKey,
    temperature: T,
    ...(model.barrierModel === 'default' ? {} : { barrierModel: model.barrierModel }),
    ...(model.extra ?? {}),
  };
}

/** The contact inputs of a row's support state (stated donors, pretreatment, or the convention); see supportState.ts. */
export function rowSupportState(row: BarrierRow | ChargeRow | BandBendingRow): SupportStateInputs {
  return supportStateInputs(row.conditions.pretreatment, row.conditions.donors_cm3);
}

/** Planar contact at the measured temperature with the row's support state (stated donors, pretreatment). */
export function barrierOptions(row: BarrierRow, model: ModelChoice, state: SupportStateInputs = rowSupportState(row)): Record<string, unknown> {
  return { ...base(row, row.conditions.temperature_K, model), geometry: 'planar', ...state.options };
}

/**
 * A particle of the measured diameter (or the default) resting on the support: the disc contact through its flat
 * footprint (src/electrostatics/geometry.ts, disc), with the row's support state. Until 2026-12-04 evening the
 * gallery used the sunk-in hemisphere, whose contact 2 pi r^2 is twice the footprint of a particle on a surface.
 */
export function chargeOptions(row: ChargeRow, model: ModelChoice, state: SupportStateInputs = rowSupportState(row)): Record<string, unknown> {
  return {
    ...base(row, row.conditions.temperature_K, model),
    geometry: 'disc',
    particleDiameter: row.conditions.particleDiameter_nm ?? DEFAULT_PARTICLE_DIAMETER_NM,
    ...state.options,
  };
}

export function bandBendingOptions(row: BandBendingRow, model: ModelChoice, state: SupportStateInputs = rowSupportState(row)): Record<string, unknown> {
  return { ...base(row, row.conditions.temperature_K, model), geometry: 'planar', ...state.options };
}

/** Information depth of the row's core level: Seah-Dench IMFP at E_kin = h nu - E_B, m. */
export function rowImfp_m(row: BandBendingRow): number {
  const a = monolayerThickness_m(row.supportMolarMass_g_mol, row.supportDensity_g_cm3, row.atomsPerFormulaUnit);
  return seahDenchImfpCompound_m(kineticEnergy_eV(row.photonEnergy_eV, row.coreLevelBindingEnergy_eV), a);
}

/** The measured band bending after deposition: initial (0 if not reported) + change, eV. */
export function measuredFinalBandBending_eV(row: BandBendingRow): number {
  return (row.initialBandBending_eV ?? 0) + row.value;
}

// ------------------------------------------------------------------------------------------ statistics (pure)

export interface Comparison {
  predicted: number;
  measured: number;
}

/** Mean absolute error, eV; null for no data. */
export function meanAbsoluteError(items: readonly Comparison[]): number | null {
  if (items.length === 0) return null;
  return items.reduce((s, c) => s + Math.abs(c.predicted - c.measured), 0) / items.length;
}

export interface PairedBarrier {
  pair: string;
  predicted: number;
  measured: number;
}

/**
 * Group barrier comparisons by metal/support pair: the measured value of a pair is the mean of all its
 * measurements (every method counts once per row), the predicted value is the mean prediction (rows of one pair
 * can differ in temperature or donors).
 */
export function pairMeans(items: readonly PairedBarrier[]): (Comparison & { pair: string; rows: number })[] {
  const groups = new Map<string, PairedBarrier[]>();
  for (const it of items) groups.set(it.pair, [...(groups.get(it.pair) ?? []), it]);
  return [...groups.entries()].map(([pair, g]) => ({
    pair,
    rows: g.length,
    predicted: g.reduce((s, x) => s + x.predicted, 0) / g.length,
    measured: g.reduce((s, x) => s + x.measured, 0) / g.length,
  }));
}

export type ChargeSign = 'to-metal' | 'to-support' | 'mixed' | 'none';

/** Below this many electrons per particle a prediction counts as "no transfer" (charge comes in whole electrons). */
export const NO_TRANSFER_BELOW_ELECTRONS = 0.5;

/** Direction of a predicted charge (electrons gained by the metal): 'none' when |N| < 0.5, else by sign. */
export function signOf(electronsGained: number): Exclude<ChargeSign, 'mixed'> {
  if (Math.abs(electronsGained) < NO_TRANSFER_BELOW_ELECTRONS) return 'none';
  return electronsGained > 0 ? 'to-metal' : 'to-support';
}

/** Fraction of rows whose predicted sign equals the measured one ('mixed' rows are not counted); null if none. */
export function signAgreement(items: readonly { predicted: number; sign: ChargeSign }[]): number | null {
  const definite = items.filter((i) => i.sign !== 'mixed');
  if (definite.length === 0) return null;
  return definite.filter((i) => signOf(i.predicted) === i.sign).length / definite.length;
}

/** |predicted| lies within a factor `factor` of the measured magnitude range [lo, hi]: lo/factor <= |p| <= hi*factor. */
export function withinFactor(predicted: number, range: readonly [number, number], factor = 3): boolean {
  const p = Math.abs(predicted);
  const lo = Math.min(range[0], range[1]);
  const hi = Math.max(range[0], range[1]);
  return p >= lo / factor && p <= hi * factor;
}

/** Fraction of rows within a factor of 3 of the measured magnitude range; null if none. */
export function fractionWithinFactor(items: readonly { predicted: number; range: readonly [number, number] }[], factor = 3): number | null {
  if (items.length === 0) return null;
  return items.filter((i) => withinFactor(i.predicted, i.range, factor)).length / items.length;
}

// ------------------------------------------------------------------------------------------ running

export type RowStatus = 'ok' | 'failed' | 'excluded';

export interface ValidationRow {
  kind: 'barrier' | 'charge' | 'bandBending';
  id: string;
  metal: string;
  support: string;
  /** library keys (null when not in the library) */
  metalKey?: string | null;
  supportKey?: string | null;
  method: string;
  citation: string;
  verified: boolean;
  /** measured value in the row's quantity (barrier eV; electrons per particle, null if only sign/range; final band bending eV) */
  measured: number | null;
  /** barrier rows: 'holeBarrier_eV' when the paper reports the hole barrier of a p-type support (absent: electron barrier) */
  quantity?: 'holeBarrier_eV';
  /** measured sign or range where that is what the paper gives */
  measuredSign?: ChargeSign;
  measuredRange?: [number, number] | null;
  predicted: number | null;
  status: RowStatus;
  reason?: string;
  /** how the measurement's support state reached the model (absent: not compared) */
  supportState?: { mapping: SupportStateMapping; inputs: Record<string, unknown>; note: string };
  /** the band of the prediction under the inputs' published scatter (only when asked for: ValidationOptions.scatter) */
  scatter?: RowScatter;
  /** why the scatter band could not be computed (every sample failed) */
  scatterFailure?: string;
}

export interface BarrierStatistics {
  rows: number;
  pairs: number;
  oxides: number;
  /** mean over pairs of |mean prediction - mean measurement|, eV */
  meanAbsoluteError_eV: number | null;
  /** the same over single rows, eV */
  rowMeanAbsoluteError_eV: number | null;
  /** the pair statistic restricted to rows with verified: true */
  verifiedMeanAbsoluteError_eV: number | null;
  /** the pair statistic per oxide (library key, else the paper's name) */
  perOxide?: Record<string, { pairs: number; meanAbsoluteError_eV: number | null }>;
  failed: number;
}

export interface ChargeStatistics {
  rows: number;
  signRows: number;
  signAgreement: number | null;
  magnitudeRows: number;
  withinFactor3: number | null;
  failed: number;
}

export interface BandBendingStatistics {
  rows: number;
  meanAbsoluteError_eV: number | null;
  failed: number;
}

/**
 * How many measurements the model reaches within the published scatter of its inputs (src/validation/scatter.ts):
 * a measured value inside the row's 5-95% band, a measured charge sign that at least 5% of the samples give, a
 * measured magnitude range that meets the band of |N|.
 */
export interface ScatterStatistics {
  samples: number;
  seed: number;
  barrierRows: number;
  barrierInsideBand: number | null;
  /** mean width of the barrier bands, eV */
  barrierMeanBandWidth_eV: number | null;
  chargeSignRows: number;
  chargeSignReached: number | null;
  magnitudeRows: number;
  magnitudeReached: number | null;
  bandBendingRows: number;
  bandBendingInsideBand: number | null;
  /** rows whose every sample failed (no band) */
  failedRows: number;
}

export interface ValidationStatistics {
  model: GalleryModel;
  /** present when the scatter bands were computed */
  scatter?: ScatterStatistics;
  /** compared rows by how their support state reached the model (supportState.ts) */
  supportStates?: Partial<Record<SupportStateMapping, number>>;
  barrier: BarrierStatistics;
  charge: ChargeStatistics;
  bandBending: BandBendingStatistics;
}

export interface ValidationResult {
  rows: ValidationRow[];
  statistics: ValidationStatistics;
}

export interface ValidationOptions {
  /** barrier model (default 'ideal'); 'default' = the library's default model per support */
  model?: GalleryModel;
  /** extra contact options for every row (e.g. statistics), never fitted to the gallery */
  extra?: Record<string, unknown>;
  /** solver (default solveContact); it receives contact options and returns a ContactResult-like object */
  solve?: SolveFunction;
  /** gallery folder (default: the one shipped in validation/) */
  galleryDir?: string;
  /** include rows with verified: false (default true) */
  includeUnverified?: boolean;
  /** pass each row's support state (stated donors, pretreatment) to the model (default true); false: library defaults for all */
  supportState?: boolean;
  /** also sample each compared row within its inputs' published ranges (uses the library solver, not `solve`) */
  scatter?: ScatterRequest;
  /** called after each row (progress) */
  onRow?: () => void;
}

function tryNumber(f: () => number): { value: number } | { error: string } {
  try {
    const v = f();
    if (!Number.isFinite(v)) return { error: 'the solver returned a non-finite value' };
    return { value: v };
  } catch (e) {
    return { error: e instanceof Error ? e.message : String(e) };
  }
}

function asResult(x: unknown): ContactResult {
  return x as ContactResult;
}

type AnyRow = BarrierRow | ChargeRow | BandBendingRow;

/**
 * The barrier a row measured: the electron barrier, or the hole barrier of a contact whose majority carriers are holes.
 * Current-voltage and BEEM rows see the barrier's top, lowered by the image force (Sze & Ng, 3rd ed., sec. 3.2.4;
 * Rhoderick & Williams, Metal-Semiconductor Contacts, 2nd ed., ch. 3: I-V barriers lie below C-V ones by about this
 * much): the contact's imageForceLowering_eV is subtracted there, where the measured carriers are depleted (a barrier
 * with a maximum); capacitance-voltage rows see the barrier a Mott–Schottky analysis of the contact's own C(V) reports
 * (capacitanceBarrier, when the contact has one); the other techniques compare the barrier without either.
 */
export function predictedBarrier_eV(result: ContactResult, quantity: BarrierRow['quantity'], technique: BarrierRow['technique'] = 'other'): number {
  const seesTop = technique === 'current-voltage' || technique === 'beem';
  if (quantity === 'electronBarrier_eV') {
    // a C-V row sees the Mott–Schottky intercept of the contact's C(V) where that analysis applies (a depleted planar
    // contact with a straight 1/C^2 line: src/derived/capacitanceVoltage.ts), else the barrier itself
    if (technique === 'capacitance-voltage' && result.capacitanceBarrier) return result.capacitanceBarrier.barrier_eV;
    const depleted = result.bandBending_eV > 0;
    return result.electronBarrier_eV - (seesTop && depleted ? result.imageForceLowering_eV : 0);
  }
  if (result.barrierCarrier !== 'hole') throw new ObservableMissing('hole barrier measured, but the model gives an electron barrier for this support (not p-type)');
  const depleted = result.bandBending_eV < 0;
  return result.barrierHeight_eV - (seesTop && depleted ? result.imageForceLowering_eV : 0);
}

/**
 * The state a row's contact gets: its support state, or library defaults (and saying so) when states are switched off
 * or the state goes through reduction thermodynamics the library does not have for the support (e.g. SrTiO3).
 */
function stateFor(source: AnyRow, usesState: boolean, lib: MaterialsLibrary): SupportStateInputs {
  if (!usesState) return unmappedState(source.support, 'support states switched off');
  const state = rowSupportState(source);
  const key = source.supportKey;
  if (!usesReductionData(state) || key === null || lib.supports.get(key)?.reduction !== undefined) return state;
  return unmappedState(key, 'no reduction data in the library');
}

/** How one row is predicted: its contact options for a support state, and the number it reads off the result. */
interface RowPrediction {
  options: (state: SupportStateInputs) => Record<string, unknown>;
  observe: (result: ContactResult) => number;
  /** charge rows: the direction of a sampled value, for the scatter's sign probabilities */
  signOf?: (value: number) => Exclude<ChargeSign, 'mixed'>;
}

/**
 * Predict one row with its support state (stateFor); an excluded row is not solved. With a scatter request the row is
 * also sampled within its inputs' published ranges (a row whose every sample fails records why and keeps its
 * prediction).
 */
function compareRow(row: ValidationRow, source: AnyRow, state: SupportStateInputs, how: RowPrediction, solve: SolveFunction, scatter?: ScatterRequest): ValidationRow {
  const why = excludedReason(source);
  if (why) return Object.assign(row, { status: 'excluded', reason: why });
  const p = tryNumber(() => how.observe(asResult(solve(how.options(state)))));
  row.supportState = { mapping: state.mapping, inputs: state.options, note: state.note };
  if (!('value' in p)) return Object.assign(row, { status: 'failed', reason: p.error });
  row.predicted = p.value;
  if (scatter) {
    try {
      row.scatter = rowScatter(how.options(state), how.observe, { ...scatter, id: row.id }, how.signOf);
    } catch (e) {
      if (!isModelFailure(e)) throw e;
      row.scatterFailure = e.message;
    }
  }
  return row;
}

function excludedReason(r: { inStatistics: boolean; metalKey: string | null; supportKey: string | null }): string | undefined {
  if (!r.inStatistics) return 'kept for the record, outside the comparison (see the row note)';
  if (r.metalKey === null) return 'metal not in the library';
  if (r.supportKey === null) return 'support not in the library';
  return undefined;
}

function rowHead(kind: ValidationRow['kind'], r: AnyRow): ValidationRow {
  return { kind, id: r.id, metal: r.metal, support: r.support, metalKey: r.metalKey, supportKey: r.supportKey, method: r.method, citation: r.citation, verified: r.verified, measured: null, predicted: null, status: 'ok' };
}

/** Run every gallery row through the solver and summarise. */
export function runValidation(options: ValidationOptions = {}): ValidationResult {
  const model: ModelChoice = { barrierModel: options.model ?? 'ideal', extra: options.extra };
  const solve: SolveFunction = options.solve ?? ((o) => solveContact(o as Parameters<typeof solveContact>[0]));
  const gallery = loadGallery(options.galleryDir);
  const keep = (r: { verified: boolean }) => options.includeUnverified !== false || r.verified;
  const usesState = options.supportState !== false;
  const lib = loadBuiltinLibrary();
  const rows: ValidationRow[] = [];

  const compare = (row: ValidationRow, r: AnyRow, how: RowPrediction): void => {
    rows.push(compareRow(row, r, stateFor(r, usesState, lib), how, solve, options.scatter));
    options.onRow?.();
  };
  for (const r of gallery.barriers.filter(keep)) {
    const row = { ...rowHead('barrier', r), measured: r.value, ...(r.quantity === 'holeBarrier_eV' ? { quantity: r.quantity } : {}) };
    compare(row, r, { options: (st) => barrierOptions(r, model, st), observe: (res) => predictedBarrier_eV(res, r.quantity, r.technique) });
  }
  for (const r of gallery.charges.filter(keep)) {
    const row = { ...rowHead('charge', r), measured: r.value, measuredSign: r.sign, measuredRange: r.magnitudeRange };
    compare(row, r, { options: (st) => chargeOptions(r, model, st), observe: (res) => res.electronsPerParticle, signOf });
  }
  for (const r of gallery.bandBending.filter(keep)) {
    const row = { ...rowHead('bandBending', r), measured: measuredFinalBandBending_eV(r) };
    compare(row, r, {
      options: (st) => bandBendingOptions(r, model, st),
      observe: (res) => {
        const { x_m, bandBending_eV } = bandBendingProfile(res);
        return observedBandBending_eV(x_m, bandBending_eV, rowImfp_m(r), r.emissionAngle_deg);
      },
    });
  }
  const statistics = summarise(rows, model.barrierModel);
  if (options.scatter) statistics.scatter = summariseScatter(rows, options.scatter);
  return { rows, statistics };
}

/** Statistics of a set of compared rows (pure). */
export function summarise(rows: readonly ValidationRow[], model: GalleryModel): ValidationStatistics {
  const ok = (kind: ValidationRow['kind']) => rows.filter((r) => r.kind === kind && r.status === 'ok' && r.predicted !== null);
  const failed = (kind: ValidationRow['kind']) => rows.filter((r) => r.kind === kind && r.status === 'failed').length;
  const supportOf = (r: ValidationRow) => r.supportKey ?? r.support;
  const metalOf = (r: ValidationRow) => r.metalKey ?? r.metal;

  const barrierRows = ok('barrier');
  const paired = (rs: ValidationRow[]) =>
    pairMeans(rs.map((r) => ({ pair: `${metalOf(r)}|${supportOf(r)}${r.quantity === 'holeBarrier_eV' ? '|hole' : ''}`, predicted: r.predicted!, measured: r.measured! })));
  const pairs = paired(barrierRows);
  const oxides = new Set(barrierRows.map(supportOf));

  const chargeRows = ok('charge');
  const signItems = chargeRows.filter((r) => r.measuredSign !== undefined).map((r) => ({ predicted: r.predicted!, sign: r.measuredSign! }));
  const magItems = chargeRows.filter((r) => r.measuredRange).map((r) => ({ predicted: r.predicted!, range: r.measuredRange! }));
  const bbRows = ok('bandBending');

  const supportStates: Partial<Record<SupportStateMapping, number>> = {};
  for (const r of rows) if (r.status === 'ok' && r.supportState) supportStates[r.supportState.mapping] = (supportStates[r.supportState.mapping] ?? 0) + 1;

  return {
    model,
    supportStates,
    barrier: {
      rows: barrierRows.length,
      pairs: pairs.length,
      oxides: oxides.size,
      meanAbsoluteError_eV: meanAbsoluteError(pairs),
      rowMeanAbsoluteError_eV: meanAbsoluteError(barrierRows.map((r) => ({ predicted: r.predicted!, measured: r.measured! }))),
      verifiedMeanAbsoluteError_eV: meanAbsoluteError(paired(barrierRows.filter((r) => r.verified))),
      perOxide: Object.fromEntries(
        [...oxides].sort().map((ox) => {
          const p = paired(barrierRows.filter((r) => supportOf(r) === ox));
          return [ox, { pairs: p.length, meanAbsoluteError_eV: meanAbsoluteError(p) }];
        }),
      ),
      failed: failed('barrier'),
    },
    charge: {
      rows: chargeRows.length,
      signRows: signItems.filter((i) => i.sign !== 'mixed').length,
      signAgreement: signAgreement(signItems),
      magnitudeRows: magItems.length,
      withinFactor3: fractionWithinFactor(magItems),
      failed: failed('charge'),
    },
    bandBending: {
      rows: bbRows.length,
      meanAbsoluteError_eV: meanAbsoluteError(bbRows.map((r) => ({ predicted: r.predicted!, measured: r.measured! }))),
      failed: failed('bandBending'),
    },
  };
}

/** Scatter statistics of compared rows that carry a band (pure). */
export function summariseScatter(rows: readonly ValidationRow[], request: ScatterRequest): ScatterStatistics {
  const banded = (kind: ValidationRow['kind']) =>
    rows.filter((r): r is ValidationRow & { scatter: RowScatter } => r.kind === kind && r.status === 'ok' && r.scatter !== undefined);
  const withMeasured = (kind: ValidationRow['kind']) =>
    banded(kind)
      .filter((r) => r.measured !== null)
      .map((r) => ({ measured: r.measured!, p05: r.scatter.p05, p95: r.scatter.p95 }));
  const barriers = withMeasured('barrier');
  const charges = banded('charge');
  const signs = charges
    .filter((r) => r.measuredSign !== undefined && r.measuredSign !== 'mixed' && r.scatter.signProbability !== undefined)
    .map((r) => ({ probability: r.scatter.signProbability![r.measuredSign as Exclude<ChargeSign, 'mixed'>] }));
  const magnitudes = charges.filter((r) => r.measuredRange).map((r) => ({ range: r.measuredRange!, p05: r.scatter.p05, p95: r.scatter.p95 }));
  const bending = withMeasured('bandBending');
  return {
    samples: request.samples,
    seed: request.seed,
    barrierRows: barriers.length,
    barrierInsideBand: fractionInsideBand(barriers),
    barrierMeanBandWidth_eV: meanBandWidth(barriers),
    chargeSignRows: signs.length,
    chargeSignReached: fractionSignReached(signs),
    magnitudeRows: magnitudes.length,
    magnitudeReached: fractionMagnitudeReached(magnitudes),
    bandBendingRows: bending.length,
    bandBendingInsideBand: fractionInsideBand(bending),
    failedRows: rows.filter((r) => r.scatterFailure !== undefined).length,
  };
}

// ------------------------------------------------------------------------------------------ baseline

/** Models in the committed baseline (validation/baseline.json). */
export const BASELINE_MODELS: readonly GalleryModel[] = ['ideal', 'pinned', 'default'];

/** Tolerances of the baseline test: an error may grow by this much, a fraction may drop by this much. */
export const BASELINE_TOLERANCE = { error_eV: 0.01, fraction: 0.001 } as const;

export interface Baseline {
  $comment: string;
  statistics: Record<string, ValidationStatistics>;
}

/** Statistics of every baseline model with the current code and library (what validation/baseline.json holds). */
export function computeBaseline(solve?: SolveFunction): Baseline {
  const statistics: Record<string, ValidationStatistics> = {};
  for (const model of BASELINE_MODELS) statistics[model] = runValidation({ model, ...(solve ? { solve } : {}) }).statistics;
  return {
    $comment:
      'Validation statistics with library defaults, recomputed by test/validation.test.ts, which fails if they get worse. ' +
      'Regenerate after a deliberate change (node -e "import(\'./dist/validation/gallery.js\').then(m => m.writeBaseline())" after npm run build) and say why in the commit.',
    statistics,
  };
}

/** Write validation/baseline.json from the current code (deliberate use only). */
export function writeBaseline(dir: string = GALLERY_DIR): Baseline {
  const b = computeBaseline();
  writeFileSync(join(dir, 'baseline.json'), `${JSON.stringify(b, null, 1)}\n`, 'utf8');
  return b;
}

/**
 * Ways the current statistics are worse than the baseline (empty: not worse). A change in how many rows, pairs or
 * failures are compared is reported too: the numbers are then not comparable and the baseline must be regenerated.
 */
export function regressions(current: ValidationStatistics, base: ValidationStatistics, tol = BASELINE_TOLERANCE): string[] {
  const out: string[] = [];
  const m = current.model;
  const sameCount = (label: string, a: number, b: number) => {
    if (a !== b) out.push(`${m}: ${label} changed from ${b} to ${a}: regenerate validation/baseline.json and say why`);
  };
  sameCount('barrier rows', current.barrier.rows, base.barrier.rows);
  sameCount('barrier pairs', current.barrier.pairs, base.barrier.pairs);
  sameCount('charge rows', current.charge.rows, base.charge.rows);
  sameCount('band-bending rows', current.bandBending.rows, base.bandBending.rows);
  const worseError = (label: string, a: number | null, b: number | null) => {
    if (b !== null && (a === null || a > b + tol.error_eV)) out.push(`${m}: ${label} ${a} eV is worse than the baseline ${b} eV`);
  };
  const worseFraction = (label: string, a: number | null, b: number | null) => {
    if (b !== null && (a === null || a < b - tol.fraction)) out.push(`${m}: ${label} ${a} is worse than the baseline ${b}`);
  };
  worseError('barrier mean absolute error', current.barrier.meanAbsoluteError_eV, base.barrier.meanAbsoluteError_eV);
  worseError('verified-row barrier error', current.barrier.verifiedMeanAbsoluteError_eV, base.barrier.verifiedMeanAbsoluteError_eV);
  worseFraction('charge sign agreement', current.charge.signAgreement, base.charge.signAgreement);
  worseFraction('charge within a factor of 3', current.charge.withinFactor3, base.charge.withinFactor3);
  worseError('band-bending mean absolute error', current.bandBending.meanAbsoluteError_eV, base.bandBending.meanAbsoluteError_eV);
  return out;
}
