import { describe, expect, it } from "vitest";
import { normalQuantile } from "@/lib/stats/distributions";
import { planningInputErrors, schoenfeldEvents, specimensNeeded } from "@/lib/stats/sample-size";

describe("normalQuantile (Wichura AS 241)", () => {
  // R 4.2.2 (2022-11-10 r83330): sprintf("%.17g", qnorm(p)) for each p.
  const R_QNORM: [number, number][] = [
    [1e-300, -37.047096299361201],
    [1e-20, -9.2623400897984052],
    [1e-10, -6.3613409024040557],
    [1e-5, -4.2648907939228256],
    [0.001, -3.0902323061678132],
    [0.01, -2.3263478740408408],
    [0.025, -1.9599639845400538],
    [0.05, -1.6448536269514726],
    [0.075, -1.4395314709384557],
    [0.1, -1.2815515655446008],
    [0.2, -0.84162123357291418],
    [0.3, -0.52440051270804067],
    [0.4, -0.25334710313579978],
    [0.5, 0],
    [0.6, 0.25334710313579978],
    [0.8, 0.84162123357291441],
    [0.9, 1.2815515655446008],
    [0.925, 1.4395314709384559],
    [0.95, 1.6448536269514715],
    [0.975, 1.9599639845400536],
    [0.99, 2.3263478740408408],
    [0.999, 3.0902323061678132],
  ];
  it.each(R_QNORM)("qnorm(%s) as R 4.2.2 gives it", (p, q) => {
    expect(Math.abs(normalQuantile(p) - q)).toBeLessThanOrEqual(4e-16 * Math.max(1, Math.abs(q)));
  });

  it("refuses probabilities outside (0, 1)", () => {
    for (const p of [0, 1, -0.1, 1.5, Number.NaN]) expect(() => normalQuantile(p)).toThrow(RangeError);
  });
});

describe("schoenfeldEvents", () => {
  it("matches a published worked example (MRC CBU statistics wiki)", () => {
    // Watson P., "FAQ/powsurv: Example comparing software for evaluating sample sizes for log rank
    // test", MRC Cognition and Brain Sciences Unit statistics wiki (imaging.mrc-cbu.cam.ac.uk/statswiki,
    // revision of 2015-01-29): survival 0.75 vs 0.37, HR = log(0.75)/log(0.37), 80 % power, two-sided
    // 5 %, equal groups: events = 4(1.96 + 0.84)² / [log(log(0.75)/log(0.37))]² = 20.39, and
    // 20.39 / [1 − (0.75 + 0.37)/2] = 47 participants in total.
    // The page rounds the z values to 1.96 and 0.84; with full-precision z the events are 20.41, so the
    // published 20.39 agrees to within 0.05.
    const input = { hazardRatio: Math.log(0.75) / Math.log(0.37), alpha: 0.05, power: 0.8 };
    expect(schoenfeldEvents(input)).toBeCloseTo(20.39, 1);
    expect(specimensNeeded({ ...input, fractionRusting: 1 - (0.75 + 0.37) / 2 }).total).toBe(47);
  });

  it("matches the Schoenfeld totals of a published table (Trials 2015, Table 1)", () => {
    // Jia B., Lynn H. S. (2015) "A sample size planning approach that considers both statistical
    // significance and clinical significance", Trials 16:213, doi:10.1186/s13063-015-0727-9, Table 1,
    // "Initial N" rows: Schoenfeld's formula, 5 % level, 80 % power, equal allocation, overall
    // censoring proportion 0.5 (so the fraction with the event is 0.5).
    // Published N: HR 1.25 → 1264, 1.5 → 384, 1.75 → 204, 2.00 → 132. Every published N is a multiple
    // of 4; our reading (not stated in the table) is that the totals were rounded up to whole blocks
    // of 4, so our total rounded up to a multiple of 4 must equal theirs.
    const published: [number, number][] = [[1.25, 1264], [1.5, 384], [1.75, 204], [2, 132]];
    for (const [hazardRatio, n] of published) {
      const plan = specimensNeeded({ hazardRatio, alpha: 0.05, power: 0.8, fractionRusting: 0.5 });
      expect(Math.ceil(plan.total / 4) * 4).toBe(n);
    }
  });

  it("agrees with the formula computed in R", () => {
    // R 4.2.2: ev <- function(hr, a, pw, pi = 0.5) (qnorm(1 - a/2) + qnorm(pw))^2 / (pi * (1 - pi) * log(hr)^2)
    // sprintf("%.17g", ev(...)) for each line.
    const cases: [Parameters<typeof schoenfeldEvents>[0], number][] = [
      [{ hazardRatio: 0.5, alpha: 0.05, power: 0.8 }, 65.345659258870896], // ev(0.5, 0.05, 0.8)
      [{ hazardRatio: 0.5, alpha: 0.05, power: 0.9 }, 87.47929772154194], // ev(0.5, 0.05, 0.9)
      [{ hazardRatio: 2, alpha: 0.05, power: 0.8 }, 65.345659258870896], // ev(2, 0.05, 0.8)
      [{ hazardRatio: 0.7, alpha: 0.01, power: 0.9, allocation: 1 / 3 }, 526.32300740658457], // ev(0.7, 0.01, 0.9, 1/3)
      [{ hazardRatio: 1.5, alpha: 0.1, power: 0.95, allocation: 0.7 }, 313.46440726536377], // ev(1.5, 0.1, 0.95, 0.7)
      [{ hazardRatio: 0.57, alpha: 0.05, power: 0.9 }, 133.01475120760904], // ev(0.57, 0.05, 0.9)
    ];
    for (const [input, d] of cases) expect(schoenfeldEvents(input)).toBeCloseTo(d, 10);
  });

  it("refuses a hazard ratio of 1 or ≤ 0, and power or α outside (0, 1), with the reason", () => {
    const ok = { hazardRatio: 0.5, alpha: 0.05, power: 0.8 };
    expect(() => schoenfeldEvents({ ...ok, hazardRatio: 1 })).toThrow(/ratio of 1 means no difference/);
    expect(() => schoenfeldEvents({ ...ok, hazardRatio: 0 })).toThrow(/greater than 0/);
    expect(() => schoenfeldEvents({ ...ok, hazardRatio: -2 })).toThrow(RangeError);
    expect(() => schoenfeldEvents({ ...ok, hazardRatio: Number.NaN })).toThrow(RangeError);
    for (const power of [0, 1, 1.2, -0.1]) expect(() => schoenfeldEvents({ ...ok, power })).toThrow(/power must lie strictly between 0 and 1/);
    for (const alpha of [0, 1, 5]) expect(() => schoenfeldEvents({ ...ok, alpha })).toThrow(/significance level α/);
    for (const allocation of [0, 1]) expect(() => schoenfeldEvents({ ...ok, allocation })).toThrow(/allocation share/);
  });
});

