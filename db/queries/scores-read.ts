import "server-only";
// Reading what the score page needs: the trial, inspection, specimen, photos with signed display
// URLs, the caller's score and marks, the previous inspection's marks (ghost layer), and first rust.
import { and, asc, desc, eq, inArray, lt, sql } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import type { Mark, Point } from "@/lib/scoring/geometry";
import { photoUrl } from "@/storage/photo-urls";
import { db } from "../client";
import { chambers, inspections, marks, photos, placements, scores, specimens, treatments, users } from "../schema";
import { loadSpecimenOutcomes } from "./analysis";
import { getTrial, getTrialAccess } from "./trial-access";

type PhotoRow = typeof photos.$inferSelect;

export type PhotoForScoring = {
  id: string;
  url: string | null;
  /** Original-image size: marks are stored in these pixel coordinates. */
  width: number | null;
  height: number | null;
  filename: string;
  capturedAt: Date | null;
};

async function photoForScoring(p: PhotoRow): Promise<PhotoForScoring> {
  return { id: p.id, url: await photoUrl(p), width: p.width, height: p.height, filename: p.filename, capturedAt: p.capturedAt };
}

/** The caller's face outline and spot marks on one photo, in paint order. */
export async function marksOnPhoto({ labId, photoId, scorerId }: { labId: string; photoId: string; scorerId: string }) {
  const rows = await db.select({ role: marks.role, geometry: marks.geometry }).from(marks)
    .where(and(eq(marks.labId, labId), eq(marks.photoId, photoId), eq(marks.scorerId, scorerId))).orderBy(asc(marks.seq));
  const faceRow = rows.find((r) => r.role === "face");
  const face: Point[] | null = faceRow && "points" in faceRow.geometry ? faceRow.geometry.points : null;
  return { face, marks: rows.filter((r) => r.role === "spot").map((r) => r.geometry as Mark) };
}

/** A photo of the caller's lab, or a 404. */
export async function getLabPhoto({ labId, photoId }: { labId: string; photoId: string }) {
  const [photo] = await db.select().from(photos).where(and(eq(photos.id, photoId), eq(photos.labId, labId)));
  if (!photo) throw new AppError("not-found", "That photo does not exist.");
  return photo;
}

/** Treatment and chamber of a specimen in a trial at a time: the placement open then, else its latest before. */
async function placementOf(labId: string, trialId: string, specimenId: string, at: Date) {
  const [row] = await db
    .select({ treatment: treatments.name, chamber: chambers.name })
    .from(placements)
    .innerJoin(treatments, eq(treatments.id, placements.treatmentId))
    .innerJoin(chambers, eq(chambers.id, placements.chamberId))
    .where(and(eq(placements.labId, labId), eq(placements.trialId, trialId), eq(placements.specimenId, specimenId)))
    .orderBy(sql`(${placements.fromAt} is null or ${placements.fromAt} <= ${at.toISOString()}::timestamptz) desc`, desc(placements.fromAt))
    .limit(1);
  return row ?? null;
}

export type ScorePageInput = { labId: string; userId: string; trialId: string; inspectionId: string; specimenId: string; photoId?: string };

