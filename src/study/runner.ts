// Running a study: points -> solveContact -> rows on disk, in-process (jobs = 1) or on worker threads.
//
// Files in outDir:
//   results.csv    header: index, swept fields with units ("donors [cm^-3]"), outputs, error
//   results.jsonl  one JSON object per line with the same keys as the CSV header
//   study.json     the normalised study, its columns, formats, shard and the run summary
//                  (written at the start with status "running", rewritten at the end)
//   .bandbend-study.lock  while a run holds the folder (see outFiles.ts)
//
// Rows are written in point order (a small reorder buffer holds rows that finish early on other
// workers), each row as one unit: the CSV and JSONL lines are appended and, when a write fails
// (disk full, file size limit), both files are cut back to the last complete row and the run stops
// with a StudyWriteError. So the files always hold the first n points of the run, complete, in
// order, with no gaps: an interruption (AbortSignal) drops rows that finished after a gap, and
// `resume` continues at point n after checking every line on disk (a partial last line, e.g. after
// SIGKILL, is cut off). A failed point is a row with empty outputs and the message in `error`;
// resume keeps such rows (they are results).
//
// Workers (jobs > 1): `jobs` worker threads are started once per run and fed batches of points
// (fewer than MIN_POINTS_FOR_WORKERS points to compute: none, this thread is faster).
// While they load their modules the main thread evaluates points itself (warm start), so a small
// study never waits for worker start-up; once a worker is ready the main thread only dispatches and
// writes. A watchdog replaces a worker that has shown no sign of life for pointTimeout_s (workers
// send one at most once a second while a batch runs, and the rows at its end): the points of its
// batch become error rows and a fresh worker takes the next batch. (The main thread's
// warm-start points are not watched: a point that never returns there would hang the run, as with
// jobs = 1.) Test hook: BANDBEND_TEST_WORKER_HANG=<index,...> makes a worker thread (never the main
// thread) hang on those point indices; see worker.ts.
import { closeSync, existsSync, readFileSync, rmSync, statSync } from 'node:fs';
import { createFolder } from '../inputs/files.js';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import { stringify } from 'csv-stringify/sync';
import { InputError } from '../errors.js';
import type { ContactOptions } from '../inputs/contactInput.js';
import type { MaterialsLibrary } from '../materials/types.js';
import { countPoints, studyColumns, type OutputValue, type Study } from './studyFile.js';
import { expandOverrides, type PointOverrides, type SweptValue } from './sweep.js';
import {
  WORKER_KIND,
  evaluatePoint,
  libraryToEntries,
  resolveMaterials,
  type MainToWorker,
  type PointResult,
  type WorkerMaterials,
  type WorkerSetup,
  type WorkerToMain,
} from './worker.js';
import {
  acquireLock,
  appendLines,
  csvCellCount,
  csvIndex,
  openAppend,
  scanLines,
  shardPointIndex,
  shardSize,
  truncateFile,
  writeFileAtomic,
  type AppendFile,
  type LockInfo,
  type Shard,
} from './outFiles.js';

export { StudyWriteError, parseShard, type Shard } from './outFiles.js';

export type StudyFormat = 'csv' | 'json';

export const RESULT_FILES = { csv: 'results.csv', json: 'results.jsonl', study: 'study.json' } as const;

/** Points per worker message, at most. */
export const MAX_BATCH = 64;
/** Most worker threads accepted. */
export const MAX_JOBS = 256;
/** Default watchdog budget per point, seconds (a normal point takes milliseconds). */
export const DEFAULT_POINT_TIMEOUT_S = 300;
/**
 * Below this many points to compute, jobs > 1 still runs in this thread: starting a worker (loading
 * its modules) costs about as much as a few hundred points.
 */
export const MIN_POINTS_FOR_WORKERS = 200;

/** The CLI's default --jobs: the cores this process may use. */
export function defaultJobs(): number {
  return Math.max(1, Math.min(MAX_JOBS, availableParallelism()));
}

