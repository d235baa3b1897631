// Hypothesis tests used when comparing treatments. Fisher and the rank tests live in their own
// files; this module is the one place the product imports tests from.
import type { SurvivalObservation } from "./observations";
import { logRank, stratifiedLogRank } from "./survival";

export {
  fisherExact,
  fisherExact2x2OneSided,
  FISHER_ENUMERATION_BUDGET,
  type FisherResult,
  type FisherOptions,
} from "./fisher";
export {
  mannWhitney,
  kruskalWallis,
  exactUDistribution,
  midRanks,
  type MannWhitneyResult,
  type KruskalWallisResult,
} from "./rank-tests";

/**
 * Holm step-down adjustment, as R's p.adjust(method = "holm"): sorted ascending, the i-th smallest
 * (1-based) is multiplied by (m − i + 1), made monotone by a running maximum and capped at 1.
 * NaN entries stay NaN and, like R's NA, do not count towards m.
 */
export function holm(pValues: readonly number[]): number[] {
  const order = pValues
    .map((p, i) => ({ p, i }))
    .filter(({ p }) => !Number.isNaN(p))
    .sort((a, b) => a.p - b.p);
  for (const { p } of order) {
    if (p < 0 || p > 1) throw new RangeError(`holm: p-values must lie in [0, 1], got ${p}`);
  }
  const m = order.length;
  const adjusted = pValues.map(() => NaN);
  let running = 0;
  order.forEach(({ p, i }, rank) => {
    running = Math.max(running, Math.min(1, (m - rank) * p));
    adjusted[i] = running;
  });
  return adjusted;
}

export interface PairwiseLogRank {
  groupA: string;
  groupB: string;
  chiSquare: number;
  pValue: number;
  /** Holm-adjusted over all pairs in this call. */
  adjustedPValue: number;
}

/** Log-rank test for every pair of groups, with Holm's adjustment across the pairs. */
export function pairwiseLogRank(
  groups: readonly (readonly SurvivalObservation[])[],
  labels: readonly string[],
): PairwiseLogRank[] {
  if (labels.length !== groups.length) throw new RangeError("pairwiseLogRank: one label per group");
  const pairs: Omit<PairwiseLogRank, "adjustedPValue">[] = [];
  for (let a = 0; a < groups.length; a++) {
    for (let b = a + 1; b < groups.length; b++) {
      const { chiSquare, pValue } = logRank([groups[a], groups[b]]);
      pairs.push({ groupA: labels[a], groupB: labels[b], chiSquare, pValue });
    }
  }
  const adjusted = holm(pairs.map((p) => p.pValue));
  return pairs.map((p, i) => ({ ...p, adjustedPValue: adjusted[i] }));
}

/**
 * Stratified log-rank test for every pair of groups (each group's rows carry their stratum), with
 * Holm's adjustment across the pairs: the pairwise companion of stratifiedLogRank.
 */
export function pairwiseStratifiedLogRank(
  groups: readonly (readonly (SurvivalObservation & { stratum: string })[])[],
  labels: readonly string[],
): PairwiseLogRank[] {
  if (labels.length !== groups.length) throw new RangeError("pairwiseStratifiedLogRank: one label per group");
  const pairs: Omit<PairwiseLogRank, "adjustedPValue">[] = [];
  for (let a = 0; a < groups.length; a++) {
    for (let b = a + 1; b < groups.length; b++) {
      const rows = [...groups[a].map((r) => ({ ...r, group: "a" })), ...groups[b].map((r) => ({ ...r, group: "b" }))];
      const { chiSquare, pValue } = stratifiedLogRank(rows);
      pairs.push({ groupA: labels[a], groupB: labels[b], chiSquare, pValue });
    }
  }
  const adjusted = holm(pairs.map((p) => p.pValue));
  return pairs.map((p, i) => ({ ...p, adjustedPValue: adjusted[i] }));
}
