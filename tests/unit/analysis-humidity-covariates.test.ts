// Specimen-history covariates in the humidity-response Weibull model, checked against R 4.2.2 with
// survival 3.5-3 on survival::lung seen every 60 days (the data and R fit of
// stats-interval-regression.test.ts):
//   survreg(Surv(L, R, type = "interval2") ~ age + sex, data = d1, dist = "weibull")
//   coef: (Intercept) 6.232018453847501, age -0.0114876105671385, sex 0.3631017662124718
//   se:   0.4609812855851364, 0.00668399309168808, 0.12247073779491285
// Here age stands in the RH column (39–82, inside 0–100) and sex is the history covariate: as
// "chloride found" (sex 2 → 1, sex 1 → 0) and as an initial mass of 1 or 2 g. Recoding a covariate
// by a shift leaves its coefficient and standard error as they are and moves the intercept by
// β·shift, which the test checks too.
import { describe, expect, it } from "vitest";
import { humidityResponse } from "@/lib/analysis/humidity-response";
import type { ResponseRow } from "@/lib/analysis/humidity-result";
import { lung } from "@/tests/support/r-interval-data";

const R = { intercept: 6.232018453847501, age: -0.0114876105671385, sex: 0.3631017662124718, seSex: 0.12247073779491285, seAge: 0.00668399309168808 };

function lungRows(extra: (i: number) => Partial<ResponseRow>): ResponseRow[] {
  return lung.time.map((t, i) => {
    const lower = 60 * Math.floor(t / 60);
    return {
      placementId: `p${i}`, specimenLabel: `L-${i}`, trialId: "t1", chamberId: `jar-${lung.age[i]}`, chamberName: "Jar",
      targetRhPercent: lung.age[i], measuredRhPercent: lung.age[i], materialClass: "iron-meteorite",
      treatmentId: "bare", treatmentName: "Bare", treatmentKind: "control",
      lower, upper: lung.status[i] === 2 ? lower + 60 : Infinity, ...extra(i),
    };
  });
}
const OPTIONS = { p: 0.1, horizonDays: 3652.5 };

describe("history covariates in the humidity response (R survreg on survival::lung)", () => {
  it("chloride found: its coefficient and standard error are survreg's for sex", () => {
    const r = humidityResponse(lungRows((i) => ({ chloridePresent: lung.sex[i] === 2 })), { ...OPTIONS, covariates: ["chloride"] }, "t1");
    const c = r.fit!.coefficients;
    expect(c.map((x) => x.name)).toEqual(["Intercept", "RH (%RH)", "Chloride found before the trial (vs not found or not tested)"]);
    expect(c[2].estimate).toBeCloseTo(R.sex, 5);
    expect(c[2].standardError).toBeCloseTo(R.seSex, 5);
    expect(c[1].estimate).toBeCloseTo(R.age, 6);
    expect(c[1].standardError).toBeCloseTo(R.seAge, 6);
    // sex = 1 + chloride, so the intercept is R's plus one β_sex.
    expect(c[0].estimate).toBeCloseTo(R.intercept + R.sex, 4);
    expect(r.cox?.hazardRatios.map((h) => h.name)).toContain("Chloride found before the trial (vs not found or not tested)");
  });

  it("initial mass: per-gram coefficient as survreg's for sex; centring moves only the intercept", () => {
    const r = humidityResponse(lungRows((i) => ({ initialMassG: lung.sex[i] })), { ...OPTIONS, covariates: ["initialMass"] }, "t1");
    const c = r.fit!.coefficients;
    expect(c[2].name).toBe("Initial mass (per g, centred on the mean)");
    expect(c[2].estimate).toBeCloseTo(R.sex, 5);
    expect(c[2].standardError).toBeCloseTo(R.seSex, 5);
    const meanSex = lung.sex.reduce((s, x) => s + x, 0) / lung.sex.length;
    expect(c[0].estimate).toBeCloseTo(R.intercept + R.sex * meanSex, 4);
  });

  it("leaves out specimens without an initial mass and says so; without covariates nothing changes", () => {
    const r = humidityResponse(lungRows((i) => ({ initialMassG: i < 8 ? null : lung.sex[i] })), { ...OPTIONS, covariates: ["initialMass"] }, "t1");
    expect(r.fit!.n).toBe(lung.time.length - 8);
    expect(r.warnings[0]).toMatch(/^8 specimens have no weighing before the trial/);
    const plain = humidityResponse(lungRows((i) => ({ chloridePresent: lung.sex[i] === 2, initialMassG: null })), OPTIONS, "t1");
    expect(plain.fit!.coefficients).toHaveLength(2);
    expect(plain.fit!.n).toBe(lung.time.length);
  });
});
