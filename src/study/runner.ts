// Running a study: points -> solveContact -> rows on disk, in-process (jobs = 1) or on worker threads.
//
// Files in outDir:
//   results.csv    header: index, swept fields with units ("donors [cm^-3]"), outputs, error
//   results.jsonl  one JSON object per line with the same keys as the CSV header
//   study.json     the normalised study, its columns and the run summary (written at the end)
// Rows are written in index order (a small reorder buffer holds rows that finish early on other
// workers), each as one write of one complete line, so the files hold only complete rows at any time.
// A failed point is a row with empty outputs and the message in `error`. After an interruption
// (AbortSignal), rows already finished are written and points still running are dropped, so an
// interrupted file can have gaps: the `index` column tells which points are present.
import { closeSync, existsSync, mkdirSync, openSync, rmSync, statSync, writeFileSync, writeSync } from 'node:fs';
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

export type StudyFormat = 'csv' | 'json';

export const RESULT_FILES = { csv: 'results.csv', json: 'results.jsonl', study: 'study.json' } as const;

/** Points per worker message, at most. */
export const MAX_BATCH = 64;
/** Most worker threads accepted. */
export const MAX_JOBS = 256;

export interface RunStudyOptions {
  study: Study;
  outDir: string;
  /** 1 (default): in this thread; > 1: that many worker threads */
  jobs?: number;
  /** replace results.csv / results.jsonl / study.json of an earlier run in outDir */
  force?: boolean;
  /** default both */
  formats?: readonly StudyFormat[];
  /** called as rows are written: rows written so far, points in the study, rows written by this call */
  onProgress?: (done: number, total: number, added: number) => void;
  /** abort = stop: no new points, running ones dropped, files closed, resolves with interrupted: true */
  signal?: AbortSignal;
  /** points per worker message (default: total / (4 jobs), between 1 and 64) */
  batchSize?: number;
}

export interface StudySummary {
  name: string;
  /** rows written */
  points: number;
  /** points in the study */
  total: number;
  /** rows with an error */
  failed: number;
  interrupted: boolean;
  elapsed_s: number;
  jobs: number;
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

// ---------------------------------------------------------------------------------------------
// output folder and files

function checkJobs(jobs: number): number {
  if (!Number.isInteger(jobs) || jobs < 1 || jobs > MAX_JOBS) {
    throw new InputError('--jobs', `expected a whole number of worker threads, got ${String(jobs)}`, `1 to ${MAX_JOBS}`);
  }
  return jobs;
}

/** Create outDir, or clear our files in it when force; refuse an earlier run's results otherwise. */
export function prepareOutDir(outDir: string, force: boolean): void {
  if (existsSync(outDir)) {
    if (!statSync(outDir).isDirectory()) throw new InputError('--out', 'exists and is not a folder');
    const ours = Object.values(RESULT_FILES).map((f) => join(outDir, f)).filter((p) => existsSync(p));
    if (ours.length === 0) return;
    if (!force) throw new InputError('--out', 'folder exists; use --force to overwrite');
    for (const p of ours) rmSync(p, { force: true });
    return;
  }
  mkdirSync(outDir, { recursive: true });
}

function writeLine(fd: number, line: string): void {
  const bytes = Buffer.from(line, 'utf8');
  // one call writes the whole line on a regular file; the loop only guards against a short write
  let offset = 0;
  while (offset < bytes.length) offset += writeSync(fd, bytes, offset);
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

interface ResultFiles {
  write(row: StudyRow): void;
  close(): void;
}

function openResultFiles(study: Study, paths: { csv: string | null; json: string | null }): ResultFiles {
  const columns = studyColumns(study);
  const csv = paths.csv !== null ? openSync(paths.csv, 'w') : null;
  const json = paths.json !== null ? openSync(paths.json, 'w') : null;
  if (csv !== null) writeLine(csv, stringify([columns]));
  return {
    write(row) {
      const cells = rowCells(study, row);
      if (csv !== null) writeLine(csv, stringify([cells.map(csvCell)]));
      if (json !== null) writeLine(json, JSON.stringify(Object.fromEntries(columns.map((c, i) => [c, cells[i]]))) + '\n');
    },
    close() {
      if (csv !== null) closeSync(csv);
      if (json !== null) closeSync(json);
    },
  };
}

interface OrderedWriter {
  push(row: StudyRow): void;
  /** write what is still buffered (after an interruption: rows after a gap), in index order */
  flush(): void;
  /** next index to be written in order */
  readonly next: number;
  readonly written: number;
  readonly failed: number;
}

function createOrderedWriter(files: ResultFiles, onRows: (written: number, added: number) => void): OrderedWriter {
  const pending = new Map<number, StudyRow>();
  let next = 0;
  let written = 0;
  let failed = 0;
  const emit = (row: StudyRow): void => {
    files.write(row);
    written++;
    if (row.error !== null) failed++;
  };
  return {
    push(row) {
      pending.set(row.index, row);
      const before = written;
      for (let r = pending.get(next); r !== undefined; r = pending.get(next)) {
        pending.delete(next);
        emit(r);
        next++;
      }
      if (written > before) onRows(written, written - before);
    },
    flush() {
      const rest = [...pending.values()].sort((a, b) => a.index - b.index);
      pending.clear();
      rest.forEach(emit);
      if (rest.length > 0) onRows(written, rest.length);
    },
    get next() {
      return next;
    },
    get written() {
      return written;
    },
    get failed() {
      return failed;
    },
  };
}

// ---------------------------------------------------------------------------------------------
// in this thread

const yieldToEventLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));