export async function getScorePage(input: ScorePageInput) {
  const { labId, userId, trialId, inspectionId, specimenId } = input;
  const { trial, access } = await getTrialAccess({ labId, trialId, userId });
  const [inspection] = await db.select().from(inspections).where(and(eq(inspections.id, inspectionId), eq(inspections.labId, labId), eq(inspections.trialId, trialId)));
  if (!inspection) throw new AppError("not-found", "That inspection does not exist in this trial.");
  const [specimen] = await db.select({ id: specimens.id, label: specimens.label, materialClass: specimens.materialClass, face: specimens.face })
    .from(specimens).where(and(eq(specimens.id, specimenId), eq(specimens.labId, labId)));
  const placed = specimen ? await placementOf(labId, trialId, specimenId, inspection.doneAt ?? inspection.plannedAt) : null;
  if (!specimen || !placed) throw new AppError("not-found", "That specimen is not in this trial.");
  // A blind scorer sees the specimen and their own work, never its arm or anyone else's score.
  const placement = access.blind ? null : placed;

  const allScores = await db
    .select({ score: scores, scorerName: users.name })
    .from(scores)
    .leftJoin(users, eq(users.id, scores.scorerId))
    .where(and(eq(scores.labId, labId), eq(scores.inspectionId, inspectionId), eq(scores.specimenId, specimenId)))
    .orderBy(asc(scores.createdAt));
  const pairScores = access.blind ? allScores.filter((r) => r.score.scorerId === userId) : allScores;
  const mine = pairScores.find((r) => r.score.scorerId === userId)?.score ?? null;
  const record = pairScores.find((r) => r.score.isRecord) ?? null;

  const photoRows = await db.select().from(photos)
    .where(and(eq(photos.labId, labId), eq(photos.specimenId, specimenId), eq(photos.inspectionId, inspectionId), eq(photos.status, "ready")))
    .orderBy(desc(photos.createdAt));
  // The photo asked for, else the one the caller scored on, else the one the record was scored on, else the newest.
  const chosen = [input.photoId, mine?.photoId, record?.score.photoId].map((id) => photoRows.find((p) => p.id === id)).find(Boolean) ?? photoRows[0] ?? null;
  // Read-only viewers see the marks behind the score of record when it was made on this photo.
  const recordScorer = record?.score.scorerId && record.score.photoId === chosen?.id ? record.score.scorerId : null;

  const [myMarks, recordMarks, previous, firstRust, photoList] = await Promise.all([
    chosen ? marksOnPhoto({ labId, photoId: chosen.id, scorerId: userId }) : Promise.resolve({ face: null, marks: [] as Mark[] }),
    chosen && recordScorer ? marksOnPhoto({ labId, photoId: chosen.id, scorerId: recordScorer }) : Promise.resolve({ face: null, marks: [] as Mark[] }),
    previousOwnScore({ labId, trialId, specimenId, userId, before: inspection.plannedAt }),
    // The comparison's own derivation (one outcome per placement), so both screens show the same interval.
    access.blind ? Promise.resolve(null) : loadSpecimenOutcomes({ labId, trial, specimenId }).then((r) => r.outcomes),
    Promise.all(photoRows.map(async (p) => ({ id: p.id, filename: p.filename, thumbUrl: await photoUrl(p, "thumb") }))),
  ]);
  return {
    trial, access, inspection, specimen, placement,
    photo: chosen ? await photoForScoring(chosen) : null,
    photos: photoList,
    mine, myMarks, recordMarks, record, pairScores, previous, firstRust,
  };
}

/**
 * The caller's own score at the latest earlier inspection of this specimen, with the marks on its
 * photo and that photo's size (the ghost layer is scaled if the frames differ).
 */
async function previousOwnScore(input: { labId: string; trialId: string; specimenId: string; userId: string; before: Date }) {
  const [row] = await db
    .select({ score: scores, dayNumber: inspections.dayNumber })
    .from(scores)
    .innerJoin(inspections, eq(inspections.id, scores.inspectionId))
    .where(and(eq(scores.labId, input.labId), eq(scores.trialId, input.trialId), eq(scores.specimenId, input.specimenId),
      eq(scores.scorerId, input.userId), lt(inspections.plannedAt, input.before)))
    .orderBy(desc(inspections.plannedAt))
    .limit(1);
  if (!row) return null;
  let ghost: { face: Point[] | null; marks: Mark[]; width: number | null; height: number | null } | null = null;
  if (row.score.photoId) {
    const [p] = await db.select({ width: photos.width, height: photos.height }).from(photos).where(and(eq(photos.id, row.score.photoId), eq(photos.labId, input.labId)));
    const m = await marksOnPhoto({ labId: input.labId, photoId: row.score.photoId, scorerId: input.userId });
    if (p && (m.face || m.marks.length)) ghost = { ...m, width: p.width, height: p.height };
  }
  return { score: row.score, dayNumber: row.dayNumber, ghost };
}

