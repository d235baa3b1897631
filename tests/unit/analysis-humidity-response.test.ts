// The humidity response and the storage threshold, checked against R 4.2.2 with survival 3.5-3.
// The rows below are an invented humidity ladder (five levels, bare and waxed, inspections on days
// 0, 7, 14, 28, 42, 56, 84, 112, 140, 168). The same rows were fitted in R with
//   d$upper[is.infinite(d$upper)] <- NA; d$lower[d$lower == 0] <- NA   # R's interval2 coding
//   fit <- survreg(Surv(lower, upper, type = "interval2") ~ rh + wax, data = d, dist = "weibull")
// and the threshold found with uniroot on predict(fit, type = "quantile", p = 0.1, se.fit = TRUE):
//   the point where the predicted 10 % quantile equals 3652.5 days (10 years), and the limits where
//   log(fit) ∓ qnorm(0.975) · se.fit / fit equals log(3652.5) — R's own delta-method standard error.
import { describe, expect, it } from "vitest";
import { humidityLevelCount, humidityResponse } from "@/lib/analysis/humidity-response";
import type { ResponseRow } from "@/lib/analysis/humidity-result";
import { thresholdSentence } from "@/lib/analysis/humidity-sentences";

const LADDER: [number, number, number, number][] = [
  [168, Infinity, 10.68, 0],
  [168, Infinity, 10.48, 0],
  [168, Infinity, 11.21, 0],
  [168, Infinity, 11.57, 0],
  [168, Infinity, 11.38, 1],
  [168, Infinity, 10.53, 1],
  [168, Infinity, 12.37, 1],
  [168, Infinity, 10.86, 1],
  [168, Infinity, 34.47, 0],
  [168, Infinity, 33.09, 0],
  [168, Infinity, 32.22, 0],
  [168, Infinity, 32.82, 0],
  [168, Infinity, 32.39, 1],
  [168, Infinity, 34.14, 1],
  [168, Infinity, 33.55, 1],
  [168, Infinity, 33.03, 1],
  [168, Infinity, 52.66, 0],
  [140, 168, 53.01, 0],
  [168, Infinity, 53.57, 0],
  [168, Infinity, 53.96, 0],
  [168, Infinity, 53.25, 1],
  [168, Infinity, 54.25, 1],
  [168, Infinity, 53.94, 1],
  [168, Infinity, 54.69, 1],
  [28, 42, 75.12, 0],
  [56, 84, 74.7, 0],
  [14, 28, 76.29, 0],
  [7, 14, 75.62, 0],
  [7, 14, 76.07, 1],
  [112, 140, 75.83, 1],
  [140, 168, 75.18, 1],
  [84, 112, 75.89, 1],
  [7, 14, 85.14, 0],
  [7, 14, 86.36, 0],
  [0, 7, 85.66, 0],
  [0, 7, 85.75, 0],
  [14, 28, 86.48, 1],
  [28, 42, 84.71, 1],
  [14, 28, 85.67, 1],
  [0, 7, 85.15, 1],
];

const TARGETS = [11.3, 33.1, 53.5, 75.4, 85.0];

function rows(data = LADDER): ResponseRow[] {
  return data.map(([lower, upper, rh, wax], i) => {
    const target = TARGETS.reduce((best, t) => (Math.abs(t - rh) < Math.abs(best - rh) ? t : best));
    return {
      placementId: `p${i}`, specimenLabel: `S-${i}`, trialId: "t1",
      chamberId: `jar-${target}-${i % 2}`, chamberName: `Jar ${target}`, targetRhPercent: target, measuredRhPercent: rh,
      materialClass: "iron-meteorite",
      treatmentId: wax ? "wax" : "control", treatmentName: wax ? "Microcrystalline wax" : "Uncoated control", treatmentKind: wax ? "coating" : "control",
      lower, upper,
    };
  });
}

const OPTIONS = { p: 0.1, horizonDays: 3652.5 };

