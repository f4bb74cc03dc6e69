// The validation gallery (validation/*.json): published measurements beside the model's predictions.
// The statistics functions are checked on toy inputs worked by hand; the gallery itself is checked for
// integrity (every row cites a reference, every verified row names where it was read); and the statistics
// of the current model are compared with the committed baseline (validation/baseline.json).
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  BASELINE_MODELS,
  GALLERY_DIR,
  fractionWithinFactor,
  loadGallery,
  meanAbsoluteError,
  pairMeans,
  regressions,
  runValidation,
  signAgreement,
  summarise,
  withinFactor,
  type Baseline,
  type ValidationRow,
} from '../src/validation/gallery.js';
import { chargeSpec, predictedVsMeasuredSpec, statisticsText, validationTable } from '../src/validation/report.js';

describe('validation statistics on toy inputs (worked by hand)', () => {
  it('mean absolute error', () => {
    // |1.0-0.8| + |0.5-0.9| + |1.2-1.2| = 0.2 + 0.4 + 0 = 0.6 -> 0.6 / 3 = 0.2
    expect(meanAbsoluteError([{ predicted: 1.0, measured: 0.8 }, { predicted: 0.5, measured: 0.9 }, { predicted: 1.2, measured: 1.2 }])).toBeCloseTo(0.2, 12);
    expect(meanAbsoluteError([])).toBeNull();
  });

  it('pair means: each pair is the mean of its rows, then one error per pair', () => {
    // Pt|ZnO measured 0.8 and 1.0 (mean 0.9), predicted 1.4 twice; Au|ZnO measured 0.6, predicted 0.7.
    // pair errors 0.5 and 0.1 -> MAE 0.3 (the per-row MAE would be (0.6 + 0.4 + 0.1)/3 = 0.3667).
    const pairs = pairMeans([
      { pair: 'Pt|ZnO', predicted: 1.4, measured: 0.8 },
      { pair: 'Pt|ZnO', predicted: 1.4, measured: 1.0 },
      { pair: 'Au|ZnO', predicted: 0.7, measured: 0.6 },
    ]);
    expect(pairs).toHaveLength(2);
    expect(pairs.find((p) => p.pair === 'Pt|ZnO')!.measured).toBeCloseTo(0.9, 12);
    expect(meanAbsoluteError(pairs)).toBeCloseTo(0.3, 12);
  });

  it('sign agreement ignores "mixed" rows; |N| < 0.5 counts as "none"', () => {
    // definite rows: (+3, to-metal) yes, (-2, to-metal) no, (-1, to-support) yes, (0, to-support) no,
    // (0.3, none) yes, (-0.6, none) no -> 3/6
    const f = signAgreement([
      { predicted: 3, sign: 'to-metal' },
      { predicted: -2, sign: 'to-metal' },
      { predicted: -1, sign: 'to-support' },
      { predicted: 0, sign: 'to-support' },
      { predicted: 0.3, sign: 'none' },
      { predicted: -0.6, sign: 'none' },
      { predicted: 5, sign: 'mixed' },
    ]);
    expect(f).toBeCloseTo(0.5, 12);
    expect(signAgreement([{ predicted: 1, sign: 'mixed' }])).toBeNull();
  });

  it('factor of 3 against a measured range [lo, hi]: lo/3 <= |p| <= 3 hi', () => {
    // range [1, 6]: accepted 1/3 .. 18
    expect(withinFactor(0.34, [1, 6])).toBe(true);
    expect(withinFactor(0.33, [1, 6])).toBe(false);
    expect(withinFactor(-18, [1, 6])).toBe(true);
    expect(withinFactor(18.1, [1, 6])).toBe(false);
    // 2 of 3 inside
    expect(fractionWithinFactor([{ predicted: 5, range: [4, 6] }, { predicted: 40, range: [4, 6] }, { predicted: -2, range: [4, 6] }])).toBeCloseTo(2 / 3, 12);
  });

  it('summarise counts only rows that were compared', () => {
    const row = (o: Partial<ValidationRow>): ValidationRow => ({
      kind: 'barrier', id: 'x', metal: 'Pt', support: 'ZnO', method: 'I-V', citation: 'c', verified: true, measured: 1, predicted: 1, status: 'ok', ...o,
    });
    const s = summarise(
      [
        row({ id: 'a', measured: 0.9, predicted: 1.1 }),
        row({ id: 'b', metal: 'Au', measured: 0.7, predicted: 0.6, verified: false }),
        row({ id: 'c', status: 'failed', predicted: null }),
        row({ id: 'd', kind: 'charge', measured: null, measuredSign: 'to-support', measuredRange: [1, 2], predicted: -4 }),
      ],
      'ideal',
    );
    // pairs Pt|ZnO (0.2) and Au|ZnO (0.1) -> 0.15; verified only: 0.2
    expect(s.barrier.pairs).toBe(2);
    expect(s.barrier.meanAbsoluteError_eV).toBeCloseTo(0.15, 12);
    expect(s.barrier.verifiedMeanAbsoluteError_eV).toBeCloseTo(0.2, 12);
    expect(s.barrier.failed).toBe(1);
    expect(s.charge.signAgreement).toBe(1);
    expect(s.charge.withinFactor3).toBe(1); // 4 <= 2*3
  });
});

