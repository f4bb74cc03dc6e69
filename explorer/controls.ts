/// <reference lib="dom" />
// The input controls of the explorer page, generated from the parameter table (src/inputs/parameters.ts):
// one control per row, with its unit and allowed range; numbers get a text field and a slider (logarithmic for
// densities, pressures and other inputs spanning several decades). An empty field means "not given": the
// library value or the default is used, shown as the field's placeholder.
import { formatNumber } from '../src/output/format.js';
import { PARAMETERS, displayUnitOf, helpText, toDisplay, type ParameterRow } from '../src/inputs/parameters.js';
import type { Catalog, InputValues, MaterialName, RowInfo } from './protocol.js';

/** Groups of the form, in order; rows not listed (added later to the table) land in the last group. */
const GROUPS: readonly { title: string; open: boolean; options: readonly string[] }[] = [
  { title: 'Metal', open: true, options: ['metal', 'workFunction', 'workFunctionShift', 'workFunctionShiftSource'] },
  {
    title: 'Support',
    open: true,
    options: ['support', 'supportFormula', 'bandGap', 'electronAffinity', 'supportWorkFunction', 'permittivity', 'opticalPermittivity', 'permittivityNonlinearity', 'electronMass', 'holeMass'],
  },
  { title: 'Conditions', open: true, options: ['temperature'] },
  { title: 'Donors and acceptors', open: true, options: ['donors', 'donorType', 'donorLevel', 'donorLevel2', 'acceptors', 'acceptorLevel', 'localisedSites', 'localisedLevel'] },
  { title: 'Reduction pretreatment (sets the donors)', open: false, options: ['reductionTemperature', 'oxygenPressure', 'hydrogenToWater', 'reductionEnthalpy', 'reductionEntropy', 'oxygenSites'] },
  {
    title: 'Barrier and interface states',
    open: true,
    options: ['barrierModel', 'pinningFactor', 'neutralLevel', 'barrier', 'neutralLevelAboveValence', 'interfaceStateDensity', 'interfaceLayerThickness', 'interfaceLayerPermittivity', 'surfaceDonors', 'surfaceDonorLevel'],
  },
  { title: 'Geometry', open: true, options: ['geometry', 'particleDiameter', 'particleDensity', 'supportThickness'] },
  { title: 'Statistics and numerics', open: false, options: ['statistics', 'refinement'] },
  { title: 'More inputs', open: false, options: [] },
];

/** Rows the page does not offer: extra materials files (no file system) and the Monte Carlo sampling. */
export const NOT_ON_PAGE: ReadonlySet<string> = new Set(['materials', 'uncertainty', 'seed']);

/** The rows on the page. */
export const PAGE_ROWS: readonly ParameterRow[] = PARAMETERS.filter((p) => !NOT_ON_PAGE.has(p.option));

const LOG_KINDS = new Set(['volumeDensity', 'arealDensity', 'stateDensityPerArea', 'pressure']);
const SLIDER_STEPS = 1000;

export interface SliderScale {
  lo: number;
  hi: number;
  log: boolean;
}

/** Slider span of a numeric row in its display unit; log for densities and anything spanning 3+ decades. */
export function sliderScale(p: ParameterRow): SliderScale | undefined {
  if (p.limits === undefined || (p.kind !== 'quantity' && p.kind !== 'integer')) return undefined;
  const lo = toDisplay(p, p.limits[0]);
  const hi = toDisplay(p, p.limits[1]);
  const log = (p.quantity !== undefined && LOG_KINDS.has(p.quantity)) || (lo > 0 && hi / lo >= 1e3);
  return { lo: log && lo <= 0 ? hi / 1e13 : lo, hi, log };
}

/** The text a slider position puts in the field: 3 significant digits, "6.31e17" style for large and small values. */
export function sliderToValue(s: SliderScale, position: number): string {
  const t = position / SLIDER_STEPS;
  const v = s.log ? 10 ** (Math.log10(s.lo) + t * (Math.log10(s.hi) - Math.log10(s.lo))) : s.lo + t * (s.hi - s.lo);
  return formatNumber(v, 3);
}

