import { describe, expect, it } from "vitest";
import type { SurvivalObservation } from "@/lib/stats/observations";
import { kaplanMeier, logRank } from "@/lib/stats/survival";
import { medianFromTurnbull, rightEndpointKm, survivalCurveFromTurnbull, turnbull, turnbullFit } from "@/lib/stats/turnbull";
import { pairwiseLogRank } from "@/lib/stats/tests";

// "9, 13+, …" → observations; "+" marks a censored time.
function parse(list: string): SurvivalObservation[] {
  return list.split(",").map((raw) => {
    const s = raw.trim();
    return { time: Number.parseFloat(s), event: !s.endsWith("+") };
  });
}

// R survival 3.5, aml
const amlMaintained = parse("9, 13, 13+, 18, 23, 28+, 31, 34, 45+, 48, 161+");
const amlNonmaintained = parse("5, 5, 8, 8, 12, 16+, 23, 27, 30, 33, 43, 45");
// Freireich 6-MP data, Gehan 1965 / R MASS gehan
const sixMp = parse("6, 6, 6, 6+, 7, 9+, 10, 10+, 11+, 13, 16, 17+, 19+, 20+, 22, 23, 25+, 32+, 32+, 34+, 35+");
const control = parse("1, 1, 2, 2, 3, 4, 4, 5, 5, 8, 8, 8, 8, 11, 11, 12, 12, 15, 17, 22, 23");

const survivalAt = (steps: { time: number; survival: number }[], t: number) =>
  steps.filter((s) => s.time <= t).at(-1)?.survival ?? 1;

describe("kaplanMeier", () => {
  it("matches R survival for aml, maintained arm", () => {
    const km = kaplanMeier(amlMaintained);
    const expected: [number, number][] = [
      [9, 0.909], [13, 0.818], [18, 0.716], [23, 0.614], [31, 0.491], [34, 0.368], [48, 0.184],
    ]; // R survival 3.5, aml
    for (const [t, s] of expected) expect(Math.abs(survivalAt(km.steps, t) - s)).toBeLessThan(0.001);
    expect(km.median).toBe(31); // R survival 3.5, aml
    expect(kaplanMeier(amlNonmaintained).median).toBe(23); // R survival 3.5, aml
  });

  it("has a step at every distinct time, censor-only times included with 0 events", () => {
    const km = kaplanMeier(amlMaintained);
    expect(km.steps.map((s) => s.time)).toEqual([9, 13, 18, 23, 28, 31, 34, 45, 48, 161]);
    const at28 = km.steps.find((s) => s.time === 28)!;
    expect(at28.events).toBe(0);
    expect(at28.atRisk).toBe(6);
    expect(at28.survival).toBe(km.steps.find((s) => s.time === 23)!.survival);
    expect(km.steps.find((s) => s.time === 13)).toMatchObject({ atRisk: 10, events: 1 });
  });

  it("matches Gehan's 6-MP arm and both medians", () => {
    const km = kaplanMeier(sixMp);
    const expected: [number, number][] = [
      [6, 0.857], [7, 0.807], [10, 0.753], [13, 0.69], [16, 0.627], [22, 0.538], [23, 0.448],
    ]; // Gehan 1965 / R MASS gehan
    for (const [t, s] of expected) expect(Math.abs(survivalAt(km.steps, t) - s)).toBeLessThan(0.001);
    expect(km.median).toBe(23); // Gehan 1965 / R MASS gehan
    expect(kaplanMeier(control).median).toBe(8); // Gehan 1965 / R MASS gehan
  });

  it("gives R's log-transformed Greenwood limits", () => {
    const step6 = kaplanMeier(sixMp).steps[0];
    expect(Math.abs(step6.lower95 - 0.72)).toBeLessThan(0.005); // R survfit on 6-MP at t = 6: lower 0.720, from memory
    expect(step6.upper95).toBe(1); // R survfit on 6-MP at t = 6: upper 1.000 (clipped), from memory

    // Hand computation from the Greenwood formula at t = 7: n = 21, d = 3, then n = 17, d = 1.
    const s7 = (18 / 21) * (16 / 17);
    const se = Math.sqrt(3 / (21 * 18) + 1 / (17 * 16));
    const step7 = kaplanMeier(sixMp).steps.find((s) => s.time === 7)!;
    expect(step7.lower95).toBeCloseTo(s7 * Math.exp(-1.959964 * se), 6);
    expect(step7.upper95).toBeCloseTo(Math.min(1, s7 * Math.exp(1.959964 * se)), 6);

    const aml9 = kaplanMeier(amlMaintained).steps[0];
    expect(Math.abs(aml9.lower95 - 0.754)).toBeLessThan(0.005); // R survival summary of aml fit, 0.7541, from memory
  });

  it("returns null median when survival never reaches one half, and handles empty input", () => {
    expect(kaplanMeier(parse("3, 4+, 5+, 6+")).median).toBeNull();
    expect(kaplanMeier([])).toEqual({ steps: [], median: null });
  });

  it("reports 0 limits where survival reaches 0 (log limits undefined)", () => {
    const last = kaplanMeier(parse("1, 2, 3")).steps.at(-1)!;
    expect(last).toMatchObject({ survival: 0, lower95: 0, upper95: 0 });
  });
});

