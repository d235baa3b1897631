// Corrections to the survival statistics: stratified log-rank, delayed entry (left truncation) in
// Kaplan–Meier, log-rank and Turnbull, and R's rule for Kaplan–Meier medians and quantiles.
import { describe, expect, it } from "vitest";
import type { SurvivalObservation } from "@/lib/stats/observations";
import { kaplanMeier, kmQuantile, logRank, stratifiedLogRank } from "@/lib/stats/survival";
import { survivalCurveFromTurnbull, turnbullFit, type IntervalObservation } from "@/lib/stats/turnbull";
import { DELAYED_ENTRY, TIED_STRATA, VETERAN } from "../support/r-strata-data";

const obs = (times: number[], status: number[]): SurvivalObservation[] => times.map((time, i) => ({ time, event: status[i] === 1 }));

describe("stratifiedLogRank", () => {
  it("matches survdiff with strata on the veteran data", () => {
    const rows = VETERAN.map(([time, status, trt, celltype]) => ({ time, event: status === 1, group: String(trt), stratum: celltype }));
    const r = stratifiedLogRank(rows);
    // R 4.2.2, survival 3.5-3: survdiff(Surv(time, status) ~ trt + strata(celltype), data = veteran)
    // Chisq = 0.701743346844319 on 1 df, p = 0.402198524
    expect(r.chiSquare).toBeCloseTo(0.701743346844319, 10);
    expect(r.df).toBe(1);
    expect(r.pValue).toBeCloseTo(0.402198524, 8);
  });

  it("matches survdiff with strata on a small tied case, two and three groups", () => {
    const two = TIED_STRATA.map(([time, status, grp, , st]) => ({ time, event: status === 1, group: grp, stratum: st }));
    // R 4.2.2, survival 3.5-3: survdiff(Surv(time, status) ~ grp + strata(st), data = tied) → 0.131191842914778
    expect(stratifiedLogRank(two).chiSquare).toBeCloseTo(0.131191842914778, 10);
    const three = TIED_STRATA.map(([time, status, , g3, st]) => ({ time, event: status === 1, group: g3, stratum: st }));
    // R 4.2.2, survival 3.5-3: survdiff(Surv(time, status) ~ g3 + strata(st), data = tied) → 0.103993919162589, 2 df
    const r3 = stratifiedLogRank(three);
    expect(r3.chiSquare).toBeCloseTo(0.103993919162589, 10);
    expect(r3.df).toBe(2);
  });

  it("with one stratum is the plain log-rank test", () => {
    const rows = VETERAN.map(([time, status, trt]) => ({ time, event: status === 1, group: String(trt), stratum: "all" }));
    const plain = logRank(["1", "2"].map((g) => rows.filter((r) => r.group === g)));
    expect(stratifiedLogRank(rows).chiSquare).toBeCloseTo(plain.chiSquare, 12);
  });

  it("refuses a single group", () => {
    expect(() => stratifiedLogRank([{ time: 1, event: true, group: "A", stratum: "s" }])).toThrow(/at least 2 groups/);
  });
});