export interface RunStudyOptions {
  study: Study;
  outDir: string;
  /** 1 (default): in this thread; > 1: that many worker threads */
  jobs?: number;
  /** replace results.csv / results.jsonl / study.json of an earlier run in outDir */
  force?: boolean;
  /** continue the run whose rows are in outDir (a fresh start when there are none) */
  resume?: boolean;
  /** default both; on resume, default: those of the earlier run */
  formats?: readonly StudyFormat[];
  /** run only this slice of the points (see outFiles.ts) */
  shard?: Shard | null;
  /** called as rows are written: rows written so far, points in this run, rows written by this call */
  onProgress?: (done: number, total: number, added: number) => void;
  /** called once on resume, before any new point is solved */
  onResume?: (info: ResumeInfo) => void;
  /** abort = stop: no new points, running ones dropped, files closed, resolves with interrupted: true */
  signal?: AbortSignal;
  /** points per worker message (default: total / (4 jobs), between 1 and 64) */
  batchSize?: number;
  /** watchdog: seconds without a sign of life before a worker is replaced (default 300) */
  pointTimeout_s?: number;
  /** main thread evaluates points while the workers start (default true) */
  warmStart?: boolean;
  /** fewer points than this left to compute: no workers, this thread does them (default 200) */
  minPointsForWorkers?: number;
}

export interface ResumeInfo {
  /** rows found complete and kept (the first points of the run, skipped now) */
  kept: number;
  /** of which failed points */
  keptFailed: number;
  /** bytes of partial last lines cut off, per file */
  cut: { file: string; bytes: number }[];
  /** complete lines dropped (one file ahead of the other, or a line that did not check) */
  droppedLines: number;
  /** the stale lock of a run that died, taken over */
  staleLock: LockInfo | null;
}

export interface StudySummary {
  name: string;
  /** rows on disk for this run (including rows kept on resume) */
  points: number;
  /** points in this run (the shard's points when sharded) */
  total: number;
  /** points in the whole study */
  studyTotal: number;
  /** rows with an error */
  failed: number;
  interrupted: boolean;
  elapsed_s: number;
  jobs: number;
  shard: Shard | null;
  resumed: ResumeInfo | null;
  /** workers replaced by the watchdog */
  watchdogRestarts: number;
  csvPath: string | null;
  jsonlPath: string | null;
  studyPath: string;
}

/** One row of results. */
export interface StudyRow {
  index: number;
  swept: Record<string, SweptValue>;
  values: OutputValue[] | null;
  error: string | null;
}

/** A point of this run: its position in the run (seq) and in the study (index). */
type RunPoint = PointOverrides & { seq: number };

// ---------------------------------------------------------------------------------------------
// output folder and files

function checkJobs(jobs: number): number {
  if (!Number.isInteger(jobs) || jobs < 1 || jobs > MAX_JOBS) {
    throw new InputError('--jobs', `expected a whole number of worker threads, got ${String(jobs)}`, `1 to ${MAX_JOBS}`);
  }
  return jobs;
}

/** Validated, de-duplicated formats: at least one of csv, json. */
export function checkFormats(formats: readonly string[]): StudyFormat[] {
  const out: StudyFormat[] = [];
  for (const f of formats) {
    if (f !== 'csv' && f !== 'json') throw new InputError('--format', `unknown format "${String(f)}"`, 'csv, json');
    if (!out.includes(f)) out.push(f);
  }
  if (out.length === 0) throw new InputError('--format', 'no result format given', 'csv, json or csv,json');
  return out;
}

function ourFiles(outDir: string): string[] {
  return Object.values(RESULT_FILES)
    .map((f) => join(outDir, f))
    .filter((p) => existsSync(p));
}

/** Create outDir, or clear our files in it when force; refuse an earlier run's results otherwise. */
export function prepareOutDir(outDir: string, force: boolean): void {
  if (existsSync(outDir)) {
    if (!statSync(outDir).isDirectory()) throw new InputError('--out', 'exists and is not a folder');
    const ours = ourFiles(outDir);
    if (ours.length === 0) return;
    if (!force) throw new InputError('--out', 'folder exists; use --force to overwrite or --resume to continue');
    for (const p of ours) rmSync(p, { force: true });
    return;
  }
  createFolder(outDir, '--out'); // bounded, one level at a time; bad paths exit 2 (src/inputs/files.ts)
}

function csvCell(v: OutputValue): string {
  if (v === null) return '';
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  return String(v);
}