describe("logRank", () => {
  it("matches R survdiff for aml", () => {
    const r = logRank([amlMaintained, amlNonmaintained]);
    expect(r.chiSquare).toBeCloseTo(3.396, 3); // R survival 3.5, aml
    expect(r.df).toBe(1);
    expect(r.pValue).toBeCloseTo(0.0653, 4); // R survival 3.5, aml
    expect(r.observed).toEqual([7, 11]);
    expect(r.expected[0] + r.expected[1]).toBeCloseTo(18, 10);
  });

  it("matches Gehan's 6-MP comparison", () => {
    const r = logRank([sixMp, control]);
    expect(r.chiSquare).toBeCloseTo(16.79, 2); // Gehan 1965 / R MASS gehan
    expect(Math.abs(r.pValue - 4.17e-5) / 4.17e-5).toBeLessThan(0.01); // Gehan 1965 / R MASS gehan
  });

  it("gives the same k-group statistic whichever group is dropped from the covariance", () => {
    // Property check: the quadratic form is invariant to which of the k groups is left out,
    // so reordering the groups must not change χ².
    const third = parse("4, 7, 7+, 12, 15, 21+, 26, 30+");
    const a = logRank([amlMaintained, amlNonmaintained, third]);
    const b = logRank([third, amlNonmaintained, amlMaintained]);
    expect(a.df).toBe(2);
    expect(a.chiSquare).toBeCloseTo(b.chiSquare, 10);
    expect(a.pValue).toBeCloseTo(Math.exp(-a.chiSquare / 2), 12); // χ² with 2 df has tail e^(−x/2)
  });

  it("leaves out a group with nothing expected, as survdiff does", () => {
    const r = logRank([amlMaintained, amlNonmaintained, []]);
    expect(r.df).toBe(1);
    expect(r.chiSquare).toBeCloseTo(logRank([amlMaintained, amlNonmaintained]).chiSquare, 10);
  });

  it("pairwise comparisons use the two-group test and Holm's adjustment", () => {
    const third = parse("4, 7, 7+, 12, 15, 21+, 26, 30+");
    const pairs = pairwiseLogRank([amlMaintained, amlNonmaintained, third], ["M", "N", "T"]);
    expect(pairs.map((p) => `${p.groupA}-${p.groupB}`)).toEqual(["M-N", "M-T", "N-T"]);
    expect(pairs[0].chiSquare).toBeCloseTo(3.396, 3); // R survival 3.5, aml
    const raw = pairs.map((p) => p.pValue);
    const sorted = [...raw].sort((x, y) => x - y);
    const smallest = pairs.find((p) => p.pValue === sorted[0])!;
    expect(smallest.adjustedPValue).toBeCloseTo(Math.min(1, 3 * sorted[0]), 12); // Holm: m·p for the smallest
    for (const p of pairs) expect(p.adjustedPValue).toBeGreaterThanOrEqual(p.pValue);
  });
});

// Nelson (1990) microprocessor data as (L, R] × count
const I = Infinity;
const nelson = (
  [
    [0, 6, 6], [6, 12, 2], [24, 48, 2], [24, I, 1], [48, 168, 1], [48, I, 839], [168, 500, 1],
    [168, I, 150], [500, 1000, 2], [500, I, 149], [1000, 2000, 1], [1000, I, 147], [2000, I, 122],
  ] as const
).map(([lower, upper, count]) => ({ lower, upper, count }));

