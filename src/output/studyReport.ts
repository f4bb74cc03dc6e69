// The report of a study, from one streaming pass over its results file (src/study/aggregate.ts), so
// memory and report size do not grow with the number of rows: <out>/report/index.html with the
// system and base conditions at the top, the sweep, an overview of every output, one figure per
// numeric output (median line, 5-95 % band when several points share a cell, panels for a third
// axis, log scales for quantities spanning decades, titles with names and units), and the failures.
// Figures are also written as plot-<output>.svg and plot-<output>.vl.json.
//
// The report is built in a temporary folder and renamed into place at the end, so an interrupted
// report (AbortSignal, checked between rows and between figures) leaves no half-written folder.
// An existing report folder is replaced only when it holds nothing but our own files, or with force.
import { createReadStream, existsSync, readdirSync, renameSync, rmSync, statSync } from 'node:fs';
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import type { TopLevelSpec } from 'vega-lite';
import { InputError } from '../errors.js';
import { StudyAggregator, fieldName, inputTitle, outputTitle, spansDecades, splitCsvLine, type AggregatedPoint, type AxisGroups } from '../study/aggregate.js';
import { axisValues } from '../study/sweep.js';
import { fieldSpec, studyColumns, type Study } from '../study/studyFile.js';
import { RESULT_FILES } from '../study/outFiles.js';
import { defaultUnitOf } from '../inputs/units.js';
import { BASE_CONFIG, axisFormatFor, decadeTicks } from './figures.js';
import { escapeHtml } from './escape.js';
import { renderSvg, svgForInline } from './render.js';

export const STUDY_REPORT_DIR = 'report';
const OUR_FILE = /^(index\.html|plot-[A-Za-z0-9_.-]+\.(svg|vl\.json))$/;
const SCHEMA = 'https://vega.github.io/schema/vega-lite/v6.json';

/** Thrown when the signal aborts the report; nothing is left behind. */
export class ReportInterrupted extends Error {
  override readonly name = 'ReportInterrupted';
  constructor() {
    super('report interrupted');
  }
}

/** Refuse (InputError) to replace a report folder holding files we did not write, unless force. */
export function checkStudyReportDir(dir: string, force: boolean): void {
  if (!existsSync(dir)) return;
  if (!statSync(dir).isDirectory()) {
    if (force) return;
    throw new InputError('--out', `${dir} exists and is not a report folder; use --force to replace it`);
  }
  const foreign = readdirSync(dir).filter((f) => !OUR_FILE.test(f));
  if (foreign.length > 0 && !force) {
    throw new InputError('--out', `${dir} holds files bandbend did not write (${foreign.slice(0, 3).join(', ')}${foreign.length > 3 ? ', ...' : ''}); use --force to replace the report or --no-plots`);
  }
}

export interface StudyReportOptions {
  outDir: string;
  study: Study;
  /** points on disk / in the study (shown at the top) */
  run?: { points: number; total: number; failed: number; elapsed_s?: number; note?: string };
  force?: boolean;
  signal?: AbortSignal;
  /** the results file to read (JSONL, or CSV when it ends in .csv); default: outDir's results.jsonl, else results.csv */
  resultsPath?: string;
}

export interface StudyReportPaths {
  htmlPath: string;
  figures: string[];
  /** bytes of everything written in the report folder */
  bytes: number;
  rows: number;
}

function checkAbort(signal: AbortSignal | undefined): void {
  if (signal?.aborted) throw new ReportInterrupted();
}

/** The results file of outDir: results.jsonl, else results.csv, else null. */
function resultsFileOf(outDir: string): string | null {
  const jsonl = join(outDir, RESULT_FILES.json);
  const csv = join(outDir, RESULT_FILES.csv);
  return existsSync(jsonl) ? jsonl : existsSync(csv) ? csv : null;
}

/** Stream the results (resultsPath, else outDir's JSONL, else its CSV) into an aggregator. */
export async function aggregateResults(outDir: string, study: Study, signal?: AbortSignal, resultsPath?: string): Promise<StudyAggregator> {
  const agg = new StudyAggregator(study, study.outputs.filter((o) => o !== 'warnings'));
  const path = resultsPath ?? resultsFileOf(outDir);
  if (path === null) return agg;
  const isCsv = path.endsWith('.csv');
  const columns = studyColumns(study);
  const rl = createInterface({ input: createReadStream(path), crlfDelay: Infinity });
  let n = 0;
  try {
    for await (const line of rl) {
      if ((n++ & 4095) === 0) checkAbort(signal);
      if (line === '') continue;
      if (isCsv) {
        if (n === 1) continue; // header
        const cells = splitCsvLine(line);
        const row: Record<string, unknown> = {};
        columns.forEach((c, i) => (row[c] = cells[i] ?? ''));
        agg.add(row);
      } else {
        agg.add(JSON.parse(line) as Record<string, unknown>);
      }
    }
  } finally {
    rl.close();
  }
  checkAbort(signal);
  return agg;
}