describe("specimensNeeded", () => {
  it("divides the events by the fraction rusting, rounds up, and splits by the allocation", () => {
    // R 4.2.2: n <- ev(0.5, 0.05, 0.8) / 0.5 → 130.69131851774179; ceiling(n) = 131; ceiling(131/2) = 66
    expect(specimensNeeded({ hazardRatio: 0.5, alpha: 0.05, power: 0.8, fractionRusting: 0.5 })).toEqual({
      eventsExact: expect.closeTo(65.345659258870896, 10), events: 66, total: 131, perArm: [66, 66],
    });
    // R 4.2.2: n <- ev(0.7, 0.01, 0.9, 1/3) / 0.25 → 2105.2920296263383; ceiling(n) = 2106;
    // ceiling(2106/3) = 702, ceiling(2106*2/3) = 1404
    expect(specimensNeeded({ hazardRatio: 0.7, alpha: 0.01, power: 0.9, allocation: 1 / 3, fractionRusting: 0.25 })).toMatchObject({ total: 2106, perArm: [702, 1404] });
  });

  it("needs more specimens the fewer of them rust", () => {
    const base = { hazardRatio: 0.5, alpha: 0.05, power: 0.8 };
    const totals = [1, 0.5, 0.25].map((fractionRusting) => specimensNeeded({ ...base, fractionRusting }).total);
    expect(totals).toEqual([66, 131, 262]); // ⌈65.3457 / f⌉ for f = 1, ½, ¼ (events from R above)
  });

  it("refuses a fraction rusting outside (0, 1]", () => {
    const ok = { hazardRatio: 0.5, alpha: 0.05, power: 0.8 };
    for (const fractionRusting of [0, -0.5, 1.01, Number.NaN]) expect(() => specimensNeeded({ ...ok, fractionRusting })).toThrow(/fraction rusting/);
    expect(specimensNeeded({ ...ok, fractionRusting: 1 }).total).toBe(66);
  });

  it("reports every bad field at once for the form", () => {
    expect(Object.keys(planningInputErrors({ hazardRatio: 1, alpha: 0, power: 2, fractionRusting: 0 })).sort()).toEqual(["alpha", "fractionRusting", "hazardRatio", "power"]);
    expect(planningInputErrors({ hazardRatio: 0.5, alpha: 0.05, power: 0.8, fractionRusting: 0.5 })).toEqual({});
  });
});
