// Pieces shared by the 2D axisymmetric references (axisymmetric2d.ts, disc2d.ts), written for the tests: graded
// node sets and the banded LU solve of their Newton steps (M-matrix Jacobians, no pivoting needed).
import type { ChargeModel } from '../../src/bulk/equilibrium.js';

/** The support side of a reference problem (reduced units as in src/electrostatics/poisson.ts). */
export interface SupportProblem {
  model: ChargeModel;
  bulkReducedFermiLevel: number;
  /** u_s = band bending / kT */
  surfaceBending: number;
  relativePermittivity: number;
  temperature_K: number;
}

/** Graded nodes on [0, L]: first cell h0, geometric growth, exactly n + 1 nodes (uniform if h0 n >= L). */
export function graded(length: number, h0: number, n: number): number[] {
  // growth g with h0 (g^n - 1)/(g - 1) = L, by bisection
  const total = (g: number): number => (Math.abs(g - 1) < 1e-12 ? h0 * n : (h0 * (Math.pow(g, n) - 1)) / (g - 1));
  if (total(1) >= length) return Array.from({ length: n + 1 }, (_, i) => (i * length) / n);
  let lo = 1;
  let hi = 2;
  while (total(hi) < length) hi *= 1.5;
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (total(mid) < length) lo = mid;
    else hi = mid;
  }
  const g = 0.5 * (lo + hi);
  const out = [0];
  let h = h0;
  for (let i = 0; i < n; i++) {
    out.push(out[i]! + h);
    h *= g;
  }
  const scale = length / out[n]!;
  return out.map((v) => v * scale);
}

/**
 * Solve A x = b in place for a banded n x n matrix stored row-wise with `width` = 2 bw + 1 entries per row (entry
 * (row, col) at row * width + bw + (col - row)): LU without pivoting, the band overwritten, b replaced by x.
 */
export function solveBandedInPlace(band: Float64Array, width: number, bw: number, n: number, b: Float64Array): void {
  for (let k = 0; k < n; k++) {
    const pivot = band[k * width + bw]!;
    const last = Math.min(n - 1, k + bw);
    const kBase = k * width + bw - k;
    for (let row = k + 1; row <= last; row++) {
      const at = row * width + bw + (k - row);
      const lk = band[at]!;
      if (lk === 0) continue;
      const factor = lk / pivot;
      band[at] = 0;
      const rowBase = row * width + bw - row;
      for (let col = k + 1; col <= last; col++) band[rowBase + col] -= factor * band[kBase + col]!;
      b[row] -= factor * b[k]!;
    }
  }
  for (let k = n - 1; k >= 0; k--) {
    let sum = b[k]!;
    const last = Math.min(n - 1, k + bw);
    const kBase = k * width + bw - k;
    for (let col = k + 1; col <= last; col++) sum -= band[kBase + col]! * b[col]!;
    b[k] = sum / band[k * width + bw]!;
  }
}

export interface DampedNewtonOptions {
  /** largest step applied at once, in the unknowns' units */
  cap: number;
  /** stop once the full step is below this */
  stepTolerance: number;
  /** give up halving once t * |step| is below this */
  minStep: number;
  maxIterations: number;
}

/**
 * Damped Newton for the references: residual(v, withJacobian) fills `res` (and the band) and returns a residual norm;
 * solve(b) replaces b by J^-1 b; the step is capped, then halved until the norm falls by (1 - 0.1 t). Updates u in
 * place; returns the iterations, or null when it did not converge within maxIterations.
 */
export function dampedNewton(
  u: Float64Array,
  res: Float64Array,
  residual: (v: Float64Array, withJacobian: boolean) => number,
  solve: (b: Float64Array) => void,
  o: DampedNewtonOptions,
): number | null {
  const n = u.length;
  const step = new Float64Array(n);
  const trial = new Float64Array(n);
  for (let iterations = 0; iterations < o.maxIterations; iterations++) {
    const norm = residual(u, true);
    for (let k = 0; k < n; k++) step[k] = -res[k]!;
    solve(step);
    let maxStep = 0;
    for (let k = 0; k < n; k++) maxStep = Math.max(maxStep, Math.abs(step[k]!));
    if (!Number.isFinite(maxStep)) throw new Error('2D reference: non-finite Newton step');
    if (maxStep < o.stepTolerance) {
      for (let k = 0; k < n; k++) u[k] += step[k]!;
      return iterations;
    }
    let t = Math.min(1, o.cap / maxStep);
    for (let h = 0; h < 40; h++) {
      for (let k = 0; k < n; k++) trial[k] = u[k]! + t * step[k]!;
      const trialNorm = residual(trial, false);
      if (trialNorm < (1 - 0.1 * t) * norm || t * maxStep < o.minStep) break;
      t *= 0.5;
    }
    u.set(trial);
  }
  return null;
}
