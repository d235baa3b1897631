import { describe, expect, it } from "vitest";
import {
  areaOverTime,
  firstRustInterval,
  firstRustIntervals,
  isRusted,
  type InspectionOutcome,
} from "@/lib/stats/outcomes";
import { formatPValue, summarizeComparison } from "@/lib/stats/summary";
import { medianFromTurnbull, turnbull } from "@/lib/stats/turnbull";

// Hand-built specimen series: (day, rusted, area %).
const series = (...rows: [number, boolean, number | null][]): InspectionOutcome[] =>
  rows.map(([inspectedAt, rusted, areaPercent]) => ({ inspectedAt, rusted, areaPercent }));

describe("isRusted", () => {
  it("counts spots, area or weeping as rust", () => {
    expect(isRusted({ spotCount: 0, areaPercent: 0, weeping: false })).toBe(false);
    expect(isRusted({ spotCount: 1, areaPercent: 0, weeping: false })).toBe(true);
    expect(isRusted({ spotCount: 0, areaPercent: 0.01, weeping: false })).toBe(true);
    expect(isRusted({ spotCount: 0, areaPercent: 0, weeping: true })).toBe(true);
    expect(isRusted({ spotCount: null, areaPercent: null, weeping: null })).toBe(false);
  });
});

describe("firstRustInterval", () => {
  it("is (last clean, first rusted] in days since start", () => {
    const s = series([7, false, 0], [14, false, 0], [21, true, 0.4], [28, true, 1.2]);
    expect(firstRustInterval(s, 0)).toEqual({ lower: 14, upper: 21 });
  });

  it("starts at 0 when rust is seen at the first inspection", () => {
    expect(firstRustInterval(series([7, true, 0.2], [14, true, 0.5]), 0)).toEqual({ lower: 0, upper: 7 });
  });

  it("is right-censored at the last clean inspection when rust is never seen", () => {
    expect(firstRustInterval(series([7, false, 0], [14, false, 0]), 0)).toEqual({ lower: 14, upper: Infinity });
  });

  it("is null without inspections", () => {
    expect(firstRustInterval([], 0)).toBeNull();
  });

  it("sorts inspections, measures from the start day and ignores later clean calls", () => {
    const s = series([130, false, 0], [116, true, 0.1], [109, false, 0], [102, false, 0]);
    expect(firstRustInterval(s, 100)).toEqual({ lower: 9, upper: 16 });
  });

  it("accepts Dates", () => {
    const start = new Date("2025-03-01T00:00:00Z");
    const s: InspectionOutcome[] = [
      { inspectedAt: new Date("2025-03-08T00:00:00Z"), rusted: false, areaPercent: 0 },
      { inspectedAt: new Date("2025-03-15T00:00:00Z"), rusted: true, areaPercent: 0.3 },
    ];
    expect(firstRustInterval(s, start)).toEqual({ lower: 7, upper: 14 });
  });

  it("feeds the Turnbull estimator end to end", () => {
    const intervals = firstRustIntervals([
      { startDay: 0, inspections: series([7, true, 1]) },
      { startDay: 0, inspections: series([7, false, 0], [14, true, 1]) },
      { startDay: 0, inspections: series([7, false, 0], [14, true, 1]) },
      { startDay: 0, inspections: series([7, false, 0], [14, false, 0]) },
      { startDay: 0, inspections: [] },
    ]);
    expect(intervals).toHaveLength(4);
    // Disjoint intervals: the NPMLE is the empirical share per interval (1/4, 2/4, 1/4 censored).
    expect(medianFromTurnbull(turnbull(intervals))).toEqual({ time: 14, lower: 7, upper: 14 });
  });
});

describe("areaOverTime", () => {
  it("gives median and quartiles (R type 7) per inspection day", () => {
    const [result] = areaOverTime([
      {
        label: "Untreated",
        specimens: [
          { startDay: 0, inspections: series([7, false, 0], [14, true, 1]) },
          { startDay: 0, inspections: series([7, false, 0], [14, true, 2]) },
          { startDay: 0, inspections: series([7, false, null], [14, true, 3]) },
          { startDay: 0, inspections: series([7, false, 0], [14, true, 4]) },
        ],
      },
    ]);
    expect(result.label).toBe("Untreated");
    expect(result.points[0]).toMatchObject({ day: 7, n: 3, median: 0, q1: 0, q3: 0 });
    // Hand computation, R quantile type 7 on 1, 2, 3, 4: q1 1.75, median 2.5, q3 3.25.
    expect(result.points[1]).toEqual({ day: 14, n: 4, median: 2.5, q1: 1.75, q3: 3.25 });
  });
});

describe("summarizeComparison", () => {
  const base = {
    groups: [
      { name: "Untreated", n: 8, events: 6, median: { time: 21, lower: 14, upper: 21 } },
      { name: "Wax", n: 4, events: 0, median: null },
    ],
    logRankP: 0.0123,
    chiSquare: 6.27,
    df: 1,
  };

  it("states n, the test, the effect and the interval-censoring caveat", () => {
    const text = summarizeComparison(base).join(" ");
    expect(text).toContain("12 specimens in 2 groups");
    expect(text).toContain("Log-rank test");
    expect(text).toContain("p = 0.012");
    expect(text).toContain("Untreated rusted soonest");
    expect(text).toContain("between 14 and 21 days");
    expect(text).toContain("only seen at inspections");
  });

  it("flags small groups, groups without rust and weak scorer agreement", () => {
    const text = summarizeComparison({ ...base, kappa: 0.35 }).join(" ");
    expect(text).toContain("Wax has fewer than 5 specimens");
    expect(text).toContain("No specimen in Wax rusted");
    expect(text).toContain("κ = 0.35, fair");
  });

  it("does not read a large p as proof of no difference, and reports Holm pairs", () => {
    const text = summarizeComparison({
      ...base,
      logRankP: 0.4,
      pairwise: [{ groupA: "Untreated", groupB: "Wax", adjustedPValue: 0.4 }],
      groupNoun: { one: "treatment", many: "treatments" },
    }).join(" ");
    expect(text).toContain("not evidence that the treatments perform the same");
    expect(text).toContain("Holm-adjusted");
    expect(formatPValue(0.00004)).toBe("p < 0.001");
  });
});
