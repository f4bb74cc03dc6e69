// Unit parsing at the edges: user strings become SI (or the project's working unit) here and nowhere else.
//
// The grammar is strict and nothing is evaluated:
//   quantity := number [unit]
//   number   := [+-] digits [. digits] [e [+-] digits]     (or .digits; decimal only)
//   unit     := ["/" | "per"] term { ("*" | "·" | " " | "/" | "per") term }
//   term     := symbol [ ["^"] [+-] digit [digit] ]       e.g. cm^-3, cm-3, m2, eV^-1
//   symbol   := [SI prefix] unit name from UNITS below     e.g. nm, um, µm, meV, kPa, mbar
// "/" and "per" divide by the next term only (so "eV^-1 cm^-2" = "per eV per cm^2" = "/eV/cm^2").
// A unit is accepted only when its dimension is the one of the quantity kind asked for; degC (°C) is affine
// and only allowed alone. Input longer than MAX_QUANTITY_LENGTH characters is refused before it is scanned,
// and the scan is one left-to-right pass, so the work per call is bounded by that length.
//
// Conversion factors are kept as mantissa x 10^p x e^k (e = elementary charge in C) so that decimal prefixes
// and powers are exact: the decimal digits of the number are re-read with the exponent shifted by p, which
// rounds once ("1e18 cm^-3" gives exactly 1e24 m^-3).
import { InputError } from '../errors.js';

export type QuantityInput = number | string;

export type QuantityKind =
  | 'energy' // returns eV
  | 'volumeDensity' // returns per m^3
  | 'arealDensity' // returns per m^2
  | 'stateDensityPerArea' // returns per eV per m^2 (interface-state density D_it)
  | 'temperature' // returns K
  | 'length' // returns m (particle sizes, support and thin-layer thicknesses)
  | 'area' // returns m^2 (electrode areas)
  | 'pressure' // returns Pa
  | 'time' // returns s
  | 'diffusionCoefficient' // returns m^2/s
  | 'electricField' // returns V/m
  | 'dimensionless';

interface KindSpec {
  /** unit applied to a bare number */
  defaultUnit: string;
  /** unit the value is returned in */
  target: string;
  /** human text for errors */
  label: string;
  /** factor from the default unit to the target unit, for bare numbers (checked against mathjs in tests) */
  bareFactor: number;
}

const KINDS: Record<QuantityKind, KindSpec> = {
  energy: { defaultUnit: 'eV', target: 'eV', label: 'an energy (e.g. "5.1 eV")', bareFactor: 1 },
  volumeDensity: { defaultUnit: 'cm^-3', target: 'm^-3', label: 'a volume density (e.g. "1e18 cm^-3")', bareFactor: 1e6 },
  arealDensity: { defaultUnit: 'cm^-2', target: 'm^-2', label: 'an areal density (e.g. "1e11 cm^-2")', bareFactor: 1e4 },
  stateDensityPerArea: {
    defaultUnit: 'eV^-1 cm^-2',
    target: 'eV^-1 m^-2',
    label: 'a density of states per energy and area (e.g. "1e12 eV^-1 cm^-2")',
    bareFactor: 1e4,
  },
  temperature: { defaultUnit: 'K', target: 'K', label: 'a temperature (e.g. "573 K" or "300 degC")', bareFactor: 1 },
  length: { defaultUnit: 'nm', target: 'm', label: 'a length (e.g. "2 nm")', bareFactor: 1e-9 },
  area: { defaultUnit: 'cm^2', target: 'm^2', label: 'an area (e.g. "0.5 cm^2")', bareFactor: 1e-4 },
  pressure: { defaultUnit: 'bar', target: 'Pa', label: 'a pressure (e.g. "1e-20 bar")', bareFactor: 1e5 },
  time: { defaultUnit: 's', target: 's', label: 'a time (e.g. "30 min")', bareFactor: 1 },
  diffusionCoefficient: { defaultUnit: 'cm^2/s', target: 'm^2/s', label: 'a diffusion coefficient (e.g. "1e-12 cm^2/s")', bareFactor: 1e-4 },
  electricField: { defaultUnit: 'V/m', target: 'V/m', label: 'an electric field (e.g. "1e7 V/m")', bareFactor: 1 },
  dimensionless: { defaultUnit: '', target: '', label: 'a plain number', bareFactor: 1 },
};

