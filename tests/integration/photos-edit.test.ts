// Looking after recorded photos through the server actions (same chain as the browser): acknowledge a
// capture-time warning with a note, move a photo within its trial, delete it (asking first when scores
// or marks were made on it; files removed now or by the sweep), each audited, each refused for a
// concluded trial with the lock message, and the note hidden from blind scorers.
import { and, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { acknowledgeCheckAction, deletePhotoAction, movePhotoAction } from "@/app/_actions/photos";
import { saveScoreAction } from "@/app/_actions/scores";
import { sweepOrphanPhotos } from "@/db/jobs/photos";
import { deletePhoto } from "@/db/queries/photo-edits";
import { listInspectionPhotos, referenceTime } from "@/db/queries/photos";
import { BLIND_HIDDEN, photoInListForViewer } from "@/lib/trials/access";
import { describeDeletion } from "@/lib/photos/photo-edits";
import { labPrefix } from "@/storage/keys";
import { headObject, listKeys } from "@/storage/objects";
import { createTestLab, type TestLab } from "../support/db";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { createReadyPhoto, createScoringTrial, squareFace, type ScoringTrial } from "./scoring-fixtures";

let s3: S3Fake;
let lab: TestLab;
let t: ScoringTrial;
let otherTrial: ScoringTrial;

beforeAll(async () => {
  s3 = await ensureS3Fake();
  lab = await createTestLab("Photo care");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id, specimens: 3, days: [0, 7, 14] });
  otherTrial = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, specimens: 1, days: [0] });
});
afterAll(async () => {
  await closeDb();
  await s3?.stop();
});

async function photoAt(inspection: number, specimen: number, over: Partial<typeof s.photos.$inferInsert> = {}) {
  const made = await createReadyPhoto({ labId: lab.labId, trialId: t.trialId, inspectionId: t.inspectionIds[inspection], specimenId: t.specimenIds[specimen], uploadedBy: lab.users.technician.id, width: 400, height: 300 });
  if (Object.keys(over).length) await db.update(s.photos).set(over).where(eq(s.photos.id, made.photoId));
  return made;
}
const row = async (id: string) => (await db.select().from(s.photos).where(eq(s.photos.id, id)))[0] ?? null;
const audits = async (entityId: string) => db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, lab.labId), eq(s.auditEvents.entityId, entityId)));
const inspection = async (i: number) => (await db.select().from(s.inspections).where(eq(s.inspections.id, t.inspectionIds[i])))[0];

/** EXIF wall-clock text at UTC+01:00 for an instant (EXIF 2.32 "YYYY:MM:DD HH:MM:SS", from memory). */
function exifAtPlusOne(at: Date) {
  const x = new Date(at.getTime() + 3_600_000).toISOString();
  return `${x.slice(0, 10).replace(/-/g, ":")} ${x.slice(11, 19)}`;
}

