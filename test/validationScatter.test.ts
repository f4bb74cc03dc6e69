// The scatter bands of the validation gallery (src/validation/scatter.ts): each row re-solved with its inputs drawn
// within their published ranges, the 5-95% band of the row's own observable, and the statistics of how many
// measurements fall inside.
//
// Checked against:
// - the exact distribution of the Schottky–Mott barrier phi_B = phi_m - chi (Sze & Ng, Physics of Semiconductor
//   Devices, 3rd ed., sec. 3.2.1) when phi_m and chi are independent uniforms: the difference of two uniforms has the
//   trapezoidal density, whose tails are F(s) = s^2 / (2 w_a w_b) (the convolution of two rectangles; e.g. Feller,
//   An Introduction to Probability Theory and Its Applications, vol. 2, 2nd ed., sec. I.9, from memory, verify);
// - the sample-quantile standard error sqrt(p (1 - p) / n) / f(x_p) (the asymptotic normality of sample quantiles,
//   e.g. Cramér, Mathematical Methods of Statistics, 1946, sec. 28.5, from memory, verify), which sets the tolerance;
// - the definitions of the statistics in validation/README.md, recomputed here on constructed rows.
import { describe, expect, it } from 'vitest';
import { resolveContact, type ContactOptions } from '../src/inputs/contactInput.js';
import { samplingRanges } from '../src/derived/uncertainty.js';
import { runValidation, summariseScatter, type ValidationRow } from '../src/validation/gallery.js';
import {
  fractionInsideBand,
  fractionMagnitudeReached,
  fractionSignReached,
  meanBandWidth,
  rowScatter,
  rowSeed,
  SCATTER_TAIL,
} from '../src/validation/scatter.js';
import { InputError } from '../src/errors.js';
import { predictedVsMeasuredSpec, statisticsText, validationTable } from '../src/validation/report.js';

/** p-quantile of A - B, A ~ U(a1, a2), B ~ U(b1, b2) independent (trapezoidal law; see the header). */
function differenceQuantile(p: number, [a1, a2]: readonly [number, number], [b1, b2]: readonly [number, number]): number {
  const wa = a2 - a1;
  const wb = b2 - b1;
  const [w1, w2] = wa <= wb ? [wa, wb] : [wb, wa];
  const lowest = a1 - b2;
  // S = X - lowest is the sum of U(0, w1) and U(0, w2): F(s) = s^2 / (2 w1 w2) for s <= w1,
  // (s - w1/2) / w2 for w1 <= s <= w2, 1 - (w1 + w2 - s)^2 / (2 w1 w2) above
  const corner = w1 / (2 * w2);
  let s: number;
  if (p <= corner) s = Math.sqrt(2 * p * w1 * w2);
  else if (p <= 1 - corner) s = p * w2 + w1 / 2;
  else s = w1 + w2 - Math.sqrt(2 * (1 - p) * w1 * w2);
  return lowest + s;
}

/** density of A - B at its p-quantile (for the quantile's standard error) */
function differenceDensity(p: number, a: readonly [number, number], b: readonly [number, number]): number {
  const h = 1e-6;
  return (2 * h) / (differenceQuantile(p + h, a, b) - differenceQuantile(p - h, a, b));
}

