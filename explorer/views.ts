/// <reference lib="dom" />
// The live views of the explorer page: headline numbers, band diagram, charge and field against depth, sweep.
import { formatNumber } from '../src/output/format.js';
import type { ContactResult } from '../src/types.js';
import type { Swept } from './protocol.js';
import { axes, el, extent, line, newSvg, scale, type Frame, type Scale } from './svg.js';

/** A dotted path into the result ("interfaceStates.layerDrop_eV"); undefined when a parent is missing. */
export function readPath(result: unknown, path: string): unknown {
  let node = result;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  return node;
}

/** label, result path, unit: the numbers shown above the diagrams (3 significant digits, like the CLI summary). */
export const HEADLINE: readonly (readonly [string, string, string])[] = [
  ['barrier height', 'barrierHeight_eV', 'eV'],
  ['band bending', 'bandBending_eV', 'eV'],
  ['direction', 'direction', ''],
  ['width', 'width_nm', 'nm'],
  ['electrons per particle', 'electronsPerParticle', ''],
  ['barrier model', 'barrierModel', ''],
  ['support work function', 'supportWorkFunction_eV', 'eV'],
  ['bulk E_C − E_F', 'fermiLevelBelowConduction_eV', 'eV'],
  ['space charge', 'spaceCharge_C_per_m2', 'C/m²'],
  ['Debye length', 'debyeLength_nm', 'nm'],
  ['interface field', 'interfaceField_V_per_m', 'V/m'],
  ['interface-state charge', 'interfaceStates.interfaceStateCharge_C_per_m2', 'C/m²'],
  ['surface donors ionised', 'interfaceStates.surfaceDonorsIonisedFraction', ''],
  ['donor density', 'donorDensity_cm3', 'cm⁻³'],
  ['equilibration time (log10 s)', 'exchange.equilibrationTimeLog10_s', ''],
];

/** The text the page shows for a result value. */
export function displayValue(value: unknown): string {
  if (typeof value === 'number') return formatNumber(value, 3);
  if (value === null || value === undefined) return 'n/a';
  return String(value);
}

export function renderHeadline(host: HTMLElement, result: ContactResult): void {
  const dl = document.createElement('dl');
  for (const [label, path, unit] of HEADLINE) {
    const value = readPath(result, path);
    if (value === undefined || (value === null && path.includes('.'))) continue;
    const item = document.createElement('div');
    item.className = 'figure';
    const dt = document.createElement('dt');
    dt.textContent = label;
    const dd = document.createElement('dd');
    dd.dataset['path'] = path;
    const number = document.createElement('span');
    number.className = 'value';
    number.textContent = displayValue(value);
    dd.append(number);
    if (unit !== '' && typeof value === 'number') dd.append(` ${unit}`);
    item.append(dt, dd);
    dl.append(item);
  }
  host.replaceChildren(dl);
}

export function renderWarnings(host: HTMLElement, result: ContactResult): void {
  const items = result.warnings.map((w) => {
    const li = document.createElement('li');
    const code = document.createElement('code');
    code.textContent = w.code;
    li.append(code, ` ${w.message}`);
    return li;
  });
  if (items.length === 0) {
    const li = document.createElement('li');
    li.className = 'none';
    li.textContent = 'no warnings';
    items.push(li);
  }
  host.replaceChildren(...items);
}

/** A provenance value of the result by the start of its label (e.g. "donor level"), if used. */
function usedInput(result: ContactResult, field: (f: string) => boolean): number | undefined {
  return result.inputs.find((i) => field(i.field))?.value;
}

const BAND_FRAME: Frame = { width: 700, height: 380, left: 56, right: 72, top: 28, bottom: 40 };

/** Depth shown: where the bands have (nearly) flattened, at least 2 nm. */
function viewDepth(result: ContactResult): number {
  const xs = result.profile.x_nm;
  const last = xs[xs.length - 1] ?? 10;
  return Math.min(last, Math.max(2, 3 * result.chargeDepth90_nm));
}

interface LevelLine {
  label: string;
  cls: string;
  ys: number[];
}

