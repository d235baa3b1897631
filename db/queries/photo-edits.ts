import "server-only";
// Looking after a recorded photo: acknowledge its capture-time warning with a note, move it to
// another inspection or specimen of the same trial, or delete it. Each is one transaction with its
// audit events, under the trial's share lock (a concluded trial refuses with the lock message).
import { and, asc, count, eq, inArray } from "drizzle-orm";
import { recordAudit } from "@/db/audit";
import { db, type DbOrTx, type Tx } from "@/db/client";
import { inspections, marks, photos, placements, scores, specimens } from "@/db/schema";
import { formatDate } from "@/lib/format";
import { AppError } from "@/lib/auth/errors";
import { checkCaptureTime } from "@/lib/photos/capture-check";
import { readPhotoConfig } from "@/lib/photos/config";
import { describeDeletion, describeMoveRefusal, hasWork, type PhotoWork } from "@/lib/photos/photo-edits";
import { assertWritable } from "@/lib/trials/lock";
import { deleteKeys } from "@/storage/objects";
import { isSpecimenPlaced, referenceTime } from "./photos";
import { lockTrial } from "./trial-access";

type Actor = { labId: string; userId: string };
type PhotoRow = typeof photos.$inferSelect;

const noPhoto = () => new AppError("not-found", "No such photo in this lab.");

/**
 * The photo, locked for update, with its trial share-locked and checked writable. The trial is locked
 * first, then the photo: the order every trial writer takes (control points, scores), so two writers
 * never wait on each other in opposite orders.
 */
export async function lockPhotoAndTrial(tx: Tx, actor: Actor, photoId: string) {
  const [found] = await tx.select({ trialId: photos.trialId }).from(photos).where(and(eq(photos.id, photoId), eq(photos.labId, actor.labId)));
  if (!found?.trialId) throw noPhoto();
  const trial = await lockTrial(tx, actor.labId, found.trialId, "share");
  assertWritable(trial);
  const [p] = await tx.select().from(photos).where(and(eq(photos.id, photoId), eq(photos.labId, actor.labId), eq(photos.trialId, found.trialId))).for("update");
  if (!p) throw noPhoto();
  return { photo: p as PhotoRow & { trialId: string }, trial };
}

async function lockPhoto(tx: Tx, actor: Actor, photoId: string): Promise<PhotoRow & { trialId: string }> {
  return (await lockPhotoAndTrial(tx, actor, photoId)).photo;
}

/** Scores and marks made on one photo, with the specimen and day they belong to. */
export async function photoWork(q: DbOrTx, { labId, photoId }: { labId: string; photoId: string }): Promise<PhotoWork> {
  const [row] = await q.select({ label: specimens.label, dayNumber: inspections.dayNumber }).from(photos)
    .innerJoin(specimens, eq(specimens.id, photos.specimenId))
    .leftJoin(inspections, eq(inspections.id, photos.inspectionId))
    .where(and(eq(photos.id, photoId), eq(photos.labId, labId)));
  if (!row) throw noPhoto();
  const [[s], [m]] = await Promise.all([
    q.select({ n: count() }).from(scores).where(and(eq(scores.labId, labId), eq(scores.photoId, photoId))),
    q.select({ n: count() }).from(marks).where(and(eq(marks.labId, labId), eq(marks.photoId, photoId))),
  ]);
  return { scores: Number(s.n), marks: Number(m.n), specimenLabel: row.label, dayNumber: row.dayNumber };
}

/** Work on several photos at once (the photo page asks before deleting). */
export async function photoWorkCounts({ labId, photoIds }: { labId: string; photoIds: string[] }) {
  const out = new Map<string, { scores: number; marks: number }>();
  if (!photoIds.length) return out;
  const [s, m] = await Promise.all([
    db.select({ photoId: scores.photoId, n: count() }).from(scores).where(and(eq(scores.labId, labId), inArray(scores.photoId, photoIds))).groupBy(scores.photoId),
    db.select({ photoId: marks.photoId, n: count() }).from(marks).where(and(eq(marks.labId, labId), inArray(marks.photoId, photoIds))).groupBy(marks.photoId),
  ]);
  for (const id of photoIds) out.set(id, { scores: 0, marks: 0 });
  for (const r of s) if (r.photoId) out.get(r.photoId)!.scores = Number(r.n);
  for (const r of m) out.get(r.photoId)!.marks = Number(r.n);
  return out;
}