export function valueToSlider(s: SliderScale, value: number): number {
  const t = s.log ? (Math.log10(Math.max(value, s.lo)) - Math.log10(s.lo)) / (Math.log10(s.hi) - Math.log10(s.lo)) : (value - s.lo) / (s.hi - s.lo);
  return Math.round(Math.min(1, Math.max(0, t)) * SLIDER_STEPS);
}

/** "donor density" for a row (its provenance label), else the option name in words. */
export function rowTitle(p: ParameterRow): string {
  if (p.label !== undefined) return p.label;
  return p.option.replace(/([A-Z])/g, ' $1').toLowerCase();
}

function rangeText(p: ParameterRow): string {
  const unit = displayUnitOf(p).unit;
  if (p.choices) return `one of ${p.choices.join(', ')}`;
  if (p.option === 'metal' || p.option === 'support') return 'from the built-in library';
  if (p.limits === undefined) return p.kind === 'text' ? 'text' : '';
  return `${formatNumber(toDisplay(p, p.limits[0]))} – ${formatNumber(toDisplay(p, p.limits[1]))}${unit ? ` ${unit}` : ''}`;
}

export interface Control {
  row: ParameterRow;
  root: HTMLElement;
  /** the text field or select holding the value ('' = not given) */
  field: HTMLInputElement | HTMLSelectElement;
  slider?: HTMLInputElement;
  scale?: SliderScale;
  info: HTMLElement;
}

function selectOf(id: string, first: string, names: readonly (string | MaterialName)[]): HTMLSelectElement {
  const select = document.createElement('select');
  select.id = id;
  const blank = new Option(first, '');
  select.append(blank);
  for (const n of names) select.append(typeof n === 'string' ? new Option(n, n) : new Option(`${n.name} — ${n.fullName}`, n.name));
  return select;
}

function fieldOf(p: ParameterRow, id: string, catalog: Catalog): HTMLInputElement | HTMLSelectElement {
  if (p.option === 'metal') return selectOf(id, '(custom: give the work function)', catalog.metals);
  if (p.option === 'support') return selectOf(id, '(custom: give its properties)', catalog.supports);
  if (p.choices) return selectOf(id, '(default)', p.choices);
  const input = document.createElement('input');
  input.type = 'text';
  input.id = id;
  input.autocomplete = 'off';
  input.spellcheck = false;
  return input;
}

function buildControl(p: ParameterRow, catalog: Catalog): Control {
  const root = document.createElement('div');
  root.className = 'control';
  root.dataset['option'] = p.option;
  root.title = helpText(p);
  const id = `in-${p.option}`;
  const label = document.createElement('label');
  label.htmlFor = id;
  label.textContent = rowTitle(p);
  const field = fieldOf(p, id, catalog);
  const entry = document.createElement('div');
  entry.className = 'entry';
  entry.append(field);
  const unit = displayUnitOf(p).unit;
  if (unit !== '' && (p.kind === 'quantity' || p.kind === 'integer')) {
    const u = document.createElement('span');
    u.className = 'unit';
    u.textContent = unit;
    entry.append(u);
  }
  if (field instanceof HTMLInputElement) {
    const clear = document.createElement('button');
    clear.type = 'button';
    clear.className = 'clear';
    clear.textContent = '×';
    clear.title = 'leave out: use the library value or the default';
    clear.setAttribute('aria-label', `leave out ${rowTitle(p)}`);
    entry.append(clear);
  }
  const range = document.createElement('div');
  range.className = 'range';
  range.textContent = rangeText(p);
  const info = document.createElement('div');
  info.className = 'info';
  root.append(label, entry);
  const control: Control = { row: p, root, field, info };
  const scale = sliderScale(p);
  if (scale !== undefined) {
    const slider = document.createElement('input');
    slider.type = 'range';
    slider.min = '0';
    slider.max = String(SLIDER_STEPS);
    slider.className = scale.log ? 'slider log' : 'slider';
    slider.setAttribute('aria-label', `${rowTitle(p)} slider${scale.log ? ' (logarithmic)' : ''}`);
    root.append(slider);
    control.slider = slider;
    control.scale = scale;
  }
  root.append(range, info);
  return control;
}

