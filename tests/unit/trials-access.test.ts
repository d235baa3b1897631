// The one view rule for trials (lib/trials/access) and the lock check (lib/trials/lock).
import { describe, expect, it } from "vitest";
import { AppError } from "@/lib/auth/errors";
import { BLIND_HIDDEN, assertResultsVisible, auditEventForViewer, hideArms, hideArmsOfTrials, photoForBlindViewer, photoInListForViewer, trialAccess } from "@/lib/trials/access";
import { assertWritable, lockedError } from "@/lib/trials/lock";

const trial = (status: "draft" | "running" | "concluded") => ({ id: "t1", status, primaryScorerId: "u-primary" });

describe("trialAccess", () => {
  it("names the scorer role and is blind only while the trial is not concluded", () => {
    expect(trialAccess(trial("running"), { userId: "u-primary", assignment: { blind: false } })).toMatchObject({ scorerRole: "primary", blind: false, locked: false });
    expect(trialAccess(trial("running"), { userId: "u2", assignment: { blind: false } })).toMatchObject({ scorerRole: "open", blind: false });
    expect(trialAccess(trial("running"), { userId: "u3", assignment: { blind: true } })).toMatchObject({ scorerRole: "blind", blind: true });
    expect(trialAccess(trial("draft"), { userId: "u3", assignment: { blind: true } })).toMatchObject({ scorerRole: "blind", blind: true });
    expect(trialAccess(trial("concluded"), { userId: "u3", assignment: { blind: true } })).toMatchObject({ scorerRole: "blind", blind: false, locked: true });
    expect(trialAccess(trial("running"), { userId: "u4", assignment: null })).toMatchObject({ scorerRole: null, blind: false });
  });

  it("refuses results to a blind viewer with a plain sentence", () => {
    expect(() => assertResultsVisible({ blind: true })).toThrow(/hidden from blind scorers until the trial is concluded/);
    expect(() => assertResultsVisible({ blind: false })).not.toThrow();
  });
});

describe("hiding arms", () => {
  const rows = [
    { label: "S-3", armId: "a2", armLabel: "Jar B / Wax", chamberName: "Jar B", treatmentName: "Wax", reason: "Random allocation (seed \"x\")" },
    { label: "S-1", armId: "a1", armLabel: "Jar A / Bare", chamberName: "Jar A", treatmentName: "Bare", reason: "" },
    { label: "S-2", armId: "a2", armLabel: "Jar B / Wax", chamberName: "Jar B", treatmentName: "Wax", reason: "moved to Jar B" },
  ];
  it("empties every arm field and puts the rows in label order for a blind viewer", () => {
    const hidden = hideArms(rows, true);
    expect(hidden.map((r) => r.label)).toEqual(["S-1", "S-2", "S-3"]);
    for (const r of hidden) expect(r).toMatchObject({ armId: null, armLabel: null, chamberName: null, treatmentName: null, reason: BLIND_HIDDEN });
  });
  it("keeps rows and order for everyone else", () => {
    expect(hideArms(rows, false)).toEqual(rows);
  });
  it("hides only the trials the viewer scores blind in a history that spans trials", () => {
    const out = hideArmsOfTrials([{ trialId: "t1", chamberName: "Jar A" }, { trialId: "t2", chamberName: "Jar B" }], new Set(["t2"]));
    expect(out[0].chamberName).toBe("Jar A");
    expect(out[1]).toMatchObject({ chamberName: null, blinded: true });
  });
});

describe("audit events and photos for a blind viewer", () => {
  const event = { userId: "other", trialId: "t1", summary: "S-1 moved to Jar B / Wax: cracked", before: { a: 1 }, after: { b: 2 } };
  it("keeps who and when but not what, for other people's events of a blind trial", () => {
    expect(auditEventForViewer(event, { userId: "me", blindTrialIds: new Set(["t1"]) })).toMatchObject({ summary: BLIND_HIDDEN, before: null, after: null, hidden: true });
    expect(auditEventForViewer({ ...event, userId: "me" }, { userId: "me", blindTrialIds: new Set(["t1"]) })).toMatchObject({ summary: event.summary, hidden: false });
    expect(auditEventForViewer(event, { userId: "me", blindTrialIds: new Set() })).toMatchObject({ summary: event.summary, hidden: false });
  });
  it("drops the specimen, file name and inspection of a photo", () => {
    const view = photoForBlindViewer({ id: "p1", specimenId: "s1", specimenLabel: "S-1", filename: "S-1 day 7.jpg", inspectionId: "i1" });
    expect(view).toMatchObject({ id: "p1", specimenId: null, specimenLabel: null, inspectionId: null, filename: BLIND_HIDDEN });
    expect(JSON.stringify(view)).not.toContain("S-1");
  });

  it("drops the file name and uploader from a blind scorer's list of an inspection's photos", () => {
    const photo = { id: "p2", specimenId: "s1", specimenLabel: "S-1", filename: "jarB-wax-S-1.jpg", uploadedBy: "Ada" };
    expect(photoInListForViewer(photo, { blind: true })).toEqual({ ...photo, filename: BLIND_HIDDEN, uploadedBy: null });
    expect(photoInListForViewer(photo, { blind: false })).toBe(photo);
  });
});

describe("the lock", () => {
  it("one message for every concluded trial, and stage checks", () => {
    const concluded = { status: "concluded" as const, concludedAt: new Date("2026-11-30T10:00:00Z") };
    expect(() => assertWritable(concluded)).toThrow("This trial was concluded on 2026-11-30 and its record is locked. Only notes can be added.");
    expect(lockedError(concluded)).toBeInstanceOf(AppError);
    expect(() => assertWritable({ status: "running", concludedAt: null }, "draft")).toThrow(/fixed once a trial is running/);
    expect(() => assertWritable({ status: "draft", concludedAt: null }, "running")).toThrow(/needs a running trial/);
    expect(() => assertWritable({ status: "running", concludedAt: null }, "running")).not.toThrow();
  });
});
