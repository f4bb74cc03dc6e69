// The 5-point Gauss–Legendre rule (Abramowitz & Stegun, Handbook of Mathematical Functions, Table 25.4) integrates
// every polynomial of degree <= 9 exactly on [-1, 1]: int t^k dt = 2/(k+1) for even k, 0 for odd k (exact analytic).
import { describe, expect, it } from 'vitest';
import { GL5_NODES, GL5_WEIGHTS } from '../src/electrostatics/gaussLegendre.js';

const rule = (f: (t: number) => number): number => GL5_NODES.reduce((sum, t, k) => sum + GL5_WEIGHTS[k]! * f(t), 0);

describe('5-point Gauss–Legendre rule', () => {
  it('integrates t^k exactly for k = 0..9 and not for k = 10', () => {
    for (let k = 0; k <= 9; k++) expect(rule((t) => t ** k), `t^${k}`).toBeCloseTo(k % 2 === 0 ? 2 / (k + 1) : 0, 14);
    // degree 10 is the first one it misses (the error term of an n-point rule involves f^(2n))
    expect(Math.abs(rule((t) => t ** 10) - 2 / 11)).toBeGreaterThan(1e-4);
  });
});