/** Where a photo of the trial may be moved: its inspections and every specimen ever placed in it. */
export async function moveTargets({ labId, trialId }: { labId: string; trialId: string }) {
  const [insp, spec] = await Promise.all([
    db.select({ id: inspections.id, dayNumber: inspections.dayNumber, plannedAt: inspections.plannedAt }).from(inspections)
      .where(and(eq(inspections.labId, labId), eq(inspections.trialId, trialId))).orderBy(asc(inspections.plannedAt)),
    db.selectDistinct({ id: specimens.id, label: specimens.label }).from(placements)
      .innerJoin(specimens, eq(specimens.id, placements.specimenId))
      .where(and(eq(placements.labId, labId), eq(placements.trialId, trialId))),
  ]);
  return {
    inspections: insp.map((i) => ({ id: i.id, label: `Day ${i.dayNumber} (planned ${formatDate(i.plannedAt)})` })),
    specimens: spec.sort((a, b) => a.label.localeCompare(b.label, undefined, { numeric: true })),
  };
}

/** Record that someone looked at the capture-time warning, with their note. Editing the note is allowed. */
export async function acknowledgeCaptureCheck({ actor, photoId, note }: { actor: Actor; photoId: string; note: string }) {
  return db.transaction(async (tx) => {
    const p = await lockPhoto(tx, actor, photoId);
    const [insp] = p.inspectionId ? await tx.select().from(inspections).where(and(eq(inspections.id, p.inspectionId), eq(inspections.labId, actor.labId))) : [];
    if (!insp) throw new AppError("conflict", "This photo belongs to no inspection, so its capture time is not checked.");
    const ref = referenceTime(insp);
    const check = checkCaptureTime({ capturedAtRaw: p.capturedAtRaw, capturedOffset: p.capturedOffset, referenceAt: ref.at, referenceKind: ref.kind, toleranceH: readPhotoConfig().toleranceH });
    if (check.status !== "far" && check.status !== "no-time") throw new AppError("conflict", "This photo's capture time raised no warning, so there is nothing to acknowledge.");
    const at = new Date();
    await tx.update(photos).set({ checkAckNote: note, checkAckBy: actor.userId, checkAckAt: at }).where(eq(photos.id, p.id));
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "photo", entityId: p.id, trialId: p.trialId, action: "update",
      summary: `Capture-time warning of photo ${p.filename} acknowledged`,
      before: { checkAckNote: p.checkAckNote, checkAckBy: p.checkAckBy, checkAckAt: p.checkAckAt },
      after: { warning: check.message, checkAckNote: note, checkAckBy: actor.userId, checkAckAt: at },
    });
    return { trialId: p.trialId, inspectionId: insp.id };
  });
}

/**
 * Move a photo to another inspection and/or specimen of its trial. The specimen must have been in the
 * trial at that inspection. A photo with scores or marks stays where it is (they would describe the
 * wrong specimen or day). Moving to another inspection clears the acknowledgement of the old warning.
 */
