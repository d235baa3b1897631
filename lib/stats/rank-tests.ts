// Rank tests for rust measures that are not times: rusted area, spot counts, ordinal grades.
import { chiSquareUpperTail, normalCdf } from "./distributions";

export interface MannWhitneyResult {
  /** R's W for x: sum of x's ranks − n1(n1+1)/2. */
  u: number;
  pValue: number;
}

export interface KruskalWallisResult {
  h: number;
  df: number;
  pValue: number;
}

/** Mid-ranks (1-based) of `values`, plus Σ(t³ − t) over tie groups for the tie corrections. */
export function midRanks(values: readonly number[]): { ranks: Float64Array; tieSum: number } {
  const n = values.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => values[a] - values[b]);
  const ranks = new Float64Array(n);
  let tieSum = 0;
  for (let i = 0; i < n; ) {
    let j = i;
    while (j + 1 < n && values[order[j + 1]] === values[order[i]]) j++;
    const rank = (i + j + 2) / 2;
    for (let k = i; k <= j; k++) ranks[order[k]] = rank;
    const t = j - i + 1;
    tieSum += t * t * t - t;
    i = j + 1;
  }
  return { ranks, tieSum };
}

function checkFinite(values: readonly number[], who: string): void {
  for (const v of values) if (!Number.isFinite(v)) throw new RangeError(`${who}: values must be finite, got ${v}`);
}

/**
 * Null distribution of U for sample sizes m and n, as probabilities indexed by u = 0…mn.
 * Recursion P(m,n;u) = m/(m+n)·P(m−1,n;u−n) + n/(m+n)·P(m,n−1;u) (the smallest observation is
 * from x or from y); all terms are positive, so it stays accurate where counts would overflow.
 */
export function exactUDistribution(m: number, n: number): Float64Array {
  // prev[j] holds P(i−1, j; ·), cur[j] holds P(i, j; ·).
  let prev: Float64Array[] = Array.from({ length: n + 1 }, () => Float64Array.of(1));
  for (let i = 1; i <= m; i++) {
    const cur: Float64Array[] = [Float64Array.of(1)];
    for (let j = 1; j <= n; j++) {
      const dist = new Float64Array(i * j + 1);
      const fromX = prev[j];
      const fromY = cur[j - 1];
      const wx = i / (i + j);
      const wy = j / (i + j);
      for (let u = 0; u < fromY.length; u++) dist[u] += wy * fromY[u];
      for (let u = 0; u < fromX.length; u++) dist[u + j] += wx * fromX[u];
      cur.push(dist);
    }
    prev = cur;
  }
  return prev[n];
}

/**
 * Two-sided Mann–Whitney / Wilcoxon rank-sum test, following R's wilcox.test defaults: exact p
 * when both samples have fewer than 50 values and there are no ties, otherwise the normal
 * approximation with tie-corrected variance and continuity correction.
 */
export function mannWhitney(x: readonly number[], y: readonly number[]): MannWhitneyResult {
  const n1 = x.length;
  const n2 = y.length;
  if (n1 === 0 || n2 === 0) throw new RangeError("mannWhitney: both samples need at least one value");
  checkFinite(x, "mannWhitney");
  checkFinite(y, "mannWhitney");
  const { ranks, tieSum } = midRanks([...x, ...y]);
  let rankSumX = 0;
  for (let i = 0; i < n1; i++) rankSumX += ranks[i];
  const u = rankSumX - (n1 * (n1 + 1)) / 2;

  if (n1 < 50 && n2 < 50 && tieSum === 0) {
    const dist = exactUDistribution(n1, n2);
    // R: the tail on the side of the observed W, doubled; summed directly so small p stay exact.
    let p = 0;
    if (u > (n1 * n2) / 2) for (let k = u; k < dist.length; k++) p += dist[k];
    else for (let k = 0; k <= u; k++) p += dist[k];
    return { u, pValue: Math.min(1, 2 * p) };
  }

  const n = n1 + n2;
  const centred = u - (n1 * n2) / 2;
  const sigma = Math.sqrt(((n1 * n2) / 12) * (n + 1 - tieSum / (n * (n - 1))));
  if (sigma === 0) return { u, pValue: 1 }; // every value tied: no evidence either way
  const z = (centred - Math.sign(centred) * 0.5) / sigma;
  const pValue = Math.min(1, 2 * Math.min(normalCdf(z), normalCdf(-z)));
  return { u, pValue };
}

/**
 * Kruskal–Wallis H with the tie correction, chi-square p on (groups − 1) df, as R's kruskal.test.
 * Empty groups are ignored; at least two non-empty groups are needed.
 */
export function kruskalWallis(groups: readonly (readonly number[])[]): KruskalWallisResult {
  const used = groups.filter((g) => g.length > 0);
  if (used.length < 2) throw new RangeError("kruskalWallis: needs at least 2 non-empty groups");
  used.forEach((g) => checkFinite(g, "kruskalWallis"));
  const all = used.flat();
  const n = all.length;
  const { ranks, tieSum } = midRanks(all);
  let offset = 0;
  let sumSquares = 0;
  for (const g of used) {
    let rankSum = 0;
    for (let i = 0; i < g.length; i++) rankSum += ranks[offset + i];
    offset += g.length;
    sumSquares += (rankSum * rankSum) / g.length;
  }
  const df = used.length - 1;
  const correction = 1 - tieSum / (n * n * n - n);
  if (correction <= 0) return { h: 0, df, pValue: 1 }; // every value tied
  const h = ((12 / (n * (n + 1))) * sumSquares - 3 * (n + 1)) / correction;
  return { h, df, pValue: chiSquareUpperTail(Math.max(0, h), df) };
}
