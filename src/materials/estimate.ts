// Estimate of an oxide's electron affinity from atomic data: the geometric-mean Mulliken
// electronegativity method (Butler & Ginley, J. Electrochem. Soc. 125, 228 (1978); the compilation
// and its comparison with measured flat-band potentials is Xu & Schoonen, Am. Mineral. 85, 543 (2000)).
//
//   chi_atom = (IE + EA) / 2                   per element, eV
//   chi      = (prod chi_i^n_i)^(1/N)          N = total number of atoms in the formula
//   EA_solid = chi - Eg / 2                    conduction-band edge below the vacuum level
//
// Atomic first ionisation energies and electron affinities come from the `periodic-table` npm
// package data (kJ/mol). That data gives the electron affinity as the energy change on attaching an
// electron (O: -141 kJ/mol, energy released), so the conventional electron affinity is its negative
// (O: +1.461 eV). Elements listed with 0 (e.g. Zn, Mg) enter with EA = 0.
import { createRequire } from 'node:module';
import { InputError, requireInRange } from '../errors.js';
import { N_AVOGADRO_PER_MOL, Q_ELEMENTARY_C } from '../constants.js';
import type { InputProvenance } from './types.js';

/** kJ/mol per eV (N_A e / 1000 = 96.485...). */
export const KJ_PER_MOL_PER_EV = (N_AVOGADRO_PER_MOL * Q_ELEMENTARY_C) / 1000;

/**
 * Scatter of the method against measured band edges, eV. Xu & Schoonen (2000) compare calculated
 * conduction-band edges with measured flat-band potentials; the spread is a few tenths of an eV for
 * most oxides and larger for some (from memory of that comparison, verify). Used as the ± range
 * attached to an estimate.
 */
export const ESTIMATE_SCATTER_eV = 0.5;

export const ESTIMATE_SOURCE = 'butler1978';
export const ESTIMATE_CITATION = 'Butler & Ginley, J. Electrochem. Soc. 125, 228 (1978), doi:10.1149/1.2131419';

interface RawElement {
  symbol: string;
  name: string;
  ionizationEnergy: number | string;
  electronAffinity: number | string;
}

const require = createRequire(import.meta.url);
// loaded on first use (start-up time of the command line); a constant table once loaded
let elementsMemo: Record<string, RawElement> | undefined;
const elements = (): Record<string, RawElement> => (elementsMemo ??= (require('periodic-table') as { symbols: Record<string, RawElement> }).symbols);

export interface ElementTerm {
  symbol: string;
  count: number;
  ionizationEnergy_eV: number;
  electronAffinity_eV: number;
  /** Mulliken electronegativity (IE + EA)/2, eV */
  mulliken_eV: number;
}

export interface ElectronAffinityEstimate {
  formula: string;
  electronAffinity_eV: number;
  /** geometric-mean electronegativity of the compound (the mid-gap energy below vacuum), eV */
  electronegativity_eV: number;
  bandGap_eV: number;
  elements: ElementTerm[];
  provenance: InputProvenance;
}

// ---------------------------------------------------------------------------------------------
// formula parser: elements with integer or fractional counts, nested parentheses with multipliers

function parseCount(src: string, pos: number): [number, number] {
  const m = /^(\d+(?:\.\d*)?|\.\d+)/.exec(src.slice(pos));
  if (!m) return [1, pos];
  return [Number(m[1]), pos + m[1]!.length];
}

function addInto(target: Map<string, number>, symbol: string, n: number): void {
  target.set(symbol, (target.get(symbol) ?? 0) + n);
}

function parseGroup(src: string, pos: number, depth: number): [Map<string, number>, number] {
  const counts = new Map<string, number>();
  while (pos < src.length) {
    const ch = src[pos]!;
    if (ch === '(') {
      const [inner, next] = parseGroup(src, pos + 1, depth + 1);
      if (src[next] !== ')') throw new InputError('formula', `"${src}": missing ")"`);
      const [mult, after] = parseCount(src, next + 1);
      for (const [s, n] of inner) addInto(counts, s, n * mult);
      pos = after;
    } else if (ch === ')') {
      if (depth === 0) throw new InputError('formula', `"${src}": unexpected ")" at position ${pos + 1}`);
      return [counts, pos];
    } else if (/[A-Z]/.test(ch)) {
      const m = /^[A-Z][a-z]?/.exec(src.slice(pos))!;
      const symbol = m[0];
      const [n, after] = parseCount(src, pos + symbol.length);
      addInto(counts, symbol, n);
      pos = after;
    } else {
      throw new InputError('formula', `"${src}": unexpected character "${ch}" at position ${pos + 1}`);
    }
  }
  if (depth > 0) throw new InputError('formula', `"${src}": missing ")"`);
  return [counts, pos];
}

