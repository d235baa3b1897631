import { describe, expect, it } from "vitest";
import { blandAltman, cohensKappa, cohensKappaFromTable } from "@/lib/stats/agreement";

// Husband × wife ratings (Agresti, Categorical Data Analysis)
const husbandWife = [
  [7, 7, 2, 3],
  [2, 8, 3, 7],
  [1, 5, 4, 9],
  [2, 8, 9, 14],
];

function expand(table: number[][]): { a: number[]; b: number[] } {
  const a: number[] = [];
  const b: number[] = [];
  table.forEach((row, i) =>
    row.forEach((count, j) => {
      for (let c = 0; c < count; c++) {
        a.push(i);
        b.push(j);
      }
    }),
  );
  return { a, b };
}

describe("cohensKappa", () => {
  const { a, b } = expand(husbandWife);

  it("expands the reference table to 91 rated pairs", () => {
    expect(a.length).toBe(91); // Agresti husband × wife table, n = 91
  });

  it("matches the unweighted, linear and quadratic reference values", () => {
    expect(cohensKappa(a, b, { categories: 4 })).toBeCloseTo(0.1293, 4); // Agresti husband × wife [lib]
    expect(cohensKappa(a, b, { categories: 4, weights: "linear" })).toBeCloseTo(0.2374, 4); // Agresti husband × wife [lib]
    expect(cohensKappa(a, b, { categories: 4, weights: "quadratic" })).toBeCloseTo(0.332, 4); // Agresti husband × wife [lib]
  });

  it("gives the same value from the table", () => {
    for (const weights of ["none", "linear", "quadratic"] as const) {
      expect(cohensKappaFromTable(husbandWife, weights)).toBeCloseTo(cohensKappa(a, b, { categories: 4, weights }), 12);
    }
  });

  it("is 1 for perfect agreement and symmetric in the raters", () => {
    expect(cohensKappa([0, 1, 2, 2], [0, 1, 2, 2], { categories: 3, weights: "quadratic" })).toBeCloseTo(1, 12);
    expect(cohensKappa(b, a, { categories: 4, weights: "linear" })).toBeCloseTo(cohensKappa(a, b, { categories: 4, weights: "linear" }), 12);
  });

  it("is undefined (NaN) when both raters used a single category", () => {
    expect(cohensKappa([1, 1, 1], [1, 1, 1], { categories: 3 })).toBeNaN();
  });

  it("rejects ratings outside 0…k−1 and unpaired input", () => {
    expect(() => cohensKappa([0, 4], [0, 1], { categories: 4 })).toThrow(RangeError);
    expect(() => cohensKappa([0, 1], [0], { categories: 4 })).toThrow(RangeError);
  });
});

describe("blandAltman", () => {
  it("computes bias, sd (n − 1) and 1.96·sd limits", () => {
    // Hand computation: differences 1, 2, 3, 4 → mean 2.5, sample variance 5/3.
    const r = blandAltman([11, 12, 13, 14], [10, 10, 10, 10]);
    const sd = Math.sqrt(5 / 3);
    expect(r.n).toBe(4);
    expect(r.bias).toBeCloseTo(2.5, 12);
    expect(r.sd).toBeCloseTo(sd, 12);
    expect(r.lower).toBeCloseTo(2.5 - 1.96 * sd, 12);
    expect(r.upper).toBeCloseTo(2.5 + 1.96 * sd, 12);
  });

  it("needs at least two pairs of equal length", () => {
    expect(() => blandAltman([1], [2])).toThrow(RangeError);
    expect(() => blandAltman([1, 2], [2])).toThrow(RangeError);
  });
});