describe("acknowledging a capture-time warning", () => {
  it("stores the note with who and when, audits it, and shows the warning as acknowledged", async () => {
    const insp = await inspection(1);
    // Three days before the done time: far outside the default tolerance.
    const p = await photoAt(1, 0, { capturedAtRaw: exifAtPlusOne(new Date(insp.doneAt!.getTime() - 3 * 86_400_000)), capturedOffset: "+01:00" });
    const empty = await acknowledgeCheckAction.withIdentity(lab.as("technician"), { photoId: p.photoId, note: "   " });
    expect(empty.ok).toBe(false);
    expect(empty.errors?.note?.[0]).toMatch(/Say why/);
    expect((await row(p.photoId))!.checkAckNote).toBeNull();
    expect((await acknowledgeCheckAction.withIdentity(lab.as("observer"), { photoId: p.photoId, note: "fine" })).code).toBe("forbidden");

    const r = await acknowledgeCheckAction.withIdentity(lab.as("technician"), { photoId: p.photoId, note: "Camera clock was three days behind; photo taken at the inspection." });
    expect(r.ok).toBe(true);
    const after = (await row(p.photoId))!;
    expect(after.checkAckNote).toBe("Camera clock was three days behind; photo taken at the inspection.");
    expect(after.checkAckBy).toBe(lab.users.technician.id);
    expect(after.checkAckAt).toBeInstanceOf(Date);
    const ev = (await audits(p.photoId)).find((e) => e.action === "update");
    expect(ev?.summary).toMatch(/acknowledged/);
    expect((ev?.after as { checkAckNote: string; warning: string }).warning).toMatch(/Wrong card or wrong day\?/);
    expect(ev?.trialId).toBe(t.trialId);

    const listed = await listInspectionPhotos({ labId: lab.labId, inspectionId: insp.id, role: "researcher", reference: referenceTime(insp) });
    const seen = listed.find((x) => x.id === p.photoId)!;
    expect(seen.check?.status).toBe("far");
    const [tech] = await db.select({ name: s.users.name }).from(s.users).where(eq(s.users.id, lab.users.technician.id));
    expect(seen.checkAck).toMatchObject({ note: after.checkAckNote, by: tech.name });
    // A blind scorer sees that it was acknowledged, not what was written (it may name jars or treatments).
    const blind = photoInListForViewer(seen, { blind: true });
    expect(blind.checkAck).toEqual({ note: BLIND_HIDDEN, by: null, at: seen.checkAck!.at });
  });

  it("refuses a photo whose capture time raised no warning", async () => {
    const insp = await inspection(1);
    const p = await photoAt(1, 1, { capturedAtRaw: exifAtPlusOne(insp.doneAt!), capturedOffset: "+01:00" });
    const r = await acknowledgeCheckAction.withIdentity(lab.as("technician"), { photoId: p.photoId, note: "ok" });
    expect(r).toMatchObject({ ok: false, code: "conflict" });
    expect(r.message).toMatch(/raised no warning/);
  });
});

describe("moving a photo", () => {
  it("moves to another specimen and inspection of the trial, audits it and clears the old acknowledgement", async () => {
    const insp = await inspection(1);
    const p = await photoAt(1, 0, { capturedAtRaw: exifAtPlusOne(new Date(insp.doneAt!.getTime() - 7 * 86_400_000)), capturedOffset: "+01:00", checkAckNote: "old", checkAckBy: lab.users.technician.id, checkAckAt: new Date() });
    const r = await movePhotoAction.withIdentity(lab.as("technician"), { photoId: p.photoId, inspectionId: t.inspectionIds[0], specimenId: t.specimenIds[2] });
    expect(r.ok).toBe(true);
    expect(r.message).toMatch(/moved to SC-.*-3 at day 0/);
    const after = (await row(p.photoId))!;
    expect([after.inspectionId, after.specimenId, after.checkAckNote, after.checkAckBy]).toEqual([t.inspectionIds[0], t.specimenIds[2], null, null]);
    const ev = (await audits(p.photoId)).find((e) => e.action === "update")!;
    expect(ev.before).toMatchObject({ inspectionId: t.inspectionIds[1], specimenId: t.specimenIds[0], checkAckNote: "old" });
    expect(ev.after).toMatchObject({ inspectionId: t.inspectionIds[0], specimenId: t.specimenIds[2] });
  });

  it("refuses another trial's inspection, a specimen not in the trial, and the place it already has, changing nothing", async () => {
    const p = await photoAt(2, 0);
    const before = await row(p.photoId);
    const foreign = await movePhotoAction.withIdentity(lab.as("technician"), { photoId: p.photoId, inspectionId: otherTrial.inspectionIds[0], specimenId: t.specimenIds[0] });
    expect(foreign).toMatchObject({ ok: false, code: "invalid" });
    expect(foreign.errors?.inspectionId?.[0]).toMatch(/inspection of this trial/);
    const notPlaced = await movePhotoAction.withIdentity(lab.as("technician"), { photoId: p.photoId, inspectionId: t.inspectionIds[2], specimenId: otherTrial.specimenIds[0] });
    expect(notPlaced).toMatchObject({ ok: false, code: "invalid" });
    expect(notPlaced.errors?.specimenId?.[0]).toMatch(/placed in the trial/);
    const same = await movePhotoAction.withIdentity(lab.as("technician"), { photoId: p.photoId, inspectionId: t.inspectionIds[2], specimenId: t.specimenIds[0] });
    expect(same).toMatchObject({ ok: false, code: "invalid" });
    expect(await row(p.photoId)).toEqual(before);
  });

  it("refuses to move a photo with a score and marks on it, saying why", async () => {
    const p = await photoAt(2, 1);
    const saved = await saveScoreAction.withIdentity(lab.as("technician"), {
      trialId: t.trialId, photoId: p.photoId, spotCount: "1", areaPercent: "1", astmLetter: "S", silicateChange: "none", notes: "",
      areaSource: "marks", face: JSON.stringify(squareFace(100, 100, 100)), marks: JSON.stringify([{ kind: "polygon", points: squareFace(120, 120, 10) }]),
    });
    expect(saved.ok).toBe(true);
    const r = await movePhotoAction.withIdentity(lab.as("technician"), { photoId: p.photoId, inspectionId: t.inspectionIds[2], specimenId: t.specimenIds[2] });
    expect(r).toMatchObject({ ok: false, code: "conflict" });
    expect(r.message).toBe(`This photo cannot be moved: 1 score and 2 marks made on it belong to ${(await db.select().from(s.specimens).where(eq(s.specimens.id, t.specimenIds[1])))[0].label} at day 14, and moving it would attach them to the wrong specimen or day. Delete the photo (its scores stay recorded) and upload it again where it belongs.`);
    expect((await row(p.photoId))!.specimenId).toBe(t.specimenIds[1]);
  });
});

