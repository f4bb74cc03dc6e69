// The strict unit grammar of src/inputs/units.ts: exact SI definitions, agreement with an independent
// general-purpose units library (mathjs, a devDependency used only here as the reference), equivalent spellings,
// and hostile strings (nothing is evaluated; every failure is a one-line InputError; work is bounded by a length
// limit checked before any scanning).
import fc from 'fast-check';
import { unit as mathUnit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { InputError } from '../src/errors.js';
import {
  MAX_QUANTITY_LENGTH,
  QUANTITY_KINDS,
  parseQuantity,
  parseUnit,
  unitSpecOf,
  type QuantityKind,
} from '../src/inputs/units.js';

/** Run parseQuantity and return the InputError it throws (fails the test when it returns or throws anything else). */
function inputError(input: string, kind: QuantityKind, field = '--x'): InputError {
  try {
    const value = parseQuantity(field, input, kind);
    throw new Error(`accepted ${JSON.stringify(input.slice(0, 60))} as ${value}`);
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    return err;
  }
}

/** A message fit for a terminal line: one line, no control characters, bounded length, names the field. */
function expectOneLine(err: InputError, field = '--x'): void {
  expect(err.message.startsWith(`${field}: `)).toBe(true);
  // eslint-disable-next-line no-control-regex
  expect(err.message).not.toMatch(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/);
  expect(err.message.length).toBeLessThan(400);
}

describe('exact values by definition (BIPM, The International System of Units, 9th edition 2019)', () => {
  it('SI prefixes are exact powers of ten (Table 7): cm^-3, cm^-2, nm, um, meV, kPa, mbar', () => {
    expect(parseQuantity('n', '1e18 cm^-3', 'volumeDensity')).toBe(1e24);
    expect(parseQuantity('n', '1e18', 'volumeDensity')).toBe(1e24);
    expect(parseQuantity('n', '3e17 cm-3', 'volumeDensity')).toBe(3e23);
    expect(parseQuantity('n', '1e24 m^-3', 'volumeDensity')).toBe(1e24);
    expect(parseQuantity('s', '1e11 cm^-2', 'arealDensity')).toBe(1e15);
    expect(parseQuantity('d', '2 nm', 'length')).toBe(2e-9);
    expect(parseQuantity('d', '3nm', 'length')).toBe(3e-9);
    expect(parseQuantity('d', '1.5 um', 'length')).toBe(1.5e-6);
    expect(parseQuantity('d', '1.5 µm', 'length')).toBe(1.5e-6);
    expect(parseQuantity('d', '0.2 mm', 'length')).toBe(2e-4);
    expect(parseQuantity('E', '100 meV', 'energy')).toBe(0.1);
    expect(parseQuantity('p', '2 kPa', 'pressure')).toBe(2000);
    expect(parseQuantity('p', '1 mbar', 'pressure')).toBe(100);
    expect(parseQuantity('t', '5 ms', 'time')).toBe(0.005);
  });

  it('non-SI units with exact definitions: bar = 1e5 Pa, Å = 1e-10 m, min = 60 s, h = 3600 s (Table 8 / 8th ed.); atm = 101325 Pa (10th CGPM 1954, Res. 4); Torr = atm/760', () => {
    expect(parseQuantity('p', '1e-20 bar', 'pressure')).toBe(1e-15);
    expect(parseQuantity('p', '1e-20', 'pressure')).toBe(1e-15);
    expect(parseQuantity('p', '1 atm', 'pressure')).toBe(101325);
    expect(parseQuantity('p', '760 Torr', 'pressure')).toBeCloseTo(101325, 9);
    expect(parseQuantity('d', '5 Å', 'length')).toBe(5e-10);
    expect(parseQuantity('t', '30 min', 'time')).toBe(1800);
    expect(parseQuantity('t', '2 h', 'time')).toBe(7200);
  });

  it('Celsius: T/K = t/°C + 273.15 (section 2.3.1); degC only alone', () => {
    expect(parseQuantity('T', '300 degC', 'temperature')).toBeCloseTo(573.15, 12);
    expect(parseQuantity('T', '25 °C', 'temperature')).toBeCloseTo(298.15, 12);
    expect(parseQuantity('T', '473K', 'temperature')).toBe(473);
    expect(inputError('300 degC^2', 'temperature').message).toMatch(/degC cannot be combined/);
    expect(inputError('300 degC K', 'temperature').message).toMatch(/degC cannot be combined/);
    expect(inputError('300 K degC', 'temperature').message).toMatch(/degC cannot be combined/);
  });

  it('electronvolt = 1.602176634e-19 J exactly (Table 8, SI 2019 value of e)', () => {
    expect(parseQuantity('E', '1.602176634e-19 J', 'energy')).toBeCloseTo(1, 14);
    expect(parseQuantity('E', '5.1 eV', 'energy')).toBe(5.1);
  });

  it('interface-state density, diffusion coefficient, field: equivalent spellings give the same value', () => {
    const dit = 1e12 * 1e4; // 1e12 eV^-1 cm^-2 in eV^-1 m^-2
    for (const s of ['1e12', '1e12 eV^-1 cm^-2', '1e12 per eV per cm^2', '1e12 /eV/cm^2', '1e12 cm^-2 eV^-1', '1e12 eV-1 cm-2', '1e16 eV^-1 m^-2', '1e12 cm^-2/eV']) {
      expect(parseQuantity('Dit', s, 'stateDensityPerArea'), s).toBe(dit);
    }
    expect(parseQuantity('D', '1e-12 cm^2/s', 'diffusionCoefficient')).toBe(1e-16);
    expect(parseQuantity('D', '1e-12', 'diffusionCoefficient')).toBe(1e-16);
    expect(parseQuantity('D', '1e-16 m^2 s^-1', 'diffusionCoefficient')).toBe(1e-16);
    expect(parseQuantity('F', '1e5 V/cm', 'electricField')).toBe(1e7);
    expect(parseQuantity('A', '0.5 cm^2', 'area')).toBe(5e-5);
    expect(parseQuantity('A', '0.5', 'area')).toBe(5e-5);
    expect(parseQuantity('A', '2 mm2', 'area')).toBe(2e-6);
  });

  it('wrong dimensions are refused with the kind named', () => {
    expect(inputError('5 nm', 'energy').message).toMatch(/wrong dimension.*allowed: an energy/);
    expect(inputError('1e11 cm^-3', 'arealDensity').message).toMatch(/wrong dimension/);
    expect(inputError('300 C', 'temperature').message).toMatch(/wrong dimension/); // C is the coulomb
    expect(inputError('1 eV', 'dimensionless').message).toMatch(/not a plain number/);
  });
});

// units both grammars accept, with the spelling mathjs wants when it differs
const COMPARABLE: readonly { kind: QuantityKind; ours: string; theirs: string; rel: number }[] = [
  { kind: 'energy', ours: 'eV', theirs: 'eV', rel: 1e-14 },
  { kind: 'energy', ours: 'meV', theirs: 'meV', rel: 1e-14 },
  // mathjs 14 carries the CODATA 2010 elementary charge 1.602176565e-19 (not the exact SI 2019 value): 4e-8 apart
  { kind: 'energy', ours: 'J', theirs: 'J', rel: 1e-7 },
  { kind: 'volumeDensity', ours: 'cm^-3', theirs: 'cm^-3', rel: 1e-14 },
  { kind: 'volumeDensity', ours: 'm^-3', theirs: 'm^-3', rel: 1e-14 },
  { kind: 'volumeDensity', ours: 'nm^-3', theirs: 'nm^-3', rel: 1e-14 },
  { kind: 'arealDensity', ours: 'cm^-2', theirs: 'cm^-2', rel: 1e-14 },
  { kind: 'arealDensity', ours: 'nm^-2', theirs: 'nm^-2', rel: 1e-14 },
  { kind: 'stateDensityPerArea', ours: 'eV^-1 cm^-2', theirs: 'eV^-1 cm^-2', rel: 1e-14 },
  { kind: 'stateDensityPerArea', ours: 'per eV per cm^2', theirs: 'eV^-1 cm^-2', rel: 1e-14 },
  { kind: 'temperature', ours: 'K', theirs: 'K', rel: 1e-14 },
  { kind: 'temperature', ours: 'degC', theirs: 'degC', rel: 1e-14 },
  { kind: 'length', ours: 'nm', theirs: 'nm', rel: 1e-14 },
  { kind: 'length', ours: 'um', theirs: 'um', rel: 1e-14 },
  { kind: 'length', ours: 'cm', theirs: 'cm', rel: 1e-14 },
  { kind: 'length', ours: 'Å', theirs: 'angstrom', rel: 1e-14 },
  { kind: 'area', ours: 'cm^2', theirs: 'cm^2', rel: 1e-14 },
  { kind: 'area', ours: 'mm2', theirs: 'mm^2', rel: 1e-14 },
  { kind: 'pressure', ours: 'bar', theirs: 'bar', rel: 1e-14 },
  { kind: 'pressure', ours: 'mbar', theirs: 'mbar', rel: 1e-14 },
  { kind: 'pressure', ours: 'Pa', theirs: 'Pa', rel: 1e-14 },
  { kind: 'pressure', ours: 'kPa', theirs: 'kPa', rel: 1e-14 },
  { kind: 'pressure', ours: 'atm', theirs: 'atm', rel: 1e-14 },
  { kind: 'pressure', ours: 'torr', theirs: 'torr', rel: 1e-5 }, // mathjs rounds the torr to 133.322 Pa
  { kind: 'time', ours: 's', theirs: 's', rel: 1e-14 },
  { kind: 'time', ours: 'min', theirs: 'min', rel: 1e-14 },
  { kind: 'time', ours: 'h', theirs: 'h', rel: 1e-14 },
  { kind: 'diffusionCoefficient', ours: 'cm^2/s', theirs: 'cm^2/s', rel: 1e-14 },
  { kind: 'electricField', ours: 'V/m', theirs: 'V/m', rel: 1e-14 },
  { kind: 'electricField', ours: 'V/cm', theirs: 'V/cm', rel: 1e-14 },
];

describe('agreement with mathjs unit conversion (independent implementation)', () => {
  it('default and target units of every kind convert by the documented bare-number factor', () => {
    for (const kind of QUANTITY_KINDS) {
      if (kind === 'dimensionless') continue;
      const spec = unitSpecOf(kind);
      expect(mathUnit(1, spec.defaultUnit).toNumber(spec.target) / spec.bareFactor, kind).toBeCloseTo(1, 12);
      expect(parseQuantity('x', `1 ${spec.defaultUnit}`, kind), kind).toBe(parseQuantity('x', '1', kind));
    }
  });

  it('random decimal numbers in every comparable unit agree with mathjs', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...COMPARABLE),
        fc.integer({ min: 1, max: 999_999 }),
        fc.integer({ min: -25, max: 25 }),
        fc.boolean(),
        ({ kind, ours, theirs, rel }, mantissa, exponent, space) => {
          const number = `${mantissa}e${exponent}`;
          const got = parseQuantity('x', `${number}${space ? ' ' : ''}${ours}`, kind);
          const want = mathUnit(`${number} ${theirs}`).toNumber(unitSpecOf(kind).target);
          expect(Math.abs(got - want)).toBeLessThanOrEqual(rel * Math.abs(want) + 1e-300);
        },
      ),
      { numRuns: 400 },
    );
  });
});

