import "server-only";
// Writing rust scores: marks and score in one transaction with their audit events, and the rule that
// picks the score of record.
import { and, asc, eq, inArray, isNull, ne, sql } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { normalisedBasis, type EstimateColourBasis } from "@/lib/scoring/colour-normalise";
import { astmD610Grade, isoRustDegree } from "@/lib/scoring/grades";
import { rustedAreaPercent, type Mark, type Point } from "@/lib/scoring/geometry";
import type { ConsensusScoreInput, SaveScoreInput } from "@/lib/validation/scores";
import { pickRecord, type RecordCandidate } from "@/lib/scoring/record-rule";
import { assertWritable } from "@/lib/trials/lock";
import { recordAudit } from "../audit";
import { db, type Tx } from "../client";
import { inspections, marks, photos, placements, scores, trials } from "../schema";
import { saveColourPatch } from "./photo-colour";
import { lockTrial, scorerAssignment } from "./trial-access";

export type ScoreActor = { labId: string; userId: string };
type TrialRow = typeof trials.$inferSelect;
type ScoreRow = typeof scores.$inferSelect;

/** The trial of the caller's lab, share-locked so a concurrent "conclude" waits for this write. */
async function writableTrial(tx: Tx, labId: string, trialId: string): Promise<TrialRow> {
  const trial = await lockTrial(tx, labId, trialId, "share");
  assertWritable(trial);
  return trial;
}

/** Inspection and specimen of a score, checked against the lab and the trial (404 otherwise). */
async function resolveTarget(tx: Tx, labId: string, trialId: string, input: { photoId?: string; inspectionId?: string; specimenId?: string }) {
  let photo: typeof photos.$inferSelect | null = null;
  if (input.photoId) {
    [photo] = await tx.select().from(photos).where(and(eq(photos.id, input.photoId), eq(photos.labId, labId)));
    if (!photo) throw new AppError("not-found", "That photo does not exist.");
    if (photo.status !== "ready") throw new AppError("invalid", "That photo is still being processed; score it once it is ready.");
  }
  const inspectionId = input.inspectionId ?? photo?.inspectionId ?? null;
  const specimenId = input.specimenId ?? photo?.specimenId ?? null;
  if (!inspectionId || !specimenId) throw new AppError("invalid", "This photo is not attached to an inspection, so it cannot be scored.");
  if (photo && (photo.inspectionId !== inspectionId || photo.specimenId !== specimenId)) {
    throw new AppError("invalid", "That photo shows another specimen or inspection.", { photoId: ["This photo belongs to another specimen or inspection."] });
  }
  const [inspection] = await tx.select().from(inspections)
    .where(and(eq(inspections.id, inspectionId), eq(inspections.labId, labId), eq(inspections.trialId, trialId)));
  if (!inspection) throw new AppError("not-found", "That inspection does not exist in this trial.");
  const [placed] = await tx.select({ id: placements.id }).from(placements)
    .where(and(eq(placements.labId, labId), eq(placements.trialId, trialId), eq(placements.specimenId, specimenId))).limit(1);
  if (!placed) throw new AppError("not-found", "That specimen is not in this trial.");
  return { photo, inspection, specimenId };
}

