// The comparison built from outcomes (pure, no database): tests chosen, medians and their intervals,
// numbers at risk, and what the summary says when data are thin.
import { describe, expect, it } from "vitest";
import { compareGroups, pearsonChiSquare, scorerAgreement } from "@/lib/analysis/compare";
import { logRank, stratifiedLogRank } from "@/lib/stats/survival";
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
    entry: 0, weepingInterval: { lower: 28, upper: null }, rustedEarlier: false, weptEarlier: false,
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
    // (hand-computed Greenwood). The lower limit first drops to 0.5 at day 7; the upper never does
    // before S reaches 0, where the log limits are undefined.
    // R 4.2.2, survival 3.5-3: survfit(Surv(c(7,7,14,14,28), rep(1,5)) ~ 1) → median 14, 0.95LCL 7, 0.95UCL NA
    expect(km.median).toBe(14);
    expect([km.medianLower, km.medianUpper]).toEqual([7, null]);
    expect(km.points[1].lower).toBeCloseTo(0.6 * Math.exp(-1.959964 * Math.sqrt(2 / 15)), 6);
    expect(c.groups[1].turnbull.median).toBeNull();
    expect(c.atRisk).toEqual({ times: [0, 7, 14, 28], counts: [[5, 5, 3, 1], [5, 5, 5, 5]] });
    expect(c.logRank?.df).toBe(1);
    // Treatments are compared within chambers (one chamber here), and the summary says so.
    expect(c.stratifiedBy).toBe("chamber");
    expect(c.summary.join(" ")).toMatch(/Log-rank test stratified by chamber of time to first rust across the 2 treatments/);
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

  it("stratifies treatment and material groupings by chamber, and leaves chamber and arm groupings unstratified", () => {
    // Chamber A (dry): control rusts late; chamber B (wet): everything rusts early, and B holds most wax.
    const mixed = [
      ...[14, 28, null].map((d, i) => outcome(i, "control", d, "A")),
      ...[28, null].map((d, i) => outcome(10 + i, "wax", d, "A")),
      ...[7, 7].map((d, i) => outcome(20 + i, "control", d, "B")),
      ...[7, 7, 14, 14].map((d, i) => outcome(30 + i, "wax", d, "B")),
    ];
    const byTreatment = compareGroups(mixed, { groupBy: "treatment" });
    const rows = mixed.map((o) => {
      const iv = o.interval!;
      return { time: iv.upper ?? iv.lower, event: iv.upper !== null, group: o.treatmentId, stratum: o.chamberId };
    });
    // The same as the stratified test on the right-endpoint rows (survdiff(… + strata(chamber)) is
    // checked against R in tests/unit/stats-strata-entry.test.ts), not the pooled one.
    expect(byTreatment.logRank!.chiSquare).toBeCloseTo(stratifiedLogRank(rows).chiSquare, 12);
    const pooled = logRank(["control", "wax"].map((t) => rows.filter((r) => r.group === t)));
    expect(Math.abs(byTreatment.logRank!.chiSquare - pooled.chiSquare)).toBeGreaterThan(0.1);
    expect(byTreatment.logRank!.stratifiedBy).toBe("chamber");
    expect(compareGroups(mixed, { groupBy: "material" }).stratifiedBy).toBe("chamber");
    const byChamber = compareGroups(mixed, { groupBy: "chamber" });
    expect(byChamber.stratifiedBy).toBeNull();
    expect(byChamber.summary.join(" ")).toMatch(/Log-rank test of time to first rust/);
    expect(compareGroups(mixed, { groupBy: "arm" }).stratifiedBy).toBeNull();
    // Pairwise tests of a stratified grouping are stratified too.
    const three = [...mixed, ...[14, null, 7].map((d, i) => outcome(40 + i, "oil", d, i === 2 ? "B" : "A"))];
    const c3 = compareGroups(three, { groupBy: "treatment" });
    const pairRows = rows.concat(three.slice(mixed.length).map((o) => ({ time: o.interval!.upper ?? o.interval!.lower, event: o.interval!.upper !== null, group: "oil", stratum: o.chamberId })));
    const controlVsWax = c3.pairwise.find((p) => p.groupA === "control" && p.groupB === "wax")!;
    expect(controlVsWax.chiSquare).toBeCloseTo(stratifiedLogRank(pairRows.filter((r) => r.group !== "oil")).chiSquare, 12);
    expect(c3.summary.join(" ")).toMatch(/Pairwise log-rank tests stratified by chamber, Holm-adjusted/);
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
    // Both scorers gave grade 10 (clean) every time: both kappas are undefined (chance agreement is 1).
    const clean = { spotCount: 0, areaPercent: 0, weeping: false };
    const same = scorerAgreement([{ recordGrade: 10, blindGrade: 10, record: clean, blind: clean }, { recordGrade: 10, blindGrade: 10, record: clean, blind: clean }]);
    expect(same).toEqual({ rustCall: { pairs: 2, kappa: null, agreed: 2, recordRusted: 0, blindRusted: 0 }, pairs: 2, kappa: null, kappaQuadratic: null });
    const c = compareGroups(data, { groupBy: "treatment", agreement: same });
    expect(c.notes.join(" ")).toMatch(/could not be expressed as kappa/);
    expect(compareGroups(data, { groupBy: "treatment" }).notes.join(" ")).toMatch(/No blind second scores exist/);
  });

  it("headlines kappa on the rust / no-rust call, with kappa on ASTM grades beside it", () => {
    // 20 photos scored twice. Rust call table (rows: record, columns: blind):
    //            blind rust  blind clean
    //   rust          6           2
    //   clean         1          11
    // Cohen 1960: p_o = (6 + 11)/20 = 0.85; p_e = (8·7 + 12·13)/20² = (56 + 156)/400 = 0.53;
    // κ = (0.85 − 0.53)/(1 − 0.53) = 0.32/0.47 = 0.680851… (by hand).
    const rust = (spotCount: number, areaPercent = 0, weeping = false) => ({ spotCount, areaPercent, weeping });
    const pairs = [
      ...Array.from({ length: 6 }, () => ({ recordGrade: 7, blindGrade: 7, record: rust(3, 0.5), blind: rust(2, 0.3) })),
      // Rust on one side only: by spots, by area alone, by weeping alone (isRusted counts each).
      { recordGrade: 9, blindGrade: 10, record: rust(1), blind: rust(0) },
      { recordGrade: null, blindGrade: 10, record: rust(0, 0, true), blind: rust(0) },
      { recordGrade: 10, blindGrade: 9, record: rust(0), blind: rust(0, 0.05) },
      ...Array.from({ length: 11 }, () => ({ recordGrade: 10, blindGrade: 10, record: rust(0), blind: rust(0) })),
    ];
    const a = scorerAgreement(pairs)!;
    expect(a.rustCall).toMatchObject({ pairs: 20, agreed: 17, recordRusted: 8, blindRusted: 7 });
    expect(a.rustCall.kappa).toBeCloseTo(0.32 / 0.47, 12);
    // Grades only where both gave one: 19 pairs.
    expect(a.pairs).toBe(19);
    const c = compareGroups(data, { groupBy: "treatment", agreement: a });
    expect(c.summary.join(" ")).toMatch(/rust \/ no-rust call: κ = 0\.68, substantial/);
    expect(c.notes.join(" ")).toMatch(/Scorer agreement on the rust \/ no-rust call .* Cohen's κ = 0\.68/);
    expect(c.notes.join(" ")).toMatch(/Kappa on ASTM D610 grades over 19 photos/);
  });
});
