// Agreement between two scorers (or a scorer and the automatic estimate) on the same photos.
import { mean, sampleStandardDeviation } from "simple-statistics";

export type KappaWeights = "none" | "linear" | "quadratic";

function agreementWeight(i: number, j: number, k: number, weights: KappaWeights): number {
  if (weights === "none" || k === 1) return i === j ? 1 : 0;
  const distance = Math.abs(i - j) / (k - 1);
  return weights === "linear" ? 1 - distance : 1 - distance * distance;
}

/**
 * Cohen's kappa from a square k × k table (rows: rater A, columns: rater B), optionally weighted
 * with agreement weights 1 − |i−j|/(k−1) (linear) or 1 − ((i−j)/(k−1))² (quadratic).
 * NaN when chance agreement is already 1 (both raters used one and the same category): kappa is
 * undefined there, and 0 or 1 would both mislead.
 */
export function cohensKappaFromTable(table: readonly (readonly number[])[], weights: KappaWeights = "none"): number {
  const k = table.length;
  if (k === 0 || table.some((row) => row.length !== k)) throw new RangeError("cohensKappaFromTable: needs a square table");
  let n = 0;
  const rowSums = new Array<number>(k).fill(0);
  const colSums = new Array<number>(k).fill(0);
  table.forEach((row, i) =>
    row.forEach((x, j) => {
      if (!(x >= 0) || !Number.isFinite(x)) throw new RangeError(`cohensKappaFromTable: counts must be ≥ 0, got ${x}`);
      n += x;
      rowSums[i] += x;
      colSums[j] += x;
    }),
  );
  if (n === 0) throw new RangeError("cohensKappaFromTable: the table is empty");
  let observed = 0;
  let chance = 0;
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      const w = agreementWeight(i, j, k, weights);
      observed += (w * table[i][j]) / n;
      chance += (w * rowSums[i] * colSums[j]) / (n * n);
    }
  }
  return chance >= 1 ? NaN : (observed - chance) / (1 - chance);
}

/**
 * Cohen's kappa for paired ordinal ratings coded 0…categories−1 (e.g. ASTM D610 grades mapped to
 * an index). Categories nobody used still count for the weights' spacing.
 */
export function cohensKappa(
  a: readonly number[],
  b: readonly number[],
  opts: { categories: number; weights?: KappaWeights },
): number {
  const k = opts.categories;
  if (!Number.isInteger(k) || k < 1) throw new RangeError(`cohensKappa: categories must be a whole number ≥ 1, got ${k}`);
  if (a.length !== b.length) throw new RangeError("cohensKappa: both raters must rate the same items");
  if (a.length === 0) throw new RangeError("cohensKappa: no ratings");
  const table = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  for (let i = 0; i < a.length; i++) {
    for (const r of [a[i], b[i]]) {
      if (!Number.isInteger(r) || r < 0 || r >= k) throw new RangeError(`cohensKappa: rating ${r} is not in 0…${k - 1}`);
    }
    table[a[i]][b[i]]++;
  }
  return cohensKappaFromTable(table, opts.weights ?? "none");
}

export interface BlandAltmanResult {
  /** Mean of a − b. */
  bias: number;
  /** Sample standard deviation (n − 1) of a − b. */
  sd: number;
  /** bias − 1.96·sd */
  lower: number;
  /** bias + 1.96·sd */
  upper: number;
  n: number;
}

/** Bland–Altman limits of agreement for paired measurements (e.g. rusted-area % by two methods). */
export function blandAltman(a: readonly number[], b: readonly number[]): BlandAltmanResult {
  if (a.length !== b.length) throw new RangeError("blandAltman: a and b must be paired (same length)");
  if (a.length < 2) throw new RangeError("blandAltman: needs at least 2 pairs for a standard deviation");
  const diffs = a.map((x, i) => x - b[i]);
  if (diffs.some((d) => !Number.isFinite(d))) throw new RangeError("blandAltman: values must be finite");
  const bias = mean(diffs);
  const sd = sampleStandardDeviation(diffs);
  return { bias, sd, lower: bias - 1.96 * sd, upper: bias + 1.96 * sd, n: diffs.length };
}
