// Thomas algorithm for a tridiagonal system in O(N), with caller-provided work arrays (no allocation in Newton loops).
// Stable without pivoting for the diagonally dominant M-matrices the Poisson Jacobian produces.

/**
 * Solve lower[i] x[i-1] + diag[i] x[i] + upper[i] x[i+1] = rhs[i] for i = 0..n-1 (lower[0], upper[n-1] unused).
 * The solution is written to `out`; `work` must hold n values. Returns false when a pivot vanishes.
 */
export function solveTridiagonal(
  n: number,
  lower: Float64Array,
  diag: Float64Array,
  upper: Float64Array,
  rhs: Float64Array,
  out: Float64Array,
  work: Float64Array,
): boolean {
  let pivot = diag[0]!;
  if (pivot === 0 || !Number.isFinite(pivot)) return false;
  out[0] = rhs[0]! / pivot;
  for (let i = 1; i < n; i++) {
    work[i] = upper[i - 1]! / pivot;
    pivot = diag[i]! - lower[i]! * work[i]!;
    if (pivot === 0 || !Number.isFinite(pivot)) return false;
    out[i] = (rhs[i]! - lower[i]! * out[i - 1]!) / pivot;
  }
  for (let i = n - 2; i >= 0; i--) out[i] = out[i]! - work[i + 1]! * out[i + 1]!;
  return true;
}