function safeName(output: string): string {
  return `plot-${output.replace(/[^A-Za-z0-9_-]/g, '_')}`;
}

/** Vega-Lite spec of one output from aggregated points (pure). */
export function studyPlotSpec(points: readonly AggregatedPoint[], plan: StudyAggregator['plan'], output: string): TopLevelSpec {
  const { x, color, facet } = plan;
  const yTitle = outputTitle(output);
  const values = points.filter((p) => Number.isFinite(p.median));
  const spread = values.some((p) => p.n > 1 && p.hi > p.lo);
  const ys = values.flatMap((p) => (spread ? [p.lo, p.hi, p.median] : [p.median]));
  const yLog = spansDecades(ys, 2.5);
  const xNums = values.map((p) => p.x).filter((v): v is number => typeof v === 'number');
  const xLog = x.numeric && x.log && xNums.every((v) => v > 0);
  const aggregatedOver = [...(plan.rest.map((a) => inputTitle(a))), ...(x.binned ? [`${x.title} within each bin`] : []), ...(color?.binned ? [`${color.title} within each range`] : []), ...(facet?.binned ? [`${facet.title} within each range`] : [])];
  const subtitle = spread
    ? `line: median; band: 5-95 % over ${aggregatedOver.join(', ') || 'the points of each cell'}`
    : `one point per ${x.title}${color ? ` and ${color.title}` : ''}`;
  const xEnc = x.numeric
    ? {
        field: 'x',
        type: 'quantitative' as const,
        title: x.title,
        scale: xLog ? { type: 'log' as const } : { zero: false },
        axis: logAxis(xNums, xLog),
      }
    : { field: 'x', type: 'ordinal' as const, title: x.title, sort: x.labels };
  const yScale = yLog ? { type: 'log' as const } : { zero: false };
  const yAxis = logAxis(ys, yLog);
  const colorEnc = (g: AxisGroups | null): Record<string, unknown> =>
    g === null
      ? { value: '#4c78a8' }
      : { field: 'group', type: 'nominal', title: g.title, sort: g.labels, scale: { scheme: g.labels.length > 10 ? 'tableau20' : 'tableau10' } };
  const layers: unknown[] = [];
  if (spread) {
    layers.push({
      mark: { type: 'area', opacity: 0.18 },
      encoding: { x: xEnc, y: { field: 'lo', type: 'quantitative', title: yTitle, scale: yScale, axis: yAxis }, y2: { field: 'hi' }, color: colorEnc(color), detail: { field: 'group' } },
    });
  }
  layers.push({
    mark: { type: 'line', strokeWidth: 2, point: x.labels.length <= 30 },
    encoding: { x: xEnc, y: { field: 'median', type: 'quantitative', title: yTitle, scale: yScale, axis: yAxis }, color: colorEnc(color), detail: { field: 'group' } },
  });
  const title = { text: `${yTitle} against ${x.title}`, subtitle };
  const data = { values: values.map((p) => ({ x: p.x, group: p.group, facet: p.facet, median: p.median, lo: p.lo, hi: p.hi, n: p.n })) };
  const unit = { width: facet ? 300 : 560, height: facet ? 200 : 320, layer: layers };
  if (facet) {
    return {
      $schema: SCHEMA,
      title,
      config: BASE_CONFIG,
      data,
      facet: { field: 'facet', type: 'ordinal', title: facet.title, sort: facet.labels },
      columns: 3,
      spec: unit,
    } as unknown as TopLevelSpec;
  }
  return { $schema: SCHEMA, title, config: BASE_CONFIG, data, ...unit } as unknown as TopLevelSpec;
}

/** Axis labels: decades only on a log axis (10^k, no crowded minor labels). */
function logAxis(values: readonly number[], log: boolean): Record<string, unknown> {
  if (!log) return { format: axisFormatFor(values, false) };
  const pos = values.filter((v) => v > 0 && Number.isFinite(v));
  const ticks = decadeTicks(Math.min(...pos), Math.max(...pos));
  return ticks.length >= 2 ? { values: ticks, format: axisFormatFor(ticks, true) } : { format: axisFormatFor(values, true) };
}

// ---------------------------------------------------------------------------------------------
// HTML

function fmtNumber(v: number): string {
  if (!Number.isFinite(v)) return '';
  const a = Math.abs(v);
  return a !== 0 && (a >= 1e5 || a < 1e-3) ? v.toExponential(3) : String(Number(v.toPrecision(5)));
}