/** Longest quantity string read; longer input is refused before it is scanned. */
export const MAX_QUANTITY_LENGTH = 200;

/** Kinds and their default/target units, for tests and help texts. */
export function unitSpecOf(kind: QuantityKind): Readonly<KindSpec> {
  return KINDS[kind];
}

/** Default unit a bare number is read in, for help texts. */
export function defaultUnitOf(kind: QuantityKind): string {
  return KINDS[kind].defaultUnit;
}

/** Every quantity kind, for tests and help texts. */
export const QUANTITY_KINDS = Object.freeze(Object.keys(KINDS) as QuantityKind[]);

// ---------------------------------------------------------------------------------------------
// dimensions and units

/** Exponents of the base dimensions: length (m), energy (eV), temperature (K), time (s), charge (e). */
type Dims = [number, number, number, number, number];

interface Factor {
  /** exact-enough multiplier (1 for every decimal unit) */
  mant: number;
  /** power of ten */
  p10: number;
  /** power of the elementary charge in coulomb (1 J = e^-1 eV, 1 C = e^-1 elementary charges) */
  pE: number;
}

interface UnitDef extends Factor {
  dims: Dims;
  /** takes SI prefixes */
  prefixed: boolean;
}

const ELEMENTARY_CHARGE_C = 1.602176634e-19; // exact (SI 2019 definition)

function def(dims: Dims, prefixed: boolean, p10 = 0, pE = 0, mant = 1): UnitDef {
  return { dims, prefixed, p10, pE, mant };
}

const L: Dims = [1, 0, 0, 0, 0];
const PRESSURE: Dims = [-3, 1, 0, 0, 0]; // Pa = J/m^3, expressed in eV/m^3
const UNITS: ReadonlyMap<string, UnitDef> = new Map([
  ['m', def(L, true)],
  ['Å', def(L, false, -10)],
  ['\u212b', def(L, false, -10)], // ANGSTROM SIGN
  ['angstrom', def(L, false, -10)],
  ['eV', def([0, 1, 0, 0, 0], true)],
  ['J', def([0, 1, 0, 0, 0], true, 0, -1)],
  ['K', def([0, 0, 1, 0, 0], false)],
  ['s', def([0, 0, 0, 1, 0], true)],
  ['min', def([0, 0, 0, 1, 0], false, 0, 0, 60)],
  ['h', def([0, 0, 0, 1, 0], false, 0, 0, 3600)],
  ['Pa', def(PRESSURE, true, 0, -1)],
  ['bar', def(PRESSURE, true, 5, -1)],
  ['atm', def(PRESSURE, false, 0, -1, 101325)], // standard atmosphere, 101325 Pa exactly
  ['Torr', def(PRESSURE, false, 0, -1, 101325 / 760)], // 1/760 atm
  ['torr', def(PRESSURE, false, 0, -1, 101325 / 760)],
  ['V', def([0, 1, 0, 0, -1], true)], // 1 V = 1 eV per elementary charge
  ['C', def([0, 0, 0, 0, 1], true, 0, -1)],
  ['F', def([0, -1, 0, 0, 2], true, 0, -1)], // C/V
]);

const PREFIXES: ReadonlyMap<string, number> = new Map([
  ['Y', 24], ['Z', 21], ['E', 18], ['P', 15], ['T', 12], ['G', 9], ['M', 6], ['k', 3], ['h', 2], ['da', 1],
  ['d', -1], ['c', -2], ['m', -3], ['u', -6], ['µ', -6], ['μ', -6], ['n', -9], ['p', -12], ['f', -15], ['a', -18],
  ['z', -21], ['y', -24],
]);

