// The points of a run on worker threads (runStudy with jobs > 1; the design is in the file comment of
// runner.ts): a feed of point batches that stays within a window of the writer, the pool of workers
// (start, dispatch, rows back, replacement of a lost worker), the watchdog, and the warm start.
import { Worker } from 'node:worker_threads';
import { InputError } from '../errors.js';
import type { OutputValue } from './studyFile.js';
import type { OrderedWriter } from './rows.js';
import { evaluateHere, yieldToEventLoop, type RunContext, type RunPoint } from './runPoints.js';
import { WORKER_KIND, libraryToEntries, type MainToWorker, type PointResult, type WorkerSetup, type WorkerToMain } from './worker.js';

export interface PoolOptions {
  jobs: number;
  batchSize: number;
  workerUrl: URL;
  pointTimeout_ms: number;
  warmStart: boolean;
}

export interface PoolOutcome {
  interrupted: boolean;
  /** workers replaced by the watchdog */
  watchdogRestarts: number;
}

/** Points handed out in batches, never further ahead of the next row to write than `window` points. */
class PointFeed {
  private taken = 0; // points taken from the iterator
  private firstSeq = -1;
  exhausted = false;

  constructor(
    private readonly points: Iterator<RunPoint>,
    private readonly writer: OrderedWriter,
    private readonly window: number,
  ) {}

  /** more points may be taken now */
  get open(): boolean {
    const ahead = this.firstSeq < 0 ? 0 : this.firstSeq + this.taken - this.writer.next;
    return !this.exhausted && ahead < this.window;
  }

  /** up to `size` points (fewer at the end) */
  take(size: number): RunPoint[] {
    const batch: RunPoint[] = [];
    while (batch.length < size && !this.exhausted) {
      const it = this.points.next();
      if (it.done === true) {
        this.exhausted = true;
        break;
      }
      if (this.firstSeq < 0) this.firstSeq = it.value.seq;
      batch.push(it.value);
    }
    this.taken += batch.length;
    return batch;
  }
}

/** A batch on a worker, and when the worker last showed a sign of life (or got the batch). */
interface InFlight {
  batch: RunPoint[];
  since: number;
}

/** The watchdog's budget for a batch: one point's, plus the second between a worker's signs of life. */
export function watchdogBudget_ms(pointTimeout_ms: number, batchLength: number): number {
  return pointTimeout_ms + (batchLength > 1 ? 1000 : 0);
}

function watchdogMessage(budget_ms: number): string {
  return `no answer from the worker within ${(budget_ms / 1000).toPrecision(3)} s (watchdog: worker replaced)`;
}

/** The setup every worker starts from: the base options, the library already loaded here, the outputs. */
function workerSetup(ctx: RunContext): WorkerSetup {
  const { materials: _files, ...base } = ctx.study.base;
  return { kind: WORKER_KIND, base, materials: { entries: libraryToEntries(ctx.library) }, outputs: [...ctx.study.outputs] };
}

/** The rows of a batch, in batch order; a point the worker left out becomes an error row. */
function batchRows(batch: readonly RunPoint[], rows: readonly PointResult[]): { p: RunPoint; values: OutputValue[] | null; error: string | null }[] {
  const byIndex = new Map(rows.map((r) => [r.index, r]));
  return batch.map((p) => {
    const r = byIndex.get(p.index);
    return { p, values: r?.values ?? null, error: r ? r.error : 'worker returned no result' };
  });
}

/** One run on worker threads: settles once, with the outcome or the first error. */
class WorkerRun {
  private readonly workers = new Set<Worker>();
  private readonly idle: Worker[] = [];
  private readonly inFlight = new Map<Worker, InFlight>();
  private readonly feed: PointFeed;
  private readonly setup: WorkerSetup;
  private readonly maxRestarts: number;
  private watchdog: NodeJS.Timeout | null = null;
  private stopped = false;
  private restarts = 0;
  private watchdogRestarts = 0;
  private batchId = 0;
  private anyReady = false;
  private localBusy = false;

  constructor(
    private readonly ctx: RunContext,
    private readonly pool: PoolOptions,
    private readonly settle: { resolve: (o: PoolOutcome) => void; reject: (err: Error) => void },
  ) {
    this.setup = workerSetup(ctx);
    // rows may finish out of order; dispatch at most this far ahead of the next row to write
    this.feed = new PointFeed(ctx.points, ctx.writer, Math.max(1024, pool.batchSize * pool.jobs * 16));
    this.maxRestarts = pool.jobs * 2;
  }

  start(): void {
    if (this.ctx.signal?.aborted) {
      this.finish(true);
      return;
    }
    this.ctx.signal?.addEventListener('abort', this.onAbort, { once: true });
    this.watchdog = setInterval(() => this.checkWatchdog(), Math.max(20, Math.min(1000, this.pool.pointTimeout_ms / 4)));
    this.watchdog.unref();
    for (let i = 0; i < this.pool.jobs; i++) this.spawn();
    if (this.pool.warmStart) void this.warm();
  }

  // --- ending the run

  private readonly onAbort = (): void => this.finish(true);

  private finish(interrupted: boolean): void {
    this.stop(() => this.settle.resolve({ interrupted, watchdogRestarts: this.watchdogRestarts }));
  }

  private fail(err: unknown): void {
    this.stop(() => this.settle.reject(err instanceof Error ? err : new Error(String(err))));
  }

