import { describe, expect, it } from "vitest";
import { buildSchedule, GEOMETRIC_RULE_TEXT, normaliseCustomDays, planDays } from "@/lib/schedule/plans";

const start = new Date("2025-03-10T09:30:00.000Z");
const iso = (dates: Date[]) => dates.map((d) => d.toISOString());

describe("planDays", () => {
  it("fixed: day 0 then every interval", () => {
    expect(planDays({ kind: "fixed", intervalDays: 7, count: 4 })).toEqual([0, 7, 14, 21]);
    expect(planDays({ kind: "fixed", intervalDays: 1, count: 1 })).toEqual([0]);
  });

  it("geometric: 0, 1, 2, 4, 7, then doubling from day 7", () => {
    // Rustline's documented sequence (GEOMETRIC_RULE_TEXT), not an external standard.
    expect(planDays({ kind: "geometric", count: 10 })).toEqual([0, 1, 2, 4, 7, 14, 28, 56, 112, 224]);
    expect(planDays({ kind: "geometric", count: 3 })).toEqual([0, 1, 2]);
    expect(GEOMETRIC_RULE_TEXT).toContain("doubling from day 7");
  });

  it("custom: accepts sorted unique whole days", () => {
    expect(planDays({ kind: "custom", days: [0, 3, 10, 30] })).toEqual([0, 3, 10, 30]);
    expect(planDays({ kind: "custom", days: [5] })).toEqual([5]);
  });

  it("custom: rejects unsorted, repeated, negative, fractional or empty days", () => {
    for (const days of [[3, 1], [0, 2, 2], [-1, 4], [0, 1.5], [], [0, Number.NaN]]) {
      expect(() => planDays({ kind: "custom", days })).toThrow(RangeError);
    }
    expect(normaliseCustomDays([14, 0, 7, 7])).toEqual([0, 7, 14]);
  });

  it("rejects nonsensical fixed and geometric plans", () => {
    expect(() => planDays({ kind: "fixed", intervalDays: 0, count: 3 })).toThrow(RangeError);
    expect(() => planDays({ kind: "fixed", intervalDays: 2.5, count: 3 })).toThrow(RangeError);
    expect(() => planDays({ kind: "fixed", intervalDays: 7, count: 0 })).toThrow(RangeError);
    expect(() => planDays({ kind: "geometric", count: 21 })).toThrow(RangeError);
    expect(() => planDays({ kind: "geometric", count: 2.5 })).toThrow(RangeError);
  });
});

describe("buildSchedule", () => {
  it("keeps the start's time of day on every planned date (UTC day arithmetic by default)", () => {
    expect(iso(buildSchedule({ kind: "fixed", intervalDays: 7, count: 3 }, start))).toEqual([
      "2025-03-10T09:30:00.000Z",
      "2025-03-17T09:30:00.000Z",
      "2025-03-24T09:30:00.000Z",
    ]);
    expect(iso(buildSchedule({ kind: "geometric", count: 6 }, start))).toEqual([
      "2025-03-10T09:30:00.000Z",
      "2025-03-11T09:30:00.000Z",
      "2025-03-12T09:30:00.000Z",
      "2025-03-14T09:30:00.000Z",
      "2025-03-17T09:30:00.000Z",
      "2025-03-24T09:30:00.000Z",
    ]);
  });

  it("crosses month and leap-day boundaries by calendar", () => {
    const s = new Date("2024-02-27T14:00:00.000Z");
    expect(iso(buildSchedule({ kind: "custom", days: [0, 2, 3] }, s))).toEqual([
      "2024-02-27T14:00:00.000Z",
      "2024-02-29T14:00:00.000Z", // 2024 is a leap year (Gregorian calendar)
      "2024-03-01T14:00:00.000Z",
    ]);
  });

  it("with the lab's zone, keeps local wall-clock time across a daylight-saving change", () => {
    // Berlin leaves CET (UTC+1) for CEST (UTC+2) on 2025-03-30 (EU rule: last Sunday of March).
    const s = new Date("2025-03-27T08:00:00.000Z"); // 09:00 in Berlin
    expect(iso(buildSchedule({ kind: "fixed", intervalDays: 7, count: 2 }, s, { timeZone: "Europe/Berlin" }))).toEqual([
      "2025-03-27T08:00:00.000Z",
      "2025-04-03T07:00:00.000Z", // still 09:00 in Berlin
    ]);
    // Default (UTC arithmetic) keeps the UTC time instead.
    expect(iso(buildSchedule({ kind: "fixed", intervalDays: 7, count: 2 }, s))[1]).toBe("2025-04-03T08:00:00.000Z");
  });

  it("rejects an invalid start or zone", () => {
    expect(() => buildSchedule({ kind: "geometric", count: 3 }, new Date("nonsense"))).toThrow(RangeError);
    expect(() => buildSchedule({ kind: "geometric", count: 3 }, start, { timeZone: "Mars/Olympus" })).toThrow(RangeError);
  });
});