const DEGREE_CELSIUS = new Set(['degC', '°C', '\u2103']);
const CELSIUS_OFFSET_K = 273.15; // ITS-90 / SI definition of the Celsius scale

interface ParsedUnit extends Factor {
  dims: Dims;
  /** the unit was exactly degC (affine) */
  celsius: boolean;
}

class GrammarError extends Error {}

const MAX_POWER = 12;

function resolveSymbol(symbol: string): UnitDef {
  const exact = UNITS.get(symbol);
  if (exact) return exact;
  for (const [prefix, p10] of PREFIXES) {
    if (symbol.length > prefix.length && symbol.startsWith(prefix)) {
      const base = UNITS.get(symbol.slice(prefix.length));
      if (base?.prefixed) return { ...base, p10: base.p10 + p10 };
    }
  }
  throw new GrammarError(`unknown unit "${symbol.length > 20 ? `${symbol.slice(0, 20)}…` : symbol}"`);
}

function isLetter(ch: string): boolean {
  return /^[A-Za-zµμÅ\u212b°\u2103]$/.test(ch);
}

/** A character for an error message: printable ASCII quoted, anything else as its code point. */
function describeChar(ch: string): string {
  return /^[\x21-\x7e]$/.test(ch) ? `"${ch}"` : `character U+${ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')}`;
}

function isMinus(ch: string | undefined): boolean {
  return ch === '-' || ch === '\u2212';
}

/** Parse a unit expression (no number). Throws GrammarError with a short reason. */
function parseUnitText(text: string): ParsedUnit {
  const dims: Dims = [0, 0, 0, 0, 0];
  const out: ParsedUnit = { dims, mant: 1, p10: 0, pE: 0, celsius: false };
  let i = 0;
  let terms = 0;
  let divide = false;
  let expectTerm = true;
  const skipSpace = (): boolean => {
    const start = i;
    while (i < text.length && (text[i] === ' ' || text[i] === '\t')) i++;
    return i > start;
  };
  skipSpace();
  while (i < text.length) {
    const ch = text[i]!;
    if (ch === '/' || ch === '*' || ch === '·' || ch === '⋅') {
      if (divide || (ch !== '/' && expectTerm)) throw new GrammarError(`unexpected ${describeChar(ch)}`);
      divide = ch === '/';
      expectTerm = true;
      i++;
      skipSpace();
      continue;
    }
    if (!isLetter(ch)) throw new GrammarError(`unexpected ${describeChar(ch)}`);
    const start = i;
    while (i < text.length && isLetter(text[i]!)) i++;
    const symbol = text.slice(start, i);
    if (symbol === 'per') {
      if (divide) throw new GrammarError('unexpected "per"');
      divide = true;
      expectTerm = true;
      if (!skipSpace()) throw new GrammarError('"per" must be followed by a space');
      continue;
    }
    let power = 1;
    let j = i;
    if (text[j] === '^') j++;
    let negative = false;
    if (text[j] === '+' || isMinus(text[j])) {
      negative = isMinus(text[j]);
      j++;
    }
    let digits = '';
    while (j < text.length && text[j]! >= '0' && text[j]! <= '9' && digits.length < 3) digits += text[j++];
    if (digits !== '') {
      power = Number(digits) * (negative ? -1 : 1);
      if (power === 0 || Math.abs(power) > MAX_POWER) throw new GrammarError(`power ${power} of "${symbol}" is outside ±1..${MAX_POWER}`);
      i = j;
    } else if (j !== i) {
      throw new GrammarError(`"${symbol}" is followed by "${text.slice(i, j)}" without a whole-number power`);
    }
    if (i < text.length && text[i]! >= '0' && text[i]! <= '9') throw new GrammarError(`power of "${symbol}" is too long`);
    if (DEGREE_CELSIUS.has(symbol)) {
      if (terms > 0 || power !== 1 || divide) throw new GrammarError('degC cannot be combined with other units or powers');
      out.celsius = true;
      dims[2] = 1;
    } else {
      if (out.celsius) throw new GrammarError('degC cannot be combined with other units or powers');
      const unit = resolveSymbol(symbol);
      const signed = divide ? -power : power;
      for (let d = 0; d < 5; d++) dims[d]! += unit.dims[d]! * signed;
      out.p10 += unit.p10 * signed;
      out.pE += unit.pE * signed;
      out.mant *= unit.mant ** signed;
    }
    terms++;
    divide = false;
    expectTerm = false;
    // between terms: spaces (product), or an operator handled at the loop top
    skipSpace();
  }
  if (expectTerm && (terms > 0 || divide)) throw new GrammarError('the unit ends with an operator');
  return out;
}

