// Validation report: a text table of every gallery row beside its prediction, the statistics, and a
// predicted-vs-measured scatter (Vega-Lite, rendered with the shared figure helpers).
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { TopLevelSpec } from 'vega-lite';
import { BASE_CONFIG, PALETTE } from '../output/figures.js';
import { writeFigure } from '../output/render.js';
import { formatNumber } from '../output/summary.js';
import { signOf, type ValidationResult, type ValidationRow, type ValidationStatistics } from './gallery.js';

const SCHEMA = 'https://vega.github.io/schema/vega-lite/v6.json';

function pad(s: string, n: number): string {
  return s.length >= n ? s : s + ' '.repeat(n - s.length);
}

function measuredText(r: ValidationRow): string {
  if (r.kind === 'charge' && r.measuredSign === 'none') return 'none';
  if (r.kind === 'charge' && r.measured === null) {
    const range = r.measuredRange ? ` |N| ${formatNumber(r.measuredRange[0])}-${formatNumber(r.measuredRange[1])}` : '';
    return `${r.measuredSign ?? ''}${range}`;
  }
  return formatNumber(r.measured);
}

const UNIT: Record<ValidationRow['kind'], string> = { barrier: 'eV', charge: 'e/particle', bandBending: 'eV' };

/** The row's 5-95% scatter band as text ('-' without one). */
function bandText(r: ValidationRow): string {
  if (r.scatter) return `${formatNumber(r.scatter.p05)} to ${formatNumber(r.scatter.p95)}`;
  return r.scatterFailure ? 'failed' : '-';
}

/** Plain-text table of the rows (one line each) followed by the statistics; a band column when bands were computed. */
export function validationTable(result: ValidationResult): string {
  const banded = result.statistics.scatter !== undefined;
  const head = ['kind', 'id', 'metal/support', 'measured', 'predicted', ...(banded ? ['5-95% band'] : []), 'unit', 'verified', 'support state', 'status'];
  const lines = result.rows.map((r) => [
    r.kind,
    r.id,
    `${r.metal} | ${r.support}`,
    measuredText(r),
    r.predicted === null ? '-' : formatNumber(r.predicted),
    ...(banded ? [bandText(r)] : []),
    UNIT[r.kind],
    r.verified ? 'yes' : 'no (memory)',
    r.supportState?.mapping ?? '-',
    r.status === 'ok' ? 'ok' : `${r.status}: ${r.reason ?? ''}`,
  ]);
  const widths = head.map((h, i) => Math.min(48, Math.max(h.length, ...lines.map((l) => l[i]!.length))));
  const fmt = (cells: string[]) => cells.map((c, i) => (i === cells.length - 1 ? c : pad(c, widths[i]!))).join('  ');
  return [fmt(head), fmt(widths.map((w) => '-'.repeat(w))), ...lines.map(fmt), '', statisticsText(result.statistics)].join('\n');
}

function pct(x: number | null): string {
  return x === null ? 'n/a' : `${Math.round(x * 100)}%`;
}

/** The statistics in a few lines. */
export function statisticsText(s: ValidationStatistics): string {
  const b = s.barrier;
  const c = s.charge;
  return [
    `model: ${s.model}`,
    `barrier heights: mean absolute error ${formatNumber(b.meanAbsoluteError_eV)} eV over ${b.pairs} metal/oxide pairs on ${b.oxides} oxides ` +
      `(each pair: mean of its measurements; ${b.rows} rows, per-row MAE ${formatNumber(b.rowMeanAbsoluteError_eV)} eV, ` +
      `verified rows only ${formatNumber(b.verifiedMeanAbsoluteError_eV)} eV; ${b.failed} failed)`,
    `barrier MAE per oxide: ${Object.entries(b.perOxide ?? {}).map(([ox, v]) => `${ox} ${formatNumber(v.meanAbsoluteError_eV)} eV (${v.pairs})`).join(', ')}`,
    `particle charge: sign agrees for ${pct(c.signAgreement)} of ${c.signRows} rows; within a factor of 3 of the measured magnitude for ` +
      `${pct(c.withinFactor3)} of ${c.magnitudeRows} rows (${c.failed} failed)`,
    `band bending seen by photoemission: mean absolute error ${formatNumber(s.bandBending.meanAbsoluteError_eV)} eV over ${s.bandBending.rows} rows (${s.bandBending.failed} failed)`,
    ...(s.scatter ? [scatterText(s.scatter)] : []),
  ].join('\n');
}

