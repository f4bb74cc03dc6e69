// Monte Carlo propagation of literature scatter: each material input with a published range is sampled
// (uniformly, or log-uniformly for densities), the contact is re-solved, and the spread of results reported.
import type { ResolvedContact } from '../inputs/contactInput.js';
import { rowOfSample, type SampledField } from '../inputs/parameters.js';
import type { ContactResult, FlowDirection, Percentiles, UncertaintySummary } from '../types.js';
import { ConvergenceError, isModelFailure, requireInRange } from '../errors.js';
import { neutralLevelRange_eV } from '../interface/interfaceStates.js';

/** mulberry32: small, fast, seedable PRNG (common practice, no source); deterministic for a seed. */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Percentile by linear interpolation between order statistics (type 7, the common default). */
export function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const position = (sorted.length - 1) * p;
  const low = Math.floor(position);
  const high = Math.min(low + 1, sorted.length - 1);
  return sorted[low]! + (position - low) * (sorted[high]! - sorted[low]!);
}

/** 5th, 50th and 95th percentiles of the values (type 7); the input is not modified. */
export function percentiles(values: readonly number[]): Percentiles {
  const sorted = [...values].sort((a, b) => a - b);
  return { p05: percentile(sorted, 0.05), p50: percentile(sorted, 0.5), p95: percentile(sorted, 0.95) };
}

/**
 * Published ranges of inputs that have no library range of their own, used when the contact took their default:
 * - interfacial layer thickness (interface-state model): 0.25 to 0.5 nm, from the decay length of metal-induced gap
 *   states, a few tenths of a nm (Louie, Chelikowsky & Cohen, Phys. Rev. B 15, 2154 (1977); from memory, verify), to
 *   the 0.5 nm of Cowley & Sze (1965);
 * - interfacial layer permittivity: 1 (vacuum-like gap, Cowley & Sze 1965) to the support's optical permittivity
 *   (the interface permittivity in Mönch's MIGS slope 1/S - 1 = q^2 D delta / (eps0 eps_i); from memory, verify);
 * - size coefficient of the particle's work function (hemisphere, array): the metal's library min/max (3/8 to 1/2,
 *   Seidl & Perdew, Phys. Rev. B 50, 5744 (1994)), recorded in the input provenance.
 * With the layer and the slope S sampled, the density of interface states D = (1/S - 1) eps_i eps0 / (q^2 delta)
 * varies too; a density given by the user is exact and not sampled.
 */
export const DEFAULT_LAYER_THICKNESS_RANGE_M: readonly [number, number] = [0.25e-9, 0.5e-9];

function defaultOrigin(base: ResolvedContact, label: string): boolean {
  return base.inputs.some((i) => i.field === label && i.origin === 'default');
}

/** Every range --uncertainty samples for this contact: the library ranges of the table rows, then the defaults'. */
export function samplingRanges(base: ResolvedContact): Map<SampledField, [number, number]> {
  const ranges = new Map(base.ranges);
  if (base.barrierModel === 'interface-states') {
    if (defaultOrigin(base, 'interfacial layer thickness')) ranges.set('interfaceLayerThickness_m', [...DEFAULT_LAYER_THICKNESS_RANGE_M]);
    const epsInf = base.support.opticalPermittivity;
    if (defaultOrigin(base, 'interfacial layer permittivity') && epsInf > 1) ranges.set('interfaceLayerPermittivity', [1, epsInf]);
  }
  const size = base.inputs.find((i) => i.field === 'size coefficient of the work function');
  if (base.geometry !== 'planar' && size?.min !== undefined && size.max !== undefined && size.max > size.min) {
    ranges.set('sizeWorkFunctionCoefficient', [size.min, size.max]);
  }
  return ranges;
}

