// The points of one run (all of the study, or one shard's, from the first not yet on disk) and their
// evaluation in this thread (jobs = 1, few points, and the warm start of the worker pool).
import type { ContactOptions } from '../inputs/contactInput.js';
import type { MaterialsLibrary } from '../materials/types.js';
import type { Study } from './studyFile.js';
import { expandOverrides, type PointOverrides } from './sweep.js';
import type { Shard } from './outFiles.js';
import type { OrderedWriter } from './rows.js';
import { evaluatePoint } from './worker.js';

/** A point of this run: its position in the run (seq) and in the study (index). */
export type RunPoint = PointOverrides & { seq: number };

/** What evaluating the points of a run needs. */
export interface RunContext {
  study: Study;
  points: Iterator<RunPoint>;
  writer: OrderedWriter;
  library: MaterialsLibrary;
  signal: AbortSignal | undefined;
}

/** The points of the study (or of the shard) in index order, from the skip-th on. */
export function* runPoints(study: Study, shard: Shard | null, skip: number): Generator<RunPoint> {
  let seq = 0;
  for (const p of expandOverrides(study.sweep)) {
    if (shard !== null && p.index % shard.count !== shard.index - 1) continue;
    if (seq >= skip) yield { ...p, seq };
    seq++;
  }
}

export const yieldToEventLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));

/** Solve one point in this thread and hand its row to the writer. */
export function evaluateHere(ctx: RunContext, p: RunPoint): void {
  const options: ContactOptions = { ...ctx.study.base, ...p.overrides, materials: ctx.library };
  const r = evaluatePoint(options, ctx.study.outputs, p.index);
  ctx.writer.push(p.seq, { index: p.index, swept: p.swept, values: r.values, error: r.error });
}

/** Every remaining point in this thread. Returns true when interrupted. */
export async function runInProcess(ctx: RunContext): Promise<boolean> {
  let lastYield = performance.now();
  for (let it = ctx.points.next(); it.done !== true; it = ctx.points.next()) {
    if (ctx.signal?.aborted) return true;
    evaluateHere(ctx, it.value);
    // let the event loop run (abort signal, progress output) every ~20 ms
    if (performance.now() - lastYield > 20) {
      await yieldToEventLoop();
      lastYield = performance.now();
    }
  }
  return ctx.signal?.aborted ?? false;
}
