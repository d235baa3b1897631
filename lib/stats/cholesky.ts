// Symmetric positive-definite solves for the Newton–Raphson fits in lib/stats (Cox and interval regression).
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

/** An LDLᵀ factor with its size, for callers that keep their matrices as arrays of rows. */
export interface SpdFactor {
  p: number;
  factor: Float64Array;
}

/** Factors a symmetric matrix given as rows; null when a pivot is not above tolerance × the largest diagonal entry. */
export function spdFactor(rows: readonly (readonly number[])[], tolerance = 0): SpdFactor | null {
  const p = rows.length;
  const factor = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) factor[i * p + j] = rows[i][j];
  return ldlFactor(factor, p, tolerance) === -1 ? { p, factor } : null;
}

/** A·x = b for x, as a new array. */
export function spdSolve({ p, factor }: SpdFactor, b: readonly number[]): number[] {
  const x = Float64Array.from(b);
  ldlSolve(factor, p, x);
  return Array.from(x);
}

/** A⁻¹ as rows. */
export function spdInverse({ p, factor }: SpdFactor): number[][] {
  const inverse = ldlInverse(factor, p);
  return Array.from({ length: p }, (_, i) => Array.from(inverse.subarray(i * p, (i + 1) * p)));
}

/**
 * The first column of a Gram matrix that is (numerically) a combination of the columns before it,
 * or -1 at full rank. Scaled to unit diagonal first, so the tolerance does not depend on units.
 */
export function firstDependentColumn(gram: readonly (readonly number[])[], tolerance = 1e-10): number {
  const p = gram.length;
  const scale = gram.map((row, i) => (row[i] > 0 ? 1 / Math.sqrt(row[i]) : 0));
  const zero = scale.indexOf(0);
  if (zero >= 0) return zero;
  const a = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) a[i * p + j] = gram[i][j] * scale[i] * scale[j];
  return ldlFactor(a, p, tolerance);
}
