// Pure functions that build Vega-Lite specs for bandbend figures.
// Design: plain white background, light grid, sans-serif text, colours from Vega's colour-blind-aware
// "tableau10" set (categorical) and "viridis" / "blueorange" ramps (continuous). Line styles differ as
// well as colours so figures still read in greyscale. Specs carry inline data only and are deterministic.
import type { Config, TopLevelSpec } from 'vega-lite';
import type { ContactResult } from '../types.js';
import { formatNumber, formatSigned } from './summary.js';

type LayerTopLevel = Extract<TopLevelSpec, { layer: unknown }>;
/** One layer of a layered spec (a unit spec or a nested layer). */
export type Layer = LayerTopLevel['layer'][number];

/** Plain data cell for table-like inputs (screens and studies). */
export type Cell = string | number | boolean | null | undefined;
export type Row = Record<string, Cell>;

/** Categorical colours (Vega tableau10 set). */
export const PALETTE = {
  blue: '#4c78a8',
  orange: '#f58518',
  red: '#e45756',
  teal: '#72b7b2',
  green: '#54a24b',
  yellow: '#eeca3b',
  purple: '#b279a2',
  brown: '#9d755d',
  grey: '#79706e',
  ink: '#222222',
} as const;

/** Our base look: neutral, readable, no web fonts (generic family only), fixed sizes. */
export const BASE_CONFIG: Config = {
  font: 'sans-serif',
  background: 'white',
  view: { stroke: '#bbbbbb' },
  axis: {
    grid: true,
    gridColor: '#ececec',
    domainColor: '#888888',
    tickColor: '#888888',
    labelFontSize: 11,
    titleFontSize: 12,
    titleFontWeight: 'normal',
  },
  legend: { labelFontSize: 11, titleFontSize: 12, titleFontWeight: 'normal', symbolStrokeWidth: 2, titleLimit: 320 },
  title: { fontSize: 14, fontWeight: 'bold', anchor: 'start', subtitleFontSize: 11, subtitleColor: '#555555' },
};

const SCHEMA = 'https://vega.github.io/schema/vega-lite/v6.json';

// ---------------------------------------------------------------- small numeric helpers