/** The cells of a row in column order. */
export function rowCells(study: Study, row: StudyRow): OutputValue[] {
  const outputs = row.values ?? study.outputs.map(() => null);
  return [row.index, ...study.sweep.axes.map((a) => row.swept[a.field] ?? null), ...outputs, row.error];
}

/** The CSV line of a row (with its newline). */
export function csvLine(study: Study, row: StudyRow): string {
  return stringify([rowCells(study, row).map(csvCell)]);
}

/** The JSONL line of a row (with its newline). */
export function jsonLine(study: Study, row: StudyRow, columns = studyColumns(study)): string {
  const cells = rowCells(study, row);
  return JSON.stringify(Object.fromEntries(columns.map((c, i) => [c, cells[i]]))) + '\n';
}

interface ResultFiles {
  write(row: StudyRow, rowsOnDisk: number): void;
  close(): void;
}

function openResultFiles(study: Study, paths: { csv: string | null; json: string | null }, append: boolean): ResultFiles {
  const columns = studyColumns(study);
  const csv = paths.csv !== null ? openAppend(paths.csv, !append) : null;
  const json = paths.json !== null ? openAppend(paths.json, !append) : null;
  const files = [csv, json].filter((f): f is AppendFile => f !== null);
  if (csv !== null && csv.size === 0) appendLines([csv], [Buffer.from(stringify([columns]), 'utf8')], 0);
  return {
    write(row, rowsOnDisk) {
      const lines: Buffer[] = [];
      if (csv !== null) lines.push(Buffer.from(csvLine(study, row), 'utf8'));
      if (json !== null) lines.push(Buffer.from(jsonLine(study, row, columns), 'utf8'));
      appendLines(files, lines, rowsOnDisk);
    },
    close() {
      for (const f of files) closeQuietly(f.fd);
    },
  };
}

function closeQuietly(fd: number): void {
  try {
    closeSync(fd);
  } catch {
    // already closed
  }
}

interface OrderedWriter {
  /** a finished point; rows are written in seq order */
  push(seq: number, row: StudyRow): void;
  /** next seq to be written */
  readonly next: number;
  readonly written: number;
  readonly failed: number;
}

function createOrderedWriter(
  files: ResultFiles,
  start: { seq: number; failed: number },
  onRows: (written: number, added: number) => void,
): OrderedWriter {
  const pending = new Map<number, StudyRow>();
  let next = start.seq;
  let failed = start.failed;
  return {
    push(seq, row) {
      pending.set(seq, row);
      const before = next;
      for (let r = pending.get(next); r !== undefined; r = pending.get(next)) {
        files.write(r, next);
        pending.delete(next);
        if (r.error !== null) failed++;
        next++;
      }
      if (next > before) onRows(next, next - before);
    },
    get next() {
      return next;
    },
    get written() {
      return next;
    },
    get failed() {
      return failed;
    },
  };
}

// ---------------------------------------------------------------------------------------------
// resume: check the rows on disk

interface StudyRecord {
  study: unknown;
  columns: string[];
  formats?: StudyFormat[];
  shard?: Shard | null;
  status?: string;
  summary: StudySummary | null;
}

/** The study as written to study.json (an in-memory materials library is not written out). */
function studyRecord(study: Study): unknown {
  const m = study.base.materials;
  const base = m === undefined || Array.isArray(m) ? study.base : { ...study.base, materials: '(in-memory library)' };
  return JSON.parse(JSON.stringify({ ...study, base })) as unknown;
}

export function readStudyRecord(path: string, field = '--out'): StudyRecord {
  try {
    return JSON.parse(readFileSync(path, 'utf8')) as StudyRecord;
  } catch (err) {
    throw new InputError(field, `cannot read ${path}: ${(err as Error).message.replace(/\s+/g, ' ')}`);
  }
}

function sameShard(a: Shard | null | undefined, b: Shard | null): boolean {
  return (a ?? null) === null ? b === null : b !== null && a!.index === b.index && a!.count === b.count;
}

