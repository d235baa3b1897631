// Small dense symmetric positive-definite algebra for the interval regression (a handful of
// parameters, so plain arrays and an unpivoted Cholesky factor are enough).

/** Lower Cholesky factor L of a symmetric matrix A (A = L Lᵀ), or null when A is not positive definite. */
export function choleskyLower(a: readonly (readonly number[])[]): number[][] | null {
  const n = a.length;
  const l: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let j = 0; j < n; j++) {
    let diag = a[j][j];
    for (let k = 0; k < j; k++) diag -= l[j][k] * l[j][k];
    if (!(diag > 0) || !Number.isFinite(diag)) return null;
    const root = Math.sqrt(diag);
    l[j][j] = root;
    for (let i = j + 1; i < n; i++) {
      let s = a[i][j];
      for (let k = 0; k < j; k++) s -= l[i][k] * l[j][k];
      l[i][j] = s / root;
    }
  }
  return l;
}

/** Solve L Lᵀ x = b for x, given the lower factor L. */
export function choleskySolve(l: readonly (readonly number[])[], b: readonly number[]): number[] {
  const n = l.length;
  const y = new Array<number>(n);
  for (let i = 0; i < n; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i][k] * y[k];
    y[i] = s / l[i][i];
  }
  const x = new Array<number>(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i];
    for (let k = i + 1; k < n; k++) s -= l[k][i] * x[k];
    x[i] = s / l[i][i];
  }
  return x;
}

/** Inverse of A from its lower Cholesky factor (symmetrised so the two triangles agree exactly). */
export function choleskyInverse(l: readonly (readonly number[])[]): number[][] {
  const n = l.length;
  const inv: number[][] = [];
  for (let j = 0; j < n; j++) {
    const e = new Array<number>(n).fill(0);
    e[j] = 1;
    inv.push(choleskySolve(l, e));
  }
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < i; j++) {
      const mean = (inv[i][j] + inv[j][i]) / 2;
      inv[i][j] = mean;
      inv[j][i] = mean;
    }
  }
  return inv;
}

/**
 * The first column of a Gram matrix that is (numerically) a linear combination of the columns
 * before it, or -1 when the matrix has full rank. The matrix is scaled to unit diagonal first so the
 * tolerance is relative and does not depend on the units of each column.
 */
export function firstDependentColumn(gram: readonly (readonly number[])[], tolerance = 1e-10): number {
  const n = gram.length;
  const scale = gram.map((row, i) => (row[i] > 0 ? 1 / Math.sqrt(row[i]) : 0));
  const l: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let j = 0; j < n; j++) {
    if (scale[j] === 0) return j;
    let diag = 1;
    for (let k = 0; k < j; k++) diag -= l[j][k] * l[j][k];
    if (!(diag > tolerance)) return j;
    const root = Math.sqrt(diag);
    l[j][j] = root;
    for (let i = j + 1; i < n; i++) {
      let s = gram[i][j] * scale[i] * scale[j];
      for (let k = 0; k < j; k++) s -= l[i][k] * l[j][k];
      l[i][j] = s / root;
    }
  }
  return -1;
}