/** Specimens of a trial at one inspection, with photo counts, the caller's score and the record. */
export async function listInspectionScoring({ labId, userId, trialId, inspectionId }: { labId: string; userId: string; trialId: string; inspectionId: string }) {
  const trial = await getTrial({ labId, trialId });
  const [inspection] = await db.select().from(inspections).where(and(eq(inspections.id, inspectionId), eq(inspections.labId, labId), eq(inspections.trialId, trialId)));
  if (!inspection) throw new AppError("not-found", "That inspection does not exist in this trial.");
  const placed = await db
    .selectDistinctOn([specimens.label], { specimenId: specimens.id, label: specimens.label, treatment: treatments.name, chamber: chambers.name })
    .from(placements)
    .innerJoin(specimens, eq(specimens.id, placements.specimenId))
    .innerJoin(treatments, eq(treatments.id, placements.treatmentId))
    .innerJoin(chambers, eq(chambers.id, placements.chamberId))
    .where(and(eq(placements.labId, labId), eq(placements.trialId, trialId)))
    .orderBy(asc(specimens.label), desc(placements.fromAt));
  const ids = placed.map((p) => p.specimenId);
  const [photoRows, scoreRows] = ids.length === 0 ? [[], []] : await Promise.all([
    db.select({ specimenId: photos.specimenId }).from(photos)
      .where(and(eq(photos.labId, labId), eq(photos.inspectionId, inspectionId), eq(photos.status, "ready"), inArray(photos.specimenId, ids))),
    db.select({ specimenId: scores.specimenId, scorerId: scores.scorerId, isRecord: scores.isRecord, areaPercent: scores.areaPercent, astmGrade: scores.astmGrade, astmLetter: scores.astmLetter })
      .from(scores).where(and(eq(scores.labId, labId), eq(scores.inspectionId, inspectionId))),
  ]);
  const rows = placed.map((p) => ({
    ...p,
    photos: photoRows.filter((r) => r.specimenId === p.specimenId).length,
    mine: scoreRows.find((s) => s.specimenId === p.specimenId && s.scorerId === userId) ?? null,
    record: scoreRows.find((s) => s.specimenId === p.specimenId && s.isRecord) ?? null,
  }));
  return { trial, inspection, rows };
}

/**
 * The next photo of an inspection the caller has not scored, after the given specimen in label order
 * (wrapping round), for "Save and next". The current specimen is never the answer; null when every
 * other specimen with a ready photo has the caller's score.
 */
export async function nextUnscoredPhoto({ labId, userId, trialId, inspectionId, specimenId }: { labId: string; userId: string; trialId: string; inspectionId: string; specimenId: string }) {
  const [ready, mine] = await Promise.all([
    db.select({ photoId: photos.id, specimenId: photos.specimenId, label: specimens.label, createdAt: photos.createdAt }).from(photos)
      .innerJoin(specimens, eq(specimens.id, photos.specimenId))
      .where(and(eq(photos.labId, labId), eq(photos.trialId, trialId), eq(photos.inspectionId, inspectionId), eq(photos.status, "ready")))
      .orderBy(desc(photos.createdAt)),
    db.select({ specimenId: scores.specimenId }).from(scores)
      .where(and(eq(scores.labId, labId), eq(scores.inspectionId, inspectionId), eq(scores.scorerId, userId))),
  ]);
  const scored = new Set(mine.map((s) => s.specimenId));
  // One photo per specimen: the newest, as the score page opens it.
  const bySpecimen = new Map<string, { photoId: string; specimenId: string; label: string }>();
  for (const r of ready) if (!bySpecimen.has(r.specimenId)) bySpecimen.set(r.specimenId, r);
  const ordered = [...bySpecimen.values()].sort((a, b) => a.label.localeCompare(b.label, undefined, { numeric: true }));
  const here = ordered.findIndex((r) => r.specimenId === specimenId);
  const rotated = here < 0 ? ordered : [...ordered.slice(here + 1), ...ordered.slice(0, here)];
  return rotated.find((r) => r.specimenId !== specimenId && !scored.has(r.specimenId)) ?? null;
}