describe('the gallery data', () => {
  const g = loadGallery();

  it('loads, every citation resolves and every id is unique (checked by loadGallery)', () => {
    expect(g.barriers.length).toBeGreaterThan(0);
    expect(g.charges.length).toBeGreaterThan(0);
    expect(g.bandBending.length).toBeGreaterThan(0);
  });

  it('every verified row names an address where the number was read; unverified rows say so in their note', () => {
    for (const r of [...g.barriers, ...g.charges, ...g.bandBending]) {
      if (r.verified) expect(r.whereSeen, r.id).toMatch(/https?:\/\//);
      else expect(`${r.whereSeen} ${r.note ?? ''}`, r.id).toMatch(/memory/i);
    }
  });

  it('library keys, where given, exist in the materials library', async () => {
    const { loadBuiltinLibrary, findMetal, findSupport } = await import('../src/materials/load.js');
    const lib = loadBuiltinLibrary();
    for (const r of [...g.barriers, ...g.charges, ...g.bandBending]) {
      if (r.metalKey !== null) expect(() => findMetal(lib, r.metalKey!), r.id).not.toThrow();
      if (r.supportKey !== null) expect(() => findSupport(lib, r.supportKey!), r.id).not.toThrow();
    }
  });

  it('the report builders work on a run with a stand-in solver', () => {
    // A stand-in that predicts 1 eV for every barrier, -1 electron for every particle and a flat profile:
    // band bending seen = 0, so the band-bending error is |0 - measured|.
    const result = runValidation({
      solve: () => ({ electronBarrier_eV: 1, electronsPerParticle: -1, fermiLevelBelowConduction_eV: 0.1, profile: { x_nm: [0, 100], conductionBand_eV: [0.1, 0.1] } }),
    });
    const bb = g.bandBending.filter((r) => r.inStatistics && r.metalKey && r.supportKey);
    const expected = bb.reduce((s, r) => s + Math.abs((r.initialBandBending_eV ?? 0) + r.value), 0) / bb.length;
    expect(result.statistics.bandBending.meanAbsoluteError_eV).toBeCloseTo(expected, 12);
    expect(validationTable(result)).toContain('barrier heights: mean absolute error');
    expect(statisticsText(result.statistics)).toContain('model: ideal');
    const spec = predictedVsMeasuredSpec(result) as unknown as { layer: { data: { values: unknown[] } }[] };
    expect(spec.layer[1]!.data.values.length).toBe(result.statistics.barrier.rows);

    // the charge figure: one marker per compared charge row, coloured by the same rule as the sign statistic
    const charge = chargeSpec(result) as unknown as { layer: { mark: { type: string }; data: { values: { agrees?: string; rangeLo?: number; rangeHi?: number }[] } }[] };
    const points = charge.layer.find((l) => l.mark.type === 'point')!.data.values;
    expect(points.length).toBe(result.statistics.charge.rows);
    const scored = points.filter((p) => p.agrees !== 'mixed (not scored)');
    expect(scored.length).toBe(result.statistics.charge.signRows);
    expect(scored.filter((p) => p.agrees === 'direction agrees').length / scored.length).toBeCloseTo(result.statistics.charge.signAgreement!, 12);
    // measured magnitude bars sit on the measured side: to-support ranges are negative (electrons gained by the metal)
    const bars = charge.layer.find((l) => l.mark.type === 'bar')!.data.values;
    expect(bars.length).toBeGreaterThan(0);
    for (const b of bars) expect(Math.sign(b.rangeLo!)).toBe(Math.sign(b.rangeHi!));
  });
});

describe('validation against the committed baseline (validation/baseline.json)', () => {
  const baseline = JSON.parse(readFileSync(join(GALLERY_DIR, 'baseline.json'), 'utf8')) as Baseline;
  for (const model of BASELINE_MODELS) {
    it(`${model}: the statistics are not worse than the baseline`, () => {
      const base = baseline.statistics[model];
      expect(base, `no baseline for ${model}`).toBeDefined();
      const current = runValidation({ model }).statistics;
      expect(regressions(current, base!)).toEqual([]);
    });
  }
});