const HOSTILE: readonly [string, QuantityKind][] = [
  ['ones(3000,3000) K', 'temperature'],
  ['zeros(20000,20000)', 'dimensionless'],
  ['1 zeros(20000,20000)', 'energy'],
  ['1 eV + 2 eV', 'energy'],
  ['2 * 3 eV', 'energy'],
  ['1 eV * 2', 'energy'],
  ['(1 eV)', 'energy'],
  ['1 cm^-3 * ones(3000,3000)', 'volumeDensity'],
  ['1e18 cm^(-3)', 'volumeDensity'],
  ['1e18 cm^-3^2', 'volumeDensity'],
  ['1e18 cm^-300', 'volumeDensity'],
  ['1e18 cm^9999999999999', 'volumeDensity'],
  ['1e999999999999999999999 cm^-3', 'volumeDensity'],
  ['1e-999999999999999999999 cm^-3', 'volumeDensity'],
  ['9'.repeat(190) + 'e9999 eV', 'energy'],
  ['Infinity', 'energy'],
  ['-Infinity eV', 'energy'],
  ['NaN', 'temperature'],
  ['0x10', 'energy'],
  ['1_000 K', 'temperature'],
  ['1,5 eV', 'energy'],
  ['5 eV; process.exit(1)', 'energy'],
  ['import("fs")', 'energy'],
  ['1 eV\u0000', 'energy'],
  ['1 \u001b[31mK\u0007', 'temperature'],
  ['300 K\r\n300 K', 'temperature'],
  ['1e18 cm\u202e3-^', 'volumeDensity'],
  ['1 \ud800', 'energy'],
  ['1 😀', 'energy'],
  ['1 eV eV eV eV eV', 'energy'],
  ['1 //eV', 'energy'],
  ['1 eV /', 'energy'],
  ['1 per', 'energy'],
  ['1 per per eV', 'stateDensityPerArea'],
  ['1 cm^', 'length'],
  ['1 mK', 'temperature'],
  ['1 degC', 'energy'],
  ['- 5 eV', 'energy'],
  ['.', 'energy'],
  ['e5', 'energy'],
];

