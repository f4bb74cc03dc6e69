// Cross-field rules of the contact inputs (src/inputs/contactInput.ts). The rules are the project's contract
// (bandbend issue 13, item 4: every option takes effect or is refused naming the conflict); the physics values
// come from the Neamen worked example in test/helpers.ts and the built-in library.
import { describe, expect, it } from 'vitest';
import { resolveContact } from '../src/inputs/contactInput.js';
import { InputError } from '../src/errors.js';
import { loadBuiltinLibrary, findSupport } from '../src/materials/load.js';
import { runScreen } from '../src/screen.js';
import type { ContactOptions } from '../src/inputs/parameters.js';
import { tungstenOnSilicon } from './helpers.js';

function refusal(options: ContactOptions): InputError {
  try {
    resolveContact(options);
  } catch (error) {
    if (error instanceof InputError) return error;
    throw error;
  }
  throw new Error('expected an InputError');
}

describe('contact inputs: refused combinations name the conflict', () => {
  const cases: [string, ContactOptions, RegExp][] = [
    ['unknown key, with the likely name', tungstenOnSilicon({ donor: 1e18 } as ContactOptions), /^donor: unknown option \(did you mean "donors"\?\)/],
    ['empty string', tungstenOnSilicon({ donors: '' }), /^--donors: missing value/],
    ['empty name', tungstenOnSilicon({ metal: ' ' }), /^--metal: expected a non-empty name/],
    ['pretreatment with donors', tungstenOnSilicon({ oxygenPressure: 1e-20 }), /^--donors: cannot be combined with a pretreatment/],
    ['two gas conditions', tungstenOnSilicon({ donors: undefined, oxygenPressure: 1e-20, hydrogenToWater: 10 }), /^--oxygen-pressure: only used without --hydrogen-to-water/],
    ['reduction data without a pretreatment', tungstenOnSilicon({ reductionEnthalpy: 4 }), /^--reduction-enthalpy: only used with a reduction pretreatment/],
    ['a given barrier without the given model', tungstenOnSilicon({ barrier: 0.7 }), /^--barrier: only used with --barrier-model given/],
    ['the given model without a barrier', tungstenOnSilicon({ barrierModel: 'given' }), /^--barrier: missing/],
    ['a pinning factor without the pinned model', tungstenOnSilicon({ pinningFactor: 0.3 }), /^--pinning-factor: only used with --barrier-model pinned/],
    ['a particle density outside the array geometry', tungstenOnSilicon({ particleDensity: 1e11 }), /^--particle-density: only used with --geometry array/],
    ['the array geometry without a density', tungstenOnSilicon({ geometry: 'array' }), /^--particle-density: the array geometries need a particle density/],
    ['a second donor level without the first', tungstenOnSilicon({ donorType: 'double', donorLevel2: 0.3 }), /^--donor-level2: only used with --donor-level and --donor-type double/],
    ['a double donor with one level', tungstenOnSilicon({ donorType: 'double', donorLevel: 0.1 }), /^--donor-level2: missing/],
    ['a seed without sampling', tungstenOnSilicon({ seed: 3 }), /^--seed: only used with --uncertainty N > 0/],
    ['a shift source without a shift', tungstenOnSilicon({ workFunctionShiftSource: 'XPS' }), /^--work-function-shift-source: only used with --work-function-shift/],
    ['a formula next to a given affinity', tungstenOnSilicon({ supportFormula: 'ZnO' }), /^--support-formula: only used without --electron-affinity and --support/],
    ['a fractional sample count', tungstenOnSilicon({ uncertainty: 2.5 }), /^--uncertainty: expected a whole number/],
    ['an unknown choice', tungstenOnSilicon({ geometry: 'cube' as ContactOptions['geometry'] }), /^--geometry: unknown geometry "cube" \(allowed: planar, hemisphere, array, disc, disc-array\)/],
  ];
  for (const [what, options, pattern] of cases) {
    it(`refuses ${what}`, () => {
      expect(refusal(options).message).toMatch(pattern);
    });
  }
});

describe('contact inputs: one conversion for user and library values', () => {
  const library = loadBuiltinLibrary();
  it('a library donor density (cm^-3) becomes the same SI value as the user typing it', () => {
    const zno = findSupport(library, 'ZnO');
    const fromLibrary = resolveContact({ metal: 'Pt', support: 'ZnO', materials: library });
    const typed = resolveContact({ metal: 'Pt', support: 'ZnO', donors: `${zno.typicalDensity_cm3!.value} cm^-3`, materials: library });
    expect(fromLibrary.support.donors_m3).toBe(typed.support.donors_m3);
    // 1 cm^-3 = 1e6 m^-3 (BIPM SI brochure, 9th ed., prefixes)
    expect(fromLibrary.support.donors_m3).toBe(zno.typicalDensity_cm3!.value * 1e6);
    expect(fromLibrary.ranges.get('donors_m3')).toEqual([zno.typicalDensity_cm3!.min! * 1e6, zno.typicalDensity_cm3!.max! * 1e6]);
  });
  it('the Neamen example resolves to SI with user provenance in display units', () => {
    const r = resolveContact(tungstenOnSilicon());
    expect(r.support.donors_m3 / 1e22).toBeCloseTo(1, 12);
    expect(r.inputs.find((i) => i.field === 'donor density')).toMatchObject({ value: 1e16, unit: 'cm^-3', origin: 'user' });
    expect(r.particleDiameter_m).toBe(2e-9);
    expect(r.inputs.find((i) => i.field === 'particle diameter')).toMatchObject({ value: 2, unit: 'nm', origin: 'default' });
  });
  it('the pinned model takes the library neutral level; the ideal model does not record it', () => {
    const pinned = resolveContact({ metal: 'Pt', support: 'TiO2-anatase', barrierModel: 'pinned', materials: library });
    const ideal = resolveContact({ metal: 'Pt', support: 'TiO2-anatase', materials: library });
    expect(ideal.support.neutralLevel_eV).toBeUndefined();
    expect(ideal.inputs.some((i) => i.field === 'charge-neutrality level')).toBe(false);
    if (findSupport(library, 'TiO2-anatase').neutralLevel_eV) expect(pinned.support.neutralLevel_eV).toBeDefined();
  });
});

describe('screens refuse per-material overrides unless asked', () => {
  const library = loadBuiltinLibrary();
  it('--work-function would relabel every metal row', () => {
    const run = (overrideMaterials: boolean) =>
      runScreen({ metals: ['Pt', 'Au'], supports: ['ZnO'], conditions: { workFunction: 4.0, donors: 1e17 }, materials: library, overrideMaterials });
    expect(() => run(false)).toThrow(/--work-function: would apply one value to every metal/);
    expect(run(true).map((r) => r.metalWorkFunction_eV)).toEqual([4, 4]);
  });
  it('a condition every pair refuses is the user\'s error, not a table of failed rows', () => {
    expect(() => runScreen({ metals: ['Pt'], supports: ['ZnO', 'CeO2'], conditions: { temperature: -5 }, materials: library })).toThrow(/--temperature/);
  });
});
