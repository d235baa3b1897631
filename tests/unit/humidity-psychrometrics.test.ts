import { createRequire } from "node:module";
import { describe, expect, it } from "vitest";
import {
  absoluteHumidityGm3,
  dewPointC,
  frostPointC,
  condensationPointC,
  rhFromDewPointC,
  saturationVaporPressureHpa,
  vaporPressureHpa,
} from "@/lib/humidity/psychrometrics";

// psychrolib ships no type declarations; describe only the calls we use.
interface PsychroLib {
  SI: number;
  SetUnitSystem(system: number): void;
  GetSatVapPres(tDryBulbC: number): number;
  GetTDewPointFromVapPres(tDryBulbC: number, vapPresPa: number): number;
  GetTDewPointFromRelHum(tDryBulbC: number, relHumFraction: number): number;
}
const psychrolib = createRequire(import.meta.url)("psychrolib") as PsychroLib;
psychrolib.SetUnitSystem(psychrolib.SI);

const TEMPS_C = Array.from({ length: 29 }, (_, i) => -20 + i * 2.5); // −20 … 50 °C
const RHS_PERCENT = [1, 2, 5, 10, 15, 20, 30, 40, 50, 60, 70, 80, 90, 95, 100];

/** Inverse of the Magnus form, Alduchov & Eskridge 1996 (over water). */
function magnusDewPointC(eHpa: number): number {
  const l = Math.log(eHpa / 6.1094);
  return (243.04 * l) / (17.625 - l);
}

describe("saturationVaporPressureHpa", () => {
  it("matches the ASHRAE (Hyland–Wexler) table values", () => {
    // ASHRAE Handbook Fundamentals 2017 ch. 1, over water; relative tolerance 0.02 %
    expect(Math.abs(saturationVaporPressureHpa(5) * 100 - 872.6) / 872.6).toBeLessThan(2e-4);
    expect(Math.abs(saturationVaporPressureHpa(25) * 100 - 3169.7) / 3169.7).toBeLessThan(2e-4);
    expect(Math.abs(saturationVaporPressureHpa(50) * 100 - 12351.3) / 12351.3).toBeLessThan(2e-4);
    // ASHRAE Handbook Fundamentals 2017 ch. 1, over ice
    expect(Math.abs(saturationVaporPressureHpa(-20, "ice") * 100 - 103.24) / 103.24).toBeLessThan(2e-4);
    expect(Math.abs(saturationVaporPressureHpa(-5, "ice") * 100 - 401.74) / 401.74).toBeLessThan(2e-4);
  });

  it("agrees with psychrolib over −20…50 °C (ice below the triple point, as psychrolib does)", () => {
    for (const tempC of TEMPS_C) {
      const ours = saturationVaporPressureHpa(tempC, tempC <= 0.01 ? "ice" : "water") * 100;
      // psychrolib 1.1.1 GetSatVapPres (ASHRAE formulas); relative tolerance 0.05 %
      expect(Math.abs(ours - psychrolib.GetSatVapPres(tempC)) / ours).toBeLessThan(5e-4);
    }
  });

  it("is higher over supercooled water than over ice, and equal at the triple point", () => {
    expect(saturationVaporPressureHpa(-10)).toBeGreaterThan(saturationVaporPressureHpa(-10, "ice"));
    expect(saturationVaporPressureHpa(0.01)).toBeCloseTo(saturationVaporPressureHpa(0.01, "ice"), 3);
    expect(() => saturationVaporPressureHpa(5, "ice")).toThrow(RangeError);
    expect(() => saturationVaporPressureHpa(Number.NaN)).toThrow(RangeError);
  });
});

describe("condensationPointC: the chart's dew or frost point", () => {
  // Frost points from the Magnus form over ice, computed in R 4.2.2 (base only):
  //   Alduchov & Eskridge 1996 (J. Appl. Meteor. 35:601), AERK e_w = 6.1094·exp(17.625 t/(243.04 + t)),
  //   AERKi e_i = 6.1121·exp(22.587 t/(273.86 + t)); e = RH/100 · e_w(t), then e_i(Tf) = e solved for Tf.
  //   WMO Guide No. 8 (2018), Annex 4.B, from memory: e_w = 6.112·exp(17.62 t/(243.12 + t)),
  //   e_i = 6.112·exp(22.46 t/(272.62 + t)).
  const CASES: [tempC: number, rhPercent: number, aerki: number, wmo: number][] = [
    [-10, 50, -16.519, -16.522],
    [-5, 80, -7.015, -7.014],
    [5, 40, -6.642, -6.646],
    [-20, 60, -23.212, -23.211],
  ];
  for (const [tempC, rhPercent, aerki, wmo] of CASES) {
    it(`gives the frost point over ice at ${tempC} °C and ${rhPercent} %RH`, () => {
      const point = condensationPointC(tempC, rhPercent);
      expect(point.over).toBe("ice");
      // Alduchov & Eskridge 1996 AERKi (R call above); Sonntag and Magnus agree within ~0.05 °C here
      expect(Math.abs(point.tempC - aerki)).toBeLessThan(0.05);
      // WMO Guide No. 8 (2018) Annex 4.B Magnus over ice — coefficients from memory
      expect(Math.abs(point.tempC - wmo)).toBeLessThan(0.05);
      // Below 0 °C the frost point lies above the dew point over (supercooled) water.
      expect(point.tempC).toBeGreaterThan(dewPointC(tempC, rhPercent));
    });
  }

  it("gives the dew point over water when the air's vapour pressure is above the triple point", () => {
    const point = condensationPointC(25, 50);
    expect(point.over).toBe("water");
    // psychrolib (npm) and Sonntag 1990 dew point at 25 °C, 50 %RH: 13.86 °C (as in the table test below)
    expect(point.tempC).toBeCloseTo(13.86, 1);
    // Alduchov & Eskridge 1996 AERK dew point at 20 °C, 50 %RH: R 4.2.2, 243.04·x/(17.625 − x), x = ln(0.5) + 17.625·20/263.04 → 9.26 °C
    expect(Math.abs(condensationPointC(20, 50).tempC - 9.26)).toBeLessThan(0.05);
  });
});

