// --uncertainty samples every input of the nanoscale contact (issue 11, item 6) within its published range:
// interface states (slope S, charge-neutrality level, interfacial layer), localised states (sites, level) and the
// size coefficient of the particle's work function. The ranges checked here are the library's min/max (each cited
// in materials/supports.json / metals.json) and the defaults' published ranges stated in src/derived/uncertainty.ts.
// Uniform sampling: with 400 draws the sample range covers > 95% of [lo, hi] unless the generator is broken
// (probability that no draw falls in the top or bottom 2.5%: 2 x 0.975^400 ~ 8e-5; elementary probability).
import { describe, expect, it } from 'vitest';
import { resolveContact } from '../src/inputs/contactInput.js';
import type { ContactOptions, SampledField } from '../src/inputs/parameters.js';
import { DEFAULT_LAYER_THICKNESS_RANGE_M, sampleInputs, samplingRanges, seededRandom } from '../src/derived/uncertainty.js';
import { solveContact } from '../src/contact.js';

const DRAWS = 400;

function draws(options: ContactOptions): { fields: Map<SampledField, number[]>; ranges: Map<SampledField, [number, number]>; gaps: number[]; levels: number[] } {
  const base = resolveContact(options);
  const ranges = samplingRanges(base);
  const random = seededRandom(11);
  const fields = new Map<SampledField, number[]>();
  const gaps: number[] = [];
  const levels: number[] = [];
  for (let i = 0; i < DRAWS; i++) {
    const s = sampleInputs(base, random, ranges);
    const all = { ...s.support, ...s.metal } as unknown as Record<string, number>;
    for (const f of ranges.keys()) fields.set(f, [...(fields.get(f) ?? []), all[f]!]);
    gaps.push(s.support.bandGap_eV);
    if (s.support.neutralLevelAboveValence_eV !== undefined) levels.push(s.support.neutralLevelAboveValence_eV);
  }
  return { fields, ranges, gaps, levels };
}

function expectCovers(values: number[], lo: number, hi: number, label: string): void {
  const min = Math.min(...values);
  const max = Math.max(...values);
  expect(min, label).toBeGreaterThanOrEqual(lo * (1 - 1e-12));
  expect(max, label).toBeLessThanOrEqual(hi * (1 + 1e-12));
  expect(max - min, label).toBeGreaterThan(0.95 * (hi - lo));
}

describe('--uncertainty samples the inputs of interface states, localised states and the finite particle', () => {
  it('Pt on rutile (interface-state model, hemisphere): S, CNL, localised level, layer and size coefficient', () => {
    const { fields, ranges } = draws({ metal: 'Pt', support: 'TiO2-rutile', geometry: 'hemisphere' });
    // library ranges, materials/supports.json (TiO2-rutile) and metals.json (Pt): see the notes there for the sources
    const expected: [SampledField, number, number][] = [
      ['pinningFactor', 0.153, 0.293],
      ['neutralLevelAboveValence_eV', 1.9, 2.5],
      ['localisedLevel_eV', 0.35, 0.85], // thermal levels converted from photoemission (src/bulk/polaron.ts)
      ['interfaceLayerThickness_m', DEFAULT_LAYER_THICKNESS_RANGE_M[0], DEFAULT_LAYER_THICKNESS_RANGE_M[1]],
      ['interfaceLayerPermittivity', 1, 7.37], // 1 to the optical permittivity of the library entry
      ['sizeWorkFunctionCoefficient', 0.375, 0.5], // Seidl & Perdew, Phys. Rev. B 50, 5744 (1994): 3/8 to 1/2
    ];
    for (const [field, lo, hi] of expected) {
      expect(ranges.get(field), field).toEqual([lo, hi]);
      expectCovers(fields.get(field)!, lo, hi, field);
    }
  });

  it('CeO2: the localised sites within the library range (2.51e22 to 2.52e22 cm^-3), log-uniform', () => {
    const { fields } = draws({ metal: 'Pt', support: 'CeO2', geometry: 'hemisphere' });
    expectCovers(fields.get('localisedSites_m3')!, 2.51e28, 2.52e28, 'localisedSites_m3');
  });

  it('a sampled charge-neutrality level is used as drawn, also above the sampled gap (ZnO: CNL 2.6-3.4 eV, gap 3.3-3.437 eV), and stays within E_g + 2 eV', () => {
    // a level in the conduction band is physical (In2O3: King et al., Phys. Rev. Lett. 101, 116808 (2008)); the model
    // accepts up to 2 eV above E_C (src/interface/interfaceStates.ts), so no ZnO draw is capped
    const { levels, gaps } = draws({ metal: 'Pt', support: 'ZnO' });
    expect(levels.length).toBe(DRAWS);
    levels.forEach((l, i) => expect(l).toBeLessThanOrEqual(gaps[i]! + 2));
    expect(levels.some((l, i) => l > gaps[i]!)).toBe(true); // some draws lie above the CBM and are kept there
    expect(Math.max(...levels)).toBeGreaterThan(3.35);
  });

  it('inputs the user gives are exact: no range for a given layer, interface-state density or planar particle', () => {
    const base = resolveContact({ metal: 'Pt', support: 'TiO2-rutile', interfaceLayerThickness: '0.4 nm', interfaceLayerPermittivity: 2, interfaceStateDensity: 1e13 });
    const ranges = samplingRanges(base);
    for (const f of ['interfaceLayerThickness_m', 'interfaceLayerPermittivity', 'pinningFactor', 'sizeWorkFunctionCoefficient'] as SampledField[]) {
      expect(ranges.has(f), f).toBe(false);
    }
  });

  it('the sampled inputs move the electrons per particle (Pt on rutile, 2 nm hemisphere)', () => {
    const r = solveContact({ metal: 'Pt', support: 'TiO2-rutile', geometry: 'hemisphere', uncertainty: 30, seed: 2 });
    const u = r.uncertainty!;
    for (const f of ['pinningFactor', 'neutralLevelAboveValence_eV', 'localisedLevel_eV', 'interfaceLayerThickness_m', 'interfaceLayerPermittivity', 'sizeWorkFunctionCoefficient']) {
      expect(u.sampledInputs, f).toContain(f);
    }
    expect(u.electronsPerParticle.p95).toBeGreaterThan(u.electronsPerParticle.p05);
  });
});
