import { describe, expect, it } from "vitest";
import {
  exactUDistribution,
  fisherExact,
  fisherExact2x2OneSided,
  holm,
  kruskalWallis,
  mannWhitney,
} from "@/lib/stats/tests";
import { chiSquareUpperTail, normalCdf } from "@/lib/stats/distributions";
import { mulberry32 } from "@/lib/allocation/prng"; // seeded, so runs are repeatable


// All k-subsets of 0…n−1 (brute-force helper).
function* subsets(n: number, k: number, start = 0, chosen: number[] = []): Generator<number[]> {
  if (chosen.length === k) {
    yield chosen.slice();
    return;
  }
  for (let i = start; i <= n - (k - chosen.length); i++) {
    chosen.push(i);
    yield* subsets(n, k, i + 1, chosen);
    chosen.pop();
  }
}

describe("distribution tails", () => {
  it("agree with closed forms", () => {
    // χ² with 2 df: P(X ≥ x) = e^(−x/2) exactly; with 1 df it is the two-sided normal tail.
    for (const x of [0.1, 1, 5.991, 20]) expect(chiSquareUpperTail(x, 2)).toBeCloseTo(Math.exp(-x / 2), 12);
    expect(chiSquareUpperTail(3.841458820694124, 1)).toBeCloseTo(0.05, 12); // qchisq(0.95, 1), textbook constant
    expect(normalCdf(1.959963984540054)).toBeCloseTo(0.975, 12); // qnorm(0.975), textbook constant
    expect(normalCdf(-8)).toBeCloseTo(6.22096057e-16, 24); // Φ(−8), standard normal tables (Abramowitz & Stegun 26.2)
  });
});

describe("fisherExact", () => {
  it("matches R fisher.test on the tea-tasting table", () => {
    expect(fisherExact([[3, 1], [1, 3]]).pValue).toBeCloseTo(0.4857, 4); // R fisher.test, tea tasting
    expect(fisherExact2x2OneSided([[3, 1], [1, 3]], "greater").pValue).toBeCloseTo(0.2429, 4); // R fisher.test, tea tasting
    // "less" is the other tail: P(X ≤ 3) = 1 − P(X = 4) = 1 − 1/70 (hypergeometric by hand).
    expect(fisherExact2x2OneSided([[3, 1], [1, 3]], "less").pValue).toBeCloseTo(69 / 70, 12);
  });

  it("agrees with a brute-force permutation enumeration on r × c tables", () => {
    // Independent check: under fixed margins every arrangement of the column labels over the
    // row-labelled items is equally likely, so enumerating arrangements gives each table's probability.
    for (const table of [[[1, 2, 0], [0, 1, 3], [2, 0, 1]], [[2, 0, 1], [0, 3, 1]], [[0, 2], [3, 0], [1, 2]]]) {
      expect(fisherExact(table).pValue).toBeCloseTo(bruteForceFisher(table), 12);
    }
  });

  it("matches R's documented job-satisfaction example", () => {
    const job = [[1, 2, 1, 0], [3, 3, 6, 1], [10, 10, 14, 9], [6, 7, 12, 11]];
    expect(fisherExact(job, { maxTables: 1e9 }).pValue).toBeCloseTo(0.7827, 3); // R ?fisher.test Job example, from memory
  });

  it("throws a clear error past the enumeration budget and drops empty rows", () => {
    const big = Array.from({ length: 4 }, () => [5, 5, 5, 5, 5]);
    expect(() => fisherExact(big)).toThrow(/tables share these margins/);
    expect(fisherExact([[3, 1, 0], [1, 3, 0], [0, 0, 0]]).pValue).toBeCloseTo(0.4857, 4); // R fisher.test, tea tasting
    expect(fisherExact([[4, 2]]).pValue).toBe(1);
    expect(() => fisherExact([[1, -1], [0, 2]])).toThrow(RangeError);
  });
});

function bruteForceFisher(table: number[][]): number {
  const rowOf: number[] = table.flatMap((row, i) => row.flatMap((x) => Array<number>(x).fill(i)));
  const colLabels: number[] = table.flatMap((row) => row.flatMap((x, j) => Array<number>(x).fill(j))).sort();
  const counts = new Map<string, number>();
  let total = 0;
  // Distinct permutations of the column-label multiset (lexicographic next-permutation).
  const perm = colLabels.slice();
  for (;;) {
    const t = table.map((row) => row.map(() => 0));
    perm.forEach((col, item) => t[rowOf[item]][col]++);
    const key = JSON.stringify(t);
    counts.set(key, (counts.get(key) ?? 0) + 1);
    total++;
    let i = perm.length - 2;
    while (i >= 0 && perm[i] >= perm[i + 1]) i--;
    if (i < 0) break;
    let j = perm.length - 1;
    while (perm[j] <= perm[i]) j--;
    [perm[i], perm[j]] = [perm[j], perm[i]];
    perm.splice(i + 1, perm.length, ...perm.slice(i + 1).reverse());
  }
  const observed = counts.get(JSON.stringify(table))!;
  let extreme = 0;
  for (const c of counts.values()) if (c <= observed * (1 + 1e-7)) extreme += c;
  return extreme / total;
}

