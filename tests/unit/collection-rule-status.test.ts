import { describe, expect, it } from "vitest";
import { createRng } from "@/lib/allocation/prng";
import { bandStats, type ClimateReading } from "@/lib/climate/band-stats";
import {
  exceedancesToAlert, locationNeeds, needRank, ruleBand, rulesForObject, strictestRule, timeInRuleOf,
} from "@/lib/collection/rule-status";

// Reference: a direct count over the raw readings, minute by minute. A reading holds until the next
// one; a minute counts when the interval holding it is no longer than the gap limit. Readings fall on
// whole minutes, so this count is exact, and it shares no code with the function under test.
const MIN = 60_000;
const DAY = 86_400_000;
const T0 = Date.UTC(2026, 0, 1);

function series(seed: string, days: number): ClimateReading[] {
  const rng = createRng(seed);
  const out: ClimateReading[] = [];
  let t = T0;
  let rh = 35;
  while (t < T0 + days * DAY) {
    rh = Math.min(90, Math.max(5, rh + (rng() - 0.5) * 6));
    out.push({ takenAt: new Date(t), rhPercent: Math.round(rh * 10) / 10 });
    // mostly 10-minute logging, now and then a gap of 2–30 hours (logger off)
    t += rng() < 0.003 ? Math.round(120 + rng() * 1680) * MIN : 10 * MIN;
  }
  return out;
}

function directCount(readings: ClimateReading[], threshold: number, fromMs: number, toMs: number, maxGapMin: number) {
  let counted = 0;
  let out = 0;
  let k = 0;
  for (let m = fromMs; m < toMs; m += MIN) {
    while (k + 1 < readings.length && readings[k + 1].takenAt.getTime() <= m) k++;
    const here = readings[k];
    const next = readings[k + 1];
    if (!here || here.takenAt.getTime() > m || !next) continue;
    if (next.takenAt.getTime() - here.takenAt.getTime() > maxGapMin * MIN) continue;
    counted++;
    if (here.rhPercent > threshold) out++;
  }
  return { counted, out };
}

describe("time in rule equals a direct count over the raw readings", () => {
  const readings = series("collection-rule-status", 40);
  const now = new Date(T0 + 37 * DAY + 7 * MIN);
  // The window holds the readings taken within it (as a chamber's window does): time before its first
  // reading is not known from them and is not counted.
  const within = (days: number) => readings.filter((r) => r.takenAt.getTime() >= now.getTime() - days * DAY && r.takenAt <= now);

  for (const days of [7, 30]) {
    for (const threshold of [30, 40, 55]) {
      it(`${days} days, threshold ${threshold} %RH`, () => {
        const w = within(days);
        const result = timeInRuleOf(bandStats(w, ruleBand(threshold), { maxGapMinutes: 60 }), days);
        const direct = directCount(w, threshold, w[0].takenAt.getTime(), now.getTime(), 60);
        expect(result.countedMinutes).toBeCloseTo(direct.counted, 6);
        expect(result.outOfRuleMinutes).toBeCloseTo(direct.out, 6);
        expect(result.fractionInRule).toBeCloseTo((direct.counted - direct.out) / direct.counted, 12);
        // every exceedance's counted time adds up to the time out of rule
        const sum = result.exceedances.reduce((s, e) => s + e.durationMinutes, 0);
        expect(sum).toBeCloseTo(direct.out, 6);
        // each exceedance's peak is the highest raw reading from its start to its end (a reading just
        // before a logger gap is seen, though the gap after it is not counted)
        for (const e of result.exceedances) {
          const inside = w.filter((r) => r.takenAt >= e.start && r.takenAt <= e.end);
          const peak = Math.max(...inside.map((r) => r.rhPercent));
          expect(e.worstRhPercent).toBe(peak);
          expect(e.worstRhPercent).toBeGreaterThan(threshold);
        }
      });
    }
  }

  it("the 365-day window holds everything there is", () => {
    const result = timeInRuleOf(bandStats(within(365), ruleBand(40), { maxGapMinutes: 60 }), 365);
    const direct = directCount(readings.filter((r) => r.takenAt <= now), 40, T0, now.getTime(), 60);
    expect(result.countedMinutes).toBeCloseTo(direct.counted, 6);
    expect(result.outOfRuleMinutes).toBeCloseTo(direct.out, 6);
  });
});