describe("delayed entry", () => {
  const groupA = DELAYED_ENTRY.filter((r) => r[3] === "A").map(([entry, time, status]) => ({ entry, time, event: status === 1 }));
  const groupB = DELAYED_ENTRY.filter((r) => r[3] === "B").map(([entry, time, status]) => ({ entry, time, event: status === 1 }));

  it("Kaplan–Meier matches survfit(Surv(entry, time, status) ~ 1)", () => {
    const km = kaplanMeier(groupA);
    // R 4.2.2, survival 3.5-3: survfit(Surv(entry, time, status) ~ 1, data = d[d$grp == "A", ])
    // time n.risk n.event surv lower upper
    const expected = [
      [3, 7, 1, 0.857142857142857, 0.6334465290121496, 1],
      [4, 8, 1, 0.75, 0.5027018412940469, 1],
      [5, 7, 0, 0.75, 0.5027018412940469, 1],
      [6, 7, 1, 0.642857142857143, 0.3893196595357802, 1],
      [7, 5, 1, 0.514285714285714, 0.2642110385979139, 1],
      [8, 4, 1, 0.385714285714286, 0.1609650006339751, 0.924272417097605],
      [9, 3, 2, 0.128571428571429, 0.0207617230297316, 0.796206182946641],
      [10, 1, 0, 0.128571428571429, 0.0207617230297316, 0.796206182946641],
    ];
    expect(km.steps.map((s) => [s.time, s.atRisk, s.events])).toEqual(expected.map((e) => e.slice(0, 3)));
    km.steps.forEach((s, i) => {
      expect(s.survival).toBeCloseTo(expected[i][3], 12);
      expect(s.lower95).toBeCloseTo(expected[i][4], 10);
      expect(s.upper95).toBeCloseTo(expected[i][5], 10);
    });
    // R: print(fit) → median 8, 0.95LCL 6, 0.95UCL NA
    expect(km.median).toBe(8);
    expect(kmQuantile(km.steps, 0.5, { curve: "lower95" })).toBe(6);
    expect(kmQuantile(km.steps, 0.5, { curve: "upper95" })).toBeNull();
  });

  it("log-rank equals the Cox score test on counting-process data", () => {
    // survdiff takes no (start, stop] data; the log-rank statistic is the score test of the Cox model
    // at β = 0, and with tied times it is the exact-partial-likelihood one that matches survdiff
    // (checked in R on these data without entry: survdiff chisq 0.0496395863881064 = coxph(…,
    // ties = "exact")$score 0.0496395863881065; Efron and Breslow give 0.0324 and 0.0422).
    const noEntry = (g: SurvivalObservation[]) => g.map(({ time, event }) => ({ time, event }));
    expect(logRank([noEntry(groupA), noEntry(groupB)]).chiSquare).toBeCloseTo(0.0496395863881064, 10);
    // R 4.2.2, survival 3.5-3: coxph(Surv(entry, time, status) ~ grp, data = d, ties = "exact")$score
    expect(logRank([groupA, groupB]).chiSquare).toBeCloseTo(0.152104609646722, 10);
    // Stratified with a single stratum gives the same.
    const rows = [...groupA.map((o) => ({ ...o, group: "A", stratum: "s" })), ...groupB.map((o) => ({ ...o, group: "B", stratum: "s" }))];
    expect(stratifiedLogRank(rows).chiSquare).toBeCloseTo(0.152104609646722, 10);
  });

  it("a row that ends at or before its entry is never at risk", () => {
    const base = [{ time: 2, event: true }, { time: 5, event: false }];
    expect(kaplanMeier([...base, { time: 3, event: true, entry: 3 }])).toEqual(kaplanMeier(base));
  });
});

describe("Turnbull with truncation (Turnbull 1976, ghost weights)", () => {
  const I = Infinity;
  const rows: IntervalObservation[] = [
    { lower: 0, upper: 7, count: 2 }, { lower: 7, upper: 14 }, { lower: 14, upper: 21 }, { lower: 0, upper: 14 },
    { lower: 21, upper: I, count: 2 }, { lower: 7, upper: 28 },
    { lower: 7, upper: 14, entry: 7 }, { lower: 14, upper: 21, entry: 7 }, { lower: 21, upper: I, entry: 7 }, { lower: 14, upper: 28, entry: 7 },
    { lower: 14, upper: 21, entry: 14 }, { lower: 21, upper: 28, entry: 14 }, { lower: 28, upper: I, entry: 14 },
  ];

  it("matches a direct maximisation of the truncated likelihood", () => {
    const fit = turnbullFit(rows, { tolerance: 1e-13 });
    expect(fit.converged).toBe(true);
    expect(fit.intervals.map((iv) => [iv.lower, iv.upper])).toEqual([[0, 7], [7, 14], [14, 21], [21, 28], [28, I]]);
    // R 4.2.2: optim(BFGS, 20 random starts, reltol 1e-15) of Σ w·log(P(A_i)/P(B_i)) over the five
    // innermost intervals (softmax parameters) → p and log-likelihood −16.5765791391253.
    const direct = [0.328533908931194, 0.194383420325849, 0.189586520464867, 0.185563601919399, 0.101932548358691];
    fit.intervals.forEach((iv, j) => expect(Math.abs(iv.probability - direct[j])).toBeLessThan(2e-6));
    const p = fit.intervals.map((iv) => iv.probability);
    const covered = (a: number, b: number) => p.slice(a, b + 1).reduce((s, x) => s + x, 0);
    const index = (t: number) => [0, 7, 14, 21, 28].indexOf(t);
    const ll = rows.reduce((s, r) => {
      const a = covered(index(r.lower), r.upper === I ? 4 : index(r.upper) - 1);
      const b = covered(r.entry === undefined ? 0 : index(r.entry), 4);
      return s + (r.count ?? 1) * Math.log(a / b);
    }, 0);
    expect(ll).toBeCloseTo(-16.5765791391253, 8);
  });

  it("ignoring the truncation gives a different (wrong) answer", () => {
    const naive = turnbullFit(rows.map(({ entry: _e, ...r }) => r)).intervals.map((iv) => iv.probability);
    expect(Math.abs(naive[0] - 0.328533908931194)).toBeGreaterThan(0.01);
  });

  it("with exact and right-censored times is the delayed-entry product-limit estimate", () => {
    // Exact times make Turnbull's NPMLE the product-limit estimate; with truncation it is the
    // delayed-entry Kaplan–Meier (R: survfit(Surv(entry, time, status) ~ 1), values in the KM test above).
    const groupA = DELAYED_ENTRY.filter((r) => r[3] === "A");
    const fit = turnbullFit(
      groupA.map(([entry, time, status]) => (status === 1 ? { lower: time, upper: time, entry } : { lower: time, upper: I, entry })),
      { tolerance: 1e-13 },
    );
    const steps = survivalCurveFromTurnbull(fit);
    const expected: [number, number][] = [[3, 0.857142857142857], [4, 0.75], [6, 0.642857142857143], [7, 0.514285714285714], [8, 0.385714285714286], [9, 0.128571428571429]];
    expect(steps.map((s) => s.time)).toEqual(expected.map((e) => e[0]));
    steps.forEach((s, i) => expect(s.survival).toBeCloseTo(expected[i][1], 7));
  });
});

