/// <reference lib="dom" />
// A few lines of SVG plotting for the explorer page: elements, linear and log scales, ticks, axes, polylines.
import { formatNumber } from '../src/output/format.js';

const SVG_NS = 'http://www.w3.org/2000/svg';

export type Attrs = Record<string, string | number>;

export function el<K extends keyof SVGElementTagNameMap>(tag: K, attrs: Attrs = {}, text?: string): SVGElementTagNameMap[K] {
  const node = document.createElementNS(SVG_NS, tag);
  for (const [k, v] of Object.entries(attrs)) node.setAttribute(k, String(v));
  if (text !== undefined) node.textContent = text;
  return node;
}

export interface Scale {
  (v: number): number;
  domain: [number, number];
  log: boolean;
}

/** Map [d0, d1] onto [r0, r1], linearly or in log10 (log needs positive domain ends). */
export function scale(domain: [number, number], range: [number, number], log = false): Scale {
  const t = (v: number) => (log ? Math.log10(Math.max(v, Number.MIN_VALUE)) : v);
  const [a, b] = [t(domain[0]), t(domain[1])];
  const span = b - a || 1;
  const f = ((v: number) => range[0] + ((t(v) - a) / span) * (range[1] - range[0])) as Scale;
  f.domain = domain;
  f.log = log;
  return f;
}

/** About `count` round tick values inside [min, max] (1, 2, 5 x 10^k steps; decades on a log scale). */
export function ticks(min: number, max: number, count = 5, log = false): number[] {
  if (log) {
    const lo = Math.ceil(Math.log10(min));
    const hi = Math.floor(Math.log10(max));
    const stride = Math.max(1, Math.ceil((hi - lo + 1) / count));
    const out: number[] = [];
    for (let k = lo; k <= hi; k += stride) out.push(10 ** k);
    return out;
  }
  if (!(max > min)) return [min];
  const raw = (max - min) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(min / step) * step; v <= max + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

/** [min, max] of finite values, widened a little (and made non-empty). */
export function extent(values: readonly number[], pad = 0.05): [number, number] {
  const finite = values.filter((v) => Number.isFinite(v));
  if (finite.length === 0) return [0, 1];
  let lo = Math.min(...finite);
  let hi = Math.max(...finite);
  if (hi === lo) {
    const d = Math.abs(lo) * 0.1 || 1;
    return [lo - d, hi + d];
  }
  const d = (hi - lo) * pad;
  lo -= d;
  hi += d;
  return [lo, hi];
}

export interface Frame {
  width: number;
  height: number;
  left: number;
  right: number;
  top: number;
  bottom: number;
}

/** Axes with ticks and labels for the frame's plot area. */
export function axes(svg: SVGSVGElement, f: Frame, x: Scale, y: Scale, xLabel: string, yLabel: string): void {
  const g = el('g', { class: 'axes' });
  g.append(el('rect', { x: f.left, y: f.top, width: f.width - f.left - f.right, height: f.height - f.top - f.bottom, class: 'plot-area' }));
  for (const v of ticks(x.domain[0], x.domain[1], 6, x.log)) {
    const px = x(v);
    g.append(el('line', { x1: px, x2: px, y1: f.height - f.bottom, y2: f.height - f.bottom + 4, class: 'tick' }));
    g.append(el('text', { x: px, y: f.height - f.bottom + 16, class: 'tick-label', 'text-anchor': 'middle' }, formatNumber(v, 3)));
  }
  for (const v of ticks(Math.min(...y.domain), Math.max(...y.domain), 5, y.log)) {
    const py = y(v);
    g.append(el('line', { x1: f.left - 4, x2: f.left, y1: py, y2: py, class: 'tick' }));
    g.append(el('line', { x1: f.left, x2: f.width - f.right, y1: py, y2: py, class: 'grid' }));
    g.append(el('text', { x: f.left - 6, y: py + 4, class: 'tick-label', 'text-anchor': 'end' }, formatNumber(v, 3)));
  }
  g.append(el('text', { x: (f.left + f.width - f.right) / 2, y: f.height - 4, class: 'axis-label', 'text-anchor': 'middle' }, xLabel));
  g.append(el('text', { x: 12, y: (f.top + f.height - f.bottom) / 2, class: 'axis-label', 'text-anchor': 'middle', transform: `rotate(-90 12 ${(f.top + f.height - f.bottom) / 2})` }, yLabel));
  svg.append(g);
}

/** Polyline through (xs[i], ys[i]); points with a null or non-finite y break the line. */
export function line(xs: readonly number[], ys: readonly (number | null)[], x: Scale, y: Scale, attrs: Attrs): SVGPathElement {
  let d = '';
  let pen = false;
  xs.forEach((xv, i) => {
    const yv = ys[i];
    if (yv === null || yv === undefined || !Number.isFinite(yv) || !Number.isFinite(xv)) {
      pen = false;
      return;
    }
    d += `${pen ? 'L' : 'M'}${x(xv).toFixed(2)},${y(yv).toFixed(2)}`;
    pen = true;
  });
  return el('path', { d, fill: 'none', ...attrs });
}

export function newSvg(f: Frame, label: string): SVGSVGElement {
  return el('svg', { viewBox: `0 0 ${f.width} ${f.height}`, width: f.width, height: f.height, role: 'img', 'aria-label': label, class: 'chart' });
}
