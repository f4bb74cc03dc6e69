// One study point = one solveContact call reduced to the requested outputs; and the worker-thread
// side of `runStudy` with jobs > 1 (compiled to dist/study/worker.js). A worker is started once per
// run, loads the materials library once and then answers batches until it is terminated.
//
// Protocol (structured-clone messages, no Maps):
//   workerData: WorkerSetup (base options without materials, materials file list or library entries, outputs)
//   worker -> main  { type: 'ready' } | { type: 'init-error', message }
//   main -> worker  { type: 'batch', id, points: [{ index, overrides }] }
//   worker -> main  { type: 'alive', id } at most once a second while a batch runs (for the watchdog)
//   worker -> main  { type: 'rows', id, rows: [{ index, values, error }] }
import { isMainThread, parentPort, workerData, type MessagePort } from 'node:worker_threads';
import { solveContact } from '../contact.js';
import { ConvergenceError, InputError } from '../errors.js';
import type { ContactOptions } from '../inputs/contactInput.js';
import { loadLibrary, resolveLibrary } from '../materials/load.js';
import type { CslItem, MaterialsLibrary, MetalRecord, SupportRecord } from '../materials/types.js';
import { readOutput, type OutputValue } from './studyFile.js';

export const WORKER_KIND = 'bandbend-study-worker';

/** A materials library as plain arrays, for postMessage. */
export interface LibraryEntries {
  metals: [string, MetalRecord][];
  supports: [string, SupportRecord][];
  references: [string, CslItem][];
}

export type WorkerMaterials = { files: string[] } | { entries: LibraryEntries };

export interface WorkerSetup {
  kind: typeof WORKER_KIND;
  base: ContactOptions;
  materials: WorkerMaterials;
  outputs: string[];
}

export interface PointResult {
  index: number;
  /** the requested outputs in order, or null when the point failed */
  values: OutputValue[] | null;
  error: string | null;
}

export type MainToWorker = { type: 'batch'; id: number; points: { index: number; overrides: Partial<ContactOptions> }[] };
export type WorkerToMain =
  | { type: 'ready' }
  | { type: 'init-error'; message: string }
  | { type: 'alive'; id: number }
  | { type: 'rows'; id: number; rows: PointResult[] };

export function libraryToEntries(lib: MaterialsLibrary): LibraryEntries {
  return { metals: [...lib.metals], supports: [...lib.supports], references: [...lib.references] };
}

export function libraryFromEntries(e: LibraryEntries): MaterialsLibrary {
  return { metals: new Map(e.metals), supports: new Map(e.supports), references: new Map(e.references) };
}

/** What goes in the materials field of every point: a loaded library (files are read once). */
export function resolveMaterials(materials: ContactOptions['materials']): MaterialsLibrary {
  return resolveLibrary(materials);
}

/** One-line message of a failed point. */
export function errorMessage(err: unknown): string {
  const text = err instanceof InputError || err instanceof ConvergenceError ? err.message : err instanceof Error ? `${err.name}: ${err.message}` : String(err);
  return text.replace(/\s+/g, ' ').trim() || 'unknown error';
}

/** Solve one point and keep only the requested outputs; any error becomes the row's error. */
export function evaluatePoint(options: ContactOptions, outputs: readonly string[], index: number): PointResult {
  try {
    const result = solveContact(options);
    return { index, values: outputs.map((o) => readOutput(result, o)), error: null };
  } catch (err) {
    return { index, values: null, error: errorMessage(err) };
  }
}

function setupMaterials(m: WorkerMaterials): MaterialsLibrary {
  return 'files' in m ? loadLibrary(m.files) : libraryFromEntries(m.entries);
}

/**
 * Test hook (for the watchdog test only): BANDBEND_TEST_WORKER_HANG=3,17 makes a worker thread stop
 * answering when it reaches point index 3 or 17. Read in worker threads only, never in the main thread.
 */
export const HANG_ENV = 'BANDBEND_TEST_WORKER_HANG';

function hangIndices(): Set<number> {
  const text = process.env[HANG_ENV];
  if (text === undefined || text.trim() === '') return new Set();
  return new Set(text.split(',').map((s) => Number(s.trim())).filter((n) => Number.isInteger(n)));
}

/** Block this thread for good, in short waits so that Worker.terminate() can still stop it. */
function hangForever(): never {
  const cell = new Int32Array(new SharedArrayBuffer(4));
  for (;;) Atomics.wait(cell, 0, 0, 50);
}

/** The worker loop: load the library once, then answer batches until terminated. */
export function serveWorker(port: MessagePort, setup: WorkerSetup): void {
  const hang = hangIndices();
  let lib: MaterialsLibrary;
  try {
    lib = setupMaterials(setup.materials);
  } catch (err) {
    port.postMessage({ type: 'init-error', message: errorMessage(err) } satisfies WorkerToMain);
    return;
  }
  port.on('message', (msg: MainToWorker) => {
    if (msg.type !== 'batch') return;
    let lastSign = performance.now();
    const rows = msg.points.map((p) => {
      if (hang.has(p.index)) hangForever();
      const row = evaluatePoint({ ...setup.base, ...p.overrides, materials: lib }, setup.outputs, p.index);
      // a sign of life for the watchdog at most once a second during a long batch
      const now = performance.now();
      if (now - lastSign > 1000) {
        lastSign = now;
        port.postMessage({ type: 'alive', id: msg.id } satisfies WorkerToMain);
      }
      return row;
    });
    port.postMessage({ type: 'rows', id: msg.id, rows } satisfies WorkerToMain);
  });
  port.postMessage({ type: 'ready' } satisfies WorkerToMain);
}

const setup = workerData as Partial<WorkerSetup> | null | undefined;
if (!isMainThread && parentPort !== null && setup?.kind === WORKER_KIND) {
  serveWorker(parentPort, setup as WorkerSetup);
}