describe("Kaplan–Meier median and quantiles as R", () => {
  it("takes the midpoint over an exact 0.5 plateau", () => {
    const km = kaplanMeier(obs([1, 2, 3, 4], [1, 1, 1, 1]));
    // R 4.2.2, survival 3.5-3: survfit(Surv(c(1,2,3,4), c(1,1,1,1)) ~ 1) prints median 2.5, 0.95LCL 1, UCL NA;
    // quantile(fit, c(.25, .5, .75)) → 1.5 2.5 3.5, lower 1 1 2, upper NA NA NA
    expect(km.median).toBe(2.5);
    expect([0.25, 0.5, 0.75].map((p) => kmQuantile(km.steps, p))).toEqual([1.5, 2.5, 3.5]);
    expect([0.25, 0.5, 0.75].map((p) => kmQuantile(km.steps, p, { curve: "lower95" }))).toEqual([1, 1, 2]);
    expect([0.25, 0.5, 0.75].map((p) => kmQuantile(km.steps, p, { curve: "upper95" }))).toEqual([null, null, null]);
  });

  it("takes the first time below the level when there is no plateau at it", () => {
    const km = kaplanMeier(obs([2, 4, 4, 6, 7, 9, 9, 12], [1, 1, 1, 0, 1, 0, 1, 0]));
    // R 4.2.2, survival 3.5-3: survfit(Surv(c(2,4,4,6,7,9,9,12), c(1,1,1,0,1,0,1,0)) ~ 1):
    // median 7 (4, NA); quantile(fit, c(.25,.5,.75)) → 4 7 NA, lower 2 4 7
    expect(km.median).toBe(7);
    expect([0.25, 0.5, 0.75].map((p) => kmQuantile(km.steps, p))).toEqual([4, 7, null]);
    expect([0.25, 0.5, 0.75].map((p) => kmQuantile(km.steps, p, { curve: "lower95" }))).toEqual([2, 4, 7]);
  });

  it("on a plateau that is the last step: print.survfit keeps the time, quantile.survfit the midpoint with the last follow-up", () => {
    // R 4.2.2, survival 3.5-3: survfit(Surv(c(1,2,3,4), c(1,1,0,0)) ~ 1) prints median 2;
    // quantile(fit, .5) → 3 ((2 + 4) / 2)
    const a = kaplanMeier(obs([1, 2, 3, 4], [1, 1, 0, 0]));
    expect(a.median).toBe(2);
    expect(kmQuantile(a.steps, 0.5, { lastPlateau: "quantile" })).toBe(3);
    expect(kmQuantile(a.steps, 0.25)).toBe(1.5);
    // R: survfit(Surv(1:6, c(1,1,1,0,0,0)) ~ 1) prints median 3; quantile(fit, c(.25, .5)) → 2 4.5
    const b = kaplanMeier(obs([1, 2, 3, 4, 5, 6], [1, 1, 1, 0, 0, 0]));
    expect(b.median).toBe(3);
    expect(kmQuantile(b.steps, 0.5, { lastPlateau: "quantile" })).toBe(4.5);
    expect(kmQuantile(b.steps, 0.25)).toBe(2);
  });

  it("refuses a probability outside (0, 1)", () => {
    expect(() => kmQuantile([], 1)).toThrow(/strictly between/);
  });
});