describe('the band of one row', () => {
  it('Schottky–Mott barrier: the band is the exact 5% and 95% quantiles of phi_m - chi (Pt on ZnO, library ranges)', () => {
    const options: ContactOptions = { metal: 'Pt', support: 'ZnO', barrierModel: 'ideal', geometry: 'planar', temperature: 300 };
    const ranges = samplingRanges(resolveContact(options));
    const wf = ranges.get('workFunction_eV')!;
    const chi = ranges.get('electronAffinity_eV')!;
    expect(wf[1] - wf[0]).toBeGreaterThan(0.1);
    expect(chi[1] - chi[0]).toBeGreaterThan(0.1);
    const n = 4000;
    const band = rowScatter(options, (r) => r.electronBarrier_eV, { samples: n, seed: 11, id: 'schottky-mott' });
    expect(band.failed).toBe(0);
    for (const [p, got] of [
      [0.05, band.p05],
      [0.5, band.p50],
      [0.95, band.p95],
    ] as const) {
      const exact = differenceQuantile(p, wf, chi);
      // 4 standard errors of the sample quantile
      const tolerance = (4 * Math.sqrt((p * (1 - p)) / n)) / differenceDensity(p, wf, chi);
      expect(Math.abs(got - exact), `p = ${p}: ${got} vs ${exact} (tolerance ${tolerance})`).toBeLessThan(tolerance);
    }
  });

  it('a row is sampled the same way whatever the rows around it: the seed mixes in the row id', () => {
    expect(rowSeed(1, 'a')).toBe(rowSeed(1, 'a'));
    expect(rowSeed(1, 'a')).not.toBe(rowSeed(1, 'b'));
    expect(rowSeed(1, 'a')).not.toBe(rowSeed(2, 'a'));
    const options = { metal: 'Au', support: 'ZnO', temperature: 300, geometry: 'planar' };
    const a = rowScatter(options, (r) => r.electronBarrier_eV, { samples: 20, seed: 5, id: 'row-x' });
    const b = rowScatter(options, (r) => r.electronBarrier_eV, { samples: 20, seed: 5, id: 'row-x' });
    expect(b).toEqual(a);
  });

  it('charge rows carry the probability of each direction, summing to 1', () => {
    const options = { metal: 'Pt', support: 'CeO2', temperature: 300, geometry: 'disc', particleDiameter: 2 };
    const sign = (v: number) => (Math.abs(v) < 0.5 ? 'none' : v > 0 ? 'to-metal' : 'to-support') as 'none' | 'to-metal' | 'to-support';
    const band = rowScatter(options, (r) => r.electronsPerParticle, { samples: 30, seed: 1, id: 'pt-ceria' }, sign);
    const p = band.signProbability!;
    expect(p['to-metal'] + p['to-support'] + p.none).toBeCloseTo(1, 12);
    expect(band.p05).toBeLessThanOrEqual(band.p50);
    expect(band.p50).toBeLessThanOrEqual(band.p95);
  });

  it('bad requests are typed input errors naming the flag', () => {
    const options = { metal: 'Pt', support: 'ZnO' };
    expect(() => rowScatter(options, (r) => r.electronBarrier_eV, { samples: 0, seed: 1, id: 'x' })).toThrow(InputError);
    expect(() => rowScatter(options, (r) => r.electronBarrier_eV, { samples: 0, seed: 1, id: 'x' })).toThrow(/--scatter/);
    expect(() => rowScatter(options, (r) => r.electronBarrier_eV, { samples: 5, seed: -1, id: 'x' })).toThrow(/--seed/);
  });
});

describe('statistics of the bands (definitions of validation/README.md, recomputed on constructed rows)', () => {
  it('inside the band, ends included; mean width', () => {
    const items = [
      { measured: 1, p05: 0.5, p95: 1.5 },
      { measured: 0.5, p05: 0.5, p95: 1.5 },
      { measured: 2, p05: 0.5, p95: 1.5 },
      { measured: -1, p05: 0, p95: 0.2 },
    ];
    expect(fractionInsideBand(items)).toBe(0.5);
    expect(meanBandWidth(items)).toBeCloseTo((1 + 1 + 1 + 0.2) / 4, 14);
    expect(fractionInsideBand([])).toBeNull();
    expect(meanBandWidth([])).toBeNull();
  });

  it('a sign counts as reached from 5% of the samples up', () => {
    expect(SCATTER_TAIL).toBe(0.05);
    expect(fractionSignReached([{ probability: 0.05 }, { probability: 0.0499 }, { probability: 1 }, { probability: 0 }])).toBe(0.5);
    expect(fractionSignReached([])).toBeNull();
  });

  it('a magnitude range meets the band of |N|, a band across zero reaching down to 0', () => {
    expect(fractionMagnitudeReached([{ range: [4, 6], p05: -3, p95: -1 }])).toBe(0); // |N| 1..3
    expect(fractionMagnitudeReached([{ range: [4, 6], p05: -5, p95: -1 }])).toBe(1); // |N| 1..5
    expect(fractionMagnitudeReached([{ range: [4, 6], p05: -1, p95: 7 }])).toBe(1); // |N| 0..7
    expect(fractionMagnitudeReached([{ range: [0.5, 1], p05: 2, p95: 3 }])).toBe(0);
    expect(fractionMagnitudeReached([{ range: [6, 4], p05: 6.5, p95: 9 }])).toBe(0); // reversed range read as [4, 6]
  });

  it('summariseScatter counts only compared rows with a band and a measurement of that kind', () => {
    const band = (p05: number, p95: number, signProbability?: Record<'to-metal' | 'to-support' | 'none', number>) => ({
      samples: 10,
      failed: 0,
      sampledInputs: [],
      p05,
      p50: (p05 + p95) / 2,
      p95,
      ...(signProbability ? { signProbability } : {}),
    });
    const head = { metal: 'M', support: 'S', method: 'm', citation: 'c', verified: true, predicted: 1, status: 'ok' as const };
    const rows: ValidationRow[] = [
      { ...head, kind: 'barrier', id: 'b1', measured: 1, scatter: band(0.5, 1.5) },
      { ...head, kind: 'barrier', id: 'b2', measured: 3, scatter: band(0.5, 1.5) },
      { ...head, kind: 'barrier', id: 'b3', measured: 3, status: 'excluded', scatter: band(0, 5) },
      { ...head, kind: 'barrier', id: 'b4', measured: 3 },
      { ...head, kind: 'charge', id: 'c1', measured: null, measuredSign: 'to-metal', measuredRange: [1, 2], scatter: band(-1, 3, { 'to-metal': 0.2, 'to-support': 0.3, none: 0.5 }) },
      { ...head, kind: 'charge', id: 'c2', measured: null, measuredSign: 'mixed', scatter: band(-1, 3, { 'to-metal': 0, 'to-support': 1, none: 0 }) },
      { ...head, kind: 'charge', id: 'c3', measured: null, measuredSign: 'to-support', scatter: band(1, 3, { 'to-metal': 1, 'to-support': 0, none: 0 }) },
      { ...head, kind: 'bandBending', id: 'bb', measured: 0.2, scatterFailure: 'every sample failed' },
    ];
    const s = summariseScatter(rows, { samples: 10, seed: 4 });
    expect(s).toEqual({
      samples: 10,
      seed: 4,
      barrierRows: 2,
      barrierInsideBand: 0.5,
      barrierMeanBandWidth_eV: 1,
      chargeSignRows: 2,
      chargeSignReached: 0.5,
      magnitudeRows: 1,
      magnitudeReached: 1,
      bandBendingRows: 0,
      bandBendingInsideBand: null,
      failedRows: 1,
    });
  });
});

