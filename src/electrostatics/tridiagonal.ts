// Thomas algorithm for a tridiagonal system in O(N), with caller-provided work arrays (no allocation in Newton loops).
// Stable without pivoting for the diagonally dominant M-matrices the Poisson Jacobian produces.

/**
 * Solve lower[i] x[i-1] + diag[i] x[i] + upper[i] x[i+1] = rhs[i] for i = offset..offset+n-1 (lower[offset] and
 * upper[offset+n-1] unused). The solution is written to `out` at the same indices; `work` must be as long as
 * the others. Returns false when a pivot vanishes.
 */
export function solveTridiagonal(
  n: number,
  lower: Float64Array,
  diag: Float64Array,
  upper: Float64Array,
  rhs: Float64Array,
  out: Float64Array,
  work: Float64Array,
  offset = 0,
): boolean {
  const first = offset;
  const end = offset + n;
  let pivot = diag[first]!;
  if (pivot === 0 || !Number.isFinite(pivot)) return false;
  out[first] = rhs[first]! / pivot;
  for (let i = first + 1; i < end; i++) {
    work[i] = upper[i - 1]! / pivot;
    pivot = diag[i]! - lower[i]! * work[i]!;
    if (pivot === 0 || !Number.isFinite(pivot)) return false;
    out[i] = (rhs[i]! - lower[i]! * out[i - 1]!) / pivot;
  }
  for (let i = end - 2; i >= first; i--) out[i] = out[i]! - work[i + 1]! * out[i + 1]!;
  return true;
}

/**
 * LU factorisation of the same tridiagonal matrix for several right-hand sides (Thomas algorithm split in two):
 * writes the reciprocal pivots to `inversePivot` and the multipliers upper[i-1]/pivot[i-1] to `ratio`, at the
 * indices offset..offset+n-1. Returns false when a pivot vanishes or is not finite.
 */
export function factorTridiagonal(
  n: number,
  lower: Float64Array,
  diag: Float64Array,
  upper: Float64Array,
  inversePivot: Float64Array,
  ratio: Float64Array,
  offset = 0,
): boolean {
  const end = offset + n;
  let pivot = diag[offset]!;
  if (pivot === 0 || !Number.isFinite(pivot)) return false;
  let inverse = 1 / pivot;
  inversePivot[offset] = inverse;
  for (let i = offset + 1; i < end; i++) {
    const r = upper[i - 1]! * inverse;
    ratio[i] = r;
    pivot = diag[i]! - lower[i]! * r;
    if (pivot === 0 || !Number.isFinite(pivot)) return false;
    inverse = 1 / pivot;
    inversePivot[i] = inverse;
  }
  return true;
}

/** Solve with a factorisation from factorTridiagonal (same n, lower and offset); rhs and out may be the same array. */
export function solveFactoredTridiagonal(
  n: number,
  lower: Float64Array,
  inversePivot: Float64Array,
  ratio: Float64Array,
  rhs: Float64Array,
  out: Float64Array,
  offset = 0,
): void {
  const end = offset + n;
  let previous = rhs[offset]! * inversePivot[offset]!;
  out[offset] = previous;
  for (let i = offset + 1; i < end; i++) {
    previous = (rhs[i]! - lower[i]! * previous) * inversePivot[i]!;
    out[i] = previous;
  }
  for (let i = end - 2; i >= offset; i--) out[i] = out[i]! - ratio[i + 1]! * out[i + 1]!;
}
