// The measurement's support state in the validation gallery (src/validation/supportState.ts): what a paper states
// (reduced, oxidised, anneal temperature, O2 pressure, H2/H2O, donor density) becomes the pretreatment inputs of the
// parameter table, and ONE documented convention (common practice, no source) fills what the paper leaves out.
// Checked against: the convention as written in validation/README.md (applied alike to every row, never per row),
// the fallback rule (library defaults when the support has no reduction data), and the mass-action law of oxygen
// vacancies ([V_O] proportional to pO2^(-1/6) at fixed T; Kroger & Vink, Solid State Physics 3, 307 (1956), from
// memory, verify): a support reduced in vacuum holds more donors than one oxidised in O2.
import { describe, expect, it } from 'vitest';
import { InputError } from '../src/errors.js';
import { loadGallery, predictedBarrier_eV, runValidation, rowSupportState } from '../src/validation/gallery.js';
import { SUPPORT_STATE_CONVENTION, supportStateInputs, type SupportState } from '../src/validation/supportState.js';
import type { ContactResult } from '../src/types.js';

const state = (o: Partial<SupportState>): SupportState => ({
  state: 'reduced', annealTemperature_K: null, oxygenPressure_bar: null, hydrogenToWater: null, basis: 'test', ...o,
});

describe('support state -> contact inputs', () => {
  it('a donor density stated by the paper wins over any pretreatment', () => {
    const s = supportStateInputs(state({ annealTemperature_K: 1000 }), 2e17);
    expect(s.options).toEqual({ donors: 2e17 });
    expect(s.mapping).toBe('paper');
  });

  it('"reduced" with nothing else: the convention (UHV anneal 900 K, residual O2 1e-13 bar)', () => {
    const s = supportStateInputs(state({}), null);
    expect(s.options).toEqual({ reductionTemperature: 900, oxygenPressure: 1e-13 });
    expect(s.mapping).toBe('convention');
    expect(s.note).toMatch(/no source/);
  });

  it('a stated anneal temperature is kept; only the missing pressure comes from the convention', () => {
    const s = supportStateInputs(state({ annealTemperature_K: 870 }), undefined);
    expect(s.options).toEqual({ reductionTemperature: 870, oxygenPressure: SUPPORT_STATE_CONVENTION.vacuumOxygenPressure_bar });
    expect(s.mapping).toBe('paper+convention');
  });

  it('"oxidised": O2 1e-9 bar at 300 K unless the paper says otherwise', () => {
    expect(supportStateInputs(state({ state: 'oxidised' }), null).options).toEqual({ reductionTemperature: 300, oxygenPressure: 1e-9 });
    const stated = supportStateInputs(state({ state: 'oxidised', annealTemperature_K: 700, oxygenPressure_bar: 1e-6 }), null);
    expect(stated.options).toEqual({ reductionTemperature: 700, oxygenPressure: 1e-6 });
    expect(stated.mapping).toBe('paper');
  });

  it('an H2 reduction uses hydrogenToWater and no oxygen pressure (the table allows one gas condition)', () => {
    const s = supportStateInputs(state({ annealTemperature_K: 773, hydrogenToWater: 100 }), null);
    expect(s.options).toEqual({ reductionTemperature: 773, hydrogenToWater: 100 });
    expect(s.mapping).toBe('paper');
  });

  it('"unknown" or no state: library defaults, said so', () => {
    for (const s of [supportStateInputs(state({ state: 'unknown' }), null), supportStateInputs(undefined, null)]) {
      expect(s.options).toEqual({});
      expect(s.mapping).toBe('library-defaults');
    }
  });
});

describe('the gallery applies the convention alike to every row', () => {
  const g = loadGallery();
  it('every "reduced" row without stated numbers gets identical inputs', () => {
    const rows = [...g.barriers, ...g.charges, ...g.bandBending].filter((r) => {
      const p = r.conditions.pretreatment;
      return p && p.state === 'reduced' && p.annealTemperature_K === null && p.oxygenPressure_bar === null && p.hydrogenToWater === null && !r.conditions.donors_cm3;
    });
    expect(rows.length).toBeGreaterThan(2);
    for (const r of rows) expect(rowSupportState(r).options, r.id).toEqual({ reductionTemperature: 900, oxygenPressure: 1e-13 });
  });

  it('a support without reduction data falls back to library defaults and says why', () => {
    // stand-in solver: refuses pretreatment inputs for SrTiO3 the way the parameter table does
    const seen: Record<string, unknown>[] = [];
    const result = runValidation({
      model: 'ideal',
      solve: (o) => {
        seen.push(o);
        if (o['support'] === 'SrTiO3' && 'reductionTemperature' in o) {
          throw new InputError('--reduction-enthalpy', 'missing', 'an energy per vacancy (the library has no reduction data for SrTiO3)');
        }
        return { electronBarrier_eV: 1, barrierHeight_eV: 1, barrierCarrier: 'hole', electronsPerParticle: 1, profile: { x_nm: [0, 1], conductionBand_eV: [0, 0] } };
      },
    });
    const sto = result.rows.find((r) => r.id === 'sto-pt-chung1979')!;
    expect(sto.status).toBe('ok');
    expect(sto.supportState?.mapping).toBe('library-defaults');
    expect(sto.supportState?.note).toMatch(/no reduction data/);
    const tio2 = result.rows.find((r) => r.id === 'tio2-au-minato2004')!;
    expect(tio2.supportState?.mapping).toBe('convention');
    expect(tio2.supportState?.inputs).toEqual({ reductionTemperature: 900, oxygenPressure: 1e-13 });
  });

  it('supportState: false gives every compared row library defaults', () => {
    const result = runValidation({ solve: () => ({ electronBarrier_eV: 1, barrierHeight_eV: 1, barrierCarrier: 'hole', electronsPerParticle: 1, profile: { x_nm: [0, 1], conductionBand_eV: [0, 0] } }), supportState: false });
    const compared = result.rows.filter((r) => r.status === 'ok');
    expect(compared.length).toBeGreaterThan(0);
    for (const r of compared) expect(r.supportState?.mapping, r.id).toBe('library-defaults');
  });
});

