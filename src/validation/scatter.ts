// How far the literature scatter of the inputs moves each gallery prediction. A row's contact is re-solved with every
// input that has a published range drawn within it (the same sampling as --uncertainty, src/derived/uncertainty.ts),
// and the row's own observable (the barrier its technique sees, the particle's electrons, the band bending seen by
// photoemission) is taken from each sample. The band from the 5th to the 95th percentile says which measurements the
// model can reach with published inputs; a measurement outside it is a model or data error, not input scatter.
import { solveResolved } from '../contact.js';
import { resolveContact, type ContactOptions } from '../inputs/contactInput.js';
import { evaluateSamples, percentiles, samplingRanges } from '../derived/uncertainty.js';
import { ConvergenceError, isModelFailure, requireInRange } from '../errors.js';
import type { ContactResult } from '../types.js';

/**
 * A contact that has no value of the row's observable (a hole barrier measured, but the sample came out n-type):
 * a failed sample in the scatter, a failed row otherwise. A RangeError, so callers that test for one still match.
 */
export class ObservableMissing extends RangeError {
  constructor(message: string) {
    super(message);
    this.name = 'ObservableMissing';
  }
}

/** Probability below which a sign counts as out of the model's reach (the 5% tail of a 90% band). */
export const SCATTER_TAIL = 0.05;

/** Largest number of samples per row the command accepts. */
export const MAX_SCATTER_SAMPLES = 10000;

export interface ScatterRequest {
  /** samples per row, 1..MAX_SCATTER_SAMPLES */
  samples: number;
  /** base seed; each row mixes in its id so a row's band does not depend on the order of rows */
  seed: number;
}

export interface RowScatter {
  samples: number;
  /** samples outside the model (typed input or convergence failures), left out of the band and counted */
  failed: number;
  /** inputs varied (library ranges of the row's contact and the documented default ranges) */
  sampledInputs: string[];
  p05: number;
  p50: number;
  p95: number;
  /** fraction of the successful samples with each charge direction (charge rows only) */
  signProbability?: Record<'to-metal' | 'to-support' | 'none', number>;
}

/** FNV-1a hash of a string (common practice, no source): a row's seed offset. */
function hashText(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/** The seed of one row: the base seed mixed with the row id (deterministic, independent of row order). */
export function rowSeed(seed: number, id: string): number {
  return (seed ^ hashText(id)) >>> 0;
}

/**
 * Sample a row's observable. `options` are the row's contact options (as for solveContact), `observe` maps a contact
 * result to the number the row compares, `signOf` (charge rows) classifies each sampled value.
 * Throws ConvergenceError when every sample fails; a failed sample is counted, never replaced.
 */
export function rowScatter(
  options: Record<string, unknown> | ContactOptions,
  observe: (result: ContactResult) => number,
  request: ScatterRequest & { id: string },
  signOf?: (value: number) => 'to-metal' | 'to-support' | 'none',
): RowScatter {
  requireInRange('--scatter', request.samples, 1, MAX_SCATTER_SAMPLES, 'samples per row');
  requireInRange('--seed', request.seed, 0, 2 ** 32 - 1, '');
  const base = resolveContact(options as ContactOptions);
  const ranges = samplingRanges(base);
  const { values, failed } = evaluateSamples(
    base,
    request.samples,
    rowSeed(request.seed, request.id),
    (sampled, i) => {
      const value = observe(solveResolved(sampled));
      // the solver never returns a non-finite value (a bug if it did): surface it, never count it as a failed sample
      if (!Number.isFinite(value)) throw new Error(`scatter sample ${i} of row ${request.id}: the observable is ${value}`);
      return value;
    },
    // a sampled combination outside the model, or an observable the sample does not have (a hole barrier of a sample
    // that turned n-type), is a failed sample
    (error) => isModelFailure(error) || error instanceof ObservableMissing,
    ranges,
  );
  if (values.length === 0) throw new ConvergenceError(`every scatter sample of row ${request.id} failed`, request.samples);
  const counts = { 'to-metal': 0, 'to-support': 0, none: 0 };
  if (signOf) for (const v of values) counts[signOf(v)]++;
  const n = values.length;
  return {
    samples: request.samples,
    failed,
    sampledInputs: [...ranges.keys()],
    ...percentiles(values),
    ...(signOf ? { signProbability: { 'to-metal': counts['to-metal'] / n, 'to-support': counts['to-support'] / n, none: counts.none / n } } : {}),
  };
}

// ------------------------------------------------------------------------------------------ statistics (pure)

/** Fraction of items whose measured value lies inside [p05, p95] (ends included); null if none. */
export function fractionInsideBand(items: readonly { measured: number; p05: number; p95: number }[]): number | null {
  if (items.length === 0) return null;
  return items.filter((i) => i.measured >= i.p05 && i.measured <= i.p95).length / items.length;
}

/** Mean width p95 - p05 of the bands; null if none. */
export function meanBandWidth(items: readonly { p05: number; p95: number }[]): number | null {
  if (items.length === 0) return null;
  return items.reduce((s, i) => s + (i.p95 - i.p05), 0) / items.length;
}

/** Fraction of items whose measured sign was reached by at least SCATTER_TAIL of the samples; null if none. */
export function fractionSignReached(items: readonly { probability: number }[]): number | null {
  if (items.length === 0) return null;
  return items.filter((i) => i.probability >= SCATTER_TAIL).length / items.length;
}

/**
 * Fraction of items whose measured magnitude range [lo, hi] meets the band of |N|: the band of predicted electrons
 * [p05, p95] mapped to magnitudes (0 inside when the band crosses zero); null if none.
 */
export function fractionMagnitudeReached(items: readonly { range: readonly [number, number]; p05: number; p95: number }[]): number | null {
  if (items.length === 0) return null;
  const meets = (i: (typeof items)[number]): boolean => {
    const lo = Math.min(i.range[0], i.range[1]);
    const hi = Math.max(i.range[0], i.range[1]);
    const magLo = i.p05 <= 0 && i.p95 >= 0 ? 0 : Math.min(Math.abs(i.p05), Math.abs(i.p95));
    const magHi = Math.max(Math.abs(i.p05), Math.abs(i.p95));
    return magLo <= hi && magHi >= lo;
  };
  return items.filter(meets).length / items.length;
}
