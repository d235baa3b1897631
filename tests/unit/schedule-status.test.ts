import { describe, expect, it } from "vitest";
import { dueWithin, inspectionStatus } from "@/lib/schedule/status";

// now: Wednesday 2025-06-11 15:00 UTC. Today's window runs to the end of tomorrow, i.e. to
// 2025-06-13T00:00Z. Grace 6 h ⇒ planned before 09:00 today is overdue.
const now = new Date("2025-06-11T15:00:00.000Z");
const at = (s: string) => new Date(s);
const grace = 6;

describe("inspectionStatus", () => {
  it("done whenever a done time is recorded", () => {
    expect(inspectionStatus({ plannedAt: at("2025-06-01T09:00:00Z"), doneAt: at("2025-06-05T10:00:00Z") }, now, grace)).toBe("done");
    expect(inspectionStatus({ plannedAt: at("2025-07-01T09:00:00Z"), doneAt: at("2025-06-11T10:00:00Z") }, now, grace)).toBe("done");
  });

  it("due: later today, tomorrow, or past but within the grace period", () => {
    expect(inspectionStatus({ plannedAt: at("2025-06-11T18:00:00Z") }, now, grace)).toBe("due"); // later today
    expect(inspectionStatus({ plannedAt: at("2025-06-12T23:59:59Z") }, now, grace)).toBe("due"); // last second of tomorrow
    expect(inspectionStatus({ plannedAt: at("2025-06-11T12:00:00Z"), doneAt: null }, now, grace)).toBe("due"); // 3 h ago
    expect(inspectionStatus({ plannedAt: at("2025-06-11T09:00:00Z") }, now, grace)).toBe("due"); // exactly now − grace
  });

  it("overdue: past by more than the grace period", () => {
    expect(inspectionStatus({ plannedAt: at("2025-06-11T08:59:59Z") }, now, grace)).toBe("overdue");
    expect(inspectionStatus({ plannedAt: at("2025-06-01T09:00:00Z") }, now, grace)).toBe("overdue");
    expect(inspectionStatus({ plannedAt: at("2025-06-11T14:59:00Z") }, now, 0)).toBe("overdue"); // no grace
  });

  it("upcoming: from the day after tomorrow on", () => {
    expect(inspectionStatus({ plannedAt: at("2025-06-13T00:00:00Z") }, now, grace)).toBe("upcoming");
    expect(inspectionStatus({ plannedAt: at("2025-07-01T09:00:00Z") }, now, grace)).toBe("upcoming");
  });

  it("counts days on the lab's calendar when a zone is given", () => {
    // 2025-06-12T23:30Z is already 2025-06-13 01:30 in Berlin (UTC+2 in summer): after tomorrow there.
    const planned = { plannedAt: at("2025-06-12T23:30:00Z") };
    expect(inspectionStatus(planned, now, grace)).toBe("due");
    expect(inspectionStatus(planned, now, grace, { timeZone: "Europe/Berlin" })).toBe("upcoming");
  });

  it("rejects a negative or non-finite grace", () => {
    expect(() => inspectionStatus({ plannedAt: now }, now, -1)).toThrow(RangeError);
    expect(() => inspectionStatus({ plannedAt: now }, now, Number.NaN)).toThrow(RangeError);
  });
});

describe("dueWithin", () => {
  const list = [
    { id: "c", plannedAt: at("2025-06-14T09:00:00Z"), doneAt: null },
    { id: "a", plannedAt: at("2025-06-05T09:00:00Z"), doneAt: null }, // overdue, still to do
    { id: "done", plannedAt: at("2025-06-10T09:00:00Z"), doneAt: at("2025-06-10T09:40:00Z") },
    { id: "b", plannedAt: at("2025-06-12T09:00:00Z") },
    { id: "far", plannedAt: at("2025-06-30T09:00:00Z"), doneAt: null },
  ];

  it("lists undone inspections planned up to now + days, earliest first, overdue included", () => {
    expect(dueWithin(list, now, 3).map((i) => i.id)).toEqual(["a", "b", "c"]);
    expect(dueWithin(list, now, 0).map((i) => i.id)).toEqual(["a"]);
    expect(dueWithin(list, now, 30).map((i) => i.id)).toEqual(["a", "b", "c", "far"]);
  });

  it("includes an inspection planned exactly at the limit", () => {
    const edge = [{ plannedAt: at("2025-06-12T15:00:00Z") }];
    expect(dueWithin(edge, now, 1)).toHaveLength(1);
  });

  it("rejects negative days", () => {
    expect(() => dueWithin(list, now, -1)).toThrow(RangeError);
  });
});