  /** No more dispatch or rows; terminate every worker, then settle. */
  private stop(outcome: () => void): void {
    if (this.stopped) return;
    this.stopped = true;
    if (this.watchdog !== null) clearInterval(this.watchdog);
    this.ctx.signal?.removeEventListener('abort', this.onAbort);
    void Promise.allSettled([...this.workers].map((w) => w.terminate())).then(outcome);
  }

  private checkDone(): void {
    if (!this.stopped && this.feed.exhausted && this.inFlight.size === 0 && !this.localBusy) this.finish(false);
  }

  /** Hand a row to the writer; false (and the run failed) when writing failed. */
  private push(p: RunPoint, values: OutputValue[] | null, error: string | null): boolean {
    try {
      this.ctx.writer.push(p.seq, { index: p.index, swept: p.swept, values, error });
      return true;
    } catch (err) {
      this.fail(err);
      return false;
    }
  }

  /** Error rows for the points of a lost batch; false when writing failed. */
  private pushErrors(points: readonly RunPoint[], error: string): boolean {
    for (const p of points) if (!this.push(p, null, error)) return false;
    return true;
  }

  // --- the pool

  private spawn(): void {
    const w = new Worker(this.pool.workerUrl, { workerData: this.setup });
    this.workers.add(w);
    w.on('message', (msg: WorkerToMain) => this.onMessage(w, msg));
    w.on('error', (err) => this.onWorkerLost(w, err.message.replace(/\s+/g, ' ')));
    w.on('exit', (code) => this.onWorkerLost(w, `exited with code ${code}`));
  }

  private onMessage(w: Worker, msg: WorkerToMain): void {
    if (this.stopped || !this.workers.has(w)) return;
    if (msg.type === 'ready') {
      this.anyReady = true;
      this.idle.push(w);
      this.pump();
    } else if (msg.type === 'alive') {
      const job = this.inFlight.get(w);
      if (job !== undefined) job.since = performance.now();
    } else if (msg.type === 'rows') {
      this.onRows(w, msg.rows);
    } else if (msg.type === 'init-error') {
      this.fail(new InputError('materials', msg.message));
    }
  }

  /** Give every idle worker a batch while the feed is open. */
  private pump(): void {
    if (this.stopped) return;
    while (this.idle.length > 0 && this.feed.open) {
      const batch = this.feed.take(this.pool.batchSize);
      if (batch.length === 0) break;
      const w = this.idle.pop()!;
      this.inFlight.set(w, { batch, since: performance.now() });
      const msg: MainToWorker = { type: 'batch', id: this.batchId++, points: batch.map((p) => ({ index: p.index, overrides: p.overrides })) };
      w.postMessage(msg);
    }
    this.checkDone();
  }

  private onRows(w: Worker, rows: PointResult[]): void {
    const job = this.inFlight.get(w);
    this.inFlight.delete(w);
    if (job === undefined) return;
    for (const r of batchRows(job.batch, rows)) if (!this.push(r.p, r.values, r.error)) return;
    this.idle.push(w);
    this.pump();
  }

  /** Forget a worker; returns the batch it held. */
  private drop(w: Worker): RunPoint[] {
    this.workers.delete(w);
    const job = this.inFlight.get(w);
    this.inFlight.delete(w);
    const i = this.idle.indexOf(w);
    if (i >= 0) this.idle.splice(i, 1);
    return job?.batch ?? [];
  }

  /** A worker died: its batch becomes error rows and a fresh worker starts (up to 2 jobs times). */
  private onWorkerLost(w: Worker, reason: string): void {
    if (this.stopped || !this.workers.has(w)) return;
    if (!this.pushErrors(this.drop(w), `worker failed: ${reason}`)) return;
    if (this.restarts >= this.maxRestarts) {
      this.fail(new Error(`study workers keep failing (last: ${reason})`));
      return;
    }
    this.restarts++;
    this.spawn();
    this.pump();
  }

  // --- the watchdog: a worker silent for longer than its batch's budget is replaced

  private checkWatchdog(): void {
    if (this.stopped) return;
    const now = performance.now();
    for (const [w, job] of [...this.inFlight]) {
      // since = dispatch or the last sign of life (sent at most once a second)
      const budget = watchdogBudget_ms(this.pool.pointTimeout_ms, job.batch.length);
      if (now - job.since <= budget) continue;
      const lost = this.drop(w);
      void w.terminate();
      this.watchdogRestarts++;
      if (!this.pushErrors(lost, watchdogMessage(budget))) return;
      this.spawn();
    }
    this.pump();
  }

  // --- warm start: evaluate here until the first worker is ready

  private async warm(): Promise<void> {
    this.localBusy = true;
    try {
      while (!this.anyReady && !this.stopped && this.feed.open) {
        for (const p of this.feed.take(4)) {
          if (this.stopped) return;
          evaluateHere(this.ctx, p);
        }
        await yieldToEventLoop();
      }
    } catch (err) {
      this.fail(err);
      return;
    } finally {
      this.localBusy = false;
    }
    this.pump();
  }
}

/** Run the remaining points of ctx on `pool.jobs` worker threads. */
export function runInWorkers(ctx: RunContext, pool: PoolOptions): Promise<PoolOutcome> {
  return new Promise((resolve, reject) => new WorkerRun(ctx, pool, { resolve, reject }).start());
}