/** Build the grouped form into `host`; returns the controls by option name. */
export function buildControls(host: HTMLElement, catalog: Catalog): Map<string, Control> {
  const controls = new Map<string, Control>();
  const listed = new Set(GROUPS.flatMap((g) => g.options));
  for (const group of GROUPS) {
    const rows = group.options.length > 0 ? PAGE_ROWS.filter((p) => group.options.includes(p.option)) : PAGE_ROWS.filter((p) => !listed.has(p.option));
    if (rows.length === 0) continue;
    const details = document.createElement('details');
    details.open = group.open;
    const summary = document.createElement('summary');
    summary.textContent = group.title;
    details.append(summary);
    for (const p of rows) {
      const control = buildControl(p, catalog);
      controls.set(p.option, control);
      details.append(control.root);
    }
    host.append(details);
  }
  return controls;
}

/** Put the inputs into the fields (and sliders). */
export function setFields(controls: Map<string, Control>, inputs: InputValues): void {
  for (const [option, c] of controls) {
    const value = inputs[option] ?? '';
    // a name the list does not spell that way (an alias such as "ceria"): offered as it was given
    if (c.field instanceof HTMLSelectElement && value !== '' && !Array.from(c.field.options).some((o) => o.value === value)) c.field.append(new Option(value, value));
    c.field.value = value;
    if (c.slider && c.scale && inputs[option] !== undefined && Number.isFinite(Number(inputs[option]))) c.slider.value = String(valueToSlider(c.scale, Number(inputs[option])));
  }
}

/** The inputs as given in the fields (empty fields left out). */
export function readFields(controls: Map<string, Control>): InputValues {
  const inputs: InputValues = {};
  for (const [option, c] of controls) {
    const v = c.field.value.trim();
    if (v !== '') inputs[option] = v;
  }
  return inputs;
}

function usedText(info: RowInfo): string {
  const u = info.used!;
  return `used: ${formatNumber(u.value, 4)}${u.unit ? ` ${u.unit}` : ''} (${u.origin}${u.fromMemory ? ', from memory' : ''})`;
}

/** Show what the solve used, the library value with its citation, and grey out inputs that do not apply. */
export function showRowInfo(controls: Map<string, Control>, rows: readonly RowInfo[], inputs: InputValues): void {
  for (const info of rows) {
    const c = controls.get(info.option);
    if (c === undefined) continue;
    c.root.classList.toggle('inapplicable', !info.applicable);
    const parts: HTMLElement[] = [];
    if (info.used !== undefined) {
      const used = document.createElement('div');
      used.className = 'used';
      used.textContent = usedText(info);
      parts.push(used);
      if (c.field instanceof HTMLInputElement) c.field.placeholder = formatNumber(info.used.value, 4);
      if (c.slider && c.scale && inputs[info.option] === undefined) c.slider.value = String(valueToSlider(c.scale, info.used.value));
    } else if (c.field instanceof HTMLInputElement) {
      c.field.placeholder = info.applicable ? '' : 'not used';
    }
    if (info.library !== undefined) {
      const lib = info.library;
      const cite = document.createElement('div');
      cite.className = 'library';
      const span = lib.min !== undefined && lib.max !== undefined ? ` (range ${formatNumber(lib.min)}–${formatNumber(lib.max)})` : '';
      cite.textContent = `library: ${formatNumber(lib.value, 4)}${lib.unit ? ` ${lib.unit}` : ''}${span} — ${lib.citation}${lib.fromMemory ? ' [from memory, unverified]' : ''}`;
      parts.push(cite);
    }
    c.info.replaceChildren(...parts);
  }
}
