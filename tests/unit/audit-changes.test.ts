// The audit trail's "field: before → after" lines, built from the stored before/after records.
import { describe, expect, it } from "vitest";
import { auditChanges, fieldLabel, formatAuditValue } from "@/lib/audit/changes";
import { auditEventForViewer } from "@/lib/trials/access";

describe("audit change lines", () => {
  it("lists only the fields an update changed, with plain labels and units from the field names", () => {
    const before = { id: "c1", labId: "l1", name: "Jar C", setpointRhPercent: 75, toleranceRhPercent: 2, nominalTempC: 22, updatedAt: "2026-11-01T10:00:00.000Z", archivedAt: null };
    const after = { ...before, setpointRhPercent: 76, nominalTempC: 23.5, updatedAt: "2026-11-02T10:00:00.000Z", archivedAt: "2026-11-02T09:30:00.000Z" };
    expect(auditChanges(before, after)).toEqual([
      { field: "setpointRhPercent", label: "Setpoint RH (%)", before: "75", after: "76" },
      { field: "nominalTempC", label: "Nominal temp (°C)", before: "22", after: "23.5" },
      { field: "archivedAt", label: "Archived at", before: "—", after: "2026-11-02 09:30 UTC" },
    ]);
  });

  it("shows what a new record set and what a deleted one held", () => {
    expect(auditChanges(null, { id: "x", role: "lead", blind: false, note: null })).toEqual([
      { field: "role", label: "Role", before: null, after: "lead" },
      { field: "blind", label: "Blind", before: null, after: "no" },
    ]);
    expect(auditChanges({ label: "TV-M-001", massG: 12.5 }, null)).toEqual([
      { field: "label", label: "Label", before: "TV-M-001", after: null },
      { field: "massG", label: "Mass (g)", before: "12.5", after: null },
    ]);
  });

  it("follows nested records two levels down and counts deeper structures", () => {
    const changes = auditChanges(
      { status: "draft", options: { mapping: { time: 0, rhPercent: 1, tempC: 2 }, timeZone: "UTC" }, assignments: [{ a: 1 }] },
      { status: "running", options: { mapping: { time: 2, rhPercent: 3, tempC: 4 }, timeZone: "Europe/Berlin" }, assignments: [{ a: 1 }, { a: 2 }] },
    );
    expect(changes).toEqual([
      { field: "status", label: "Status", before: "draft", after: "running" },
      { field: "options.mapping.time", label: "Options › mapping › time", before: "0", after: "2" },
      { field: "options.mapping.rhPercent", label: "Options › mapping › RH (%)", before: "1", after: "3" },
      { field: "options.mapping.tempC", label: "Options › mapping › temp (°C)", before: "2", after: "4" },
      { field: "options.timeZone", label: "Options › time zone", before: "UTC", after: "Europe/Berlin" },
      { field: "assignments", label: "Assignments", before: "1 entry", after: "2 entries" },
    ]);
    // Records that are lists give one line for the whole record.
    expect(auditChanges([{ specimenId: "a" }], [{ specimenId: "b" }, { reason: "x" }])).toEqual([{ field: "", label: "Record", before: "1 entry", after: "2 entries" }]);
  });

  it("formats values as the rest of the product does", () => {
    // RFC 3339 §4.2: 13:05+01:00 is 12:05 UTC; the product shows UTC with the zone named (lib/format.ts).
    expect(formatAuditValue("2026-11-18T13:05:00+01:00")).toBe("2026-11-18 12:05 UTC");
    expect(formatAuditValue("2026-11-18")).toBe("2026-11-18");
    expect(formatAuditValue(true)).toBe("yes");
    expect(formatAuditValue(["a", "b"])).toBe("a, b");
    expect(formatAuditValue(Array.from({ length: 10 }, (_, i) => i))).toBe("0, 1, 2, 3, 4, 5, 6, 7, … (10 in all)");
    expect(formatAuditValue("")).toBe("(empty)");
    expect(formatAuditValue({ a: 1, b: 2 })).toBe("2 fields");
    expect(fieldLabel("primaryScorerId")).toBe("Primary scorer ID");
    expect(fieldLabel("sha256")).toBe("SHA-256");
    expect(fieldLabel("hasGPS")).toBe("Has GPS");
  });

  it("has nothing to show for an event hidden from a blind scorer", () => {
    const event = { trialId: "t1", userId: "other", summary: "Score 2.5 %", before: { areaPercent: 1 }, after: { areaPercent: 2.5 } };
    const seen = auditEventForViewer(event, { userId: "me", blindTrialIds: new Set(["t1"]) });
    expect(seen.hidden).toBe(true);
    expect(auditChanges(seen.before, seen.after)).toEqual([]);
  });
});