interface RunContext {
  study: Study;
  total: number;
  writer: OrderedWriter;
  library: MaterialsLibrary;
  signal: AbortSignal | undefined;
}

/** Returns true when interrupted. */
async function runInProcess(ctx: RunContext): Promise<boolean> {
  const { study, writer, library, signal } = ctx;
  let lastYield = performance.now();
  for (const p of expandOverrides(study.sweep)) {
    if (signal?.aborted) return true;
    const options: ContactOptions = { ...study.base, ...p.overrides, materials: library };
    const r = evaluatePoint(options, study.outputs, p.index);
    writer.push({ index: p.index, swept: p.swept, values: r.values, error: r.error });
    // let the event loop run (abort signal, progress output) every ~20 ms
    if (performance.now() - lastYield > 20) {
      await yieldToEventLoop();
      lastYield = performance.now();
    }
  }
  return signal?.aborted ?? false;
}

// ---------------------------------------------------------------------------------------------
// on worker threads

function workerMaterials(materials: ContactOptions['materials']): WorkerMaterials {
  if (materials === undefined) return { files: [] };
  return Array.isArray(materials) ? { files: [...materials] } : { entries: libraryToEntries(materials) };
}

interface PoolOptions {
  jobs: number;
  batchSize: number;
  workerUrl: URL;
}

/** Returns true when interrupted. */
function runInWorkers(ctx: RunContext, pool: PoolOptions): Promise<boolean> {
  const { study, writer, signal } = ctx;
  const { materials, ...base } = study.base;
  const setup: WorkerSetup = { kind: WORKER_KIND, base, materials: workerMaterials(materials), outputs: [...study.outputs] };
  const points = expandOverrides(study.sweep);
  // rows may finish out of order; dispatch at most this far ahead of the next row to write
  const window = Math.max(1024, pool.batchSize * pool.jobs * 16);
  const maxRestarts = pool.jobs * 2;

  return new Promise<boolean>((resolve, reject) => {
    const workers = new Set<Worker>();
    const idle: Worker[] = [];
    const inFlight = new Map<Worker, PointOverrides[]>();
    let dispatched = 0;
    let exhausted = false;
    let stopped = false;
    let restarts = 0;
    let batchId = 0;

    const stop = (outcome: () => void): void => {
      if (stopped) return;
      stopped = true;
      signal?.removeEventListener('abort', onAbort);
      void Promise.allSettled([...workers].map((w) => w.terminate())).then(outcome);
    };
    const onAbort = (): void => stop(() => resolve(true));

    const nextBatch = (): PointOverrides[] => {
      const batch: PointOverrides[] = [];
      while (batch.length < pool.batchSize) {
        const it = points.next();
        if (it.done === true) {
          exhausted = true;
          break;
        }
        batch.push(it.value);
      }
      return batch;
    };

    const pump = (): void => {
      if (stopped) return;
      while (idle.length > 0 && !exhausted && dispatched - writer.next < window) {
        const batch = nextBatch();
        if (batch.length === 0) break;
        const w = idle.pop()!;
        inFlight.set(w, batch);
        dispatched += batch.length;
        const msg: MainToWorker = { type: 'batch', id: batchId++, points: batch.map((p) => ({ index: p.index, overrides: p.overrides })) };
        w.postMessage(msg);
      }
      if (exhausted && inFlight.size === 0) stop(() => resolve(false));
    };

    const onRows = (w: Worker, rows: PointResult[]): void => {
      const batch = inFlight.get(w);
      inFlight.delete(w);
      if (batch === undefined) return;
      const byIndex = new Map(rows.map((r) => [r.index, r]));
      for (const p of batch) {
        const r = byIndex.get(p.index);
        writer.push({ index: p.index, swept: p.swept, values: r?.values ?? null, error: r ? r.error : 'worker returned no result' });
      }
      idle.push(w);
      pump();
    };

    const onWorkerLost = (w: Worker, reason: string): void => {
      if (stopped || !workers.has(w)) return;
      workers.delete(w);
      const batch = inFlight.get(w);
      inFlight.delete(w);
      const i = idle.indexOf(w);
      if (i >= 0) idle.splice(i, 1);
      for (const p of batch ?? []) writer.push({ index: p.index, swept: p.swept, values: null, error: `worker failed: ${reason}` });
      if (restarts >= maxRestarts) {
        stop(() => reject(new Error(`study workers keep failing (last: ${reason})`)));
        return;
      }
      restarts++;
      spawn();
      pump();
    };

    const spawn = (): void => {
      const w = new Worker(pool.workerUrl, { workerData: setup });
      workers.add(w);
      w.on('message', (msg: WorkerToMain) => {
        if (stopped) return;
        if (msg.type === 'ready') {
          idle.push(w);
          pump();
        } else if (msg.type === 'rows') {
          onRows(w, msg.rows);
        } else if (msg.type === 'init-error') {
          stop(() => reject(new InputError('materials', msg.message)));
        }
      });
      w.on('error', (err) => onWorkerLost(w, err.message.replace(/\s+/g, ' ')));
      w.on('exit', (code) => onWorkerLost(w, `exited with code ${code}`));
    };

    if (signal?.aborted) {
      resolve(true);
      return;
    }
    signal?.addEventListener('abort', onAbort, { once: true });
    for (let i = 0; i < pool.jobs; i++) spawn();
  });
}