describe("dew and frost point", () => {
  it("match the dew-point table values", () => {
    // psychrolib (npm) and Sonntag 1990 agree within 0.01 °C
    expect(dewPointC(25, 50)).toBeCloseTo(13.86, 1);
    expect(dewPointC(20, 90)).toBeCloseTo(18.31, 1);
    expect(dewPointC(25, 80)).toBeCloseTo(21.31, 1);
    expect(Math.abs(dewPointC(25, 2) - -27.7)).toBeLessThan(0.05);
    expect(Math.abs(frostPointC(25, 2) - -25.0)).toBeLessThan(0.05);
    expect(Math.abs(dewPointC(20, 5) - -20.8)).toBeLessThan(0.05);
    expect(Math.abs(frostPointC(20, 5) - -18.7)).toBeLessThan(0.05);
  });

  it("frost point agrees with psychrolib within 0.1 °C over −20…50 °C × 1…100 %RH", () => {
    for (const tempC of TEMPS_C) {
      for (const rhPercent of RHS_PERCENT) {
        // RH here is relative to water (WMO); psychrolib's own RH is relative to ice below 0.01 °C,
        // so hand it the vapour pressure instead. It returns the frost point below 0.01 °C.
        const ePa = vaporPressureHpa(tempC, rhPercent) * 100;
        const expected = psychrolib.GetTDewPointFromVapPres(tempC, ePa); // psychrolib 1.1.1
        const ours = frostPointC(tempC, rhPercent);
        if (ours > tempC) {
          // Air near water saturation below 0 °C is supersaturated over ice: the true frost point
          // lies above the air temperature. psychrolib caps its answer at the dry-bulb temperature.
          expect(expected).toBeCloseTo(tempC, 6);
          continue;
        }
        expect(Math.abs(ours - expected)).toBeLessThan(0.1);
        if (tempC > 0.01) {
          expect(Math.abs(frostPointC(tempC, rhPercent) - psychrolib.GetTDewPointFromRelHum(tempC, rhPercent / 100))).toBeLessThan(0.1);
        }
      }
    }
  });

  it("dew point over water agrees with psychrolib above 0 °C and with Magnus below", () => {
    for (const tempC of TEMPS_C) {
      for (const rhPercent of RHS_PERCENT) {
        const dew = dewPointC(tempC, rhPercent);
        if (dew > 0.01) {
          // psychrolib 1.1.1: above the triple point its result is the dew point over water
          expect(Math.abs(dew - psychrolib.GetTDewPointFromRelHum(tempC, rhPercent / 100))).toBeLessThan(0.1);
        } else if (dew >= -40) {
          // Magnus form, Alduchov & Eskridge 1996, valid −40…50 °C
          expect(Math.abs(dew - magnusDewPointC(vaporPressureHpa(tempC, rhPercent)))).toBeLessThan(0.1);
        }
        expect(dew).toBeLessThanOrEqual(frostPointC(tempC, rhPercent) + 1e-9);
      }
    }
  });

  it("round-trips RH through the dew point", () => {
    for (const tempC of [-15, 0, 12.5, 25, 40]) {
      for (const rhPercent of [1, 12, 33, 75, 100]) {
        expect(rhFromDewPointC(tempC, dewPointC(tempC, rhPercent))).toBeCloseTo(rhPercent, 6);
      }
    }
    expect(() => rhFromDewPointC(20, 25)).toThrow(RangeError);
    expect(() => dewPointC(20, 0)).toThrow(RangeError);
    expect(() => dewPointC(20, 101)).toThrow(RangeError);
  });

  it("reproduces the common-practice dew points of desiccated and humid jars", () => {
    // common practice, no published source: a jar near 25 °C reading under 2 %RH has a dew point of about −28 °C or lower
    expect(dewPointC(25, 1.9)).toBeLessThan(-28);
    expect(dewPointC(25, 2)).toBeLessThan(-27.5);
    // common practice, no published source: ~90 %RH near 19–20 °C has a dew point near 18 °C
    expect(Math.abs(dewPointC(19.5, 90) - 18)).toBeLessThan(0.5);
  });
});

describe("absoluteHumidityGm3", () => {
  it("gives the saturation vapour density", () => {
    // OpenStax College Physics, Table 13.5: 23.0 g/m³ at 25 °C
    expect(absoluteHumidityGm3(25, 100)).toBeCloseTo(23.0, 1);
    // Computed from ASHRAE e_s with R_v = 461.5: 23.03 at 25 °C, 17.29 at 20 °C (±0.01)
    expect(Math.abs(absoluteHumidityGm3(25, 100) - 23.03)).toBeLessThanOrEqual(0.01);
    expect(Math.abs(absoluteHumidityGm3(20, 100) - 17.29)).toBeLessThanOrEqual(0.01);
    expect(absoluteHumidityGm3(20, 0)).toBe(0);
  });
});