describe("humidityResponse (R survreg + predict, see the header)", () => {
  const r = humidityResponse(rows(), OPTIONS, "t1");

  it("fits the Weibull model of R on the measured RH and the treatment", () => {
    expect(r.fit).not.toBeNull();
    const c = r.fit!.coefficients;
    // R: coef(fit) = 13.799211055054, -0.137106685397, 1.137943931707; fit$scale = 0.576626672653
    expect(c[0].estimate).toBeCloseTo(13.799211055054, 4);
    expect(c[1].name).toBe("RH (%RH)");
    expect(c[1].estimate).toBeCloseTo(-0.137106685397, 6);
    expect(c[2].estimate).toBeCloseTo(1.137943931707, 4);
    expect(r.fit!.scale).toBeCloseTo(0.576626672653, 5);
    // R: sqrt(diag(vcov(fit))) = 1.767531292890, 0.022500890955, 0.292994353843 (log scale 0.215438728240)
    expect(c[0].standardError).toBeCloseTo(1.76753129289, 4);
    expect(c[1].standardError).toBeCloseTo(0.022500890955, 6);
    expect(c[2].standardError).toBeCloseTo(0.292994353843, 5);
    // R: fit$loglik[2] = -29.4358005644
    expect(r.fit!.logLik).toBeCloseTo(-29.4358005644, 5);
  });

  it("predicts the 10 % quantile and its band as predict(type = 'quantile', se.fit = TRUE)", () => {
    const bare = r.combos.find((c) => c.treatmentId === "control")!;
    const at30 = bare.curve.find((p) => p.rhPercent === 30)!;
    const at60 = bare.curve.find((p) => p.rhPercent === 60)!;
    const z = 1.959963984540054;
    // R: fit 4395.729009992 and 71.893661741 days; se.fit 4830.1436119218 and 37.1977529879
    expect(at30.days / 4395.729009992).toBeCloseTo(1, 5);
    expect(at60.days / 71.893661741).toBeCloseTo(1, 5);
    expect(at30.lower95 / (4395.729009992 * Math.exp(-z * 4830.1436119218 / 4395.729009992))).toBeCloseTo(1, 4);
    expect(at60.upper95 / (71.893661741 * Math.exp(z * 37.1977529879 / 71.893661741))).toBeCloseTo(1, 4);
  });

  it("finds the threshold and its limits where R's uniroot finds them", () => {
    const bare = r.combos.find((c) => c.treatmentId === "control")!.threshold;
    const waxed = r.combos.find((c) => c.treatmentId === "wax")!.threshold;
    expect(bare.status).toBe("found");
    // R: 31.350929933 (limits 9.24796800734 – 43.1638628348); waxed 39.6506268326 (20.8753434748 – 49.8434625919)
    expect(bare.rhPercent!).toBeCloseTo(31.350929933, 2);
    expect(bare.lower95!).toBeCloseTo(9.24796800734, 2);
    expect(bare.upper95!).toBeCloseTo(43.1638628348, 2);
    expect(waxed.rhPercent!).toBeCloseTo(39.6506268326, 2);
    expect(waxed.lower95!).toBeCloseTo(20.8753434748, 2);
    expect(waxed.upper95!).toBeCloseTo(49.8434625919, 2);
  });

  it("says the threshold in a plain sentence and warns about the extrapolation", () => {
    const bare = r.combos.find((c) => c.treatmentId === "control")!;
    expect(bare.sentence).toBe("Keep iron meteorites (uncoated control) below 31 %RH (95 % CI 9–43 %RH) so that fewer than 10 % rust within 10 years.");
    expect(r.warnings.some((w) => w.includes("far beyond the longest observation (168 days)"))).toBe(true);
    expect(r.levels.map((l) => l.targetRhPercent)).toEqual([11, 33, 54, 75, 85]);
  });

  it("checks the model against the Turnbull estimate of each level", () => {
    expect(r.check).toHaveLength(5);
    const wettest = r.check[4];
    // All 8 specimens at 85 %RH rusted by day 42: the Turnbull estimate reaches 100 % there.
    expect(wettest.events).toBe(8);
    expect(wettest.observed[wettest.observed.length - 1].rustedShare).toBeCloseTo(1, 6);
    const fittedAt42 = wettest.fitted.find((p) => p.day === 42)!.rustedShare;
    expect(fittedAt42).toBeGreaterThan(0.9);
    expect(r.check[0].events).toBe(0);
  });

  it("gives Cox hazard ratios for the same covariates", () => {
    expect(r.cox).not.toBeNull();
    const perTen = r.cox!.hazardRatios[0];
    expect(perTen.name).toBe("RH (per 10 %RH)");
    // Rust comes sooner at higher RH and later under wax.
    expect(perTen.hazardRatio).toBeGreaterThan(1);
    expect(r.cox!.hazardRatios[1].hazardRatio).toBeLessThan(1);
  });
});