function bandLevels(result: ContactResult, n: number): LevelLine[] {
  const p = result.profile;
  const ec = p.conductionBand_eV.slice(0, n);
  const ev = p.valenceBand_eV.slice(0, n);
  const chi = result.supportWorkFunction_eV - result.fermiLevelBelowConduction_eV;
  const levels: LevelLine[] = [
    { label: 'E_vac', cls: 'vacuum', ys: ec.map((e) => e + chi) },
    { label: 'E_C', cls: 'conduction', ys: ec },
    { label: 'E_V', cls: 'valence', ys: ev },
  ];
  const donorDepth = usedInput(result, (f) => f.startsWith('donor level') && !f.startsWith('donor level 2'));
  if (result.donorDensity_cm3 > 0 && donorDepth !== undefined) levels.push({ label: 'E_D', cls: 'donor', ys: ec.map((e) => e - donorDepth) });
  const donorDepth2 = usedInput(result, (f) => f.startsWith('donor level 2'));
  if (result.donorDensity_cm3 > 0 && donorDepth2 !== undefined) levels.push({ label: 'E_D2', cls: 'donor', ys: ec.map((e) => e - donorDepth2) });
  const sites = usedInput(result, (f) => f.startsWith('localised-electron sites')) ?? 0;
  const localDepth = usedInput(result, (f) => f.startsWith('localised level'));
  if (sites > 0 && localDepth !== undefined) levels.push({ label: 'E_loc', cls: 'localised', ys: ec.map((e) => e - localDepth) });
  const acceptorHeight = usedInput(result, (f) => f.startsWith('acceptor level'));
  if (result.acceptorDensity_cm3 > 0 && acceptorHeight !== undefined) levels.push({ label: 'E_A', cls: 'acceptor', ys: ev.map((e) => e + acceptorHeight) });
  return levels;
}

/** Label positions (px) pushed apart so that no two are closer than `gap`, keeping their order. */
export function spreadLabels(ys: readonly number[], gap = 12): number[] {
  const order = ys.map((y, i) => [y, i] as const).sort((a, b) => a[0] - b[0]);
  const out = new Array<number>(ys.length);
  let last = -Infinity;
  for (const [y, i] of order) {
    last = Math.max(y, last + gap);
    out[i] = last;
  }
  return out;
}

/** The interface-state mark (charge-neutrality level) at the interface, and their charge written in the widest
 * empty stretch of the gap (between E_F and the nearer band edge in the bulk). */
function interfaceMark(svg: SVGSVGElement, result: ContactResult, x: Scale, y: Scale, ev0: number, bulk: { ec: number; ev: number }): void {
  const states = result.interfaceStates;
  if (states === null) return;
  const cnl = ev0 + states.neutralLevelAboveValence_eV;
  svg.append(el('line', { x1: x(0), x2: x(0) + 22, y1: y(cnl), y2: y(cnl), class: 'level cnl' }));
  svg.append(el('text', { x: x(0) - 4, y: y(cnl) + 4, class: 'level-label cnl', 'text-anchor': 'end' }, 'CNL'));
  const yText = bulk.ec > -bulk.ev ? bulk.ec / 2 : bulk.ev / 2;
  const [x0, x1] = x.domain;
  const text = `interface states: Q_it = ${formatNumber(states.interfaceStateCharge_C_per_m2, 3)} C/m², ${formatNumber(states.electronsFromInterfaceStates, 3)} e⁻ per particle`;
  svg.append(el('text', { x: x(x0 + 0.3 * (x1 - x0)), y: y(yText), class: 'note cnl-note' }, text));
}

/** One line under the diagram: barrier, band bending and (with interface states) the charge they hold. */
export function diagramCaption(result: ContactResult): string {
  const parts = [
    `Φ_B = ${formatNumber(result.barrierHeight_eV, 3)} eV for ${result.barrierCarrier}s`,
    `band bending ${formatNumber(result.bandBending_eV, 3)} eV`,
    `metal work function ${formatNumber(result.particleWorkFunction_eV, 3)} eV`,
  ];
  const states = result.interfaceStates;
  if (states !== null) {
    parts.push(
      `interface states hold ${formatNumber(states.interfaceStateCharge_C_per_m2, 3)} C/m² (${formatNumber(states.electronsFromInterfaceStates, 3)} e⁻ per particle), ` +
        `drop across the interfacial layer ${formatNumber(states.layerDrop_eV, 3)} eV`,
    );
  }
  return parts.join(' · ');
}

