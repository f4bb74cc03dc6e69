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
//
// Modules: this file checks the options and runs the steps; rows.ts writes rows in order, resume.ts
// checks an earlier run, studyRecord.ts reads and writes study.json, runPoints.ts evaluates points in
// this thread, workerPool.ts on worker threads, outFiles.ts holds the lock, line scans and shards.
import { existsSync, rmSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { InputError } from '../errors.js';
import { createFolder } from '../inputs/files.js';
import type { MaterialsLibrary } from '../materials/types.js';
import { countPoints, studyColumns, type Study } from './studyFile.js';
import { resolveMaterials } from './worker.js';
import { createOrderedWriter, openResultFiles, type OrderedWriter, type ResultFiles } from './rows.js';
import { checkEarlierRun, inspectForResume, type ResumeInfo } from './resume.js';
import { studyRecord, writeStudyRecord } from './studyRecord.js';
import { runInProcess, runPoints, type RunContext } from './runPoints.js';
import { runInWorkers, type PoolOutcome } from './workerPool.js';
import { RESULT_FILES, acquireLock, resultPaths, shardSize, type HeldLock, type ResultPaths, type Shard, type StudyFormat } from './outFiles.js';

export { StudyWriteError, parseShard, RESULT_FILES, type Shard, type StudyFormat } from './outFiles.js';
export { csvLine, jsonLine, rowCells, type StudyRow } from './rows.js';
export { readStudyRecord } from './studyRecord.js';
export type { ResumeInfo } from './resume.js';

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

// ---------------------------------------------------------------------------------------------
// options and the output folder

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

/** Create outDir when missing (InputError('--out') when it cannot be a folder of results) and take its lock. */
export function lockOutDir(outDir: string): HeldLock {
  createFolder(outDir, '--out');
  return acquireLock(outDir);
}

/** Clear the result files of an earlier run in outDir when force; refuse them otherwise. */
export function clearEarlierResults(outDir: string, force: boolean): void {
  const ours = ourFiles(outDir);
  if (ours.length === 0) return;
  if (!force) throw new InputError('--out', 'folder exists; use --force to overwrite or --resume to continue');
  for (const p of ours) rmSync(p, { force: true });
}

// ---------------------------------------------------------------------------------------------
// one run

function defaultBatchSize(total: number, jobs: number): number {
  return Math.max(1, Math.min(MAX_BATCH, Math.ceil(total / (jobs * 4))));
}

/** The options of a run, checked, and what follows from them. */
interface RunPlan {
  study: Study;
  outDir: string;
  jobs: number;
  resume: boolean;
  force: boolean;
  /** null: not given (both, or on resume those of the earlier run) */
  requestedFormats: StudyFormat[] | null;
  shard: Shard | null;
  studyTotal: number;
  /** points in this run */
  total: number;
  batchSize: number;
  pointTimeout_s: number;
  warmStart: boolean;
  minPointsForWorkers: number;
  library: MaterialsLibrary;
}

/** Check the options (InputError naming the flag) and load the materials once. */
function planRun(options: RunStudyOptions): RunPlan {
  const jobs = checkJobs(options.jobs ?? 1);
  const resume = options.resume === true;
  if (resume && options.force === true) throw new InputError('--resume', 'cannot be combined with --force (which deletes the rows to resume from)');
  const requestedFormats = options.formats === undefined ? null : checkFormats(options.formats);
  const shard = options.shard ?? null;
  const studyTotal = countPoints(options.study.sweep);
  const total = shardSize(studyTotal, shard);
  const batchSize = options.batchSize ?? defaultBatchSize(total, jobs);
  if (!Number.isInteger(batchSize) || batchSize < 1) throw new InputError('batchSize', `expected a whole number >= 1, got ${batchSize}`);
  const pointTimeout_s = options.pointTimeout_s ?? DEFAULT_POINT_TIMEOUT_S;
  if (!(pointTimeout_s > 0 && pointTimeout_s <= 1e6)) throw new InputError('--point-timeout', `expected seconds > 0, got ${pointTimeout_s}`, '0.001 to 1e6 s');
  // fail fast on a materials problem (the same library is then handed to every worker)
  const library = resolveMaterials(options.study.base.materials);
  return {
    study: options.study,
    outDir: options.outDir,
    jobs,
    resume,
    force: options.force === true,
    requestedFormats,
    shard,
    studyTotal,
    total,
    batchSize,
    pointTimeout_s,
    warmStart: options.warmStart ?? true,
    minPointsForWorkers: options.minPointsForWorkers ?? MIN_POINTS_FOR_WORKERS,
    library,
  };
}

/** Where a run starts: its formats, what resume found, and the first point to compute. */
interface RunStart {
  formats: StudyFormat[];
  resumed: ResumeInfo | null;
  start: { seq: number; failed: number };
}

/** Keep the earlier run's complete rows (resume) or clear the folder for a fresh start. */
function startRun(plan: RunPlan, lock: HeldLock): RunStart {
  if (plan.resume && ourFiles(plan.outDir).length > 0) {
    const formats = checkEarlierRun(plan.study, plan.outDir, plan.shard, plan.requestedFormats);
    const found = inspectForResume(plan.study, plan.outDir, formats, plan.shard, plan.total);
    return { formats, resumed: { ...found, staleLock: lock.replaced }, start: { seq: found.kept, failed: found.keptFailed } };
  }
  clearEarlierResults(plan.outDir, plan.force);
  const resumed = plan.resume ? { kept: 0, keptFailed: 0, cut: [], droppedLines: 0, staleLock: lock.replaced } : null;
  return { formats: plan.requestedFormats ?? ['csv', 'json'], resumed, start: { seq: 0, failed: 0 } };
}

/** Compute the remaining points: in this thread when there are few (or jobs = 1), else on worker threads. */
async function computePoints(ctx: RunContext, plan: RunPlan, remaining: number): Promise<PoolOutcome> {
  if (plan.jobs === 1 || remaining === 0 || remaining < plan.minPointsForWorkers) {
    return { interrupted: remaining === 0 ? false : await runInProcess(ctx), watchdogRestarts: 0 };
  }
  return runInWorkers(ctx, {
    jobs: Math.max(1, Math.min(plan.jobs, Math.ceil(remaining / plan.batchSize))),
    batchSize: plan.batchSize,
    // '../study/': the same file from this module and from the CLI bundle's chunk in dist/bundle/ (src/cli/bundle.ts)
    workerUrl: new URL('../study/worker.js', import.meta.url),
    pointTimeout_ms: plan.pointTimeout_s * 1000,
    warmStart: plan.warmStart,
  });
}

function runSummary(plan: RunPlan, begin: RunStart, writer: OrderedWriter, outcome: PoolOutcome, paths: ResultPaths, started: number): StudySummary {
  return {
    name: plan.study.name,
    points: writer.written,
    total: plan.total,
    studyTotal: plan.studyTotal,
    failed: writer.failed,
    interrupted: outcome.interrupted && writer.written < plan.total,
    elapsed_s: (performance.now() - started) / 1000,
    jobs: plan.jobs,
    shard: plan.shard,
    resumed: begin.resumed,
    watchdogRestarts: outcome.watchdogRestarts,
    ...paths,
  };
}

/** Run every point of a study (or of one shard) and write the results to outDir (see the file comment). */
export async function runStudy(options: RunStudyOptions): Promise<StudySummary> {
  const started = performance.now();
  const plan = planRun(options);
  const { study, total } = plan;
  const lock = lockOutDir(plan.outDir);
  let files: ResultFiles | null = null;
  try {
    const begin = startRun(plan, lock);
    if (begin.resumed !== null) options.onResume?.(begin.resumed);
    const paths = resultPaths(plan.outDir, begin.formats);
    const columns = studyColumns(study);
    const writeRecord = (status: string, summary: StudySummary | null): void =>
      writeStudyRecord(paths.studyPath, { study: studyRecord(study), columns, formats: begin.formats, shard: plan.shard, status, summary });
    writeRecord('running', null);
    files = openResultFiles(study, { csv: paths.csvPath, json: paths.jsonlPath }, begin.resumed !== null && begin.start.seq > 0);
    const writer = createOrderedWriter(files, begin.start, (written, added) => options.onProgress?.(written, total, added));
    if (begin.start.seq > 0) options.onProgress?.(begin.start.seq, total, begin.start.seq);
    const points = runPoints(study, plan.shard, begin.start.seq);
    const outcome = await computePoints({ study, points, writer, library: plan.library, signal: options.signal }, plan, total - begin.start.seq);
    files.close();
    files = null;
    const summary = runSummary(plan, begin, writer, outcome, paths, started);
    writeRecord(summary.interrupted ? 'interrupted' : 'finished', summary);
    return summary;
  } finally {
    files?.close();
    lock.release();
  }
}