function finite(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

function minOf(values: readonly number[]): number {
  return values.reduce((m, v) => (v < m ? v : m), Infinity);
}

function maxOf(values: readonly number[]): number {
  return values.reduce((m, v) => (v > m ? v : m), -Infinity);
}

/** Decade tick values 10^k inside [lo, hi]. */
export function decadeTicks(lo: number, hi: number): number[] {
  if (!(lo > 0) || !(hi >= lo)) return [];
  const out: number[] = [];
  for (let k = Math.ceil(Math.log10(lo) - 1e-9); k <= Math.floor(Math.log10(hi) + 1e-9); k++) {
    out.push(Number(`1e${k}`));
  }
  return out;
}

/**
 * d3 number format for axis labels: plain digits when the magnitudes sit in 1e-3..1e5 (for log axes
 * both ends are checked), otherwise exponential ("1.5e+5").
 */
export function axisFormatFor(values: readonly unknown[], log = false): string {
  const mags = values.filter(finite).filter((v) => v !== 0).map(Math.abs);
  if (mags.length === 0) return '~r';
  const hi = maxOf(mags);
  const lo = minOf(mags);
  return hi < 1e5 && (log ? lo >= 1e-3 : hi >= 1e-3) ? '~r' : '.2~e';
}

/** Symmetric-log transform used by Vega's symlog scale. */
function symlog(x: number, c: number): number {
  return Math.sign(x) * Math.log1p(Math.abs(x) / c);
}

function symlogInverse(u: number, c: number): number {
  return Math.sign(u) * c * Math.expm1(Math.abs(u));
}

// ---------------------------------------------------------------- band diagram

export interface BandDiagramOptions {
  /** symmetric-log position axis (decades of depth into the support); the metal slab stays on the left */
  logDepth?: boolean;
  width?: number;
  height?: number;
}

export const BAND_SERIES = {
  vacuum: 'vacuum level E_vac',
  conduction: 'conduction band E_C',
  valence: 'valence band E_V',
  fermi: 'Fermi level E_F',
} as const;

interface LevelPoint {
  series: string;
  x_nm: number;
  energy_eV: number;
  order: number;
}

/** Support-side points of the profile, sorted by depth, non-finite points dropped. */
function supportPoints(result: ContactResult): { x: number; ec: number; ev: number; rho: number; field: number }[] {
  const p = result.profile;
  const pts: { x: number; ec: number; ev: number; rho: number; field: number }[] = [];
  for (let i = 0; i < p.x_nm.length; i++) {
    const x = p.x_nm[i];
    const ec = p.conductionBand_eV[i];
    const ev = p.valenceBand_eV[i];
    if (!finite(x) || !finite(ec) || !finite(ev)) continue;
    pts.push({ x, ec, ev, rho: p.chargeDensity_C_per_m3[i] ?? NaN, field: p.field_V_per_m[i] ?? NaN });
  }
  // stable sort by depth keeps the spec deterministic for already-sorted meshes
  return pts.map((pt, i) => ({ pt, i })).sort((a, b) => a.pt.x - b.pt.x || a.i - b.i).map((e) => e.pt);
}

/** Electron affinity implied by the result: chi = W_support - (E_C - E_F)_bulk. */
export function electronAffinityOf(result: ContactResult): number {
  return result.supportWorkFunction_eV - result.fermiLevelBelowConduction_eV;
}

/**
 * Band diagram across the metal | support interface. Position x in nm: the metal is a short slab at
 * x < 0 (Fermi level and vacuum level E_vac = work function), the support at x >= 0 from the profile.
 * Energies are relative to the Fermi level (E_F = 0). Annotated: the barrier (E_F to E_C(0), or to E_V(0)
 * for a hole barrier) at the interface, and the band bending (bulk E_C to E_C(0)).
 */
export function bandDiagramSpec(result: ContactResult, opts: BandDiagramOptions = {}): TopLevelSpec {
  const pts = supportPoints(result);
  if (pts.length === 0) throw new Error('bandDiagramSpec: the profile has no finite points');
  const logDepth = opts.logDepth === true;
  const width = opts.width ?? 620;
  const height = opts.height ?? 380;

  const chi = electronAffinityOf(result);
  const xFirst = pts[0]!.x;
  const xMax = Math.max(pts[pts.length - 1]!.x, xFirst + 1e-9, 1e-9);
  const firstPositive = pts.find((p) => p.x > 0)?.x ?? xMax;
  const c = Math.max(firstPositive, xMax * 1e-6);

  // place things at fractions of the drawn width, in data coordinates of the chosen scale
  const span = logDepth ? symlog(xMax, c) : xMax;
  const at = (fraction: number): number => (logDepth ? symlogInverse(fraction * span, c) : fraction * span);
  const metalSlab = at(0.25); // metal from -metalSlab to 0
  const xLeft = -metalSlab;
  const xBarrier = -at(0.125); // visual middle of the metal slab on either scale
  const xBending = at(0.93);

  const ec0 = pts[0]!.ec;
  const ev0 = pts[0]!.ev;
  const ecBulk = result.fermiLevelBelowConduction_eV;
  const wm = result.metalWorkFunction_eV;

  const levels: LevelPoint[] = [];
  let order = 0;
  levels.push({ series: BAND_SERIES.vacuum, x_nm: xLeft, energy_eV: wm, order: order++ });
  levels.push({ series: BAND_SERIES.vacuum, x_nm: 0, energy_eV: wm, order: order++ });
  for (const p of pts) levels.push({ series: BAND_SERIES.vacuum, x_nm: p.x, energy_eV: p.ec + chi, order: order++ });
  for (const p of pts) levels.push({ series: BAND_SERIES.conduction, x_nm: p.x, energy_eV: p.ec, order: order++ });
  for (const p of pts) levels.push({ series: BAND_SERIES.valence, x_nm: p.x, energy_eV: p.ev, order: order++ });
  levels.push({ series: BAND_SERIES.fermi, x_nm: xLeft, energy_eV: 0, order: order++ });
  levels.push({ series: BAND_SERIES.fermi, x_nm: xMax, energy_eV: 0, order: order++ });

  const energies = levels.map((l) => l.energy_eV);
  const yMin = Math.floor((Math.min(minOf(energies), 0) - 0.6) * 2) / 2;
  const yMax = Math.ceil((Math.max(maxOf(energies), wm) + 0.8) * 2) / 2;

  const xScale = logDepth
    ? { type: 'symlog' as const, constant: c, domain: [xLeft, xMax], nice: false, zero: false }
    : { type: 'linear' as const, domain: [xLeft, xMax], nice: false, zero: false };
  const xAxis = logDepth
    ? { values: [0, ...decadeTicks(c, xMax)], format: '~r', title: 'position (nm, symmetric-log scale); metal at x < 0' }
    : { format: '~r', title: 'position (nm); metal at x < 0, support at x > 0' };
  const yScale = { domain: [yMin, yMax], nice: false, zero: false };
  const yAxis = { title: 'energy relative to E_F (eV)', format: '~g' };
  const x = (field: string) => ({ field, type: 'quantitative' as const, scale: xScale, axis: xAxis });
  const y = (field: string) => ({ field, type: 'quantitative' as const, scale: yScale, axis: yAxis });

  const hole = result.barrierCarrier === 'hole';
  const barrierEdge = hole ? ev0 : ec0;
  const barrierText = `${hole ? 'hole barrier' : 'barrier'} ${formatNumber(result.barrierHeight_eV)} eV`;
  // labels sit just above the upper end of their rule so they never straddle a band or E_F
  const bendingText = `band bending ${formatSigned(result.bandBending_eV)} eV`;
  const textBase = { type: 'text' as const, fontSize: 11, lineBreak: '\n', color: PALETTE.ink };

  const seriesDomain = [BAND_SERIES.vacuum, BAND_SERIES.conduction, BAND_SERIES.valence, BAND_SERIES.fermi];

  const layer: Layer[] = [
    // metal slab: occupied states up to E_F
    {
      data: { values: [{ x1: xLeft, x2: 0, y1: yMin, y2: 0 }] },
      mark: { type: 'rect', color: '#dcdcdc', opacity: 0.8 },
      encoding: { x: x('x1'), x2: { field: 'x2' }, y: y('y1'), y2: { field: 'y2' } },
    },
    {
      data: { values: [{ x: 0, y: yMin, label: 'filled metal states' }] },
      mark: { ...textBase, align: 'right', baseline: 'bottom', dx: -6, dy: -4, color: '#555555', fontSize: 10 },
      encoding: { x: x('x'), y: y('y'), text: { field: 'label' } },
    },
    // interface
    {
      data: { values: [{ x: 0, y1: yMin, y2: yMax }] },
      mark: { type: 'rule', color: '#999999', strokeWidth: 1 },
      encoding: { x: x('x'), y: y('y1'), y2: { field: 'y2' } },
    },
    // region labels
    {
      data: { values: [{ x: 0, y: yMax, label: `metal (${result.metal})` }] },
      mark: { ...textBase, align: 'right', baseline: 'top', dx: -6, dy: 6, fontWeight: 'bold' },
      encoding: { x: x('x'), y: y('y'), text: { field: 'label' } },
    },
    {
      data: { values: [{ x: 0, y: yMax, label: `support (${result.support})` }] },
      mark: { ...textBase, align: 'left', baseline: 'top', dx: 6, dy: 6, fontWeight: 'bold' },
      encoding: { x: x('x'), y: y('y'), text: { field: 'label' } },
    },
    // energy levels
    {
      data: { values: levels },
      mark: { type: 'line', strokeWidth: 2, interpolate: 'linear' },
      encoding: {
        x: x('x_nm'),
        y: y('energy_eV'),
        order: { field: 'order', type: 'quantitative' },
        color: {
          field: 'series',
          type: 'nominal',
          scale: { domain: seriesDomain, range: [PALETTE.purple, PALETTE.blue, PALETTE.orange, PALETTE.ink] },
          legend: { title: 'level', orient: 'bottom', direction: 'horizontal', columns: 4, labelLimit: 240 },
        },
        strokeDash: {
          field: 'series',
          type: 'nominal',
          scale: { domain: seriesDomain, range: [[2, 3], [1, 0], [1, 0], [7, 4]] },
          legend: { title: 'level', orient: 'bottom', direction: 'horizontal', columns: 4, labelLimit: 240 },
        },
      },
    },
    // barrier: E_F to the band edge at the interface
    {
      data: { values: [{ x: xBarrier, y1: 0, y2: barrierEdge, label: barrierText, ytop: Math.max(0, barrierEdge) }] },
      layer: [
        {
          mark: { type: 'rule', color: PALETTE.red, strokeWidth: 2.5 },
          encoding: { x: x('x'), y: y('y1'), y2: { field: 'y2' } },
        },
        {
          mark: { ...textBase, align: 'center', baseline: 'bottom', dy: -4 },
          encoding: { x: x('x'), y: y('ytop'), text: { field: 'label' } },
        },
      ],
    },
    // band bending: bulk E_C to E_C(0), with a dotted guide at E_C(0)
    {
      data: { values: [{ x1: 0, x2: xBending, y: ec0 }] },
      mark: { type: 'rule', color: PALETTE.grey, strokeDash: [1, 3], strokeWidth: 1.5 },
      encoding: { x: x('x1'), x2: { field: 'x2' }, y: y('y') },
    },
    {
      data: { values: [{ x: xBending, y1: ecBulk, y2: ec0, label: bendingText, ytop: Math.max(ecBulk, ec0) }] },
      layer: [
        {
          mark: { type: 'rule', color: PALETTE.green, strokeWidth: 2.5 },
          encoding: { x: x('x'), y: y('y1'), y2: { field: 'y2' } },
        },
        {
          mark: { ...textBase, align: 'right', baseline: 'bottom', dx: 4, dy: -4 },
          encoding: { x: x('x'), y: y('ytop'), text: { field: 'label' } },
        },
      ],
    },
  ];

  return {
    $schema: SCHEMA,
    title: {
      text: `Band diagram: ${result.metal} | ${result.support} at ${formatNumber(result.temperature_K, 4)} K`,
      subtitle: `energies relative to the Fermi level; ${result.statistics} statistics, ${result.barrierModel} barrier model`,
    },
    width,
    height,
    config: BASE_CONFIG,
    layer,
  };
}

// ---------------------------------------------------------------- charge and field

export interface ChargeFieldOptions {
  /** logarithmic depth axis; points at x <= 0 are skipped */
  logDepth?: boolean;
  width?: number;
  height?: number;
}

/** Space-charge density (C/m^3) and electric field (V/m) against depth, two stacked panels. */
export function chargeFieldSpec(result: ContactResult, opts: ChargeFieldOptions = {}): TopLevelSpec {
  const logDepth = opts.logDepth === true;
  const width = opts.width ?? 620;
  const height = opts.height ?? 200;
  const pts = supportPoints(result).filter((p) => (logDepth ? p.x > 0 : true));
  const values = pts.map((p) => ({
    x_nm: p.x,
    charge_C_per_m3: finite(p.rho) ? p.rho : null,
    field_V_per_m: finite(p.field) ? p.field : null,
  }));
  const xs = pts.map((p) => p.x);
  const xDomain = xs.length > 0 ? [minOf(xs), maxOf(xs)] : logDepth ? [1e-3, 1] : [0, 1];
  const xScale = logDepth
    ? { type: 'log' as const, domain: xDomain, nice: false }
    : { type: 'linear' as const, domain: xDomain, nice: false, zero: false };
  const xAxis = {
    title: `depth into the support (nm${logDepth ? ', log scale' : ''})`,
    format: '~r',
    ...(logDepth ? { values: decadeTicks(xDomain[0]!, xDomain[1]!) } : {}),
  };

  const panel = (field: 'charge_C_per_m3' | 'field_V_per_m', title: string, color: string): Layer => ({
    layer: [
      {
        data: { values: [{ zero: 0 }] },
        mark: { type: 'rule', color: '#999999', strokeWidth: 1 },
        encoding: { y: { field: 'zero', type: 'quantitative' } },
      },
      {
        transform: [{ filter: `isValid(datum['${field}'])` }],
        mark: { type: 'line', color, strokeWidth: 2 },
        encoding: {
          x: { field: 'x_nm', type: 'quantitative', scale: xScale, axis: xAxis },
          y: { field, type: 'quantitative', title, axis: { format: axisFormatFor(values.map((v) => v[field])) } },
        },
      },
    ],
  });

  const chargePanel = panel('charge_C_per_m3', 'charge density (C/m^3)', PALETTE.blue);
  const fieldPanel = panel('field_V_per_m', 'field (V/m, + into support)', PALETTE.orange);
  return {
    $schema: SCHEMA,
    title: {
      text: `Space charge and field: ${result.metal} | ${result.support} at ${formatNumber(result.temperature_K, 4)} K`,
      subtitle: 'support side of the contact; the field is positive when it points away from the metal',
    },
    config: BASE_CONFIG,
    data: { values },
    vconcat: [
      { width, height, ...chargePanel },
      { width, height, ...fieldPanel },
    ],
  };
}

// ---------------------------------------------------------------- heat map

export interface HeatmapOptions {
  /** numeric field of each row to colour by */
  metricField: string;
  title: string;
  /** row order (y axis) */
  metals: string[];
  /** column order (x axis) */
  supports: string[];
  /** legend title; defaults to metricField */
  legendTitle?: string;
  /** force a diverging (signed) or sequential colour scale; default: diverging when any value is negative */
  diverging?: boolean;
  /** significant digits of the cell labels (default 3) */
  digits?: number;
}

interface HeatCell {
  metal: string;
  support: string;
  value: number | null;
  label: string;
  lightText: boolean;
}

/** Metals (rows) x supports (columns) heat map with the value written in each cell. Rows need `metal` and `support`. */
export function heatmapSpec(rows: readonly Row[], opts: HeatmapOptions): TopLevelSpec {
  const metals = new Set(opts.metals);
  const supports = new Set(opts.supports);
  const picked = rows.filter((r) => metals.has(String(r.metal)) && supports.has(String(r.support)));
  const nums = picked.map((r) => r[opts.metricField]).filter(finite);
  const diverging = opts.diverging ?? (nums.length > 0 && minOf(nums) < 0);
  const digits = opts.digits ?? 3;

  let domain: [number, number];
  if (nums.length === 0) domain = [0, 1];
  else if (diverging) {
    const m = Math.max(Math.abs(minOf(nums)), Math.abs(maxOf(nums))) || 1;
    domain = [-m, m];
  } else {
    const lo = minOf(nums);
    const hi = maxOf(nums);
    const pad = lo === hi ? Math.abs(lo) * 0.1 || 1 : 0;
    domain = [lo - pad, hi + pad];
  }
  const lightText = (v: number): boolean =>
    diverging ? Math.abs(v) / domain[1] > 0.65 : (v - domain[0]) / (domain[1] - domain[0]) < 0.5;

  const cells: HeatCell[] = picked.map((r) => {
    const raw = r[opts.metricField];
    const value = finite(raw) ? raw : null;
    return {
      metal: String(r.metal),
      support: String(r.support),
      value,
      label: value === null ? 'n/a' : formatNumber(value, digits),
      lightText: value === null ? false : lightText(value),
    };
  });

  const xEnc = {
    field: 'support',
    type: 'nominal' as const,
    sort: opts.supports,
    title: 'support',
    axis: { labelAngle: -30, grid: false },
  };
  const yEnc = { field: 'metal', type: 'nominal' as const, sort: opts.metals, title: 'metal', axis: { grid: false } };
  return {
    $schema: SCHEMA,
    title: { text: opts.title, subtitle: diverging ? 'diverging colour scale centred on zero' : undefined },
    config: BASE_CONFIG,
    width: { step: 70 },
    height: { step: 30 },
    data: { values: cells },
    encoding: { x: xEnc, y: yEnc },
    layer: [
      {
        mark: { type: 'rect', stroke: 'white', strokeWidth: 1 },
        encoding: {
          color: {
            field: 'value',
            type: 'quantitative',
            scale: diverging ? { scheme: 'blueorange', domain } : { scheme: 'viridis', domain },
            legend: { title: opts.legendTitle ?? opts.metricField },
            condition: { test: 'datum.value === null', value: '#e6e6e6' },
          },
        },
      },
      {
        mark: { type: 'text', fontSize: 11 },
        encoding: {
          text: { field: 'label' },
          color: { condition: { test: 'datum.lightText', value: 'white' }, value: '#111111' },
        },
      },
    ],
  };
}

// ---------------------------------------------------------------- line plot

export interface LinePlotOptions {
  /** swept input field */
  x: string;
  /** result field */
  y: string;
  xLog?: boolean;
  yLog?: boolean;
  /** optional grouping field (one line per value) */
  color?: string;
  title: string;
  xTitle?: string;
  yTitle?: string;
  width?: number;
  height?: number;
}

/**
 * Study results against the swept input: line + points, one line per `color` group.
 * Non-numeric x values give an ordinal axis in the order of first appearance; rows whose y is not
 * finite (or not positive on a log axis) are left out.
 */
export function linePlotSpec(rows: readonly Row[], opts: LinePlotOptions): TopLevelSpec {
  const numericX = rows.every((r) => finite(r[opts.x]) || r[opts.x] === null || r[opts.x] === undefined);
  const kept = rows.filter((r) => {
    const xv = r[opts.x];
    const yv = r[opts.y];
    if (!finite(yv) || (opts.yLog && yv <= 0)) return false;
    if (numericX) return finite(xv) && !(opts.xLog && xv <= 0);
    return xv !== null && xv !== undefined;
  });
  const values = kept.map((r, i) => ({
    x: numericX ? (r[opts.x] as number) : String(r[opts.x]),
    y: r[opts.y] as number,
    group: opts.color === undefined ? '' : String(r[opts.color] ?? 'n/a'),
    i,
  }));
  const xOrder = [...new Set(values.map((v) => String(v.x)))];
  const groups = [...new Set(values.map((v) => v.group))];

  const xEnc = numericX
    ? {
        field: 'x',
        type: 'quantitative' as const,
        title: opts.xTitle ?? opts.x,
        scale: opts.xLog ? { type: 'log' as const } : { zero: false },
        axis: { format: axisFormatFor(values.map((v) => v.x), opts.xLog === true) },
      }
    : { field: 'x', type: 'ordinal' as const, title: opts.xTitle ?? opts.x, sort: xOrder };
  const yEnc = {
    field: 'y',
    type: 'quantitative' as const,
    title: opts.yTitle ?? opts.y,
    scale: opts.yLog ? { type: 'log' as const } : { zero: false },
    axis: { format: axisFormatFor(values.map((v) => v.y), opts.yLog === true) },
  };
  const colorEnc =
    opts.color === undefined
      ? { value: PALETTE.blue }
      : { field: 'group', type: 'nominal' as const, title: opts.color, sort: groups, scale: { scheme: 'tableau10' } };

  return {
    $schema: SCHEMA,
    title: opts.title,
    config: BASE_CONFIG,
    width: opts.width ?? 520,
    height: opts.height ?? 320,
    data: { values },
    encoding: { x: xEnc, y: yEnc, color: colorEnc },
    layer: [
      {
        mark: { type: 'line', strokeWidth: 2 },
        encoding: { detail: { field: 'group', type: 'nominal' }, order: numericX ? { field: 'x' } : { field: 'i' } },
      },
      { mark: { type: 'point', filled: true, size: 40 } },
    ],
  };
}

// ---------------------------------------------------------------- Mott-Schottky

export interface MottSchottkyPoint {
  potential_V: number;
  inverseCapSquared: number;
}

export interface MottSchottkyFit {
  slope: number;
  intercept: number;
  flatBand_V: number;
}

export interface MottSchottkyOptions {
  title?: string;
  /** y axis title including the unit of the data, e.g. "1/C^2 (cm^4/F^2)" */
  yTitle?: string;
  width?: number;
  height?: number;
}

/** Measured 1/C^2 against potential, the fitted straight line (extended to the axis) and the flat-band potential. */
export function mottSchottkyFitSpec(
  points: readonly MottSchottkyPoint[],
  fit: MottSchottkyFit,
  opts: MottSchottkyOptions = {},
): TopLevelSpec {
  const data = points
    .filter((p) => finite(p.potential_V) && finite(p.inverseCapSquared))
    .map((p) => ({ potential_V: p.potential_V, inverseCapSquared: p.inverseCapSquared }));
  const vs = data.map((p) => p.potential_V);
  const crossing = fit.slope !== 0 ? -fit.intercept / fit.slope : NaN;
  const extent = [...vs, fit.flatBand_V, ...(finite(crossing) ? [crossing] : [])].filter(finite);
  let lo = extent.length > 0 ? minOf(extent) : -1;
  let hi = extent.length > 0 ? maxOf(extent) : 1;
  if (lo === hi) {
    lo -= 0.5;
    hi += 0.5;
  }
  const pad = 0.05 * (hi - lo);
  lo -= pad;
  hi += pad;
  const line = [lo, hi].map((v) => ({ potential_V: v, inverseCapSquared: fit.slope * v + fit.intercept }));

  const x = { field: 'potential_V', type: 'quantitative' as const, title: 'potential (V)', scale: { domain: [lo, hi], nice: false, zero: false } };
  const y = { field: 'inverseCapSquared', type: 'quantitative' as const, title: opts.yTitle ?? '1/C^2', axis: { format: axisFormatFor([...data, ...line].map((p) => p.inverseCapSquared)) } };
  const label = `flat band ${formatNumber(fit.flatBand_V)} V`;

  return {
    $schema: SCHEMA,
    title: { text: opts.title ?? 'Mott-Schottky analysis', subtitle: `fit: slope ${formatNumber(fit.slope)}, intercept ${formatNumber(fit.intercept)}` },
    config: BASE_CONFIG,
    width: opts.width ?? 520,
    height: opts.height ?? 320,
    layer: [
      { data: { values: [{ zero: 0 }] }, mark: { type: 'rule', color: '#999999' }, encoding: { y: { field: 'zero', type: 'quantitative' } } },
      {
        data: { values: line.map((p) => ({ ...p, series: 'linear fit' })) },
        mark: { type: 'line', color: PALETTE.blue, strokeWidth: 2 },
        encoding: { x, y },
      },
      {
        data: { values: data.map((p) => ({ ...p, series: 'data' })) },
        mark: { type: 'point', filled: true, size: 50, color: PALETTE.orange, stroke: PALETTE.ink, strokeWidth: 0.5 },
        encoding: { x, y },
      },
      {
        data: { values: [{ potential_V: fit.flatBand_V, label }] },
        layer: [
          { mark: { type: 'rule', color: PALETTE.red, strokeDash: [6, 4], strokeWidth: 1.5 }, encoding: { x } },
          {
            mark: { type: 'text', align: 'left', baseline: 'top', dx: 4, dy: 4, fontSize: 11, color: PALETTE.red },
            encoding: { x, y: { value: 0 }, text: { field: 'label' } },
          },
        ],
      },
    ],
  };
}

/** True when the positive depths of the profile span more than two decades (log depth reads better). */
export function prefersLogDepth(result: ContactResult): boolean {
  const pos = result.profile.x_nm.filter((v) => finite(v) && v > 0);
  if (pos.length < 3) return false;
  return maxOf(pos) / minOf(pos) > 100;
}
