// Shareable state of the explorer page: the URL query (every input and the sweep), the equivalent
// `bandbend contact ...` command line, and the study file of the current sweep. Pure functions, no DOM.
import { DISPLAY_UNITS, PARAMETERS, flagName, type ParameterRow } from '../src/inputs/parameters.js';
import type { SweepAxis as StudyAxis, Study } from '../src/study/studyFile.js';
import type { InputValues, SweepAxis } from './protocol.js';

/** The sweep settings of the page. */
export interface SweepSettings extends SweepAxis {
  /** the study output path plotted on y */
  output: string;
}

export interface PageState {
  inputs: InputValues;
  sweep: SweepSettings;
}

export const MAX_SWEEP_POINTS = 400;
const SWEEP_KEYS = { option: 'sweep.x', from: 'sweep.from', to: 'sweep.to', points: 'sweep.points', log: 'sweep.log', output: 'sweep.y' } as const;

const ROW_BY_OPTION = new Map<string, ParameterRow>(PARAMETERS.map((p) => [p.option, p]));

/** The study axis of the page's sweep (numbers in the field's default unit, which is its display unit). */
export function studyAxis(axis: SweepAxis): StudyAxis {
  const range = { from: axis.from, to: axis.to, points: Math.max(2, Math.min(MAX_SWEEP_POINTS, Math.round(axis.points))) };
  return axis.log ? { field: axis.option, log: range } : { field: axis.option, linear: range };
}

/** State -> URL query string ("?metal=Pt&donors=1e17&sweep.x=donors..."); inputs in table order. */
export function toQuery(state: PageState): string {
  const q = new URLSearchParams();
  for (const p of PARAMETERS) {
    const v = state.inputs[p.option];
    if (v !== undefined) q.set(p.option, v);
  }
  const s = state.sweep;
  q.set(SWEEP_KEYS.option, s.option);
  q.set(SWEEP_KEYS.from, String(s.from));
  q.set(SWEEP_KEYS.to, String(s.to));
  q.set(SWEEP_KEYS.points, String(s.points));
  q.set(SWEEP_KEYS.log, s.log ? '1' : '0');
  q.set(SWEEP_KEYS.output, s.output);
  return `?${q.toString()}`;
}

/** URL query -> state; unknown keys are ignored, missing sweep settings take `defaults`. */
export function fromQuery(query: string, defaults: SweepSettings): PageState {
  const q = new URLSearchParams(query);
  const inputs: InputValues = {};
  for (const [key, value] of q) {
    if (ROW_BY_OPTION.has(key) && value.trim() !== '') inputs[key] = value;
  }
  const num = (key: string, fallback: number): number => {
    const v = Number(q.get(key));
    return q.has(key) && Number.isFinite(v) ? v : fallback;
  };
  const sweep: SweepSettings = {
    option: q.get(SWEEP_KEYS.option) ?? defaults.option,
    from: num(SWEEP_KEYS.from, defaults.from),
    to: num(SWEEP_KEYS.to, defaults.to),
    points: num(SWEEP_KEYS.points, defaults.points),
    log: q.has(SWEEP_KEYS.log) ? q.get(SWEEP_KEYS.log) === '1' : defaults.log,
    output: q.get(SWEEP_KEYS.output) ?? defaults.output,
  };
  return { inputs, sweep };
}

/** A bare number typed for a quantity gets the row's display unit written out ("1e17" -> "1e17 cm^-3"). */
export function withUnit(option: string, text: string): string {
  const p = ROW_BY_OPTION.get(option);
  const trimmed = text.trim();
  if (p?.kind !== 'quantity' || p.quantity === undefined || p.quantity === 'dimensionless') return trimmed;
  const unit = DISPLAY_UNITS[p.quantity].unit;
  return unit !== '' && trimmed !== '' && Number.isFinite(Number(trimmed)) ? `${trimmed} ${unit}` : trimmed;
}

/** POSIX shell quoting: plain words stay as they are, anything else goes in single quotes. */
export function shellQuote(word: string): string {
  if (/^[A-Za-z0-9_.,:+\-/=@%]+$/.test(word)) return word;
  return `'${word.replace(/'/g, `'\\''`)}'`;
}

/** The equivalent command line, flags in table order, values with their units. */
export function commandLine(inputs: InputValues): string {
  const words = ['bandbend', 'contact'];
  for (const p of PARAMETERS) {
    const v = inputs[p.option];
    if (v !== undefined) words.push(flagName(p), shellQuote(withUnit(p.option, v)));
  }
  return words.join(' ');
}

const STUDY_OUTPUTS = ['bandBending_eV', 'barrierHeight_eV', 'direction', 'electronsPerParticle', 'width_nm', 'warnings'];

/** The study file (bandbend study FILE) of the current sweep: the inputs as its base, the sweep as its one axis. */
export function studyFile(state: PageState): Study {
  const base: Record<string, string> = {};
  for (const p of PARAMETERS) {
    const v = state.inputs[p.option];
    if (v !== undefined && p.option !== state.sweep.option) base[p.option] = withUnit(p.option, v);
  }
  return {
    name: `explorer-sweep-${state.sweep.option}`,
    description: `Sweep of ${state.sweep.option} saved by the bandbend explorer page`,
    base,
    sweep: { mode: 'product', axes: [studyAxis(state.sweep)] },
    outputs: [...new Set([state.sweep.output, ...STUDY_OUTPUTS])] as Study['outputs'],
  };
}
