// The comparison built from outcomes (pure, no database): tests chosen, medians and their intervals,
// numbers at risk, and what the summary says when data are thin.
import { describe, expect, it } from "vitest";
import { compareGroups, pearsonChiSquare, scorerAgreement } from "@/lib/analysis/compare";
import type { SpecimenOutcome } from "@/lib/analysis/derive";

const DAYS = [0, 7, 14, 28];

/** A specimen of `treatment` first seen rusted at `rustDay` (null: never), scored at DAYS. */
function outcome(i: number, treatment: string, rustDay: number | null, chamber = "A"): SpecimenOutcome {
  const observations = DAYS.map((day) => ({ inspectionId: `i${day}`, day, rusted: rustDay !== null && day >= rustDay, areaPercent: rustDay !== null && day >= rustDay ? day / 10 : 0, weeping: false }));
  const k = rustDay === null ? -1 : DAYS.indexOf(rustDay);
  return {
    placementId: `p${i}`, specimenId: `s${i}`, specimenLabel: `S-${i}`, materialClass: "iron-meteorite",
    chamberId: chamber, chamberName: `Jar ${chamber}`, chamberRhPercent: chamber === "A" ? 33 : 75, treatmentId: treatment,
    treatmentName: treatment, treatmentKind: treatment === "control" ? "control" : "coating", armLabel: null, observations,
    interval: k < 0 ? { lower: 28, upper: null } : { lower: k === 0 ? 0 : DAYS[k - 1], upper: DAYS[k] },
    rusted: k >= 0, finalAreaPercent: observations[3].areaPercent, finalDay: 28, weepingSeen: false,
  };
}

describe("pearsonChiSquare", () => {
  it("matches a hand computation", () => {
    // [[10, 20], [20, 10]]: every expected count is 15, χ² = 4 · 5²/15 = 20/3 on 1 df;
    // p = 2(1 − Φ(√(20/3))) = 0.00982 (normal tail, computed by hand).
    const r = pearsonChiSquare([[10, 20], [20, 10]]);
    expect(r.chiSquare).toBeCloseTo(20 / 3, 12);
    expect(r.df).toBe(1);
    expect(r.pValue).toBeCloseTo(0.00982, 4);
  });
});

describe("compareGroups", () => {
  const data = [
    ...[7, 7, 14, 14, 28].map((d, i) => outcome(i, "control", d)),
    ...[28, null, null, null, null].map((d, i) => outcome(10 + i, "wax", d)),
  ];

  it("puts the control first, gives Turnbull and Kaplan–Meier medians, and orders the KM interval around its median", () => {
    const c = compareGroups(data, { groupBy: "treatment" });
    expect(c.groups.map((g) => [g.label, g.n, g.events])).toEqual([["control", 5, 5], ["wax", 5, 1]]);
    // Control: 2 of 5 by day 7, 4 of 5 by day 14, so S first ≤ 0.5 in (7, 14].
    expect(c.groups[0].turnbull.median).toEqual({ time: 14, lower: 7, upper: 14 });
    const km = c.groups[0].km;
    // KM (all five rust): S(7) = 0.6 with log limits 0.29–1, S(14) = 0.2 with 0.035–1, S(28) = 0
    // (hand-computed Greenwood). The lower limit first drops to 0.5 at day 7, the upper only at day 28.
    expect(km.median).toBe(14);
    expect([km.medianLower, km.medianUpper]).toEqual([7, 28]);
    expect(km.points[1].lower).toBeCloseTo(0.6 * Math.exp(-1.959964 * Math.sqrt(2 / 15)), 6);
    expect(c.groups[1].turnbull.median).toBeNull();
    expect(c.atRisk).toEqual({ times: [0, 7, 14, 28], counts: [[5, 5, 3, 1], [5, 5, 5, 5]] });
    expect(c.logRank?.df).toBe(1);
    expect(c.finalStateTest?.method).toBe("fisher");
    // Censoring marks sit where the wax specimens were last seen clean.
    expect(c.groups[1].turnbull.censorMarks).toEqual([{ time: 28, survival: 0.8, count: 4 }]);
  });

  it("draws Greenwood bands only for Kaplan–Meier", () => {
    const c = compareGroups(data, { groupBy: "treatment", method: "km" });
    expect(c.groups[0].km.points.every((p) => p.lower !== null && p.lower <= p.survival && p.survival <= p.upper!)).toBe(true);
    expect(c.groups[0].turnbull.points.every((p) => p.lower === null && p.upper === null)).toBe(true);
    expect(c.notes.join(" ")).toMatch(/Greenwood 95 % bands on the log scale/);
    expect(c.summary.join(" ")).toMatch(/Median time to first rust: control 14 days; wax not reached/);
  });

  it("runs no log-rank test when nothing rusted, and says so", () => {
    const clean = [outcome(1, "control", null), outcome(2, "wax", null)];
    const c = compareGroups(clean, { groupBy: "treatment" });
    expect(c.logRank).toBeNull();
    expect(c.summary.join(" ")).toMatch(/No log-rank test could be run/);
    expect(c.summary.join(" ")).toMatch(/No specimen in control and wax rusted/);
  });

  it("falls back to Pearson's χ² when the final-state table is too large for Fisher's exact test", () => {
    const many = Array.from({ length: 1200 }, (_, i) => outcome(i, `t${i % 12}`, i % (2 + (i % 12)) === 0 ? 14 : null));
    const c = compareGroups(many, { groupBy: "treatment" });
    expect(c.finalStateTest?.method).toBe("chi-square");
    expect(c.notes.join(" ")).toMatch(/Pearson's χ² \(the table is too large for Fisher's exact test\)/);
    expect(c.pairwise).toHaveLength(66);
  });

  it("reports scorer agreement, or why it has none", () => {
    expect(scorerAgreement([])).toBeNull();
    // Both scorers gave grade 10 every time: kappa is undefined (chance agreement is 1).
    const same = scorerAgreement([{ recordGrade: 10, blindGrade: 10 }, { recordGrade: 10, blindGrade: 10 }]);
    expect(same).toEqual({ pairs: 2, kappa: null, kappaQuadratic: null });
    const c = compareGroups(data, { groupBy: "treatment", agreement: same });
    expect(c.notes.join(" ")).toMatch(/could not be expressed as kappa/);
    expect(compareGroups(data, { groupBy: "treatment" }).notes.join(" ")).toMatch(/No blind second scores exist/);
  });
});
