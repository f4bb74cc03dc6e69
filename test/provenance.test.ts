// Provenance, pretreatment and uncertainty through the whole contact pipeline.
import { describe, expect, it } from 'vitest';
import { solveContact } from '../src/contact.js';
import { loadLibrary } from '../src/materials/load.js';
import type { MaterialsLibrary, MetalRecord, SupportRecord } from '../src/materials/types.js';

const library = loadLibrary();

describe('every input of a library contact carries resolvable provenance', () => {
  it('Pt on ZnO: library inputs cite a reference that exists', () => {
    const r = solveContact({ metal: 'Pt', support: 'ZnO', donors: '1e18', materials: library });
    const fromLibrary = r.inputs.filter((i) => i.origin === 'library');
    expect(fromLibrary.length).toBeGreaterThan(5);
    for (const input of fromLibrary) {
      expect(input.source, input.field).toBeDefined();
      expect(library.references.has(input.source!), `${input.field} -> ${input.source}`).toBe(true);
      expect(input.citation, input.field).toBeTruthy();
    }
    // the user-given donor density is marked as such
    expect(r.inputs.find((i) => i.field === 'donor density')?.origin).toBe('user');
  });

  it('a derived pretreatment input cites NIST-JANAF (Chase 1998)', () => {
    const r = solveContact({ metal: 'Pt', support: 'CeO2', reductionTemperature: '773 K', hydrogenToWater: 100, temperature: '473 K', materials: library });
    const po2 = r.inputs.find((i) => i.field.startsWith('oxygen pressure'));
    expect(po2?.source).toBe('chase1998');
    expect(library.references.has('chase1998')).toBe(true);
    expect(r.cautions.some((c) => /flammable/i.test(c))).toBe(true);
    expect(r.pretreatment.mode).toBe('frozen-in');
    expect(r.donorDensity_cm3 / r.pretreatment.vacancyDensity_cm3! - 1).toBeCloseTo(0, 12);
  });
});

describe('library defaults of the third materials survey reach the contact with their provenance', () => {
  it('Pt on CeO2 with defaults is not an undoped support: the typical density derived from the ceria reduction law is used and cited', () => {
    const r = solveContact({ metal: 'Pt', support: 'CeO2', materials: library });
    const donors = r.inputs.find((i) => i.field === 'donor density');
    expect(donors?.origin).toBe('library');
    expect(library.references.has(donors!.source!)).toBe(true);
    expect(r.donorDensity_cm3).toBeGreaterThan(1e14);
    expect(r.cautions.some((c) => /undoped/i.test(c))).toBe(false);
  });

  it('every library input of Pt on the new supports cites a reference that exists', () => {
    for (const support of ['WO3', 'MoO3', 'V2O5', 'Nb2O5', 'Co3O4', 'ThO2', 'NiO']) {
      const r = solveContact({ metal: 'Pt', support, materials: library });
      for (const input of r.inputs.filter((i) => i.origin === 'library')) {
        expect(library.references.has(input.source!), `${support} ${input.field} -> ${input.source}`).toBe(true);
      }
    }
  });
});

describe('pretreatment defect chemistry through the contact', () => {
  it('donor density falls with slope -1/6 in log pO2 (Brouwer regime n = 2[V_O]; Kofstad, Nonstoichiometry, 1972; from memory, verify)', () => {
    const density = (po2_bar: number): number =>
      solveContact({ metal: 'Pt', support: 'CeO2', oxygenPressure: `${po2_bar} bar`, reductionTemperature: '1000 K', temperature: '473 K', materials: library })
        .donorDensity_cm3;
    const slope = (Math.log10(density(1e-20)) - Math.log10(density(1e-14))) / (-20 - -14);
    expect(slope).toBeCloseTo(-1 / 6, 10);
  });

  it('a stronger reduction (more H2) gives more donors and more charge per particle', () => {
    const run = (ratio: number) =>
      solveContact({ metal: 'Pt', support: 'CeO2', hydrogenToWater: ratio, reductionTemperature: '773 K', temperature: '473 K', geometry: 'hemisphere', materials: library });
    const mild = run(1);
    const strong = run(1000);
    expect(strong.donorDensity_cm3).toBeGreaterThan(mild.donorDensity_cm3);
  });
});

describe('uncertainty sampling', () => {
  // a library made for this test: symmetric ranges on the metal work function only (invented values)
  const metal: MetalRecord = {
    kind: 'metal',
    name: 'Mx',
    fullName: 'test metal',
    workFunction_eV: { value: 5.0, min: 4.8, max: 5.2, source: 'test' },
    density_g_cm3: { value: 20, source: 'test' },
    molarMass_g_mol: { value: 195, source: 'test' },
    metallicRadius_pm: { value: 139, source: 'test' },
  };
  const support: SupportRecord = {
    kind: 'support',
    name: 'Sx',
    fullName: 'test oxide',
    formula: 'SxO2',
    electronAffinity_eV: { value: 4.0, source: 'test' },
    bandGap_eV: { value: 3.2, source: 'test' },
    staticPermittivity: { value: 10, source: 'test' },
    opticalPermittivity: { value: 5, source: 'test' },
    electronMass_me: { value: 0.5, source: 'test' },
    holeMass_me: { value: 1, source: 'test' },
    conductionType: 'n',
    typicalDensity_cm3: { value: 1e18, source: 'test' },
  };
  const testLibrary: MaterialsLibrary = {
    metals: new Map([['Mx', metal]]),
    supports: new Map([['Sx', support]]),
    references: new Map([['test', { id: 'test', type: 'article', title: 'invented values for a unit test' }]]),
  };
  const options = { metal: 'Mx', support: 'Sx', materials: testLibrary, geometry: 'hemisphere' as const };

  it('is reproducible for a seed', () => {
    const a = solveContact({ ...options, uncertainty: 50, seed: 9 }).uncertainty!;
    const b = solveContact({ ...options, uncertainty: 50, seed: 9 }).uncertainty!;
    const c = solveContact({ ...options, uncertainty: 50, seed: 10 }).uncertainty!;
    expect(a).toEqual(b);
    expect(a.barrierHeight_eV.p50).not.toBe(c.barrierHeight_eV.p50);
  });

  it('the median approaches the nominal result (barrier linear in a symmetric range; common practice, no source)', () => {
    const nominal = solveContact(options);
    const u = solveContact({ ...options, uncertainty: 400, seed: 1 }).uncertainty!;
    expect(u.sampledInputs).toEqual(['workFunction_eV']);
    expect(Math.abs(u.barrierHeight_eV.p50 - nominal.barrierHeight_eV)).toBeLessThan(0.02);
    expect(u.barrierHeight_eV.p05).toBeGreaterThan(0.8 - 0.01);
    expect(u.barrierHeight_eV.p95).toBeLessThan(1.2 + 0.01);
    expect(u.directionProbability['support-to-metal']).toBe(1);
  });
});