export async function movePhoto({ actor, photoId, inspectionId, specimenId }: { actor: Actor; photoId: string; inspectionId: string; specimenId: string }) {
  return db.transaction(async (tx) => {
    const p = await lockPhoto(tx, actor, photoId);
    if (p.inspectionId === inspectionId && p.specimenId === specimenId) {
      throw new AppError("invalid", "The photo is already filed under that inspection and specimen; nothing was changed.", { inspectionId: ["Choose another inspection or specimen."] });
    }
    const [target] = await tx.select().from(inspections)
      .where(and(eq(inspections.id, inspectionId), eq(inspections.labId, actor.labId), eq(inspections.trialId, p.trialId)));
    if (!target) throw new AppError("invalid", "That inspection is not part of this photo's trial.", { inspectionId: ["Choose an inspection of this trial."] });
    const [spec] = await tx.select({ label: specimens.label }).from(specimens).where(and(eq(specimens.id, specimenId), eq(specimens.labId, actor.labId)));
    const placed = spec && await isSpecimenPlaced({ labId: actor.labId, trialId: p.trialId, specimenId, at: referenceTime(target).at });
    if (!placed) throw new AppError("invalid", `That specimen was not in this trial at day ${target.dayNumber}.`, { specimenId: ["Choose a specimen placed in the trial at that inspection."] });
    const work = await photoWork(tx, { labId: actor.labId, photoId: p.id });
    if (hasWork(work)) throw new AppError("conflict", describeMoveRefusal(work)!);
    const newInspection = p.inspectionId !== inspectionId;
    await tx.update(photos).set({
      inspectionId, specimenId,
      ...(newInspection ? { checkAckNote: null, checkAckBy: null, checkAckAt: null } : {}),
    }).where(eq(photos.id, p.id));
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "photo", entityId: p.id, trialId: p.trialId, action: "update",
      summary: `Photo ${p.filename} moved to ${spec.label} at day ${target.dayNumber}`,
      before: { inspectionId: p.inspectionId, specimenId: p.specimenId, checkAckNote: p.checkAckNote },
      after: { inspectionId, specimenId, checkAckNote: newInspection ? null : p.checkAckNote },
    });
    return { trialId: p.trialId, fromInspectionId: p.inspectionId, inspectionId, specimenLabel: spec.label, dayNumber: target.dayNumber };
  });
}

/**
 * Delete a photo. Marks drawn on it go with it; scores made on it stay (they are the record of that
 * specimen at that inspection) but lose their link to the photo. When there are any, the caller must
 * have confirmed after reading describeDeletion. The stored files are removed after the commit; if
 * storage cannot be reached, no row owns them any longer and the hourly sweep removes them.
 */
export async function deletePhoto({ actor, photoId, confirmScores, removeFiles = deleteKeys }: {
  actor: Actor; photoId: string; confirmScores: boolean; removeFiles?: (keys: string[]) => Promise<void>;
}) {
  const done = await db.transaction(async (tx) => {
    const p = await lockPhoto(tx, actor, photoId);
    const work = await photoWork(tx, { labId: actor.labId, photoId: p.id });
    const impact = describeDeletion(work);
    if (impact && !confirmScores) throw new AppError("conflict", `${impact} Tick the box to confirm, then delete again.`, { confirmScores: ["Confirm what happens to the work on this photo."] });
    const detached = await tx.update(scores).set({ photoId: null, updatedAt: new Date() })
      .where(and(eq(scores.labId, actor.labId), eq(scores.photoId, p.id))).returning({ id: scores.id, scorerId: scores.scorerId, inspectionId: scores.inspectionId, specimenId: scores.specimenId });
    for (const s of detached) {
      await recordAudit(tx, {
        labId: actor.labId, userId: actor.userId, entity: "score", entityId: s.id, trialId: p.trialId, action: "update",
        summary: `Score kept; the photo it was made on (${p.filename}) was deleted`,
        before: { photoId: p.id }, after: { photoId: null },
      });
    }
    await tx.delete(marks).where(and(eq(marks.labId, actor.labId), eq(marks.photoId, p.id)));
    await tx.delete(photos).where(eq(photos.id, p.id));
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "photo", entityId: p.id, trialId: p.trialId, action: "delete",
      summary: `Photo ${p.filename} deleted`,
      before: { filename: p.filename, inspectionId: p.inspectionId, specimenId: p.specimenId, sha256: p.sha256, objectKey: p.objectKey, capturedAtRaw: p.capturedAtRaw, checkAckNote: p.checkAckNote },
      after: { scoresKept: detached.length, marksDeleted: work.marks },
    });
    return { trialId: p.trialId, inspectionId: p.inspectionId, filename: p.filename, keys: [p.objectKey, ...Object.values(p.derivatives)], scoresKept: detached.length, marksDeleted: work.marks };
  });
  let filesRemoved = true;
  try {
    await removeFiles(done.keys);
  } catch (err) {
    filesRemoved = false;
    console.error("[photos] could not remove deleted photo files now; the sweep will:", (err as Error).message);
  }
  return { ...done, filesRemoved };
}