describe('hostile strings: nothing is evaluated, every failure is a one-line InputError', () => {
  it.each(HOSTILE)('%j (%s) is refused', (input, kind) => {
    const err = inputError(input, kind);
    expectOneLine(err);
    expect(err.allowed).toBe(unitSpecOf(kind).label);
  });

  it('strings over the length limit are refused before they are scanned (1e6 characters, any content)', () => {
    for (const big of ['1'.repeat(1_000_000), `1 ${'eV '.repeat(333_333)}`, `ones(${'9'.repeat(999_990)}) K`, ' '.repeat(1_000_000) + '1']) {
      const err = inputError(big, 'energy');
      expect(err.message).toMatch(new RegExp(`too long \\(${big.length} characters; at most ${MAX_QUANTITY_LENGTH}\\)`));
      expectOneLine(err);
    }
    // the limit is on the raw input, so 200 characters of valid padding still parse and 201 do not
    expect(parseQuantity('x', `${' '.repeat(MAX_QUANTITY_LENGTH - 4)}5 eV`, 'energy')).toBe(5);
    expect(inputError(`${' '.repeat(MAX_QUANTITY_LENGTH - 3)}5 eV`, 'energy').message).toMatch(/too long/);
  });

  it('any unicode string up to the limit gives a finite number or a one-line InputError (property)', () => {
    const anyString = fc.oneof(
      fc.string({ unit: 'binary', maxLength: 60 }),
      fc.string({ unit: fc.constantFrom(...'0123456789.eE+-^*/ ()perVcmKdegCÅµ°\u2212\u0000\u001b'.split('')), maxLength: 40 }),
      fc
        .tuple(fc.double({ noNaN: false }), fc.constantFrom('eV', 'cm^-3', 'K', 'nm', 'bar', 'eV^-1 cm^-2', 'ones(3000,3000)', 'zeros(9,9)', '+ 2 eV'))
        .map(([x, u]) => `${x} ${u}`),
    );
    fc.assert(
      fc.property(anyString, fc.constantFrom(...QUANTITY_KINDS), (input, kind) => {
        let value: number | undefined;
        try {
          value = parseQuantity('--x', input, kind);
        } catch (err) {
          if (!(err instanceof InputError)) throw err;
          expectOneLine(err);
          return;
        }
        expect(Number.isFinite(value)).toBe(true);
      }),
      { numRuns: 2000 },
    );
  });

  it('study-axis units go through the same grammar (parseUnit)', () => {
    expect(parseUnit('unit', 'cm^-3', 'volumeDensity')).toBe(1e6);
    expect(parseUnit('unit', 'degC', 'temperature')).toBe(1);
    for (const bad of ['cm^-3 * ones(3000,3000)', 'K + 1', '1 K', 'nm', '\u001b]0;x\u0007', 'x'.repeat(1_000_000)]) {
      let err: unknown;
      try {
        parseUnit('unit', bad, bad === 'nm' ? 'temperature' : 'volumeDensity');
      } catch (e) {
        err = e;
      }
      expect(err, bad.slice(0, 30)).toBeInstanceOf(InputError);
      expectOneLine(err as InputError, 'unit');
    }
  });
});