/** What the scatter bands reach, in one paragraph. */
function scatterText(x: NonNullable<ValidationStatistics['scatter']>): string {
  return (
    `within the published scatter of the inputs (${x.samples} samples per row, seed ${x.seed}; band = 5th to 95th percentile): ` +
    `${pct(x.barrierInsideBand)} of ${x.barrierRows} measured barriers inside the band (mean width ${formatNumber(x.barrierMeanBandWidth_eV)} eV); ` +
    `measured charge sign reached by at least 5% of the samples for ${pct(x.chargeSignReached)} of ${x.chargeSignRows} rows; ` +
    `magnitude range met for ${pct(x.magnitudeReached)} of ${x.magnitudeRows}; band bending inside the band for ${pct(x.bandBendingInsideBand)} of ${x.bandBendingRows}` +
    (x.failedRows > 0 ? `; ${x.failedRows} rows without a band (every sample failed)` : '')
  );
}

/** Predicted vs measured for the rows with a number on both sides, one panel-free scatter with the y = x line. */
export function predictedVsMeasuredSpec(result: ValidationResult, kind: 'barrier' | 'bandBending' = 'barrier'): TopLevelSpec {
  const values = result.rows
    .filter((r) => r.kind === kind && r.status === 'ok' && r.predicted !== null && r.measured !== null)
    .map((r) => ({
      id: r.id,
      oxide: r.supportKey ?? r.support,
      pair: `${r.metal} | ${r.support}`,
      measured: r.measured!,
      predicted: r.predicted!,
      verified: r.verified ? 'seen' : 'from memory',
      method: r.method,
      ...(r.scatter ? { p05: r.scatter.p05, p95: r.scatter.p95 } : {}),
    }));
  const bands = values.filter((v) => v.p05 !== undefined);
  const all = values.flatMap((v) => [v.measured, v.predicted, ...(v.p05 !== undefined ? [v.p05, v.p95!] : [])]);
  const lo = all.length ? Math.min(0, ...all) : 0;
  const hi = all.length ? Math.max(...all) * 1.05 : 1;
  const label = kind === 'barrier' ? 'barrier height (eV)' : 'band bending seen by photoemission (eV)';
  return {
    $schema: SCHEMA,
    title: {
      text: kind === 'barrier' ? 'Barrier heights: predicted vs measured' : 'Band bending: predicted vs measured',
      subtitle: `model: ${result.statistics.model}; line: y = x${bands.length > 0 ? '; bars: 5-95% band under the published scatter of the inputs' : ''}`,
    },
    config: BASE_CONFIG,
    width: 420,
    height: 420,
    layer: [
      {
        data: { values: [{ v: lo }, { v: hi }] },
        mark: { type: 'line', color: PALETTE.grey, strokeDash: [4, 3] },
        encoding: {
          x: { field: 'v', type: 'quantitative', scale: { domain: [lo, hi] }, title: `measured ${label}` },
          y: { field: 'v', type: 'quantitative', scale: { domain: [lo, hi] }, title: `predicted ${label}` },
        },
      },
      ...(bands.length > 0
        ? [
            {
              data: { values: bands },
              mark: { type: 'rule', strokeOpacity: 0.45, strokeWidth: 1.5 },
              encoding: {
                x: { field: 'measured', type: 'quantitative', scale: { domain: [lo, hi] } },
                y: { field: 'p05', type: 'quantitative', scale: { domain: [lo, hi] } },
                y2: { field: 'p95' },
                color: { field: 'oxide', type: 'nominal', title: 'support', scale: { scheme: 'tableau20' } },
              },
            },
          ]
        : []),
      {
        data: { values },
        mark: { type: 'point', filled: true, size: 60 },
        encoding: {
          x: { field: 'measured', type: 'quantitative', scale: { domain: [lo, hi] } },
          y: { field: 'predicted', type: 'quantitative', scale: { domain: [lo, hi] } },
          color: { field: 'oxide', type: 'nominal', title: 'support', scale: { scheme: 'tableau20' } },
          shape: { field: 'verified', type: 'nominal', title: 'value', scale: { domain: ['seen', 'from memory'], range: ['circle', 'triangle'] } },
          tooltip: [
            { field: 'id', type: 'nominal' },
            { field: 'pair', type: 'nominal' },
            { field: 'method', type: 'nominal' },
            { field: 'measured', type: 'quantitative', format: '.3f' },
            { field: 'predicted', type: 'quantitative', format: '.3f' },
          ],
        },
      },
    ],
  } as TopLevelSpec;
}

/**
 * Particle charge, one line per compared charge row: the predicted electrons gained by the metal (x, symmetric-log
 * scale), the measured direction as the marker's shape, green where the predicted direction agrees (a prediction
 * below half an electron counts as none, as in the statistics), the measured magnitude range as a grey bar on the
 * measured side, and the 5-95% scatter band as a line when computed.
 */
