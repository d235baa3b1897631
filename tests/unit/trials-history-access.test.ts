// What a blind scorer sees of a specimen's history (lib/trials/access.ts): entries dated from the day
// the specimen entered a trial the viewer scores blind are hidden; earlier ones, and everything for
// other viewers, stay. The audit event of an entry belongs to the trial whose placement had started.
import { describe, expect, it } from "vitest";
import { historyForViewer, trialOfHistoryDate } from "@/lib/trials/access";

const spans = [
  { trialId: "old", fromAt: new Date("2025-03-01T09:00:00Z") },
  { trialId: "blind", fromAt: new Date("2026-02-01T23:30:00Z") },
  { trialId: "draft", fromAt: null },
];
const entries = ["2025-01-10", "2025-06-01", "2026-01-31", "2026-02-01", "2026-03-05"].map((on) => ({ on }));

describe("historyForViewer", () => {
  it("hides entries on or after the first day in a trial scored blind", () => {
    const r = historyForViewer(entries, spans, new Set(["blind"]));
    expect(r.shown.map((e) => e.on)).toEqual(["2025-01-10", "2025-06-01", "2026-01-31"]);
    expect(r.hidden).toBe(2);
  });
  it("hides nothing for a viewer not blind in the specimen's trials, or for an unstarted placement", () => {
    expect(historyForViewer(entries, spans, new Set()).hidden).toBe(0);
    expect(historyForViewer(entries, spans, new Set(["elsewhere", "draft"])).hidden).toBe(0);
  });
});

describe("trialOfHistoryDate", () => {
  it("is the latest placement started by that day, or none before any", () => {
    expect(trialOfHistoryDate("2025-01-10", spans)).toBeNull();
    expect(trialOfHistoryDate("2025-03-01", spans)).toBe("old");
    expect(trialOfHistoryDate("2026-01-31", spans)).toBe("old");
    expect(trialOfHistoryDate("2026-02-01", spans)).toBe("blind");
  });
});