describe("strictest rule and needs", () => {
  it("takes the lowest threshold; none without rules", () => {
    expect(strictestRule([{ id: "a", thresholdRhPercent: 40 }, { id: "b", thresholdRhPercent: 25 }, { id: "c", thresholdRhPercent: 25 }])?.id).toBe("b");
    expect(strictestRule([])).toBeNull();
  });

  it("refuses a threshold outside 0–100 %RH", () => {
    expect(() => ruleBand(0)).toThrow(/above 0/);
    expect(() => ruleBand(120)).toThrow(/at most 100/);
  });

  it("alerts only for exceedances of at least the delay", () => {
    const e = (minutes: number) => ({ start: new Date(T0), end: new Date(T0 + minutes * MIN), durationMinutes: minutes, worstRhPercent: 60, direction: "above" as const, openEnded: false });
    expect(exceedancesToAlert([e(359), e(360), e(900)], 6).map((x) => x.durationMinutes)).toEqual([360, 900]);
  });

  it("orders what a location needs", () => {
    const now = new Date(T0 + 10 * DAY);
    const needs = locationNeeds({
      now, thresholdRhPercent: 35, lastReading: { takenAt: new Date(now.getTime() - 3600_000), rhPercent: 41 },
      fractionInRule30d: 0.8, outOfRuleShareLimit: 0.1, desiccantDueAt: new Date(now.getTime() - DAY),
    });
    expect(needs).toEqual(["out-of-rule-now", "often-out-of-rule", "desiccant-due"]);
    expect(needRank(needs)).toBe(0);
    const stale = locationNeeds({
      now, thresholdRhPercent: null, lastReading: { takenAt: new Date(now.getTime() - 3 * DAY), rhPercent: 60 },
      fractionInRule30d: null, outOfRuleShareLimit: 0.1, desiccantDueAt: null,
    });
    expect(stale).toEqual(["no-readings", "no-rule"]);
    expect(needRank([])).toBeGreaterThan(needRank(stale));
  });
});

describe("rules that hold for an object", () => {
  const rules = [
    { id: "any", materialClass: "archaeological-iron", treatmentName: "Any treatment", thresholdRhPercent: 30 },
    { id: "wax", materialClass: "archaeological-iron", treatmentName: "Microcrystalline wax", thresholdRhPercent: 35 },
    { id: "bare", materialClass: "archaeological-iron", treatmentName: "Uncoated control", thresholdRhPercent: 20 },
    { id: "met", materialClass: "iron-meteorite", treatmentName: "Any treatment", thresholdRhPercent: 25 },
  ];
  const ids = (o: { materialClass: string; treatmentsApplied: string }) => rulesForObject(o, rules).map((r) => r.id);

  it("matches the material class and the treatments the register lists", () => {
    expect(ids({ materialClass: "archaeological-iron", treatmentsApplied: "Desalinated; microcrystalline wax" })).toEqual(["any", "wax"]);
    expect(ids({ materialClass: "archaeological-iron", treatmentsApplied: "" })).toEqual(["any", "bare"]);
    expect(ids({ materialClass: "iron-meteorite", treatmentsApplied: "Microcrystalline wax" })).toEqual(["met"]);
    expect(ids({ materialClass: "chondrite", treatmentsApplied: "" })).toEqual([]);
  });

  it("a location takes the strictest rule of all its objects", () => {
    const objects = [
      { materialClass: "archaeological-iron", treatmentsApplied: "Microcrystalline wax" },
      { materialClass: "iron-meteorite", treatmentsApplied: "" },
    ];
    expect(strictestRule(objects.flatMap((o) => rulesForObject(o, rules)))?.id).toBe("met");
  });
});
