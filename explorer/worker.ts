/// <reference lib="dom" />
// The solver of the explorer page, in a Web Worker: the same solveContact as the CLI, with the built-in materials
// library built from the bundled JSON files (the node:fs reader of src/materials/load.ts is not used here).
//
// A solve request replaces any solve still waiting (only the newest inputs matter); a new sweep makes a running
// sweep stop at its next pause (the sweep yields every few tens of milliseconds so that solves keep flowing).
import metalsJson from '../materials/metals.json' with { type: 'json' };
import supportsJson from '../materials/supports.json' with { type: 'json' };
import referencesJson from '../materials/references.json' with { type: 'json' };
import { solveContact } from '../src/contact.js';
import { InputError } from '../src/errors.js';
import { buildLibrary, parseMaterialsData } from '../src/materials/load.js';
import type { MaterialsLibrary } from '../src/materials/types.js';
import { OUTPUT_PATHS, readOutput } from '../src/study/studyFile.js';
import { axisValues, optionValue } from '../src/study/sweep.js';
import type { ContactOptions } from '../src/inputs/parameters.js';
import type { ContactResult } from '../src/types.js';
import { rowInfos } from './rowInfo.js';
import { studyAxis } from './share.js';
import type { Catalog, FromWorker, SolveRequest, SweepRequest, Swept, ToWorker } from './protocol.js';

const scope = self as unknown as { postMessage(message: FromWorker): void; onmessage: ((event: MessageEvent<ToWorker>) => void) | null };

function builtinLibrary(): MaterialsLibrary {
  const files = [
    { label: 'materials/references.json', data: parseMaterialsData({ references: referencesJson }, 'materials/references.json') },
    { label: 'materials/metals.json', data: parseMaterialsData(metalsJson, 'materials/metals.json') },
    { label: 'materials/supports.json', data: parseMaterialsData(supportsJson, 'materials/supports.json') },
  ];
  return buildLibrary(files);
}

const library = builtinLibrary();

function solve(inputs: Readonly<Record<string, string | number>>): ContactResult {
  return solveContact({ ...(inputs as ContactOptions), materials: library });
}

/** The numeric study outputs: the scalar paths that are not text or true/false on a rich reference contact. */
function numericOutputs(): string[] {
  let reference: ContactResult | undefined;
  try {
    reference = solve({ metal: 'Pt', support: 'ZnO', geometry: 'array', particleDensity: '1e12' });
  } catch {
    reference = undefined;
  }
  return OUTPUT_PATHS.filter((path) => {
    if (path === 'warnings' || path.startsWith('uncertainty.')) return false;
    const value = reference === undefined ? null : readOutput(reference, path);
    return value === null || typeof value === 'number';
  });
}

function catalog(): Catalog {
  const names = (map: Map<string, { name: string; fullName: string }>) => [...map.values()].map((r) => ({ name: r.name, fullName: r.fullName }));
  return { type: 'catalog', metals: names(library.metals), supports: names(library.supports), outputs: numericOutputs() };
}

function handleSolve(request: SolveRequest): void {
  const started = performance.now();
  try {
    const result = solve(request.inputs);
    const solve_ms = performance.now() - started;
    scope.postMessage({ type: 'solved', id: request.id, result, rows: rowInfos(request.inputs, result, library), solve_ms });
  } catch (error) {
    const field = error instanceof InputError ? error.field : '';
    const message = error instanceof Error ? error.message : String(error);
    scope.postMessage({ type: 'failed', id: request.id, field, message, rows: rowInfos(request.inputs, undefined, library) });
  }
}

let pendingSolve: SolveRequest | undefined;
let solveScheduled = false;
let latestSweep = -1;

function scheduleSolve(): void {
  if (solveScheduled) return;
  solveScheduled = true;
  setTimeout(() => {
    solveScheduled = false;
    const request = pendingSolve;
    pendingSolve = undefined;
    if (request !== undefined) handleSolve(request);
  }, 0);
}

const SWEEP_SLICE_MS = 25;

async function runSweep(request: SweepRequest): Promise<void> {
  const started = performance.now();
  // the points and option values of the study file the page offers for download: the sweep is that study
  const axis = studyAxis(request.axis);
  const xs = axisValues(axis) as number[];
  const ys: (number | null)[] = [];
  let failure: string | null = null;
  let failed = 0;
  let sliceStart = performance.now();
  for (const x of xs) {
    if (performance.now() - sliceStart > SWEEP_SLICE_MS) {
      await new Promise((resolve) => setTimeout(resolve, 0));
      if (request.id !== latestSweep) return; // a newer sweep was asked for: this one is stale
      sliceStart = performance.now();
    }
    try {
      const value = readOutput(solve({ ...request.inputs, [axis.field]: optionValue(axis, x) }), request.output);
      ys.push(typeof value === 'number' ? value : null);
    } catch (error) {
      ys.push(null);
      failed++;
      failure ??= error instanceof Error ? error.message : String(error);
    }
  }
  const done: Swept = { type: 'swept', id: request.id, xs, ys, failure, failed, sweep_ms: performance.now() - started };
  scope.postMessage(done);
}

scope.onmessage = (event) => {
  const message = event.data;
  if (message.type === 'solve') {
    pendingSolve = message;
    scheduleSolve();
  } else {
    latestSweep = message.id;
    void runSweep(message);
  }
};

scope.postMessage(catalog());