// ---------------------------------------------------------------------------------------------

function defaultBatchSize(total: number, jobs: number): number {
  return Math.max(1, Math.min(MAX_BATCH, Math.ceil(total / (jobs * 4))));
}

/** The study as written to study.json (an in-memory materials library is not written out). */
function studyRecord(study: Study): unknown {
  const m = study.base.materials;
  const base = m === undefined || Array.isArray(m) ? study.base : { ...study.base, materials: '(in-memory library)' };
  return { ...study, base };
}

/** Run every point of a study and write the results to outDir (see the file comment for the files). */
export async function runStudy(options: RunStudyOptions): Promise<StudySummary> {
  const started = performance.now();
  const { study, outDir, signal, onProgress } = options;
  const jobs = checkJobs(options.jobs ?? 1);
  const formats = new Set<StudyFormat>(options.formats ?? ['csv', 'json']);
  for (const f of formats) {
    if (f !== 'csv' && f !== 'json') throw new InputError('--format', `unknown format "${String(f)}"`, 'csv, json');
  }
  const total = countPoints(study.sweep);
  const batchSize = options.batchSize ?? defaultBatchSize(total, jobs);
  if (!Number.isInteger(batchSize) || batchSize < 1) throw new InputError('batchSize', `expected a whole number >= 1, got ${batchSize}`);
  // fail fast on a materials problem (the same files are then read by every worker)
  const library = resolveMaterials(study.base.materials);
  prepareOutDir(outDir, options.force ?? false);

  const csvPath = formats.has('csv') ? join(outDir, RESULT_FILES.csv) : null;
  const jsonlPath = formats.has('json') ? join(outDir, RESULT_FILES.json) : null;
  const studyPath = join(outDir, RESULT_FILES.study);
  const files = openResultFiles(study, { csv: csvPath, json: jsonlPath });
  const writer = createOrderedWriter(files, (written, added) => onProgress?.(written, total, added));
  const ctx: RunContext = { study, total, writer, library, signal };
  const workers = Math.min(jobs, Math.ceil(total / batchSize));
  let interrupted: boolean;
  try {
    interrupted =
      jobs === 1 ? await runInProcess(ctx) : await runInWorkers(ctx, { jobs: workers, batchSize, workerUrl: new URL('./worker.js', import.meta.url) });
    writer.flush();
  } finally {
    files.close();
  }
  const summary: StudySummary = {
    name: study.name,
    points: writer.written,
    total,
    failed: writer.failed,
    interrupted,
    elapsed_s: (performance.now() - started) / 1000,
    jobs,
    csvPath,
    jsonlPath,
    studyPath,
  };
  const record = { study: studyRecord(study), columns: studyColumns(study), summary, finishedAt: new Date().toISOString() };
  writeFileSync(studyPath, JSON.stringify(record, null, 2) + '\n');
  return summary;
}