describe('the mapped states reach the physics', () => {
  it('reduced (convention) holds more donors than oxidised (convention) in rutile: [V_O] ~ pO2^(-1/6), Arrhenius in T', async () => {
    const { solveContact } = await import('../src/contact.js');
    const base = { metal: 'Pt', support: 'TiO2-rutile', geometry: 'planar' as const };
    const reduced = solveContact({ ...base, ...supportStateInputs(state({}), null).options } as Parameters<typeof solveContact>[0]);
    const oxidised = solveContact({ ...base, ...supportStateInputs(state({ state: 'oxidised' }), null).options } as Parameters<typeof solveContact>[0]);
    expect(reduced.donorDensity_cm3).toBeGreaterThan(1e3 * oxidised.donorDensity_cm3);
  });
});

describe('hole barriers of p-type supports', () => {
  it('compared with the majority-carrier barrier when the carriers are holes, refused otherwise', () => {
    const r = (carrier: 'hole' | 'electron') => ({ electronBarrier_eV: 2.0, barrierHeight_eV: carrier === 'hole' ? 1.5 : 2.0, barrierCarrier: carrier }) as unknown as ContactResult;
    expect(predictedBarrier_eV(r('hole'), 'holeBarrier_eV')).toBe(1.5);
    expect(predictedBarrier_eV(r('hole'), 'electronBarrier_eV')).toBe(2.0);
    expect(() => predictedBarrier_eV(r('electron'), 'holeBarrier_eV')).toThrow(RangeError);
  });
});

describe('technique: what each measurement sees', () => {
  // I-V (thermionic) and BEEM barriers are the top of the barrier, lowered by the image force; C-V, internal
  // photoemission extrapolated to zero field and photoemission see the barrier without it (Sze & Ng, Physics of
  // Semiconductor Devices, 3rd ed., sec. 3.2.4; Rhoderick & Williams, Metal-Semiconductor Contacts, 2nd ed., ch. 3)
  const r = (bandBending_eV: number, carrier: 'electron' | 'hole' = 'electron') =>
    ({ electronBarrier_eV: 1.0, barrierHeight_eV: carrier === 'hole' ? 0.8 : 1.0, barrierCarrier: carrier, bandBending_eV, imageForceLowering_eV: 0.07 }) as unknown as ContactResult;
  it('I-V and BEEM subtract the image-force lowering where the carriers are depleted; the others do not', () => {
    expect(predictedBarrier_eV(r(0.5), 'electronBarrier_eV', 'current-voltage')).toBeCloseTo(0.93, 12);
    expect(predictedBarrier_eV(r(0.5), 'electronBarrier_eV', 'beem')).toBeCloseTo(0.93, 12);
    for (const t of ['capacitance-voltage', 'internal-photoemission', 'photoemission', 'other'] as const) expect(predictedBarrier_eV(r(0.5), 'electronBarrier_eV', t)).toBe(1.0);
    // accumulation: no barrier maximum to lower
    expect(predictedBarrier_eV(r(-0.2), 'electronBarrier_eV', 'current-voltage')).toBe(1.0);
    // holes: depleted when the bands bend down
    expect(predictedBarrier_eV(r(-0.4, 'hole'), 'holeBarrier_eV', 'current-voltage')).toBeCloseTo(0.73, 12);
    expect(predictedBarrier_eV(r(0.4, 'hole'), 'holeBarrier_eV', 'current-voltage')).toBe(0.8);
  });
  it('every barrier row names its technique consistently with its method text', () => {
    for (const row of loadGallery().barriers) {
      const m = row.method.toLowerCase();
      if (row.technique === 'current-voltage') expect(m.startsWith('current-voltage'), row.id).toBe(true);
      if (row.technique === 'capacitance-voltage') expect(m.startsWith('capacitance-voltage'), row.id).toBe(true);
      if (row.technique === 'beem') expect(m, row.id).toContain('ballistic electron');
    }
  });
});