describe("deleting a photo", () => {
  it("deletes a photo without work at once: row, files and an audit event", async () => {
    const p = await photoAt(0, 0);
    const keys = [p.objectKey, p.displayKey];
    expect(await headObject(keys[0])).not.toBeNull();
    expect((await deletePhotoAction.withIdentity(lab.as("observer"), { photoId: p.photoId })).code).toBe("forbidden");
    const r = await deletePhotoAction.withIdentity(lab.as("technician"), { photoId: p.photoId });
    expect(r).toMatchObject({ ok: true, message: "Photo deleted." });
    expect(await row(p.photoId)).toBeNull();
    for (const k of keys) expect(await headObject(k)).toBeNull();
    const ev = (await audits(p.photoId)).find((e) => e.action === "delete")!;
    expect(ev.before).toMatchObject({ objectKey: p.objectKey, specimenId: t.specimenIds[0] });
    expect(ev.after).toEqual({ scoresKept: 0, marksDeleted: 0 });
  });

  it("asks first when a score and marks were made on it; then keeps the score without the photo and deletes the marks", async () => {
    const p = await photoAt(0, 1);
    await saveScoreAction.withIdentity(lab.as("technician"), {
      trialId: t.trialId, photoId: p.photoId, spotCount: "1", areaPercent: "1", astmLetter: "S", silicateChange: "slight", notes: "kept",
      areaSource: "marks", face: JSON.stringify(squareFace(100, 100, 100)), marks: JSON.stringify([{ kind: "polygon", points: squareFace(120, 120, 10) }]),
    });
    const [score] = await db.select().from(s.scores).where(eq(s.scores.photoId, p.photoId));
    const label = (await db.select().from(s.specimens).where(eq(s.specimens.id, t.specimenIds[1])))[0].label;
    const ask = await deletePhotoAction.withIdentity(lab.as("technician"), { photoId: p.photoId });
    expect(ask).toMatchObject({ ok: false, code: "conflict" });
    // The same words the page shows before asking.
    expect(ask.message).toBe(`${describeDeletion({ scores: 1, marks: 2, specimenLabel: label, dayNumber: 0 })} Tick the box to confirm, then delete again.`);
    expect(ask.message).toContain(`1 score was made on this photo. It stays recorded for ${label} at day 0 with its area, grades and notes, but no longer points to a photo; the 2 marks drawn on it`);
    expect(await row(p.photoId)).not.toBeNull();

    const r = await deletePhotoAction.withIdentity(lab.as("technician"), { photoId: p.photoId, confirmScores: "on" });
    expect(r.ok).toBe(true);
    expect(r.message).toBe("Photo deleted. The score made on it stays recorded without the photo.");
    expect(await row(p.photoId)).toBeNull();
    const [kept] = await db.select().from(s.scores).where(eq(s.scores.id, score.id));
    expect(kept).toMatchObject({ photoId: null, areaPercent: 1, astmLetter: "S", silicateChange: "slight", notes: "kept" });
    expect(await db.select().from(s.marks).where(eq(s.marks.photoId, p.photoId))).toEqual([]);
    const scoreEv = (await audits(score.id)).find((e) => e.summary?.includes("was deleted"));
    expect(scoreEv?.after).toEqual({ photoId: null });
  });

  it("leaves the files to the sweep when storage cannot remove them now", async () => {
    const p = await photoAt(2, 2);
    const r = await deletePhoto({ actor: { labId: lab.labId, userId: lab.users.technician.id }, photoId: p.photoId, confirmScores: false, removeFiles: async () => { throw new Error("storage down"); } });
    expect(r.filesRemoved).toBe(false);
    expect(await row(p.photoId)).toBeNull();
    expect(await headObject(p.objectKey)).not.toBeNull();
    // No row owns the folder any longer, so the sweep removes it (age limit 0 here, 1 h in service).
    const swept = await sweepOrphanPhotos({ olderThanMs: -1, prefix: labPrefix(lab.labId), enqueue: async () => undefined });
    expect(swept.deleted).toEqual(expect.arrayContaining([p.objectKey, p.displayKey]));
    expect(await headObject(p.objectKey)).toBeNull();
  });
});