describe("turnbull", () => {
  it("reproduces the Nelson microprocessor NPMLE", () => {
    const fit = turnbull(nelson);
    const expected: [number, number][] = [
      [6, 0.004216], [12, 0.005622], [48, 0.007028], [168, 0.008761],
      [500, 0.01111], [1000, 0.018381], [2000, 0.026362],
    ]; // SAS/STAT LIFEREG documentation example; R survfit interval2 (Nelson 1990)
    for (const [t, f] of expected) expect(Math.abs(1 - fit.survivalAt(t) - f)).toBeLessThan(1e-5);
  });

  it("builds Turnbull's innermost intervals", () => {
    const fit = turnbullFit(nelson);
    expect(fit.converged).toBe(true);
    expect(fit.intervals.map((iv) => [iv.lower, iv.upper])).toEqual([
      [0, 6], [6, 12], [24, 48], [48, 168], [168, 500], [500, 1000], [1000, 2000], [2000, I],
    ]);
    expect(fit.intervals.reduce((s, iv) => s + iv.probability, 0)).toBeCloseTo(1, 12);
  });

  it("treats counts exactly like repeated rows", () => {
    const expanded = nelson.slice(0, 6).flatMap(({ lower, upper, count }) => Array.from({ length: count }, () => ({ lower, upper })));
    const a = turnbull(nelson.slice(0, 6));
    const b = turnbull(expanded);
    for (const t of [6, 12, 48, 100]) expect(a.survivalAt(t)).toBeCloseTo(b.survivalAt(t), 10);
  });

  it("equals Kaplan–Meier when times are exact or right-censored", () => {
    // Independent check: with no interval censoring the NPMLE is the KM estimate.
    const obs = amlMaintained.map((o) => (o.event ? { lower: o.time, upper: o.time } : { lower: o.time, upper: I }));
    const fit = turnbull(obs);
    for (const step of kaplanMeier(amlMaintained).steps) expect(fit.survivalAt(step.time)).toBeCloseTo(step.survival, 7);
  });

  it("reaches the NPMLE on heavily overlapping intervals (optimality conditions)", () => {
    // Independent check (Gentleman & Geyer 1994): at the NPMLE, for every innermost interval j,
    // Σ_i w_i·[i covers j] / (mass covered by i) ≤ N, with equality wherever p_j > 0.
    let seed = 99;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    const obs = Array.from({ length: 300 }, () => {
      const offset = Math.floor(rand() * 5);
      const rustDay = -Math.log(1 - rand()) * 40;
      let lower = 0;
      for (let k = 1; k <= 12; k++) {
        const day = offset + 7 * k;
        if (rustDay <= day) return { lower, upper: day };
        lower = day;
      }
      return { lower, upper: I };
    });
    const fit = turnbullFit(obs);
    expect(fit.converged).toBe(true);
    const covers = (o: { lower: number; upper: number }, iv: { lower: number; upper: number }) =>
      o.lower <= iv.lower && iv.upper <= o.upper;
    const coveredMass = obs.map((o) => fit.intervals.filter((iv) => covers(o, iv)).reduce((s, iv) => s + iv.probability, 0));
    for (const iv of fit.intervals) {
      const gradient = obs.reduce((s, o, i) => s + (covers(o, iv) ? 1 / coveredMass[i] : 0), 0) / obs.length;
      expect(gradient).toBeLessThan(1 + 1e-4);
      if (iv.probability > 1e-4) expect(gradient).toBeCloseTo(1, 4);
    }
  });

  it("equals the empirical distribution when intervals do not overlap", () => {
    const fit = turnbull([{ lower: 0, upper: 7 }, { lower: 0, upper: 7 }, { lower: 7, upper: 14 }, { lower: 14, upper: 21 }]);
    expect(fit.survivalAt(7)).toBeCloseTo(0.5, 9);
    expect(fit.survivalAt(13.9)).toBeCloseTo(0.5, 9);
    expect(fit.survivalAt(14)).toBeCloseTo(0.25, 9);
    expect(fit.survivalAt(21)).toBeCloseTo(0, 9);
  });

  it("gives a median interval and chart steps", () => {
    const fit = turnbull([{ lower: 0, upper: 7 }, { lower: 7, upper: 14 }, { lower: 7, upper: 14 }, { lower: 14, upper: I }]);
    expect(medianFromTurnbull(fit)).toEqual({ time: 14, lower: 7, upper: 14 });
    const steps = survivalCurveFromTurnbull(fit);
    expect(steps.map((s) => s.time)).toEqual([7, 14]);
    expect(steps[1].intervalLower).toBe(7);
    expect(steps[1].survival).toBeCloseTo(0.25, 9);
    expect(medianFromTurnbull(turnbull([{ lower: 10, upper: I }, { lower: 10, upper: I }, { lower: 0, upper: 5 }]))).toBeNull();
  });

  it("rejects malformed intervals", () => {
    expect(() => turnbull([{ lower: 5, upper: 3 }])).toThrow(RangeError);
    expect(() => turnbull([{ lower: Number.NaN, upper: 3 }])).toThrow(RangeError);
  });
});

describe("rightEndpointKm", () => {
  it("counts rust at the first rusted inspection and censors at the last clean one", () => {
    expect(rightEndpointKm([{ lower: 7, upper: 14 }, { lower: 28, upper: I, count: 2 }])).toEqual([
      { time: 14, event: true },
      { time: 28, event: false },
      { time: 28, event: false },
    ]);
  });
});
