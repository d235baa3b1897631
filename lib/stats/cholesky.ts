// Symmetric positive-definite solves for the Newton–Raphson fits in lib/stats (Cox regression first).
// The factor is LDLᵀ (Cholesky without square roots), done in place on a p×p row-major Float64Array,
// with R survival's cholesky2 rule for "singular": a pivot below tolerance × the largest diagonal entry.

/** R survival's default toler.chol, .Machine$double.eps^0.75. */
export const CHOLESKY_TOLERANCE = Math.pow(2.220446049250313e-16, 0.75);

/**
 * Factors the symmetric matrix `a` (p×p, row-major; only the lower triangle is read) in place into
 * L (unit lower triangle, below the diagonal) and D (on the diagonal). Returns -1 when every pivot is
 * positive and above the tolerance, otherwise the 0-based index of the first column whose pivot is not:
 * that column is (numerically) a combination of the columns before it, or carries no information.
 */
export function ldlFactor(a: Float64Array, p: number, tolerance = CHOLESKY_TOLERANCE): number {
  let largest = 0;
  for (let i = 0; i < p; i++) {
    const d = a[i * p + i];
    if (!Number.isFinite(d)) return i;
    if (d > largest) largest = d;
  }
  const eps = largest * tolerance;
  for (let i = 0; i < p; i++) {
    const pivot = a[i * p + i];
    if (!(pivot > eps) || !Number.isFinite(pivot)) return i;
    for (let j = i + 1; j < p; j++) {
      const ratio = a[j * p + i] / pivot;
      a[j * p + i] = ratio;
      a[j * p + j] -= ratio * ratio * pivot;
      for (let k = j + 1; k < p; k++) a[k * p + j] -= ratio * a[k * p + i];
    }
  }
  return -1;
}

/** Solves A·x = b in place (b becomes x), given the LDLᵀ factor of A from ldlFactor. */
export function ldlSolve(factor: Float64Array, p: number, b: Float64Array): void {
  for (let i = 0; i < p; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= factor[i * p + k] * b[k];
    b[i] = s;
  }
  for (let i = 0; i < p; i++) b[i] /= factor[i * p + i];
  for (let i = p - 1; i >= 0; i--) {
    let s = b[i];
    for (let k = i + 1; k < p; k++) s -= factor[k * p + i] * b[k];
    b[i] = s;
  }
}

/** A⁻¹ as a full symmetric p×p row-major matrix, given the LDLᵀ factor of A. */
export function ldlInverse(factor: Float64Array, p: number): Float64Array {
  const inverse = new Float64Array(p * p);
  const column = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    column.fill(0);
    column[j] = 1;
    ldlSolve(factor, p, column);
    for (let i = 0; i < p; i++) inverse[i * p + j] = column[i];
  }
  // Symmetrise: the two triangles differ by rounding only, and callers read either.
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < i; j++) {
      const mean = (inverse[i * p + j] + inverse[j * p + i]) / 2;
      inverse[i * p + j] = mean;
      inverse[j * p + i] = mean;
    }
  }
  return inverse;
}

/** x'·A⁻¹·x given the LDLᵀ factor of A (a score or Wald statistic). */
export function ldlQuadraticForm(factor: Float64Array, p: number, x: ArrayLike<number>): number {
  const solved = Float64Array.from(x);
  ldlSolve(factor, p, solved);
  let value = 0;
  for (let i = 0; i < p; i++) value += x[i] * solved[i];
  return value;
}