/** Serialises writes to one specimen × inspection, so the record rule never races itself. */
async function lockPair(tx: Tx, inspectionId: string, specimenId: string) {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`score:${inspectionId}:${specimenId}`}))`);
}

/** Re-apply the record rule to every specimen × inspection of a trial (after the rule changes). */
export async function applyRecordRuleToTrial(tx: Tx, trial: TrialRow) {
  const rows = await tx.select({ id: scores.id, scorerId: scores.scorerId, blind: scores.blind, inspectionId: scores.inspectionId, specimenId: scores.specimenId })
    .from(scores).where(and(eq(scores.labId, trial.labId), eq(scores.trialId, trial.id))).orderBy(asc(scores.createdAt), asc(scores.id));
  const groups = new Map<string, RecordCandidate[]>();
  for (const r of rows) {
    const key = `${r.inspectionId}|${r.specimenId}`;
    groups.set(key, [...(groups.get(key) ?? []), r]);
  }
  const picks = [...groups.values()].map((g) => pickRecord(g, trial)?.id).filter((id): id is string => !!id);
  // Clear first: the partial unique index allows one record per pair at every statement's end.
  await tx.update(scores).set({ isRecord: false }).where(and(eq(scores.trialId, trial.id), eq(scores.isRecord, true)));
  for (let i = 0; i < picks.length; i += 1000) {
    await tx.update(scores).set({ isRecord: true }).where(inArray(scores.id, picks.slice(i, i + 1000)));
  }
  return picks.length;
}

async function applyRecordRule(tx: Tx, trial: TrialRow, inspectionId: string, specimenId: string): Promise<string | null> {
  const rows = await tx.select({ id: scores.id, scorerId: scores.scorerId, blind: scores.blind }).from(scores)
    .where(and(eq(scores.inspectionId, inspectionId), eq(scores.specimenId, specimenId))).orderBy(asc(scores.createdAt), asc(scores.id));
  const pick = pickRecord(rows, trial);
  await tx.update(scores).set({ isRecord: false })
    .where(and(eq(scores.inspectionId, inspectionId), eq(scores.specimenId, specimenId), eq(scores.isRecord, true), pick ? ne(scores.id, pick.id) : undefined));
  if (pick) await tx.update(scores).set({ isRecord: true }).where(eq(scores.id, pick.id));
  return pick?.id ?? null;
}

function grades(areaPercent: number, letter: string | undefined) {
  return {
    astmGrade: astmD610Grade(areaPercent),
    // A letter describes how rust is distributed; with no rust there is nothing to describe.
    astmLetter: areaPercent > 0 ? (letter ?? null) : null,
    isoDegree: isoRustDegree(areaPercent),
  };
}

/** Replace the caller's face outline and marks on a photo (paint order kept in seq). */
async function replaceMarks(tx: Tx, actor: ScoreActor, trialId: string, photoId: string, face: Point[] | null | undefined, spotMarks: Mark[]) {
  const mine = and(eq(marks.labId, actor.labId), eq(marks.photoId, photoId), eq(marks.scorerId, actor.userId));
  const before = await tx.select({ role: marks.role, geometry: marks.geometry }).from(marks).where(mine).orderBy(asc(marks.seq));
  await tx.delete(marks).where(mine);
  const rows: (typeof marks.$inferInsert)[] = [];
  if (face) rows.push({ labId: actor.labId, photoId, scorerId: actor.userId, role: "face", seq: 0, geometry: { kind: "polygon", points: face } });
  spotMarks.forEach((geometry, i) => rows.push({ labId: actor.labId, photoId, scorerId: actor.userId, role: "spot", seq: i + 1, geometry }));
  if (rows.length) await tx.insert(marks).values(rows);
  if (before.length === 0 && rows.length === 0) return null;
  const areaFromMarks = face ? rustedAreaPercent(face, spotMarks) : null;
  await recordAudit(tx, {
    labId: actor.labId, userId: actor.userId, entity: "marks", entityId: photoId, trialId, action: before.length ? "update" : "create",
    summary: `Marks on a photo: ${before.filter((m) => m.role === "spot").length} → ${spotMarks.length}${face ? ", face outlined" : ""}`,
    before: before.length ? before : null,
    after: { face: face ?? null, marks: spotMarks, areaFromMarksPercent: areaFromMarks },
  });
  return areaFromMarks;
}

/**
 * Save the caller's score for one specimen at one inspection, with their marks on the photo.
 * Everything (marks, score, record flag, audit events) commits together or not at all.
 */
export async function saveScore(actor: ScoreActor, input: SaveScoreInput) {
  return db.transaction(async (tx) => {
    const trial = await writableTrial(tx, actor.labId, input.trialId);
    const { photo, inspection, specimenId } = await resolveTarget(tx, actor.labId, trial.id, input);
    await lockPair(tx, inspection.id, specimenId);
    const assignment = await scorerAssignment(tx, { labId: actor.labId, trialId: trial.id, userId: actor.userId });
    const blind = assignment?.blind ?? false;
    const mine = and(eq(scores.inspectionId, inspection.id), eq(scores.specimenId, specimenId), eq(scores.scorerId, actor.userId));
    const [before] = await tx.select().from(scores).where(mine);

    // Marks first: if the score write fails afterwards, the transaction takes the marks back too.
    if (photo) await replaceMarks(tx, actor, trial.id, photo.id, input.face, input.marks);
    if (photo && input.colourPatch) await saveColourPatch(tx, actor, trial.id, photo, input.colourPatch);
    // The estimate keeps how its pixels were read; no estimate, no basis.
    const autoEstimateColour: EstimateColourBasis | null = input.autoEstimatePercent == null ? null
      : input.estimateNormalised && input.colourPatch ? normalisedBasis(input.colourPatch) : { normalised: false };

    const values = {
      photoId: photo?.id ?? before?.photoId ?? null,
      blind,
      spotCount: input.spotCount,
      areaPercent: input.areaPercent,
      ...grades(input.areaPercent, input.astmLetter),
      autoEstimatePercent: input.autoEstimatePercent ?? null,
      autoEstimateColour,
      areaSource: input.areaSource,
      weeping: input.weeping,
      silicateChange: input.silicateChange,
      noChange: input.noChange,
      notes: input.notes,
      updatedAt: new Date(),
    };
    let score: ScoreRow;
    if (before) {
      [score] = await tx.update(scores).set(values).where(eq(scores.id, before.id)).returning();
    } else {
      [score] = await tx.insert(scores).values({
        ...values, labId: actor.labId, trialId: trial.id, inspectionId: inspection.id, specimenId, scorerId: actor.userId, isRecord: false,
      }).returning();
    }
    const recordId = await applyRecordRule(tx, trial, inspection.id, specimenId);
    score = { ...score, isRecord: recordId === score.id };
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "score", entityId: score.id, action: before ? "update" : "create",
      // No specimen label here: the audit trail is readable by blind scorers too.
      summary: `${before ? "Corrected" : "Recorded"} a ${blind ? "blind " : ""}rust score at day ${inspection.dayNumber}: ${score.areaPercent} %`,
      before: before ?? null,
      after: score,
    });
    return { score, inspection, specimenId, blind };
  });
}

/** A consensus score (no scorer) recorded by a lead or researcher after the scorers discussed. */
export async function saveConsensusScore(actor: ScoreActor, input: ConsensusScoreInput) {
  return db.transaction(async (tx) => {
    const trial = await writableTrial(tx, actor.labId, input.trialId);
    const { inspection, specimenId } = await resolveTarget(tx, actor.labId, trial.id, input);
    await lockPair(tx, inspection.id, specimenId);
    const where = and(eq(scores.inspectionId, inspection.id), eq(scores.specimenId, specimenId), isNull(scores.scorerId));
    const [before] = await tx.select().from(scores).where(where);
    const values = {
      spotCount: input.spotCount, areaPercent: input.areaPercent, ...grades(input.areaPercent, input.astmLetter),
      weeping: input.weeping, silicateChange: input.silicateChange, notes: input.notes, areaSource: "manual", updatedAt: new Date(),
    };
    let score: ScoreRow;
    if (before) [score] = await tx.update(scores).set(values).where(eq(scores.id, before.id)).returning();
    else [score] = await tx.insert(scores).values({ ...values, labId: actor.labId, trialId: trial.id, inspectionId: inspection.id, specimenId, scorerId: null, blind: false, isRecord: false }).returning();
    const recordId = await applyRecordRule(tx, trial, inspection.id, specimenId);
    score = { ...score, isRecord: recordId === score.id };
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "score", entityId: score.id, action: before ? "update" : "create",
      summary: `${before ? "Corrected the" : "Recorded a"} consensus rust score at day ${inspection.dayNumber}: ${score.areaPercent} %`,
      before: before ?? null, after: score,
    });
    return { score, inspection, specimenId };
  });
}