function table(headers: readonly string[], rows: readonly (readonly string[])[]): string {
  const head = headers.map((h) => `<th scope="col">${escapeHtml(h)}</th>`).join('');
  const body = rows.map((r) => `<tr>${r.map((c) => `<td>${escapeHtml(c)}</td>`).join('')}</tr>`).join('\n');
  return `<table>\n<thead><tr>${head}</tr></thead>\n<tbody>\n${body}\n</tbody>\n</table>`;
}

function baseValue(v: unknown, field?: string): string {
  if (Array.isArray(v)) return v.map(String).join(', ');
  if (v !== null && typeof v === 'object') return '(in-memory)';
  // a bare number is in the field's default unit
  const spec = field === undefined ? undefined : fieldSpec(field);
  if (typeof v === 'number' && spec?.kind === 'quantity' && spec.quantity !== 'dimensionless') return `${v} ${defaultUnitOf(spec.quantity)}`;
  return String(v);
}

/** "Pt on CeO2", with swept or custom sides named as such. */
export function systemLine(study: Study): string {
  const b = study.base as Record<string, unknown>;
  const swept = (f: string): string | null => {
    const a = study.sweep.axes.find((ax) => ax.field === f);
    if (!a) return null;
    const vals = axisValues(a);
    return `${vals.slice(0, 8).join(', ')}${vals.length > 8 ? `, ... (${vals.length})` : ''} (swept)`;
  };
  const metal =
    swept('metal') ??
    (typeof b['metal'] === 'string' ? b['metal'] : b['workFunction'] !== undefined ? `custom metal (work function ${baseValue(b['workFunction'])}${isNaN(Number(b['workFunction'])) ? '' : ' eV'})` : 'metal not given');
  const supportName = typeof b['support'] === 'string' ? b['support'] : typeof b['supportFormula'] === 'string' ? b['supportFormula'] : null;
  const support =
    swept('support') ??
    supportName ??
    (b['electronAffinity'] !== undefined ? `custom support (electron affinity ${baseValue(b['electronAffinity'], 'electronAffinity')}, band gap ${baseValue(b['bandGap'] ?? '?', 'bandGap')})` : 'support not given');
  return `${metal} on ${support}`;
}

function sweepRows(study: Study, agg: StudyAggregator): string[][] {
  const { x, color, facet } = agg.plan;
  return study.sweep.axes.map((a) => {
    const vals = axisValues(a);
    const range =
      'log' in a
        ? `${a.log.from} to ${a.log.to}, ${a.log.points} points, logarithmic`
        : 'linear' in a
          ? `${a.linear.from} to ${a.linear.to}, ${a.linear.points} points, linear`
          : `${vals.slice(0, 10).join(', ')}${vals.length > 10 ? `, ... (${vals.length} values)` : ''}`;
    const role =
      a === x.axis
        ? `x axis${x.binned ? ` (${x.labels.length} bins)` : ''}`
        : a === color?.axis
          ? `colour${color.binned ? ` (${color.labels.length} ranges)` : ''}${color.dropped ? ` (first ${color.labels.length} shown)` : ''}`
          : a === facet?.axis
            ? `panels${facet.binned ? ` (${facet.labels.length} ranges)` : ''}${facet.dropped ? ` (first ${facet.labels.length} shown)` : ''}`
            : 'aggregated (band)';
    return [inputTitle(a), range, role];
  });
}

const STYLE = `body{font-family:sans-serif;max-width:1100px;margin:2em auto;padding:0 1em;color:#222;line-height:1.45}
table{border-collapse:collapse;margin:.5em 0 1em}th,td{border:1px solid #ddd;padding:.25em .6em;text-align:left;vertical-align:top}
th{background:#f4f4f4}.lead{font-size:1.1em}.muted{color:#666}figure{margin:1.5em 0}figcaption{color:#555;font-size:.9em}`;