/** Check every line of the earlier run's files, cut them back to the rows complete in all of them. */
function inspectForResume(
  study: Study,
  outDir: string,
  formats: readonly StudyFormat[],
  shard: Shard | null,
  runTotal: number,
): { kept: number; keptFailed: number; cut: ResumeInfo['cut']; droppedLines: number } {
  const columns = studyColumns(study);
  const header = stringify([columns]).slice(0, -1);
  const failedSeqs: number[] = [];
  const counts: { path: string; rows: number; ends: number[]; header: boolean; partial: number }[] = [];
  if (formats.includes('csv')) {
    const path = join(outDir, RESULT_FILES.csv);
    const csvFailed: number[] = [];
    const scan = existsSync(path)
      ? scanLines(path, (line, n) => {
          if (n === 0) return line === header;
          const seq = n - 1;
          if (seq >= runTotal || csvIndex(line) !== shardPointIndex(seq, shard) || csvCellCount(line) !== columns.length) return false;
          if (!line.endsWith(',')) csvFailed.push(seq); // the error cell is the last one
          return true;
        })
      : { ends: [], partialBytes: 0, size: 0 };
    counts.push({ path, rows: Math.max(0, scan.ends.length - 1), ends: scan.ends, header: true, partial: scan.size - (scan.ends.at(-1) ?? 0) });
    if (!formats.includes('json')) failedSeqs.push(...csvFailed);
  }
  if (formats.includes('json')) {
    const path = join(outDir, RESULT_FILES.json);
    const scan = existsSync(path)
      ? scanLines(path, (line, seq) => {
          if (seq >= runTotal) return false;
          let o: Record<string, unknown>;
          try {
            o = JSON.parse(line) as Record<string, unknown>;
          } catch {
            return false;
          }
          if (o === null || typeof o !== 'object' || o['index'] !== shardPointIndex(seq, shard) || Object.keys(o).length !== columns.length) return false;
          if (o['error'] !== null) failedSeqs.push(seq);
          return true;
        })
      : { ends: [], partialBytes: 0, size: 0 };
    counts.push({ path, rows: scan.ends.length, ends: scan.ends, header: false, partial: scan.size - (scan.ends.at(-1) ?? 0) });
  }
  const kept = Math.min(...counts.map((c) => c.rows));
  const cut: ResumeInfo['cut'] = [];
  let droppedLines = 0;
  for (const c of counts) {
    const keepLines = c.header ? (c.ends.length === 0 ? 0 : kept + 1) : kept;
    const length = keepLines === 0 ? 0 : c.ends[keepLines - 1]!;
    droppedLines += c.ends.length - keepLines;
    if (c.partial > 0) cut.push({ file: c.path, bytes: c.partial });
    if (existsSync(c.path) && statSync(c.path).size !== length) truncateFile(c.path, length);
  }
  return { kept, keptFailed: failedSeqs.filter((s) => s < kept).length, cut, droppedLines };
}

// ---------------------------------------------------------------------------------------------
// the points of this run

function* runPoints(study: Study, shard: Shard | null, skip: number): Generator<RunPoint> {
  let seq = 0;
  for (const p of expandOverrides(study.sweep)) {
    if (shard !== null && p.index % shard.count !== shard.index - 1) continue;
    if (seq >= skip) yield { ...p, seq };
    seq++;
  }
}

// ---------------------------------------------------------------------------------------------
// in this thread

const yieldToEventLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));

interface RunContext {
  study: Study;
  points: Iterator<RunPoint>;
  writer: OrderedWriter;
  library: MaterialsLibrary;
  signal: AbortSignal | undefined;
}

function evaluateHere(ctx: RunContext, p: RunPoint): void {
  const options: ContactOptions = { ...ctx.study.base, ...p.overrides, materials: ctx.library };
  const r = evaluatePoint(options, ctx.study.outputs, p.index);
  ctx.writer.push(p.seq, { index: p.index, swept: p.swept, values: r.values, error: r.error });
}