const TARGETS: ReadonlyMap<QuantityKind, ParsedUnit> = new Map(
  (Object.keys(KINDS) as QuantityKind[]).map((kind) => [kind, parseUnitText(KINDS[kind].target)] as const),
);
const DEFAULTS: ReadonlyMap<QuantityKind, ParsedUnit> = new Map(
  (Object.keys(KINDS) as QuantityKind[]).map((kind) => [kind, parseUnitText(KINDS[kind].defaultUnit)] as const),
);

function sameDims(a: Dims, b: Dims): boolean {
  return a.every((x, k) => x === b[k]);
}

// ---------------------------------------------------------------------------------------------
// numbers

interface ParsedNumber {
  negative: boolean;
  /** all decimal digits, integer and fraction part */
  digits: string;
  /** decimal exponent applying to digits read as an integer */
  exponent: number;
  /** length of the number text */
  length: number;
}

/** Read the leading decimal number of text; null when there is none. */
function readNumber(text: string): ParsedNumber | null {
  const m = /^([+\-\u2212]?)(\d*)(?:\.(\d*))?(?:[eE]([+\-\u2212]?)(\d+))?/.exec(text);
  if (!m) return null;
  const int = m[2] ?? '';
  const frac = m[3] ?? '';
  if (int === '' && frac === '') return null;
  const expDigits = m[5] ?? '';
  // an exponent of more than 6 digits is out of range whatever the mantissa; keep the sign for 0 vs infinity
  const significant = expDigits.replace(/^0+/, '');
  const expValue = significant.length > 6 ? 1e7 : Number(significant || '0');
  const exponent = (isMinus(m[4]) ? -expValue : expValue) - frac.length;
  return { negative: isMinus(m[1]), digits: int + frac, exponent, length: m[0].length };
}

function isZeroDigits(digits: string): boolean {
  return /^0*$/.test(digits);
}

/** Value of digits x 10^(exponent + p10), rounded once. */
function decimalValue(n: ParsedNumber, p10: number): number {
  if (isZeroDigits(n.digits)) return 0;
  const e = n.exponent + p10;
  if (e > 1e6) return n.negative ? -Infinity : Infinity;
  if (e < -1e6) return 0;
  return Number(`${n.negative ? '-' : ''}${n.digits}e${e}`);
}

// ---------------------------------------------------------------------------------------------
// public API

/** The input as it may appear inside an error message: no control characters, at most 40 characters. */
function shown(text: string): string {
  // eslint-disable-next-line no-control-regex
  const clean = text.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/g, '?');
  return clean.length > 40 ? `${clean.slice(0, 40)}…` : clean;
}

function conversion(from: ParsedUnit, to: ParsedUnit): Factor {
  return { mant: from.mant / to.mant, p10: from.p10 - to.p10, pE: from.pE - to.pE };
}

/**
 * Parse a user quantity into the project's working unit for its kind.
 * Bare numbers take the kind's default unit (cm^-3, eV, K, nm, bar, ...). Nothing is evaluated: see the
 * grammar at the top of this file. Every problem is an InputError naming the field.
 */
