// Unit parsing at the edges: user strings become SI (or the project's working unit) here and nowhere else.
import { createRequire } from 'node:module';
import type { Unit } from 'mathjs';
import { InputError } from '../errors.js';

type MathJs = typeof import('mathjs');
let mathjs: MathJs | undefined;
/** mathjs is loaded on first use (about 0.5 s), so bare-number inputs and --help stay fast. */
function math(): MathJs {
  mathjs ??= createRequire(import.meta.url)('mathjs') as MathJs;
  return mathjs;
}

export type QuantityInput = number | string;

export type QuantityKind =
  | 'energy' // returns eV
  | 'volumeDensity' // returns per m^3
  | 'arealDensity' // returns per m^2
  | 'temperature' // returns K
  | 'length' // returns m
  | 'pressure' // returns Pa
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
  temperature: { defaultUnit: 'K', target: 'K', label: 'a temperature (e.g. "573 K" or "300 degC")', bareFactor: 1 },
  length: { defaultUnit: 'nm', target: 'm', label: 'a length (e.g. "2 nm")', bareFactor: 1e-9 },
  pressure: { defaultUnit: 'bar', target: 'Pa', label: 'a pressure (e.g. "1e-20 bar")', bareFactor: 1e5 },
  dimensionless: { defaultUnit: '', target: '', label: 'a plain number', bareFactor: 1 },
};

/** Default unit a bare number is read in, for help texts. */
/** Kinds and their default/target units, for tests and help texts. */
export function unitSpecOf(kind: QuantityKind): Readonly<KindSpec> {
  return KINDS[kind];
}

export function defaultUnitOf(kind: QuantityKind): string {
  return KINDS[kind].defaultUnit;
}

/**
 * Parse a user quantity into the project's working unit for its kind.
 * Bare numbers take the kind's default unit (cm^-3, eV, K, nm, bar).
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
  const text = input.trim();
  const bare = Number(text);
  if (text !== '' && !Number.isNaN(bare) && /^[+-]?(\d|\.\d|Infinity|NaN)/.test(text)) {
    if (!Number.isFinite(bare)) throw new InputError(field, `not a finite number ("${text}")`, spec.label);
    return bare * spec.bareFactor;
  }
  if (kind === 'dimensionless') throw new InputError(field, `"${text}" is not a plain number`, spec.label);
  let parsed: unknown;
  try {
    parsed = math().evaluate(text);
  } catch {
    throw new InputError(field, `cannot read "${text}" as a quantity`, spec.label);
  }
  if (!math().isUnit(parsed)) throw new InputError(field, `"${text}" has no unit I can read`, spec.label);
  return convert(field, parsed, spec, text);
}

function convert(field: string, value: Unit, spec: KindSpec, text?: string): number {
  let out: number;
  try {
    out = value.toNumber(spec.target);
  } catch {
    throw new InputError(field, `"${text ?? value.toString()}" has the wrong dimension`, spec.label);
  }
  if (!Number.isFinite(out)) throw new InputError(field, `"${text ?? value.toString()}" is not finite`, spec.label);
  return out;
}