/** Returns true when interrupted. */
async function runInProcess(ctx: RunContext): Promise<boolean> {
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

// ---------------------------------------------------------------------------------------------
// on worker threads

/** The library already loaded and checked here, as plain entries: workers need not read and validate the files again. */
function workerMaterials(library: MaterialsLibrary): WorkerMaterials {
  return { entries: libraryToEntries(library) };
}

interface PoolOptions {
  jobs: number;
  batchSize: number;
  workerUrl: URL;
  pointTimeout_ms: number;
  warmStart: boolean;
}

/** Returns interrupted and the number of watchdog restarts. */
function runInWorkers(ctx: RunContext, pool: PoolOptions): Promise<{ interrupted: boolean; watchdogRestarts: number }> {
  const { study, writer, signal } = ctx;
  const { materials: _files, ...base } = study.base;
  const setup: WorkerSetup = { kind: WORKER_KIND, base, materials: workerMaterials(ctx.library), outputs: [...study.outputs] };
  // rows may finish out of order; dispatch at most this far ahead of the next row to write
  const window = Math.max(1024, pool.batchSize * pool.jobs * 16);
  const maxRestarts = pool.jobs * 2;

  return new Promise((resolve, reject) => {
    const workers = new Set<Worker>();
    const idle: Worker[] = [];
    const inFlight = new Map<Worker, { batch: RunPoint[]; since: number }>();
    let taken = 0; // points taken from the iterator (seq of the next one, relative)
    let firstSeq = -1;
    let exhausted = false;
    let stopped = false;
    let restarts = 0;
    let watchdogRestarts = 0;
    let batchId = 0;
    let anyReady = false;
    let localBusy = false;

    const finish = (interrupted: boolean): void => stop(() => resolve({ interrupted, watchdogRestarts }));
    const fail = (err: unknown): void => stop(() => reject(err instanceof Error ? err : new Error(String(err))));
    const stop = (outcome: () => void): void => {
      if (stopped) return;
      stopped = true;
      clearInterval(watchdog);
      signal?.removeEventListener('abort', onAbort);
      void Promise.allSettled([...workers].map((w) => w.terminate())).then(outcome);
    };
    const onAbort = (): void => finish(true);

    const nextBatch = (size: number): RunPoint[] => {
      const batch: RunPoint[] = [];
      while (batch.length < size && !exhausted) {
        const it = ctx.points.next();
        if (it.done === true) {
          exhausted = true;
          break;
        }
        if (firstSeq < 0) firstSeq = it.value.seq;
        batch.push(it.value);
      }
      taken += batch.length;
      return batch;
    };
    const aheadOfWriter = (): number => (firstSeq < 0 ? 0 : firstSeq + taken - writer.next);

    const push = (p: RunPoint, values: OutputValue[] | null, error: string | null): boolean => {
      try {
        writer.push(p.seq, { index: p.index, swept: p.swept, values, error });
        return true;
      } catch (err) {
        fail(err);
        return false;
      }
    };

    const checkDone = (): void => {
      if (!stopped && exhausted && inFlight.size === 0 && !localBusy) finish(false);
    };

    const pump = (): void => {
      if (stopped) return;
      while (idle.length > 0 && !exhausted && aheadOfWriter() < window) {
        const batch = nextBatch(pool.batchSize);
        if (batch.length === 0) break;
        const w = idle.pop()!;
        inFlight.set(w, { batch, since: performance.now() });
        const msg: MainToWorker = { type: 'batch', id: batchId++, points: batch.map((p) => ({ index: p.index, overrides: p.overrides })) };
        w.postMessage(msg);
      }
      checkDone();
    };

    const onRows = (w: Worker, rows: PointResult[]): void => {
      const job = inFlight.get(w);
      inFlight.delete(w);
      if (job === undefined) return;
      const byIndex = new Map(rows.map((r) => [r.index, r]));
      for (const p of job.batch) {
        const r = byIndex.get(p.index);
        if (!push(p, r?.values ?? null, r ? r.error : 'worker returned no result')) return;
      }
      idle.push(w);
      pump();
    };

    const drop = (w: Worker): RunPoint[] => {
      workers.delete(w);
      const job = inFlight.get(w);
      inFlight.delete(w);
      const i = idle.indexOf(w);
      if (i >= 0) idle.splice(i, 1);
      return job?.batch ?? [];
    };

    const onWorkerLost = (w: Worker, reason: string): void => {
      if (stopped || !workers.has(w)) return;
      for (const p of drop(w)) if (!push(p, null, `worker failed: ${reason}`)) return;
      if (restarts >= maxRestarts) {
        fail(new Error(`study workers keep failing (last: ${reason})`));
        return;
      }
      restarts++;
      spawn();
      pump();
    };

    // the watchdog: a worker silent for longer than its batch's budget is replaced
    const watchdog = setInterval(
      () => {
        if (stopped) return;
        const now = performance.now();
        for (const [w, job] of [...inFlight]) {
          // since = dispatch or the last sign of life (sent at most once a second): one point's budget
          const budget = pool.pointTimeout_ms + (job.batch.length > 1 ? 1000 : 0);
          if (now - job.since <= budget) continue;
          const lost = drop(w);
          void w.terminate();
          watchdogRestarts++;
          const message = `no answer from the worker within ${(budget / 1000).toPrecision(3)} s (watchdog: worker replaced)`;
          for (const p of lost) if (!push(p, null, message)) return;
          spawn();
        }
        pump();
      },
      Math.max(20, Math.min(1000, pool.pointTimeout_ms / 4)),
    );
    watchdog.unref();

    const spawn = (): void => {
      const w = new Worker(pool.workerUrl, { workerData: setup });
      workers.add(w);
      w.on('message', (msg: WorkerToMain) => {
        if (stopped || !workers.has(w)) return;
        if (msg.type === 'ready') {
          anyReady = true;
          idle.push(w);
          pump();
        } else if (msg.type === 'alive') {
          const job = inFlight.get(w);
          if (job !== undefined) job.since = performance.now();
        } else if (msg.type === 'rows') {
          onRows(w, msg.rows);
        } else if (msg.type === 'init-error') {
          fail(new InputError('materials', msg.message));
        }
      });
      w.on('error', (err) => onWorkerLost(w, err.message.replace(/\s+/g, ' ')));
      w.on('exit', (code) => onWorkerLost(w, `exited with code ${code}`));
    };

    // warm start: evaluate here until the first worker is ready
    const warm = async (): Promise<void> => {
      localBusy = true;
      try {
        while (!anyReady && !stopped && !exhausted && aheadOfWriter() < window) {
          const batch = nextBatch(4);
          for (const p of batch) {
            if (stopped) return;
            evaluateHere(ctx, p);
          }
          await yieldToEventLoop();
        }
      } catch (err) {
        fail(err);
        return;
      } finally {
        localBusy = false;
      }
      pump();
    };

    if (signal?.aborted) {
      finish(true);
      return;
    }
    signal?.addEventListener('abort', onAbort, { once: true });
    for (let i = 0; i < pool.jobs; i++) spawn();
    if (pool.warmStart) void warm();
  });
}

// ---------------------------------------------------------------------------------------------

function defaultBatchSize(total: number, jobs: number): number {
  return Math.max(1, Math.min(MAX_BATCH, Math.ceil(total / (jobs * 4))));
}

/** Run every point of a study (or of one shard) and write the results to outDir (see the file comment). */
export async function runStudy(options: RunStudyOptions): Promise<StudySummary> {
  const started = performance.now();
  const { study, outDir, signal, onProgress } = options;
  const jobs = checkJobs(options.jobs ?? 1);
  const resume = options.resume === true;
  if (resume && options.force === true) throw new InputError('--resume', 'cannot be combined with --force (which deletes the rows to resume from)');
  const requestedFormats = options.formats === undefined ? null : checkFormats(options.formats);
  const shard = options.shard ?? null;
  const studyTotal = countPoints(study.sweep);
  const total = shardSize(studyTotal, shard);
  const batchSize = options.batchSize ?? defaultBatchSize(total, jobs);
  if (!Number.isInteger(batchSize) || batchSize < 1) throw new InputError('batchSize', `expected a whole number >= 1, got ${batchSize}`);
  const pointTimeout_s = options.pointTimeout_s ?? DEFAULT_POINT_TIMEOUT_S;
  if (!(pointTimeout_s > 0 && pointTimeout_s <= 1e6)) throw new InputError('--point-timeout', `expected seconds > 0, got ${pointTimeout_s}`, '0.001 to 1e6 s');
  // fail fast on a materials problem (the same files are then read by every worker)
  const library = resolveMaterials(study.base.materials);

  if (existsSync(outDir) && !statSync(outDir).isDirectory()) throw new InputError('--out', 'exists and is not a folder');
  createFolder(outDir, '--out'); // bounded, one level at a time; bad paths exit 2 (src/inputs/files.ts)
  const lock = acquireLock(outDir);
  const studyPath = join(outDir, RESULT_FILES.study);
  let files: ResultFiles | null = null;
  try {
    // what is on disk
    let formats: StudyFormat[] = requestedFormats ?? ['csv', 'json'];
    let resumed: ResumeInfo | null = null;
    let start = { seq: 0, failed: 0 };
    const earlier = ourFiles(outDir);
    if (resume && earlier.length > 0) {
      if (!existsSync(studyPath)) throw new InputError('--resume', `${outDir} has results but no ${RESULT_FILES.study}: cannot check what they belong to`);
      const record = readStudyRecord(studyPath, '--resume');
      if (JSON.stringify(record.study) !== JSON.stringify(studyRecord(study))) {
        throw new InputError('--resume', `the study in ${studyPath} differs from this study file; use another --out or --force to start over`);
      }
      if (!sameShard(record.shard, shard)) {
        const was = record.shard ? `${record.shard.index}/${record.shard.count}` : 'none';
        throw new InputError('--shard', `the earlier run in ${outDir} used shard ${was}`);
      }
      const earlierFormats = record.formats ?? formats;
      if (requestedFormats !== null && requestedFormats.slice().sort().join() !== earlierFormats.slice().sort().join()) {
        throw new InputError('--format', `the earlier run wrote ${earlierFormats.join(',')}; resume with the same formats`);
      }
      formats = [...earlierFormats];
      const found = inspectForResume(study, outDir, formats, shard, total);
      resumed = { ...found, staleLock: lock.replaced };
      start = { seq: found.kept, failed: found.keptFailed };
    } else {
      prepareOutDir(outDir, options.force === true);
      if (resume) resumed = { kept: 0, keptFailed: 0, cut: [], droppedLines: 0, staleLock: lock.replaced };
    }
    if (resumed !== null) options.onResume?.(resumed);

    const csvPath = formats.includes('csv') ? join(outDir, RESULT_FILES.csv) : null;
    const jsonlPath = formats.includes('json') ? join(outDir, RESULT_FILES.json) : null;
    const columns = studyColumns(study);
    const writeRecord = (status: string, summary: StudySummary | null): void => {
      const record = { study: studyRecord(study), columns, formats, shard, status, summary, updatedAt: new Date().toISOString() };
      writeFileAtomic(studyPath, JSON.stringify(record, null, 2) + '\n');
    };
    writeRecord('running', null);
    files = openResultFiles(study, { csv: csvPath, json: jsonlPath }, resumed !== null && start.seq > 0);
    const writer = createOrderedWriter(files, start, (written, added) => onProgress?.(written, total, added));
    if (start.seq > 0) onProgress?.(start.seq, total, start.seq);
    const ctx: RunContext = { study, points: runPoints(study, shard, start.seq), writer, library, signal };
    const remaining = total - start.seq;
    const workers = Math.max(1, Math.min(jobs, Math.ceil(remaining / batchSize)));
    let interrupted: boolean;
    let watchdogRestarts = 0;
    if (jobs === 1 || remaining === 0 || remaining < (options.minPointsForWorkers ?? MIN_POINTS_FOR_WORKERS)) {
      interrupted = remaining === 0 ? false : await runInProcess(ctx);
    } else {
      const r = await runInWorkers(ctx, {
        jobs: workers,
        batchSize,
        workerUrl: new URL('./worker.js', import.meta.url),
        pointTimeout_ms: pointTimeout_s * 1000,
        warmStart: options.warmStart ?? true,
      });
      interrupted = r.interrupted;
      watchdogRestarts = r.watchdogRestarts;
    }
    files.close();
    files = null;
    const summary: StudySummary = {
      name: study.name,
      points: writer.written,
      total,
      studyTotal,
      failed: writer.failed,
      interrupted: interrupted && writer.written < total,
      elapsed_s: (performance.now() - started) / 1000,
      jobs,
      shard,
      resumed,
      watchdogRestarts,
      csvPath,
      jsonlPath,
      studyPath,
    };
    writeRecord(summary.interrupted ? 'interrupted' : 'finished', summary);
    return summary;
  } finally {
    files?.close();
    lock.release();
  }
}