export function chargeSpec(result: ValidationResult): TopLevelSpec {
  const rows = result.rows.filter((r) => r.kind === 'charge' && r.status === 'ok' && r.predicted !== null);
  const values = rows.map((r) => {
    const sign = r.measuredSign ?? 'mixed';
    const agrees = sign === 'mixed' ? 'mixed (not scored)' : signOf(r.predicted!) === sign ? 'direction agrees' : 'direction differs';
    const side = sign === 'to-support' ? -1 : 1;
    return {
      id: r.id,
      pair: `${r.metal} | ${r.support}`,
      method: r.method,
      predicted: r.predicted!,
      measuredSign: sign,
      agrees,
      ...(r.measuredRange && sign !== 'mixed' ? { rangeLo: side * r.measuredRange[0], rangeHi: side * r.measuredRange[1] } : {}),
      ...(r.scatter ? { p05: r.scatter.p05, p95: r.scatter.p95 } : {}),
    };
  });
  const ticks = [-300, -100, -30, -10, -3, -1, 0, 1, 3, 10, 30, 100, 300];
  const x = {
    type: 'quantitative' as const,
    scale: { type: 'symlog' as const, constant: 1 },
    axis: { values: ticks },
    title: 'electrons gained by the metal per particle (symmetric log)',
  };
  const y = { field: 'id', type: 'nominal' as const, title: null, sort: null, axis: { labelLimit: 260 } };
  return {
    $schema: SCHEMA,
    title: {
      text: 'Particle charge: predicted, beside the measured direction',
      subtitle: `model: ${result.statistics.model}; shape: measured direction; grey bar: measured magnitude${values.some((v) => v.p05 !== undefined) ? '; line: 5-95% scatter band' : ''}`,
    },
    config: BASE_CONFIG,
    width: 360,
    height: { step: 16 },
    layer: [
      { data: { values: [{ v: 0 }] }, mark: { type: 'rule', color: PALETTE.grey, strokeDash: [4, 3] }, encoding: { x: { field: 'v', ...x } } },
      {
        data: { values: values.filter((v) => v.rangeLo !== undefined) },
        mark: { type: 'bar', color: '#cccccc', height: 10 },
        encoding: { x: { field: 'rangeLo', ...x }, x2: { field: 'rangeHi' }, y },
      },
      {
        data: { values: values.filter((v) => v.p05 !== undefined) },
        mark: { type: 'rule', strokeWidth: 1.2, color: PALETTE.grey, strokeOpacity: 0.7 },
        encoding: { x: { field: 'p05', ...x }, x2: { field: 'p95' }, y },
      },
      {
        data: { values },
        mark: { type: 'point', filled: true, size: 70 },
        encoding: {
          x: { field: 'predicted', ...x },
          y,
          shape: {
            field: 'measuredSign',
            type: 'nominal',
            title: 'measured',
            scale: { domain: ['to-metal', 'to-support', 'none', 'mixed'], range: ['triangle-right', 'triangle-left', 'circle', 'diamond'] },
          },
          color: {
            field: 'agrees',
            type: 'nominal',
            title: 'prediction',
            scale: { domain: ['direction agrees', 'direction differs', 'mixed (not scored)'], range: [PALETTE.green, PALETTE.red, PALETTE.grey] },
          },
          tooltip: [
            { field: 'id', type: 'nominal' },
            { field: 'pair', type: 'nominal' },
            { field: 'method', type: 'nominal' },
            { field: 'measuredSign', type: 'nominal' },
            { field: 'predicted', type: 'quantitative', format: '.3g' },
          ],
        },
      },
    ],
  } as TopLevelSpec;
}

export interface ValidationReportPaths {
  table: string;
  json: string;
  figures: string[];
}

/** Write validation.txt, validation.json and the predicted-vs-measured figures (barrier; charge and band bending when compared) into dir. */
export async function writeValidationReport(dir: string, result: ValidationResult): Promise<ValidationReportPaths> {
  await mkdir(dir, { recursive: true });
  const table = join(dir, 'validation.txt');
  const json = join(dir, 'validation.json');
  await writeFile(table, `${validationTable(result)}\n`, 'utf8');
  await writeFile(json, `${JSON.stringify(result, null, 2)}\n`, 'utf8');
  const figures: string[] = [];
  const fig = await writeFigure(dir, 'barrier-predicted-vs-measured', predictedVsMeasuredSpec(result, 'barrier'));
  figures.push(fig.svgPath);
  if (result.rows.some((r) => r.kind === 'charge' && r.status === 'ok')) {
    const ch = await writeFigure(dir, 'charge-predicted-vs-measured', chargeSpec(result));
    figures.push(ch.svgPath);
  }
  if (result.rows.some((r) => r.kind === 'bandBending' && r.status === 'ok')) {
    const bb = await writeFigure(dir, 'band-bending-predicted-vs-measured', predictedVsMeasuredSpec(result, 'bandBending'));
    figures.push(bb.svgPath);
  }
  return { table, json, figures };
}
