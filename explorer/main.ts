/// <reference lib="dom" />
// The explorer page: controls generated from the parameter table, the solver in a Web Worker, live views, and
// the page state in the URL. Inputs are sent to the worker at most once per animation frame (slider drags) or
// after a short pause in typing; the worker keeps only the newest request, so stale solves never queue up.
import { jsonText } from '../src/cli/io.js';
import { flagName } from '../src/inputs/parameters.js';
import { formatNumber } from '../src/output/format.js';
import { PAGE_ROWS, buildControls, readFields, rowTitle, setFields, showRowInfo, sliderScale, sliderToValue, type Control } from './controls.js';
import type { Catalog, FromWorker, Failed, InputValues, Solved, Swept, ToWorker } from './protocol.js';
import { commandLine, fromQuery, studyFile, toQuery, type PageState, type SweepSettings } from './share.js';
import { renderBandDiagram, renderChargeField, renderHeadline, renderSweep, renderWarnings } from './views.js';

const DEFAULT_INPUTS: InputValues = { metal: 'Pt', support: 'ZnO', donors: '1e17' };
const DEFAULT_SWEEP: SweepSettings = { option: 'donors', from: 1e15, to: 1e20, points: 41, log: true, output: 'bandBending_eV' };
const TYPING_PAUSE_MS = 250;
const SWEEP_PAUSE_MS = 200;

/** Measurements read by the browser test and the bench: input-to-diagram times (ms) and the last rendered solve. */
interface ExplorerProbe {
  latencies_ms: number[];
  rendered: number;
  swept: number;
  lastSolve_ms: number;
  lastSweep?: { xs: number[]; ys: (number | null)[]; output: string };
}

const probe: ExplorerProbe = { latencies_ms: [], rendered: 0, swept: 0, lastSolve_ms: 0 };
(window as unknown as { bandbendExplorer: ExplorerProbe }).bandbendExplorer = probe;

const $ = <T extends HTMLElement>(id: string): T => document.getElementById(id) as T;

const worker = new Worker(new URL('./worker.ts', import.meta.url), { type: 'module' });
const post = (message: ToWorker): void => worker.postMessage(message);

let controls = new Map<string, Control>();
let state: PageState = { inputs: { ...DEFAULT_INPUTS }, sweep: { ...DEFAULT_SWEEP } };
let lastResult: Solved | undefined;
let solveId = 0;
let sweepId = 0;
let renderedId = 0;
let inputAt: number | undefined;
let postedInputs = '';
let frameRequested = false;
let typingTimer: ReturnType<typeof setTimeout> | undefined;
let sweepTimer: ReturnType<typeof setTimeout> | undefined;

function setStatus(text: string, error = false): void {
  const status = $('status');
  status.textContent = text;
  status.classList.toggle('error', error);
}

/** Read the form, store it in the URL, and ask for a new solve (and, after a pause, a new sweep). */
function commit(): void {
  state = { inputs: readFields(controls), sweep: readSweepForm() };
  history.replaceState(null, '', toQuery(state));
  $('command').textContent = commandLine(state.inputs);
  const key = JSON.stringify(state.inputs);
  if (key !== postedInputs) post({ type: 'solve', id: ++solveId, inputs: state.inputs });
  else inputAt = undefined; // only the sweep changed: no new diagram to wait for
  postedInputs = key;
  clearTimeout(sweepTimer);
  sweepTimer = setTimeout(requestSweep, SWEEP_PAUSE_MS);
}

function onInput(immediate: boolean): void {
  inputAt ??= performance.now();
  clearTimeout(typingTimer);
  if (!immediate) {
    typingTimer = setTimeout(commit, TYPING_PAUSE_MS);
    return;
  }
  if (frameRequested) return;
  frameRequested = true;
  requestAnimationFrame(() => {
    frameRequested = false;
    commit();
  });
}

function wireControls(): void {
  for (const c of controls.values()) {
    if (c.field instanceof HTMLSelectElement) c.field.addEventListener('change', () => onInput(true));
    else c.field.addEventListener('input', () => onInput(false));
    c.root.querySelector('.clear')?.addEventListener('click', () => {
      c.field.value = '';
      onInput(true);
    });
    c.slider?.addEventListener('input', () => {
      c.field.value = sliderToValue(c.scale!, Number(c.slider!.value));
      onInput(true);
    });
  }
}

function onSolved(message: Solved): void {
  if (message.id < renderedId) return;
  renderedId = message.id;
  lastResult = message;
  document.querySelector('.views')!.classList.remove('stale');
  const r = message.result;
  renderHeadline($('headline'), r);
  renderBandDiagram($('band'), r);
  renderChargeField($('charge'), r);
  renderWarnings($('warnings'), r);
  showRowInfo(controls, message.rows, state.inputs);
  for (const c of controls.values()) c.root.classList.remove('refused');
  setStatus(`${r.metal} | ${r.support} at ${r.temperature_K} K — solved in ${message.solve_ms.toFixed(1)} ms`);
  probe.lastSolve_ms = message.solve_ms;
  if (inputAt !== undefined) probe.latencies_ms.push(performance.now() - inputAt);
  inputAt = undefined;
  probe.rendered = message.id;
  document.body.dataset['rendered'] = String(message.id);
}