export function parseQuantity(field: string, input: QuantityInput | undefined | null, kind: QuantityKind): number {
  const spec = KINDS[kind];
  if (input === undefined || input === null || (typeof input === 'string' && input.trim() === '')) {
    throw new InputError(field, 'missing value', spec.label);
  }
  if (typeof input === 'number') {
    if (!Number.isFinite(input)) throw new InputError(field, `not a finite number (${input})`, spec.label);
    return input * spec.bareFactor;
  }
  if (typeof input !== 'string') throw new InputError(field, `expected a number or a string, got ${typeof input}`, spec.label);
  if (input.length > MAX_QUANTITY_LENGTH) {
    throw new InputError(field, `value is too long (${input.length} characters; at most ${MAX_QUANTITY_LENGTH})`, spec.label);
  }
  const text = input.trim();
  const number = readNumber(text);
  if (number === null) throw new InputError(field, `"${shown(text)}" does not start with a number`, spec.label);
  const unitText = text.slice(number.length);
  const target = TARGETS.get(kind)!;
  let value: number;
  if (unitText.trim() === '') {
    const f = conversion(DEFAULTS.get(kind)!, target);
    value = decimalValue(number, f.p10) * f.mant; // the default units are decimal multiples of the targets
  } else {
    if (kind === 'dimensionless') throw new InputError(field, `"${shown(text)}" is not a plain number`, spec.label);
    let unit: ParsedUnit;
    try {
      unit = parseUnitText(unitText);
    } catch (err) {
      if (!(err instanceof GrammarError)) throw err;
      throw new InputError(field, `cannot read "${shown(text)}": ${err.message}`, spec.label);
    }
    if (!sameDims(unit.dims, target.dims)) throw new InputError(field, `"${shown(text)}" has the wrong dimension`, spec.label);
    if (unit.celsius) {
      value = decimalValue(number, 0) + CELSIUS_OFFSET_K; // T/K = t/°C + 273.15
    } else {
      const f = conversion(unit, target);
      value = decimalValue(number, f.p10) * f.mant;
      if (f.pE !== 0) value *= ELEMENTARY_CHARGE_C ** f.pE;
    }
  }
  if (!Number.isFinite(value)) throw new InputError(field, `"${shown(text)}" is too large`, spec.label);
  if (value === 0 && !isZeroDigits(number.digits)) throw new InputError(field, `"${shown(text)}" is too small to represent`, spec.label);
  return value;
}

/**
 * Check a unit string (no number) for a quantity kind, e.g. a study axis unit "cm^-3"; returns the factor
 * from that unit to the kind's working unit (for degC, the factor of a temperature difference, 1).
 */
export function parseUnit(field: string, unit: string, kind: QuantityKind): number {
  const spec = KINDS[kind];
  if (typeof unit !== 'string' || unit.trim() === '') throw new InputError(field, 'missing unit', spec.label);
  if (unit.length > MAX_QUANTITY_LENGTH) {
    throw new InputError(field, `unit is too long (${unit.length} characters; at most ${MAX_QUANTITY_LENGTH})`, spec.label);
  }
  if (kind === 'dimensionless') throw new InputError(field, `"${shown(unit)}" given for a plain number`, spec.label);
  let parsed: ParsedUnit;
  try {
    parsed = parseUnitText(unit.trim());
  } catch (err) {
    if (!(err instanceof GrammarError)) throw err;
    throw new InputError(field, `cannot read unit "${shown(unit)}": ${err.message}`, spec.label);
  }
  const target = TARGETS.get(kind)!;
  if (!sameDims(parsed.dims, target.dims)) throw new InputError(field, `"${shown(unit)}" has the wrong dimension`, spec.label);
  if (parsed.celsius) return 1;
  const f = conversion(parsed, target);
  return f.mant * 10 ** f.p10 * ELEMENTARY_CHARGE_C ** f.pE;
}