describe("mannWhitney", () => {
  it("matches R's documented Hollander & Wolfe example", () => {
    const x = [0.8, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46];
    const y = [1.15, 0.88, 0.9, 0.74, 1.21];
    const r = mannWhitney(x, y);
    expect(r.u).toBe(35); // R ?wilcox.test example, W = 35, from memory
    expect(Math.abs(r.pValue - 2 * 0.1272)).toBeLessThan(0.002); // R one-sided p = 0.1272, doubled; from memory
  });

  it("gives the exact p of a brute-force permutation enumeration when there are no ties", () => {
    // Independent check: enumerate every split of the pooled sample into groups of n1 and n2.
    const rand = mulberry32(7);
    for (const [n1, n2] of [[5, 6], [3, 8], [7, 4]]) {
      const pooled = Array.from({ length: n1 + n2 }, () => rand());
      const x = pooled.slice(0, n1);
      const y = pooled.slice(n1);
      const uOf = (xs: number[], ys: number[]) => xs.reduce((s, a) => s + ys.filter((b) => b < a).length, 0);
      const observed = uOf(x, y);
      const us: number[] = [];
      for (const idx of subsets(n1 + n2, n1)) {
        const inX = new Set(idx);
        us.push(uOf(idx.map((i) => pooled[i]), pooled.filter((_, i) => !inX.has(i))));
      }
      const lower = us.filter((u) => u <= observed).length / us.length;
      const upper = us.filter((u) => u >= observed).length / us.length;
      const expectedP = Math.min(1, 2 * (observed > (n1 * n2) / 2 ? upper : lower));
      const r = mannWhitney(x, y);
      expect(r.u).toBe(observed);
      expect(r.pValue).toBeCloseTo(expectedP, 12);
    }
  });

  it("builds the exact U distribution that brute force counts", () => {
    const dist = exactUDistribution(4, 5);
    const counts = new Array<number>(21).fill(0);
    for (const idx of subsets(9, 4)) counts[idx.reduce((s, v, k) => s + v - k, 0)]++; // U = Σ(rank − own position)
    counts.forEach((c, u) => expect(dist[u]).toBeCloseTo(c / 126, 14));
  });

  it("uses the tie-corrected normal approximation with continuity correction when there are ties", () => {
    const x = [1, 2, 2, 3, 5, 5, 6];
    const y = [2, 3, 3, 4, 4, 5, 7, 8];
    const r = mannWhitney(x, y);
    // Hand computation of R's formula: mid-ranks of x = 1, 3, 3, 6, 11, 11, 13 → W = 48 − 28 = 20.
    expect(r.u).toBe(20);
    const ties = [3, 3, 2, 3].reduce((s, t) => s + t ** 3 - t, 0); // tie groups: 2s, 3s, 4s, 5s
    const sigma = Math.sqrt(((7 * 8) / 12) * (16 - ties / (15 * 14)));
    const z = (20 - 28 + 0.5) / sigma;
    expect(r.pValue).toBeCloseTo(2 * normalCdf(z), 12);
  });
});

describe("kruskalWallis", () => {
  it("matches R's documented Hollander & Wolfe example", () => {
    const r = kruskalWallis([[2.9, 3.0, 2.5, 2.6, 3.2], [3.8, 2.7, 4.0, 2.4], [2.8, 3.4, 3.7, 2.2, 2.0]]);
    expect(r.h).toBeCloseTo(0.77143, 4); // R ?kruskal.test example, from memory
    expect(r.df).toBe(2);
    expect(Math.abs(r.pValue - 0.68)).toBeLessThan(0.005); // R ?kruskal.test example, from memory
  });

  it("equals the squared uncorrected rank-sum z for two groups, ties included", () => {
    // Identity: with two groups H is z² of the Mann–Whitney statistic with the tie-corrected
    // variance and no continuity correction; checks both tie corrections against each other.
    const x = [1, 2, 2, 3, 5, 5, 6];
    const y = [2, 3, 3, 4, 4, 5, 7, 8];
    const u = mannWhitney(x, y).u;
    const ties = [3, 3, 2, 3].reduce((s, t) => s + t ** 3 - t, 0);
    const variance = ((7 * 8) / 12) * (16 - ties / (15 * 14));
    expect(kruskalWallis([x, y]).h).toBeCloseTo((u - 28) ** 2 / variance, 10);
  });

  it("ignores empty groups and needs two non-empty ones", () => {
    expect(kruskalWallis([[1, 2], [], [3, 4]]).df).toBe(1);
    expect(() => kruskalWallis([[1, 2], []])).toThrow(RangeError);
  });
});

describe("holm", () => {
  it("matches the hand-worked step-down example", () => {
    // 5·0.01, 4·0.02, 3·0.03, then running maximum 0.09 (Holm 1979 procedure by hand)
    const adjusted = holm([0.01, 0.02, 0.03, 0.04, 0.05]);
    [0.05, 0.08, 0.09, 0.09, 0.09].forEach((v, i) => expect(adjusted[i]).toBeCloseTo(v, 12));
  });

  it("agrees with the brute-force definition on random inputs", () => {
    // Definition: adj(p_i) = min(1, max over p_(j) ≤ p_i of (m − j + 1)·p_(j)), j the 1-based rank.
    const rand = mulberry32(11);
    for (let trial = 0; trial < 50; trial++) {
      const m = 1 + Math.floor(rand() * 8);
      const p = Array.from({ length: m }, () => (rand() < 0.2 ? 0.5 : rand() ** 3));
      const sorted = [...p].sort((a, b) => a - b);
      const expected = p.map((pi) =>
        Math.min(1, Math.max(...sorted.map((pj, j) => (pj <= pi ? (m - j) * pj : 0)))),
      );
      holm(p).forEach((v, i) => expect(v).toBeCloseTo(expected[i], 12));
    }
  });

  it("passes NaN through without counting it", () => {
    const adjusted = holm([0.01, Number.NaN, 0.04]);
    expect(adjusted[0]).toBeCloseTo(0.02, 12);
    expect(adjusted[1]).toBeNaN();
    expect(adjusted[2]).toBeCloseTo(0.04, 12);
  });
});
