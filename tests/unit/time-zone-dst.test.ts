// Wall clock → instant across every daylight-saving change of 2010–2025 in a dozen zones, checked
// against an independent implementation: the TC39 Temporal proposal's reference polyfill
// (@js-temporal/polyfill), whose disambiguation "later" is the rule lib/time/zone.ts promises
// (ECMAScript Temporal proposal, §"GetPossibleEpochNanoseconds" / "DisambiguatePossibleEpochNanoseconds").
import { Temporal } from "@js-temporal/polyfill";
import { describe, expect, it } from "vitest";
import { wallClock, wallToUtcMs, zoneOffsetMs } from "@/lib/time/zone";

// West of Greenwich (both hemispheres), east of it, a half-hour change (Lord Howe), midnight changes
// (Havana, Santiago, São Paulo until 2019) and Apia's 2011 jump across the date line.
const ZONES = [
  "America/New_York", "America/Los_Angeles", "America/Havana", "America/Santiago", "America/Sao_Paulo", "Pacific/Apia",
  "Europe/London", "Europe/Berlin", "Asia/Tehran", "Australia/Sydney", "Australia/Lord_Howe", "Pacific/Auckland",
];
const MINUTE_MS = 60_000;
const STEP_MS = 15 * MINUTE_MS;

function transitions(zone: string): number[] {
  const out: number[] = [];
  let at: Temporal.ZonedDateTime | null = Temporal.ZonedDateTime.from({ timeZone: zone, year: 2010, month: 1, day: 1 });
  for (;;) {
    at = at.getTimeZoneTransition("next");
    if (!at || at.year > 2025) return out;
    out.push(at.epochMilliseconds);
  }
}

/** The instant Temporal gives for a wall time, fields taken from a UTC-epoch number. */
function temporalLater(wallMs: number, zone: string): number {
  const d = new Date(wallMs);
  return Temporal.PlainDateTime.from({
    year: d.getUTCFullYear(), month: d.getUTCMonth() + 1, day: d.getUTCDate(), hour: d.getUTCHours(), minute: d.getUTCMinutes(),
  }).toZonedDateTime(zone, { disambiguation: "later" }).epochMilliseconds;
}

describe("wallToUtcMs across daylight-saving changes", () => {
  for (const zone of ZONES) {
    it(`${zone}: every change 2010–2025 agrees with Temporal (disambiguation "later")`, () => {
      const changes = transitions(zone);
      expect(changes.length).toBeGreaterThan(0);
      const mismatches: string[] = [];
      for (const t of changes) {
        const offBefore = zoneOffsetMs(t - 1, zone);
        const offAfter = zoneOffsetMs(t, zone);
        // Every quarter hour from an hour before the lower wall time to an hour after the higher one.
        const from = t + Math.min(offBefore, offAfter) - 60 * MINUTE_MS;
        const to = t + Math.max(offBefore, offAfter) + 60 * MINUTE_MS;
        for (let wall = from; wall <= to; wall += STEP_MS) {
          const ours = wallToUtcMs(wall, (u) => zoneOffsetMs(u, zone));
          const theirs = temporalLater(wall, zone);
          if (ours !== theirs) mismatches.push(`${new Date(wall).toISOString().slice(0, 16)} wall: ${new Date(ours).toISOString()} ≠ ${new Date(theirs).toISOString()}`);
        }
      }
      expect(mismatches).toEqual([]);
    });
  }

  it("a New York time in the repeated autumn hour is the later, standard-time instant", () => {
    // 2024-11-03 01:30 happens at 05:30Z (EDT, UTC−4) and again at 06:30Z (EST, UTC−5); tz database, America/New_York.
    const wall = Date.UTC(2024, 10, 3, 1, 30);
    const at = wallToUtcMs(wall, (u) => zoneOffsetMs(u, "America/New_York"));
    expect(new Date(at).toISOString()).toBe("2024-11-03T06:30:00.000Z");
    expect(wallClock(at, "America/New_York")).toMatchObject({ day: 3, hour: 1, minute: 30 });
  });

  it("a Santiago time in the spring gap moves forward by the gap", () => {
    // Chile skipped 2023-09-03 00:00–01:00 (UTC−4 → UTC−3); tz database, America/Santiago.
    const at = wallToUtcMs(Date.UTC(2023, 8, 3, 0, 30), (u) => zoneOffsetMs(u, "America/Santiago"));
    expect(wallClock(at, "America/Santiago")).toMatchObject({ day: 3, hour: 1, minute: 30 });
  });
});