export function renderBandDiagram(host: HTMLElement, result: ContactResult): void {
  const f = BAND_FRAME;
  const depth = viewDepth(result);
  const n = Math.max(2, result.profile.x_nm.findIndex((v) => v > depth) + 1 || result.profile.x_nm.length);
  const xs = result.profile.x_nm.slice(0, n);
  const levels = bandLevels(result, n);
  const phiM = result.particleWorkFunction_eV;
  const [y0, y1] = extent([...levels.flatMap((l) => l.ys), phiM, 0], 0.08);
  const metalWidth = 0.16 * depth;
  const x = scale([-metalWidth, xs[n - 1]!], [f.left, f.width - f.right]);
  const y = scale([y0, y1], [f.height - f.bottom, f.top]);
  const svg = newSvg(f, 'band diagram');
  axes(svg, f, x, y, 'depth into the support (nm)', 'energy relative to E_F (eV)');
  svg.append(el('rect', { x: x(-metalWidth), y: f.top, width: x(0) - x(-metalWidth), height: f.height - f.top - f.bottom, class: 'metal' }));
  svg.append(el('text', { x: (x(-metalWidth) + x(0)) / 2, y: f.height - f.bottom - 8, class: 'metal-label', 'text-anchor': 'middle' }, result.metal));
  svg.append(el('line', { x1: x(-metalWidth), x2: x(0), y1: y(phiM), y2: y(phiM), class: 'level vacuum' }));
  svg.append(el('line', { x1: x(0), x2: x(0), y1: y(phiM), y2: y(levels[0]!.ys[0]!), class: 'level vacuum step' }));
  svg.append(el('line', { x1: x(-metalWidth), x2: x(xs[n - 1]!), y1: y(0), y2: y(0), class: 'level fermi' }));
  const labelled = [{ label: 'E_F', cls: 'fermi', ys: [0] }, ...levels];
  const labelY = spreadLabels(labelled.map((l) => y(l.ys[l.ys.length - 1]!) + 4));
  for (const level of levels) svg.append(line(xs, level.ys, x, y, { class: `level ${level.cls}` }));
  labelled.forEach((level, i) => svg.append(el('text', { x: f.width - f.right + 4, y: labelY[i]!, class: `level-label ${level.cls}` }, level.label)));
  interfaceMark(svg, result, x, y, levels[2]!.ys[0]!, { ec: levels[1]!.ys[n - 1]!, ev: levels[2]!.ys[n - 1]! });
  const caption = document.createElement('p');
  caption.className = 'caption';
  caption.textContent = diagramCaption(result);
  host.replaceChildren(svg, caption);
}

const SMALL_FRAME: Frame = { width: 700, height: 190, left: 72, right: 24, top: 14, bottom: 38 };

function profilePlot(xs: number[], ys: number[], yLabel: string, cls: string, label: string): SVGSVGElement {
  const f = SMALL_FRAME;
  const x = scale([0, xs[xs.length - 1]!], [f.left, f.width - f.right]);
  const y = scale(extent([...ys, 0]), [f.height - f.bottom, f.top]);
  const svg = newSvg(f, label);
  axes(svg, f, x, y, 'depth into the support (nm)', yLabel);
  svg.append(el('line', { x1: f.left, x2: f.width - f.right, y1: y(0), y2: y(0), class: 'zero' }));
  svg.append(line(xs, ys, x, y, { class: `trace ${cls}` }));
  return svg;
}

export function renderChargeField(host: HTMLElement, result: ContactResult): void {
  const depth = viewDepth(result);
  const p = result.profile;
  const n = Math.max(2, p.x_nm.findIndex((v) => v > depth) + 1 || p.x_nm.length);
  const xs = p.x_nm.slice(0, n);
  const charge = p.chargeDensity_C_per_m3.slice(0, n).map((q) => q * 1e-6);
  const field = p.field_V_per_m.slice(0, n).map((e) => e * 1e-8);
  host.replaceChildren(
    profilePlot(xs, charge, 'ρ (C/cm³)', 'charge', 'space-charge density against depth'),
    profilePlot(xs, field, 'field (MV/cm)', 'field', 'electric field against depth'),
  );
}

const SWEEP_FRAME: Frame = { width: 700, height: 300, left: 72, right: 24, top: 16, bottom: 40 };

export function renderSweep(host: HTMLElement, swept: Swept, xLabel: string, yLabel: string, log: boolean): void {
  const f = SWEEP_FRAME;
  const ys = swept.ys.filter((v): v is number => v !== null);
  const x = scale([swept.xs[0]!, swept.xs[swept.xs.length - 1]!], [f.left, f.width - f.right], log);
  const y = scale(extent(ys), [f.height - f.bottom, f.top]);
  const svg = newSvg(f, 'sweep');
  axes(svg, f, x, y, xLabel, yLabel);
  svg.append(line(swept.xs, swept.ys, x, y, { class: 'trace sweep' }));
  swept.xs.forEach((xv, i) => {
    const yv = swept.ys[i];
    if (yv !== null && yv !== undefined) svg.append(el('circle', { cx: x(xv), cy: y(yv), r: 2.5, class: 'point' }));
  });
  host.replaceChildren(svg);
}
