import { describe, expect, it } from "vitest";
import { applyCorrection, correctionAt, correctionOf, twoSaltCorrection, type TimedCorrection } from "@/lib/climate/hygrometer-check";
import { excludedByBand, placementExposure, type ExposureReading } from "@/lib/climate/exposure";
import { dewPointC } from "@/lib/humidity/psychrometrics";
import { saltEquilibriumRh } from "@/lib/humidity/salts";

const MIN = 60_000;

describe("two-salt hygrometer check", () => {
  // References from the Greenspan 1977 fits in lib/humidity/salts.ts (L. Greenspan, "Humidity fixed
  // points of binary saturated aqueous solutions", J. Res. NBS 81A, 1977); Table 1 at 25 °C gives
  // MgCl2 32.78 and NaCl 75.29 %RH (from memory), which the fits reproduce to 0.02.
  const mg = saltEquilibriumRh("MgCl2", 25).rhPercent;
  const na = saltEquilibriumRh("NaCl", 25).rhPercent;

  it("maps the two readings onto the two references, and any reading onto the line through them", () => {
    expect(mg).toBeCloseTo(32.78, 1);
    expect(na).toBeCloseTo(75.29, 1);
    const c = twoSaltCorrection({ tempC: 25, first: { salt: "MgCl2", readingRhPercent: 35 }, second: { salt: "NaCl", readingRhPercent: 78.5 } });
    // Direct: the instrument's slope is Δreading / Δreference; a reading x is corrected to
    // mg + (x − 35) × (na − mg) / (78.5 − 35).
    expect(c.slope).toBeCloseTo((78.5 - 35) / (na - mg), 12);
    expect(c.first.offsetPercent).toBeCloseTo(35 - mg, 12);
    for (const x of [10, 35, 50, 78.5, 90]) {
      expect(applyCorrection(x, c)).toBeCloseTo(mg + ((x - 35) * (na - mg)) / (78.5 - 35), 10);
    }
    // The stored form (first salt's reading and reference, and the slope) gives the same line.
    const stored = correctionOf({ offsetRhPercent: 35 - mg, readingRhPercent: 35, referenceRhPercent: mg, slope: c.slope });
    expect(stored.gain).toBeCloseTo(c.gain, 12);
    expect(stored.shiftRhPercent).toBeCloseTo(c.shiftRhPercent, 10);
  });

  it("a one-salt check is the plain offset (slope 1)", () => {
    const c = correctionOf({ offsetRhPercent: 77 - na, readingRhPercent: 77, referenceRhPercent: na, slope: null });
    expect(applyCorrection(60, c)).toBeCloseTo(60 - (77 - na), 12);
  });

  it("refuses the same salt twice, readings outside 0–100 %RH and a falling response", () => {
    expect(() => twoSaltCorrection({ tempC: 25, first: { salt: "NaCl", readingRhPercent: 75 }, second: { salt: "NaCl", readingRhPercent: 76 } })).toThrow(/two different salts/);
    expect(() => twoSaltCorrection({ tempC: 25, first: { salt: "MgCl2", readingRhPercent: 33 }, second: { salt: "NaCl", readingRhPercent: 101 } })).toThrow(/between 0 % and 100 %/);
    expect(() => twoSaltCorrection({ tempC: 25, first: { salt: "MgCl2", readingRhPercent: 80 }, second: { salt: "NaCl", readingRhPercent: 30 } })).toThrow(/wetter salt/);
  });
});

describe("drift between checks", () => {
  const checks: TimedCorrection[] = [
    { atMs: 1000 * MIN, gain: 1, shiftRhPercent: -2 },
    { atMs: 3000 * MIN, gain: 0.9, shiftRhPercent: 4 },
  ];
  it("interpolates linearly in time between checks and holds the nearest check outside them", () => {
    // Direct: a quarter of the way from the first check to the second.
    const q = correctionAt(checks, 1500 * MIN)!;
    expect(q.gain).toBeCloseTo(1 + 0.25 * (0.9 - 1), 12);
    expect(q.shiftRhPercent).toBeCloseTo(-2 + 0.25 * 6, 12);
    expect(correctionAt(checks, 0)).toEqual(checks[0]);
    expect(correctionAt(checks, 9999 * MIN)).toEqual(checks[1]);
    expect(correctionAt([], 0)).toBeNull();
    // The corrected value is the time-weighted mix of both checks' corrections.
    const x = 50;
    expect(applyCorrection(x, q)).toBeCloseTo(0.75 * (x - 2) + 0.25 * (0.9 * x + 4), 10);
  });
});