/** Element counts of a formula such as "Ce0.8Zr0.2O2" or "(Ce0.5Zr0.5)O2", in order of appearance. */
export function parseFormula(formula: string): Map<string, number> {
  const src = formula.replace(/\s+/g, '');
  if (src === '') throw new InputError('formula', 'empty formula');
  const [counts] = parseGroup(src, 0, 0);
  for (const [symbol, n] of counts) {
    if (!Number.isFinite(n) || n <= 0) throw new InputError('formula', `"${formula}": count of ${symbol} must be positive`);
  }
  return counts;
}

// ---------------------------------------------------------------------------------------------
// atomic data

function numeric(v: number | string): number | undefined {
  if (typeof v === 'number') return Number.isFinite(v) ? v : undefined;
  if (v.trim() === '') return undefined;
  const n = Number(v);
  return Number.isFinite(n) ? n : undefined;
}

/** First ionisation energy and electron affinity (conventional sign: positive = bound anion), eV. */
export function atomicEnergies(symbol: string): { ionizationEnergy_eV: number; electronAffinity_eV: number } {
  const el = Object.prototype.hasOwnProperty.call(elements(), symbol) ? elements()[symbol] : undefined;
  if (el === undefined) throw new InputError('formula', `unknown element "${symbol}"`);
  const ie = numeric(el.ionizationEnergy);
  const ea = numeric(el.electronAffinity);
  if (ie === undefined) throw new InputError('formula', `no ionisation energy for element ${symbol} (${el.name}) in the atomic data`);
  if (ea === undefined) throw new InputError('formula', `no electron affinity for element ${symbol} (${el.name}) in the atomic data`);
  return { ionizationEnergy_eV: ie / KJ_PER_MOL_PER_EV, electronAffinity_eV: -ea / KJ_PER_MOL_PER_EV };
}

/** Mulliken electronegativity (IE + EA)/2 of an element, eV. */
export function mullikenElectronegativity(symbol: string): number {
  const { ionizationEnergy_eV, electronAffinity_eV } = atomicEnergies(symbol);
  return (ionizationEnergy_eV + electronAffinity_eV) / 2;
}

// ---------------------------------------------------------------------------------------------

/** Geometric-mean electronegativity estimate of a compound's electron affinity (flagged as an estimate). */
export function estimateElectronAffinity(formula: string, bandGap_eV: number): ElectronAffinityEstimate {
  requireInRange('bandGap_eV', bandGap_eV, 0, 12, 'eV');
  const counts = parseFormula(formula);
  const elements: ElementTerm[] = [...counts].map(([symbol, count]) => {
    const e = atomicEnergies(symbol);
    const mulliken_eV = (e.ionizationEnergy_eV + e.electronAffinity_eV) / 2;
    if (!(mulliken_eV > 0)) throw new InputError('formula', `element ${symbol} has a non-positive electronegativity`);
    return { symbol, count, ...e, mulliken_eV };
  });
  const total = elements.reduce((s, e) => s + e.count, 0);
  const logMean = elements.reduce((s, e) => s + e.count * Math.log(e.mulliken_eV), 0) / total;
  const electronegativity_eV = Math.exp(logMean);
  const electronAffinity_eV = electronegativity_eV - bandGap_eV / 2;
  const provenance: InputProvenance = {
    field: 'electronAffinity_eV',
    value: electronAffinity_eV,
    unit: 'eV',
    min: electronAffinity_eV - ESTIMATE_SCATTER_eV,
    max: electronAffinity_eV + ESTIMATE_SCATTER_eV,
    origin: 'estimate',
    source: ESTIMATE_SOURCE,
    citation: ESTIMATE_CITATION,
    note:
      `estimate: geometric-mean Mulliken electronegativity of ${formula} (${electronegativity_eV.toFixed(3)} eV) minus Eg/2 ` +
      `(Eg = ${bandGap_eV} eV); atomic IE/EA from the periodic-table package; range = ±${ESTIMATE_SCATTER_eV} eV method scatter`,
    fromMemory: false,
  };
  return { formula, electronAffinity_eV, electronegativity_eV, bandGap_eV, elements, provenance };
}