/** One sampled copy of the resolved inputs: each ranged input drawn by its table row's sampling rule (else uniform). */
export function sampleInputs(base: ResolvedContact, random: () => number, ranges = samplingRanges(base)): ResolvedContact {
  const metal: Record<string, unknown> = { ...base.metal };
  const support: Record<string, unknown> = { ...base.support };
  for (const [field, [min, max]] of ranges) {
    const u = random();
    const logScale = rowOfSample(field)?.sampling === 'log-uniform' && min > 0;
    const value = logScale ? Math.exp(Math.log(min) + u * (Math.log(max) - Math.log(min))) : min + u * (max - min);
    if (field in metal) metal[field] = value;
    else support[field] = value;
  }
  // a sampled charge-neutrality level beyond the range the interface-state model accepts for the sampled gap (up to
  // 2 eV above E_C) is taken at that limit
  const gap = support['bandGap_eV'] as number;
  const level = support['neutralLevelAboveValence_eV'] as number | undefined;
  if (level !== undefined) support['neutralLevelAboveValence_eV'] = Math.min(level, neutralLevelRange_eV(gap)[1]);
  return { ...base, metal: metal as unknown as ResolvedContact['metal'], support: support as unknown as ResolvedContact['support'] };
}

/**
 * Draw `samples` sampled copies of `base` (seeded by `seed`, each ranged input by its table row's rule) and evaluate
 * each with `evaluate(sampled, index)`. A sample whose evaluation throws an error `isFailure` accepts (by default a
 * model failure: an input combination outside the model) is counted in `failed`, never replaced; anything else is a
 * bug and surfaces. Serves --uncertainty (propagateUncertainty) and the gallery's scatter bands.
 */
export function evaluateSamples<T>(
  base: ResolvedContact,
  samples: number,
  seed: number,
  evaluate: (sampled: ResolvedContact, index: number) => T,
  isFailure: (error: unknown) => boolean = isModelFailure,
  ranges: Map<SampledField, [number, number]> = samplingRanges(base),
): { values: T[]; failed: number } {
  const random = seededRandom(seed);
  const values: T[] = [];
  let failed = 0;
  for (let i = 0; i < samples; i++) {
    const sampled = sampleInputs(base, random, ranges);
    try {
      values.push(evaluate(sampled, i));
    } catch (error) {
      if (!isFailure(error)) throw error;
      failed++;
    }
  }
  return { values, failed };
}

/**
 * Sample `samples` contacts and summarise. A sample that fails (e.g. an input combination outside the model)
 * is counted in `failed` and left out of the statistics, never silently replaced.
 */
export function propagateUncertainty(
  base: ResolvedContact,
  solve: (r: ResolvedContact) => ContactResult,
  samples: number,
  seed: number,
): UncertaintySummary {
  requireInRange('--uncertainty', samples, 1, 100000, 'samples');
  requireInRange('--seed', seed, 0, 2 ** 32 - 1, '');
  const ranges = samplingRanges(base);
  // only the summarised numbers of each sample are kept (a whole result carries its profile)
  const { values, failed } = evaluateSamples(
    base,
    samples,
    seed,
    (sampled) => {
      const r = solve(sampled);
      return { direction: r.direction, barrier: r.barrierHeight_eV, bending: r.bandBending_eV, electrons: r.electronsPerParticle };
    },
    isModelFailure,
    ranges,
  );
  const ok = values.length;
  if (ok === 0) throw new ConvergenceError('every uncertainty sample failed', samples);
  const counts: Record<FlowDirection, number> = { 'support-to-metal': 0, 'metal-to-support': 0, none: 0 };
  for (const v of values) counts[v.direction]++;
  const probability = (k: FlowDirection): number => counts[k] / ok;
  return {
    samples,
    seed,
    failed,
    sampledInputs: [...ranges.keys()],
    directionProbability: {
      'support-to-metal': probability('support-to-metal'),
      'metal-to-support': probability('metal-to-support'),
      none: probability('none'),
    },
    barrierHeight_eV: percentiles(values.map((v) => v.barrier)),
    bandBending_eV: percentiles(values.map((v) => v.bending)),
    electronsPerParticle: percentiles(values.map((v) => v.electrons)),
  };
}