describe("placement exposure equals a direct computation over the raw readings", () => {
  // Invented readings every 10 minutes with one 3-hour hole, two instruments, temperatures missing now and then.
  const rows: ExposureReading[] = [];
  let t = Date.UTC(2026, 2, 1);
  for (let i = 0; i < 300; i++) {
    t += i === 120 ? 180 * MIN : 10 * MIN;
    const rhRaw = 55 + 35 * Math.sin(i / 17) + (i % 7) - 3;
    rows.push({ takenAt: new Date(t), rhRaw: Math.min(100, Math.max(0, rhRaw)), tempC: i % 11 === 0 ? null : 20 + 3 * Math.cos(i / 23), instrument: i % 2 ? "B" : "A" });
  }
  const checks = new Map<string, TimedCorrection[]>([["A", [
    { atMs: rows[50].takenAt.getTime(), gain: 1, shiftRhPercent: -1.5 },
    { atMs: rows[250].takenAt.getTime(), gain: 0.95, shiftRhPercent: 1 },
  ]]]);
  const band = { minRh: 50, maxRh: 70 };
  const maxGapMinutes = 60;

  it("mean, out-of-band share, time above thresholds and condensation time", () => {
    const e = placementExposure({ rows, checks, band, thresholdsRhPercent: [25, 60, 85], maxGapMinutes });

    // Direct computation, written independently: each reading holds until the next one; intervals
    // over an hour are not counted; instrument A's correction is interpolated by hand.
    const a0 = rows[50].takenAt.getTime(), a1 = rows[250].takenAt.getTime();
    const fix = (r: ExposureReading) => {
      if (r.instrument !== "A") return r.rhRaw;
      const w = Math.min(1, Math.max(0, (r.takenAt.getTime() - a0) / (a1 - a0)));
      const gain = 1 + w * (0.95 - 1), shift = -1.5 + w * (1 - -1.5);
      return Math.min(100, Math.max(0, gain * r.rhRaw + shift));
    };
    let counted = 0, weighted = 0, outMin = 0, withTemp = 0, wet = 0;
    const above = [0, 0, 0];
    for (let i = 0; i + 1 < rows.length; i++) {
      const dt = (rows[i + 1].takenAt.getTime() - rows[i].takenAt.getTime()) / MIN;
      if (dt > maxGapMinutes) continue;
      const rh = fix(rows[i]);
      counted += dt;
      weighted += rh * dt;
      if (rh < 50 || rh > 70) outMin += dt;
      [25, 60, 85].forEach((th, k) => { if (rh > th) above[k] += dt; });
      const temp = rows[i].tempC;
      if (temp != null) {
        withTemp += dt;
        if (temp - dewPointC(temp, rh) <= 2) wet += dt;
      }
    }
    expect(counted).toBe(298 * 10);
    expect(e.countedMinutes).toBeCloseTo(counted, 9);
    expect(e.meanRhPercent).toBeCloseTo(weighted / counted, 9);
    expect(e.outOfBandShare).toBeCloseTo(outMin / counted, 12);
    expect(e.above.map((x) => x.minutes)).toEqual(above.map((m) => expect.closeTo(m, 9)));
    expect(e.minutesWithTemp).toBeCloseTo(withTemp, 9);
    expect(e.condensationMinutes).toBeCloseTo(wet, 9);
    expect(wet).toBeGreaterThan(0);
    expect(e.corrected).toBe(true);
  });

  it("the re-analysis leaves out a specimen whose jar was out of band more than the share", () => {
    const e = placementExposure({ rows, checks, band, maxGapMinutes });
    const share = e.outOfBandShare! * 100;
    const list = [{ specimenId: "s1", exposure: e }];
    expect(excludedByBand(list, Math.floor(share) - 1)).toHaveLength(1);
    expect(excludedByBand(list, Math.ceil(share) + 1)).toHaveLength(0);
    const none = placementExposure({ rows: [], checks, band, maxGapMinutes });
    expect(none.outOfBandShare).toBeNull();
    expect(excludedByBand([{ specimenId: "s2", exposure: none }], 0)).toHaveLength(0);
  });
});