describe("humidityResponse: when there is no threshold to give", () => {
  it("needs three humidity levels", () => {
    const two = rows().filter((x) => x.targetRhPercent > 70);
    const r = humidityResponse(two, OPTIONS, "t1");
    expect(r.fit).toBeNull();
    expect(r.reason).toBe("A humidity response needs specimens at 3 or more humidity levels; this analysis has 2.");
  });

  it("needs some rust", () => {
    const clean = rows().map((x) => ({ ...x, lower: 168, upper: Infinity }));
    expect(humidityResponse(clean, OPTIONS, "t1").reason).toBe("No specimen has rusted yet: there is no time to first rust to model.");
  });

  it("gives no threshold when rust does not come sooner at higher RH", () => {
    // Mirror the humidities: the driest jars now hold the rusted specimens.
    const mirrored = rows().map((x) => ({ ...x, measuredRhPercent: 100 - x.measuredRhPercent, targetRhPercent: 100 - x.targetRhPercent }));
    const r = humidityResponse(mirrored, OPTIONS, "t1");
    expect(r.combos.every((c) => c.threshold.status === "no-trend")).toBe(true);
    expect(r.combos[0].sentence).toContain("does not show rust coming sooner at higher humidity");
  });

  it("refuses options outside their range", () => {
    expect(() => humidityResponse(rows(), { p: 0, horizonDays: 100 })).toThrow(/share rusted/);
    expect(() => humidityResponse(rows(), { p: 0.1, horizonDays: -1 })).toThrow(/horizon/);
  });

  it("counts jars within 1 %RH as one level", () => {
    expect(humidityLevelCount([75.4, 75.3, 33, 2, 2.2])).toBe(3);
  });

  it("words each kind of threshold", () => {
    const o = { p: 0.05, horizonDays: 730.5 };
    expect(thresholdSentence({ rhPercent: 40.4, lower95: 30.2, upper95: null, status: "found" }, "waxed slices", o))
      .toBe("Keep waxed slices below 40 %RH (95 % CI 30 %RH or more) so that fewer than 5 % rust within 2 years.");
    expect(thresholdSentence({ rhPercent: null, lower95: null, upper95: null, status: "above-range" }, "waxed slices", o))
      .toBe("For waxed slices the model predicts fewer than 5 % rusted within 2 years even at 100 %RH: the data set no limit below saturation.");
  });
});

describe("the humidity charts as drawn (vega-lite compiled, vega rendered to SVG)", () => {
  async function svgOf(spec: object) {
    const { compile } = await import("vega-lite");
    const { parse, View } = await import("vega");
    const sized = { ...spec, width: 600 } as Parameters<typeof compile>[0];
    return new View(parse(compile(sized).spec), { renderer: "none" }).toSVG();
  }

  it("draws one legend entry per material and treatment, and the horizon", async () => {
    const { responseSpec, modelCheckSpec } = await import("@/components/analysis/humidity-specs");
    const r = humidityResponse(rows(), OPTIONS, "t1");
    const svg = await svgOf(responseSpec(r));
    const legend = svg.slice(svg.indexOf("role-legend"));
    expect(svg).toContain("role-legend");
    expect(legend).toContain("Iron meteorite, Uncoated control");
    expect(svg).toContain("Iron meteorite, Microcrystalline wax");
    expect(svg).toContain("horizon");
    const check = await svgOf(modelCheckSpec(r));
    expect(check).toContain("85 %RH target");
  });
});
