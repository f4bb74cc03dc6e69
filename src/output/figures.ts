// Pure functions that build Vega-Lite specs for bandbend figures.
// Design: plain white background, light grid, sans-serif text, colours from Vega's colour-blind-aware
// "tableau10" set (categorical) and "viridis" / "blueorange" ramps (continuous). Line styles differ as
// well as colours so figures still read in greyscale. Specs carry inline data only and are deterministic.
import type { Config, TopLevelSpec } from 'vega-lite';
import type { ContactResult } from '../types.js';
import { formatNumber, formatSigned } from './summary.js';
import { row, type OptionName } from '../inputs/parameters.js';
import { LOCALISED_DEGENERACY } from '../bulk/equilibrium.js';
import { K_BOLTZMANN_EV_PER_K, Q_ELEMENTARY_C } from '../constants.js';

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
  localised: 'localised level E_L',
} as const;

interface LevelPoint {
  series: string;
  x_nm: number;
  energy_eV: number;
  order: number;
}

interface SupportPoint {
  x: number;
  ec: number;
  ev: number;
  rho: number;
  field: number;
}

/** Support-side points of the profile, sorted by depth, non-finite points dropped. */
function supportPoints(result: ContactResult): SupportPoint[] {
  const p = result.profile;
  const pts: SupportPoint[] = [];
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

/** Where the band diagram puts things: positions in nm, in data coordinates of the chosen x scale. */
interface DiagramFrame {
  logDepth: boolean;
  /** symmetric-log constant (smallest positive depth) */
  c: number;
  xLeft: number;
  xMax: number;
  /** position at a fraction of the drawn support width */
  at: (fraction: number) => number;
}

function diagramFrame(pts: readonly { x: number }[], logDepth: boolean): DiagramFrame {
  const xFirst = pts[0]!.x;
  const xMax = Math.max(pts[pts.length - 1]!.x, xFirst + 1e-9, 1e-9);
  const firstPositive = pts.find((p) => p.x > 0)?.x ?? xMax;
  const c = Math.max(firstPositive, xMax * 1e-6);
  const span = logDepth ? symlog(xMax, c) : xMax;
  const at = (fraction: number): number => (logDepth ? symlogInverse(fraction * span, c) : fraction * span);
  return { logDepth, c, xLeft: -at(0.25), xMax, at };
}

/** Value of an input the result used, found by its provenance label in the parameter table. */
function inputValueOf(result: ContactResult, option: OptionName): number | undefined {
  const label = row(option).label;
  const hit = result.inputs.find((i) => i.field === label);
  return hit !== undefined && finite(hit.value) ? hit.value : undefined;
}

/** Localised (small-polaron) level of the support and its occupancy, when the result used one. */
export interface LocalisedLevelView {
  /** depth of the level below E_C, eV */
  depth_eV: number;
  sites_cm3: number;
  /** occupied fraction of the sites in the bulk (from the bulk solution) */
  bulkOccupancy: number;
  /** occupied fraction at the interface: f = 1 / (1 + exp((E_L(0) - E_F)/kT) / g), g = 2 (equilibrium.ts) */
  interfaceOccupancy: number;
}

export function localisedLevelOf(result: ContactResult): LocalisedLevelView | null {
  const sites = inputValueOf(result, 'localisedSites');
  const depth = inputValueOf(result, 'localisedLevel');
  const ec0 = result.profile.conductionBand_eV[0];
  if (sites === undefined || !(sites > 0) || depth === undefined || !finite(ec0)) return null;
  const kT = K_BOLTZMANN_EV_PER_K * result.temperature_K;
  // Fermi–Dirac occupancy of a singly occupiable site with spin degeneracy g (Sze & Ng eq. 1.35 form)
  const x = (ec0 - depth) / kT - Math.log(LOCALISED_DEGENERACY);
  const interfaceOccupancy = x > 0 ? Math.exp(-x) / (1 + Math.exp(-x)) : 1 / (1 + Math.exp(x));
  const bulkOccupancy = Math.min(1, Math.max(0, result.bulk.localisedElectrons_cm3 / sites));
  return { depth_eV: depth, sites_cm3: sites, bulkOccupancy, interfaceOccupancy };
}

/** The energy-level series of the band diagram (vacuum, bands, Fermi level, localised level when present). */
function diagramLevels(result: ContactResult, pts: readonly SupportPoint[], frame: DiagramFrame, localised: LocalisedLevelView | null): LevelPoint[] {
  const chi = electronAffinityOf(result);
  const wm = result.metalWorkFunction_eV;
  const levels: LevelPoint[] = [];
  let order = 0;
  const push = (series: string, x_nm: number, energy_eV: number) => levels.push({ series, x_nm, energy_eV, order: order++ });
  push(BAND_SERIES.vacuum, frame.xLeft, wm);
  push(BAND_SERIES.vacuum, 0, wm);
  for (const p of pts) push(BAND_SERIES.vacuum, p.x, p.ec + chi);
  for (const p of pts) push(BAND_SERIES.conduction, p.x, p.ec);
  for (const p of pts) push(BAND_SERIES.valence, p.x, p.ev);
  if (localised !== null) for (const p of pts) push(BAND_SERIES.localised, p.x, p.ec - localised.depth_eV);
  push(BAND_SERIES.fermi, frame.xLeft, 0);
  push(BAND_SERIES.fermi, frame.xMax, 0);
  return levels;
}

type Encode = (field: string) => { field: string; type: 'quantitative'; scale: object; axis: object };
interface Encoders {
  x: Encode;
  y: Encode;
  yMin: number;
  yMax: number;
}

function diagramEncoders(frame: DiagramFrame, yMin: number, yMax: number): Encoders {
  const { c, xLeft, xMax } = frame;
  const xScale = frame.logDepth
    ? { type: 'symlog' as const, constant: c, domain: [xLeft, xMax], nice: false, zero: false }
    : { type: 'linear' as const, domain: [xLeft, xMax], nice: false, zero: false };
  const xAxis = frame.logDepth
    ? { values: [0, ...decadeTicks(c, xMax)], format: '~r', title: 'position (nm, symmetric-log scale); metal at x < 0' }
    : { format: '~r', title: 'position (nm); metal at x < 0, support at x > 0' };
  const yScale = { domain: [yMin, yMax], nice: false, zero: false };
  const yAxis = { title: 'energy relative to E_F (eV)', format: '~g' };
  return {
    x: (field) => ({ field, type: 'quantitative', scale: xScale, axis: xAxis }),
    y: (field) => ({ field, type: 'quantitative', scale: yScale, axis: yAxis }),
    yMin,
    yMax,
  };
}

const TEXT_BASE = { type: 'text' as const, fontSize: 11, lineBreak: '\n', color: PALETTE.ink };

/** A vertical rule from y1 to y2 at x with a label above its upper end. */
function labelledRule(e: Encoders, x: number, y1: number, y2: number, label: string, color: string, align: 'center' | 'right'): Layer {
  return {
    data: { values: [{ x, y1, y2, label, ytop: Math.max(y1, y2) }] },
    layer: [
      { mark: { type: 'rule', color, strokeWidth: 2.5 }, encoding: { x: e.x('x'), y: e.y('y1'), y2: { field: 'y2' } } },
      {
        mark: { ...TEXT_BASE, align, baseline: 'bottom', dx: align === 'right' ? 4 : 0, dy: -4 },
        encoding: { x: e.x('x'), y: e.y('ytop'), text: { field: 'label' } },
      },
    ],
  };
}

/** Metal slab, interface line and the two region labels. */
function frameLayers(result: ContactResult, frame: DiagramFrame, e: Encoders): Layer[] {
  const { xLeft } = frame;
  const text = (label: string, align: 'left' | 'right', dx: number): Layer => ({
    data: { values: [{ x: 0, y: e.yMax, label }] },
    mark: { ...TEXT_BASE, align, baseline: 'top', dx, dy: 6, fontWeight: 'bold' },
    encoding: { x: e.x('x'), y: e.y('y'), text: { field: 'label' } },
  });
  return [
    // metal slab: occupied states up to E_F
    {
      data: { values: [{ x1: xLeft, x2: 0, y1: e.yMin, y2: 0 }] },
      mark: { type: 'rect', color: '#dcdcdc', opacity: 0.8 },
      encoding: { x: e.x('x1'), x2: { field: 'x2' }, y: e.y('y1'), y2: { field: 'y2' } },
    },
    {
      data: { values: [{ x: 0, y: e.yMin, label: 'filled metal states' }] },
      mark: { ...TEXT_BASE, align: 'right', baseline: 'bottom', dx: -6, dy: -4, color: '#555555', fontSize: 10 },
      encoding: { x: e.x('x'), y: e.y('y'), text: { field: 'label' } },
    },
    {
      data: { values: [{ x: 0, y1: e.yMin, y2: e.yMax }] },
      mark: { type: 'rule', color: '#999999', strokeWidth: 1 },
      encoding: { x: e.x('x'), y: e.y('y1'), y2: { field: 'y2' } },
    },
    text(`metal (${result.metal})`, 'right', -6),
    text(`support (${result.support})`, 'left', 6),
  ];
}

/** The level lines, coloured and dashed by series (the localised level only when the support has one). */
function levelLayer(levels: readonly LevelPoint[], e: Encoders, withLocalised: boolean): Layer {
  const domain: string[] = [BAND_SERIES.vacuum, BAND_SERIES.conduction, BAND_SERIES.valence, BAND_SERIES.fermi];
  const colours: string[] = [PALETTE.purple, PALETTE.blue, PALETTE.orange, PALETTE.ink];
  const dashes: number[][] = [[2, 3], [1, 0], [1, 0], [7, 4]];
  if (withLocalised) {
    domain.push(BAND_SERIES.localised);
    colours.push(PALETTE.brown);
    dashes.push([4, 2, 1, 2]);
  }
  const legend = { title: 'level', orient: 'bottom' as const, direction: 'horizontal' as const, columns: withLocalised ? 3 : 4, labelLimit: 240 };
  return {
    data: { values: levels },
    mark: { type: 'line', strokeWidth: 2, interpolate: 'linear' },
    encoding: {
      x: e.x('x_nm'),
      y: e.y('energy_eV'),
      order: { field: 'order', type: 'quantitative' },
      color: { field: 'series', type: 'nominal', scale: { domain, range: colours }, legend },
      strokeDash: { field: 'series', type: 'nominal', scale: { domain, range: dashes }, legend },
    },
  };
}

/** Barrier (E_F to the band edge at the interface) and band bending (bulk E_C to E_C(0)) annotations. */
function barrierLayers(result: ContactResult, pts: readonly SupportPoint[], frame: DiagramFrame, e: Encoders): Layer[] {
  const ec0 = pts[0]!.ec;
  const hole = result.barrierCarrier === 'hole';
  const barrierEdge = hole ? pts[0]!.ev : ec0;
  const barrierText = `${hole ? 'hole barrier' : 'barrier'} ${formatNumber(result.barrierHeight_eV)} eV`;
  const bendingText = `band bending ${formatSigned(result.bandBending_eV)} eV`;
  const xBending = frame.at(0.93);
  return [
    labelledRule(e, -frame.at(0.125), 0, barrierEdge, barrierText, PALETTE.red, 'center'),
    {
      data: { values: [{ x1: 0, x2: xBending, y: ec0 }] },
      mark: { type: 'rule', color: PALETTE.grey, strokeDash: [1, 3], strokeWidth: 1.5 },
      encoding: { x: e.x('x1'), x2: { field: 'x2' }, y: e.y('y') },
    },
    labelledRule(e, xBending, result.fermiLevelBelowConduction_eV, ec0, bendingText, PALETTE.green, 'right'),
  ];
}

/** Energy of the charge-neutrality level at the interface relative to E_F, eV (null without interface states). */
function neutralLevelEnergy(result: ContactResult, pts: readonly SupportPoint[]): number | null {
  const it = result.interfaceStates;
  return it === null ? null : pts[0]!.ev + it.neutralLevelAboveValence_eV;
}

/** The charge-neutrality level as a short teal bar next to the interface, labelled "CNL" (interface-state model only). */
function interfaceStateLayers(result: ContactResult, pts: readonly SupportPoint[], frame: DiagramFrame, e: Encoders): Layer[] {
  const level = neutralLevelEnergy(result, pts);
  if (level === null) return [];
  return [
    {
      data: { values: [{ x1: 0, x2: frame.at(0.12), y: level, label: 'CNL' }] },
      layer: [
        { mark: { type: 'rule', color: PALETTE.teal, strokeWidth: 4 }, encoding: { x: e.x('x1'), x2: { field: 'x2' }, y: e.y('y') } },
        {
          mark: { ...TEXT_BASE, align: 'left', baseline: 'bottom', dx: 2, dy: -3, color: '#2a6f6b', fontSize: 10 },
          encoding: { x: e.x('x1'), y: e.y('y'), text: { field: 'label' } },
        },
      ],
    },
  ];
}

/**
 * Subtitle lines of the band diagram: the model, then (when present) the interface-state charge (Q_it / q per nm^2,
 * + when the states gave electrons to the metal) with the electrons they passed to the particle, the ionised share of
 * surface donors, and the occupancy
 * of the localised level in the bulk and at the interface.
 */
function diagramSubtitle(result: ContactResult, localised: LocalisedLevelView | null): string[] {
  const lines = [`energies relative to the Fermi level; ${result.statistics} statistics, ${result.barrierModel} barrier model`];
  const it = result.interfaceStates;
  if (it !== null) {
    const perNm2 = it.interfaceStateCharge_C_per_m2 / Q_ELEMENTARY_C / 1e18;
    lines.push(
      `interface states (CNL ${formatNumber(it.neutralLevelAboveValence_eV)} eV above E_V): charge ${formatSigned(perNm2)} q/nm², ` +
        `${formatSigned(it.electronsFromInterfaceStates)} electrons to the particle`,
    );
    if (it.surfaceDonors_per_cm2 > 0) {
      lines.push(
        `surface donors ${formatNumber(it.surfaceDonorLevel_eV!)} eV below E_C: ${formatNumber(100 * (it.surfaceDonorsIonisedFraction ?? 0), 2)}% of ` +
          `${formatNumber(it.surfaceDonors_per_cm2, 2)} cm⁻² ionised (in the interface-state charge)`,
      );
    }
  }
  if (localised !== null) {
    const pct = (f: number) => `${formatNumber(100 * f, 2)}%`;
    lines.push(
      `localised level ${formatNumber(localised.depth_eV)} eV below E_C: ${pct(localised.bulkOccupancy)} of the sites occupied in the bulk, ` +
        `${pct(localised.interfaceOccupancy)} at the interface`,
    );
  }
  return lines;
}

/**
 * Band diagram across the metal | support interface. Position x in nm: the metal is a short slab at
 * x < 0 (Fermi level and vacuum level E_vac = work function), the support at x >= 0 from the profile.
 * Energies are relative to the Fermi level (E_F = 0). Annotated: the barrier (E_F to E_C(0), or to E_V(0)
 * for a hole barrier) at the interface, the band bending (bulk E_C to E_C(0)), and when the model has them the
 * charge-neutrality level with the interface-state charge and the localised level with its occupancy.
 */
export function bandDiagramSpec(result: ContactResult, opts: BandDiagramOptions = {}): TopLevelSpec {
  const pts = supportPoints(result);
  if (pts.length === 0) throw new Error('bandDiagramSpec: the profile has no finite points');
  const frame = diagramFrame(pts, opts.logDepth === true);
  const localised = localisedLevelOf(result);
  const levels = diagramLevels(result, pts, frame, localised);
  const cnl = neutralLevelEnergy(result, pts);
  const energies = [...levels.map((l) => l.energy_eV), ...(cnl === null ? [] : [cnl])];
  const yMin = Math.floor((Math.min(minOf(energies), 0) - 0.6) * 2) / 2;
  const yMax = Math.ceil((Math.max(maxOf(energies), result.metalWorkFunction_eV) + 0.8) * 2) / 2;
  const e = diagramEncoders(frame, yMin, yMax);
  const layer: Layer[] = [
    ...frameLayers(result, frame, e),
    levelLayer(levels, e, localised !== null),
    ...barrierLayers(result, pts, frame, e),
    ...interfaceStateLayers(result, pts, frame, e),
  ];
  return {
    $schema: SCHEMA,
    title: {
      text: `Band diagram: ${result.metal} | ${result.support} at ${formatNumber(result.temperature_K, 4)} K`,
      subtitle: diagramSubtitle(result, localised),
    },
    width: opts.width ?? 620,
    height: opts.height ?? 380,
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
