import { describe, expect, it } from "vitest";
import { bandStats, downsample, settleTimeMinutes, type ClimateReading } from "@/lib/climate/band-stats";

const T0 = Date.UTC(2025, 2, 1, 8, 0);
const at = (minutes: number) => new Date(T0 + minutes * 60_000);
const series = (points: [number, number][]): ClimateReading[] => points.map(([m, rh]) => ({ takenAt: at(m), rhPercent: rh }));

// Band 30–40 %RH. A 20-minute excursion to 50 %, a dip to 25 % just before a 140-minute logger gap.
const READINGS = series([
  [0, 35],
  [10, 35],
  [20, 45],
  [30, 50],
  [40, 38],
  [50, 38],
  [60, 25],
  [200, 36],
  [210, 36],
]);
const BAND = { minRh: 30, maxRh: 40 };

describe("bandStats", () => {
  it("weights each reading by the time until the next and leaves long gaps out", () => {
    const stats = bandStats(READINGS, BAND, { maxGapMinutes: 60 });
    // Counted intervals (hand count): 0–60 in 10-minute steps and 200–210; 60–200 is a gap.
    expect(stats.countedMinutes).toBe(70);
    expect(stats.inBandMinutes).toBe(50);
    expect(stats.fractionInBand).toBeCloseTo(50 / 70, 12);
    // (35 + 35 + 45 + 50 + 38 + 38 + 36) × 10 / 70
    expect(stats.meanRhPercent).toBeCloseTo(2770 / 70, 12);
    expect(stats.minRhPercent).toBe(25);
    expect(stats.maxRhPercent).toBe(50);
  });

  it("lists excursions and picks the worst", () => {
    const stats = bandStats(READINGS, BAND, { maxGapMinutes: 60 });
    expect(stats.excursions).toHaveLength(2);
    expect(stats.excursions[0]).toEqual({
      start: at(20),
      end: at(40),
      durationMinutes: 20,
      worstRhPercent: 50,
      direction: "above",
      openEnded: false,
    });
    // The dip at 60 min is followed by a gap: we do not know how long it lasted.
    expect(stats.excursions[1]).toMatchObject({ start: at(60), durationMinutes: 0, worstRhPercent: 25, direction: "below", openEnded: true });
    expect(stats.worstExcursion).toBe(stats.excursions[0]);
    expect(stats.longestExcursion).toBe(stats.excursions[0]);
  });

  it("counts the gap when the allowed gap is long enough", () => {
    const stats = bandStats(READINGS, BAND, { maxGapMinutes: 180 });
    expect(stats.countedMinutes).toBe(210);
    expect(stats.excursions[1]).toMatchObject({ end: at(200), durationMinutes: 140, openEnded: false });
    expect(stats.longestExcursion).toBe(stats.excursions[1]);
    expect(stats.worstExcursion).toBe(stats.excursions[0]);
  });

  it("handles empty and single-reading series without inventing time", () => {
    expect(bandStats([], BAND).fractionInBand).toBeNull();
    const one = bandStats(series([[0, 35]]), BAND);
    expect(one.fractionInBand).toBeNull();
    expect(one.meanRhPercent).toBeNull();
    expect(() => bandStats(series([[10, 35], [0, 35]]), BAND)).toThrow(RangeError);
    expect(() => bandStats(READINGS, { minRh: 50, maxRh: 40 })).toThrow(RangeError);
  });
});

describe("settleTimeMinutes", () => {
  it("is the time until RH enters the band and stays for the hold time", () => {
    // From 15 min: in band until 20, out 20–40, back in 40–60 (20 minutes).
    expect(settleTimeMinutes(READINGS, BAND, at(15), { holdMinutes: 20 })).toBe(25);
    expect(settleTimeMinutes(READINGS, BAND, at(15), { holdMinutes: 30 })).toBeNull();
    expect(settleTimeMinutes(READINGS, BAND, at(5), { holdMinutes: 5 })).toBe(0);
  });

  it("does not let a run bridge a logger gap", () => {
    expect(settleTimeMinutes(READINGS, BAND, at(100), { holdMinutes: 10, maxGapMinutes: 60 })).toBe(100);
    expect(settleTimeMinutes(READINGS, BAND, at(45), { holdMinutes: 30, maxGapMinutes: 60 })).toBeNull();
  });
});

describe("downsample", () => {
  it("keeps spikes and dips and stays within the point budget", () => {
    const long: ClimateReading[] = Array.from({ length: 1000 }, (_, i) => ({ takenAt: at(i), rhPercent: 40 + Math.sin(i / 20) }));
    long[500] = { takenAt: at(500), rhPercent: 99 };
    long[777] = { takenAt: at(777), rhPercent: 1 };
    const thin = downsample(long, 50);
    expect(thin.length).toBeLessThanOrEqual(50);
    expect(thin.some((r) => r.rhPercent === 99)).toBe(true);
    expect(thin.some((r) => r.rhPercent === 1)).toBe(true);
    for (let i = 1; i < thin.length; i++) expect(thin[i].takenAt.getTime()).toBeGreaterThan(thin[i - 1].takenAt.getTime());
    expect(downsample(long.slice(0, 10), 50)).toHaveLength(10);
    expect(() => downsample(long, 1)).toThrow(RangeError);
  });
});