describe('the gallery with scatter bands', () => {
  it('every compared row gets an ordered, finite band of its own observable; the plain statistics are unchanged', () => {
    const plain = runValidation({ model: 'default' });
    let ticks = 0;
    const banded = runValidation({ model: 'default', scatter: { samples: 6, seed: 2 }, onRow: () => ticks++ });
    expect(ticks).toBe(banded.rows.length);
    expect(banded.statistics.barrier).toEqual(plain.statistics.barrier);
    expect(banded.statistics.charge).toEqual(plain.statistics.charge);
    const s = banded.statistics.scatter!;
    expect(s.samples).toBe(6);
    expect(s.barrierRows).toBe(plain.statistics.barrier.rows);
    for (const f of [s.barrierInsideBand, s.chargeSignReached, s.bandBendingInsideBand]) {
      expect(f).not.toBeNull();
      expect(f!).toBeGreaterThanOrEqual(0);
      expect(f!).toBeLessThanOrEqual(1);
    }
    for (const r of banded.rows) {
      if (r.status !== 'ok') {
        expect(r.scatter).toBeUndefined();
        continue;
      }
      expect(r.scatter ?? r.scatterFailure, r.id).toBeDefined();
      if (!r.scatter) continue;
      const { p05, p50, p95 } = r.scatter;
      for (const v of [p05, p50, p95]) expect(Number.isFinite(v), r.id).toBe(true);
      expect(p05, r.id).toBeLessThanOrEqual(p50);
      expect(p50, r.id).toBeLessThanOrEqual(p95);
      expect(r.scatter.sampledInputs.length, r.id).toBeGreaterThan(0);
      if (r.kind === 'charge') expect(r.scatter.signProbability, r.id).toBeDefined();
    }
    expect(plain.statistics.scatter).toBeUndefined();

    // the report shows the bands: a column, a paragraph, and bars in the figure (one per banded barrier row)
    expect(validationTable(banded)).toContain('5-95% band');
    expect(validationTable(plain)).not.toContain('5-95% band');
    expect(statisticsText(banded.statistics)).toContain('within the published scatter of the inputs (6 samples per row');
    const spec = predictedVsMeasuredSpec(banded) as unknown as { layer: { mark: { type: string }; data: { values: unknown[] } }[] };
    const rules = spec.layer.filter((l) => l.mark.type === 'rule');
    expect(rules).toHaveLength(1);
    expect(rules[0]!.data.values.length).toBe(banded.rows.filter((r) => r.kind === 'barrier' && r.status === 'ok' && r.scatter).length);
  });
});