describe("a concluded trial", () => {
  it("refuses acknowledging, moving and deleting with the lock message, changing nothing", async () => {
    const insp = await inspection(1);
    const p = await photoAt(1, 2, { capturedAtRaw: exifAtPlusOne(new Date(insp.doneAt!.getTime() - 3 * 86_400_000)), capturedOffset: "+01:00" });
    const concludedAt = new Date(Date.UTC(2026, 10, 20, 12));
    await db.update(s.trials).set({ status: "concluded", concludedAt }).where(eq(s.trials.id, t.trialId));
    try {
      const before = await row(p.photoId);
      const answers = [
        await acknowledgeCheckAction.withIdentity(lab.as("technician"), { photoId: p.photoId, note: "late note" }),
        await movePhotoAction.withIdentity(lab.as("technician"), { photoId: p.photoId, inspectionId: t.inspectionIds[0], specimenId: t.specimenIds[2] }),
        await deletePhotoAction.withIdentity(lab.as("lead"), { photoId: p.photoId, confirmScores: "on" }),
      ];
      for (const a of answers) {
        expect(a).toMatchObject({ ok: false, code: "locked", message: "This trial was concluded on 2026-11-20 and its record is locked. Only notes can be added." });
      }
      expect(await row(p.photoId)).toEqual(before);
      expect(await headObject(p.objectKey)).not.toBeNull();
    } finally {
      await db.update(s.trials).set({ status: "running", concludedAt: null }).where(eq(s.trials.id, t.trialId));
    }
  });

  it("keeps every file of the lab's remaining photos in storage", async () => {
    const left = await db.select({ key: s.photos.objectKey }).from(s.photos).where(and(eq(s.photos.labId, lab.labId), inArray(s.photos.trialId, [t.trialId])));
    const stored = new Set(await listKeys(labPrefix(lab.labId)));
    for (const r of left) expect(stored.has(r.key)).toBe(true);
  });
});