function onFailed(message: Failed): void {
  if (message.id < renderedId) return;
  renderedId = message.id;
  lastResult = undefined;
  document.querySelector('.views')!.classList.add('stale'); // the views show the last inputs that solved
  showRowInfo(controls, message.rows, state.inputs);
  const row = PAGE_ROWS.find((p) => flagName(p) === message.field || p.option === message.field);
  for (const c of controls.values()) c.root.classList.toggle('refused', c.row === row);
  setStatus(`not solved: ${message.message}`, true);
  inputAt = undefined;
  probe.rendered = message.id;
  document.body.dataset['rendered'] = String(message.id);
}

// ---------------------------------------------------------------------------------------------
// sweep

function readSweepForm(): SweepSettings {
  const form = $('sweep-form') as HTMLFormElement;
  const value = (name: string) => (form.elements.namedItem(name) as HTMLInputElement | HTMLSelectElement).value;
  return {
    option: value('x'),
    from: Number(value('from')),
    to: Number(value('to')),
    points: Number(value('points')),
    log: ($('sweep-log') as HTMLInputElement).checked,
    output: value('y'),
  };
}

function writeSweepForm(s: SweepSettings): void {
  const form = $('sweep-form') as HTMLFormElement;
  const set = (name: string, v: string) => ((form.elements.namedItem(name) as HTMLInputElement | HTMLSelectElement).value = v);
  set('x', s.option);
  set('from', formatNumber(s.from, 6));
  set('to', formatNumber(s.to, 6));
  set('points', String(s.points));
  set('y', s.output);
  ($('sweep-log') as HTMLInputElement).checked = s.log;
}

function buildSweepForm(catalog: Catalog): void {
  const x = $('sweep-x') as HTMLSelectElement;
  for (const p of PAGE_ROWS) if (sliderScale(p) !== undefined) x.append(new Option(rowTitle(p), p.option));
  const y = $('sweep-y') as HTMLSelectElement;
  for (const path of catalog.outputs) y.append(new Option(path, path));
  x.addEventListener('change', () => {
    const scale = sliderScale(PAGE_ROWS.find((p) => p.option === x.value)!)!;
    writeSweepForm({ ...readSweepForm(), from: scale.lo, to: scale.hi, log: scale.log });
    onInput(true);
  });
  ($('sweep-form') as HTMLFormElement).addEventListener('input', (event) => {
    if (event.target !== x) onInput(false);
  });
}

function requestSweep(): void {
  const s = state.sweep;
  const valid = Number.isFinite(s.from) && Number.isFinite(s.to) && s.to !== s.from && s.points >= 2 && (!s.log || (s.from > 0 && s.to > 0));
  if (!valid) {
    $('sweep-status').textContent = 'sweep: give from ≠ to (both > 0 on a log axis) and at least 2 points';
    return;
  }
  $('sweep-status').textContent = 'sweeping…';
  post({ type: 'sweep', id: ++sweepId, inputs: state.inputs, axis: s, output: s.output });
}

function onSwept(message: Swept): void {
  if (message.id !== sweepId) return;
  const s = state.sweep;
  const row = PAGE_ROWS.find((p) => p.option === s.option);
  const unit = row ? sliderUnit(row) : '';
  renderSweep($('sweep-plot'), message, `${row ? rowTitle(row) : s.option}${unit ? ` (${unit})` : ''}`, s.output, s.log);
  const failed = message.failed > 0 ? ` — ${message.failed} point(s) failed: ${message.failure}` : '';
  $('sweep-status').textContent = `${message.xs.length} points in ${message.sweep_ms.toFixed(0)} ms${failed}`;
  probe.swept = message.id;
  probe.lastSweep = { xs: message.xs, ys: message.ys, output: s.output };
}

function sliderUnit(p: (typeof PAGE_ROWS)[number]): string {
  return controls.get(p.option)?.root.querySelector('.unit')?.textContent ?? '';
}

// ---------------------------------------------------------------------------------------------
// sharing

function download(name: string, text: string): void {
  const url = URL.createObjectURL(new Blob([text], { type: 'application/json' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

async function copy(text: string, what: string): Promise<void> {
  try {
    await navigator.clipboard.writeText(text);
    setStatus(`${what} copied to the clipboard`);
  } catch {
    setStatus(`${what}: select and copy it by hand (the clipboard is not available here)`, true);
  }
}

function wireActions(): void {
  $('copy-command').addEventListener('click', () => void copy(commandLine(state.inputs), 'command'));
  $('copy-link').addEventListener('click', () => void copy(location.href, 'link'));
  $('download-json').addEventListener('click', () => {
    if (lastResult !== undefined) download('bandbend-contact.json', jsonText(lastResult.result));
    else setStatus('nothing to download: the current inputs were not solved', true);
  });
  $('download-study').addEventListener('click', () => download(`${studyFile(state).name}.json`, jsonText(studyFile(state))));
}

function start(catalog: Catalog): void {
  controls = buildControls($('controls'), catalog);
  buildSweepForm(catalog);
  state = location.search.length > 1 ? fromQuery(location.search, DEFAULT_SWEEP) : { inputs: { ...DEFAULT_INPUTS }, sweep: { ...DEFAULT_SWEEP } };
  setFields(controls, state.inputs);
  writeSweepForm(state.sweep);
  wireControls();
  wireActions();
  commit();
}

worker.onmessage = (event: MessageEvent<FromWorker>) => {
  const message = event.data;
  if (message.type === 'catalog') start(message);
  else if (message.type === 'solved') onSolved(message);
  else if (message.type === 'failed') onFailed(message);
  else onSwept(message);
};
worker.onerror = (event) => setStatus(`the solver stopped: ${event.message}`, true);