export function studyReportHtml(study: Study, agg: StudyAggregator, figures: readonly { name: string; title: string; svg: string }[], run: StudyReportOptions['run']): string {
  const base = Object.entries(study.base as Record<string, unknown>).filter(([k]) => k !== 'materials');
  const swept = new Set(study.sweep.axes.map((a) => a.field));
  const baseRows = base.filter(([k]) => !swept.has(k)).map(([k, v]) => [fieldName(k), k, baseValue(v, k)]);
  const m = (study.base as Record<string, unknown>)['materials'];
  if (m !== undefined) baseRows.push(['materials library', 'materials', baseValue(m)]);
  const overview = agg.overview().map((o) => [o.title, o.output, String(o.numeric), fmtNumber(o.min), fmtNumber(o.median), fmtNumber(o.max)]);
  const nonNumeric = agg.overview().filter((o) => o.numeric === 0).map((o) => o.output);
  const runLine = run
    ? `${run.points} of ${run.total} points on disk, ${run.failed} failed${run.elapsed_s !== undefined ? `, ${run.elapsed_s.toFixed(1)} s` : ''}${run.note ? `; ${run.note}` : ''}.`
    : `${agg.rows} rows read.`;
  const errors = [...agg.errors.entries()].sort((a, b) => b[1] - a[1]).slice(0, 20).map(([msg, n]) => [String(n), msg]);
  const parts = [
    `<h1>Study ${escapeHtml(study.name)}</h1>`,
    `<p class="lead"><strong>System:</strong> ${escapeHtml(systemLine(study))}</p>`,
    study.description ? `<p>${escapeHtml(study.description)}</p>` : '',
    `<p>${escapeHtml(runLine)} Data: <a href="../results.csv">results.csv</a> (all rows; the figures are aggregated).</p>`,
    '<h2>Base conditions</h2>',
    baseRows.length > 0 ? table(['quantity', 'field', 'value'], baseRows) : '<p class="muted">None: defaults only.</p>',
    '<h2>Sweep</h2>',
    `<p>Mode: ${escapeHtml(study.sweep.mode)}.</p>`,
    table(['swept quantity', 'values', 'in the figures'], sweepRows(study, agg)),
    '<h2>Outputs</h2>',
    table(['quantity', 'field', 'numeric rows', 'min', 'median', 'max'], overview),
    nonNumeric.length > 0 ? `<p class="muted">Not numeric (see results.csv): ${escapeHtml(nonNumeric.join(', '))}.</p>` : '',
    '<h2>Figures</h2>',
    figures.length > 0
      ? figures
          .map((f) => `<figure>\n${svgForInline(f.svg, f.title)}\n<figcaption>${escapeHtml(f.title)} <span class="muted">(files: ${escapeHtml(f.name)}.svg, ${escapeHtml(f.name)}.vl.json)</span></figcaption>\n</figure>`)
          .join('\n')
      : '<p class="muted">No numeric output to plot.</p>',
    '<h2>Failed points</h2>',
    errors.length > 0 ? table(['points', 'message'], errors) : '<p>None.</p>',
  ];
  return `<!doctype html>\n<html lang="en">\n<head>\n<meta charset="utf-8">\n<title>${escapeHtml(`Study ${study.name}`)}</title>\n<style>${STYLE}</style>\n</head>\n<body>\n${parts.filter((p) => p !== '').join('\n')}\n</body>\n</html>\n`;
}

/** Write <outDir>/report from the results on disk (see the file comment). */
export async function writeStudyReportFromResults(opts: StudyReportOptions): Promise<StudyReportPaths> {
  const dir = join(opts.outDir, STUDY_REPORT_DIR);
  checkStudyReportDir(dir, opts.force === true);
  const tmp = join(opts.outDir, `.report.tmp-${process.pid}`);
  rmSync(tmp, { recursive: true, force: true });
  try {
    const agg = await aggregateResults(opts.outDir, opts.study, opts.signal, opts.resultsPath);
    await mkdir(tmp, { recursive: true });
    const figures: { name: string; title: string; svg: string }[] = [];
    let bytes = 0;
    for (const o of agg.overview()) {
      checkAbort(opts.signal);
      if (o.numeric === 0) continue;
      const points = agg.points(o.output);
      if (points.length === 0) continue;
      const spec = studyPlotSpec(points, agg.plan, o.output);
      const svg = await renderSvg(spec);
      const name = safeName(o.output);
      const specText = `${JSON.stringify(spec)}\n`;
      await writeFile(join(tmp, `${name}.svg`), svg.endsWith('\n') ? svg : `${svg}\n`, 'utf8');
      await writeFile(join(tmp, `${name}.vl.json`), specText, 'utf8');
      bytes += Buffer.byteLength(svg) + Buffer.byteLength(specText); // the SVG file; its inline copy is counted with index.html
      figures.push({ name, title: `${o.title} against ${agg.plan.x.title}`, svg });
    }
    checkAbort(opts.signal);
    const html = studyReportHtml(opts.study, agg, figures, opts.run);
    const htmlPath = join(dir, 'index.html');
    await writeFile(join(tmp, 'index.html'), html, 'utf8');
    bytes += Buffer.byteLength(html);
    checkAbort(opts.signal);
    rmSync(dir, { recursive: true, force: true });
    renameSync(tmp, dir);
    return { htmlPath, figures: figures.map((f) => join(dir, `${f.name}.svg`)), bytes, rows: agg.rows };
  } finally {
    rmSync(tmp, { recursive: true, force: true });
  }
}
