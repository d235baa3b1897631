import "server-only";
// Protocol points and scale recorded with each photo, the per-series scale, and the scaled areas
// (mm², spot size classes, growth per day) of a trial's scores of record. The maths is
// lib/scoring/scale.ts and lib/scoring/scaled-areas.ts; which protocol points are missing is
// lib/photos/protocol-record.ts.
import { and, asc, eq, inArray } from "drizzle-orm";
import { recordAudit } from "@/db/audit";
import { db } from "@/db/client";
import { inspections, marks, photoEvidence, photos, scores, seriesScales } from "@/db/schema";
import { AppError } from "@/lib/auth/errors";
import { effectivePxPerMm, missingProtocolPoints } from "@/lib/photos/protocol-record";
import type { Mark, Point } from "@/lib/scoring/geometry";
import { areaKey, outcomeAreasMm2, scaleScore, type ScaledScore } from "@/lib/scoring/scaled-areas";
import type { PhotoEvidenceInput } from "@/lib/validation/photo-evidence";
import { lockPhotoAndTrial } from "./photo-edits";

type Actor = { labId: string; userId: string };

export async function savePhotoEvidence({ actor, input }: { actor: Actor; input: PhotoEvidenceInput }) {
  return db.transaction(async (tx) => {
    const { photo: p, trial } = await lockPhotoAndTrial(tx, actor, input.photoId);
    const unknown = input.protocolConfirmed.filter((l) => !trial.photoProtocol.includes(l));
    if (unknown.length) throw new AppError("invalid", "The trial's photo protocol has changed; reload the page and tick again.", { "protocol[]": ["These points are not in the trial's protocol any more."] });
    const [before] = await tx.select().from(photoEvidence).where(and(eq(photoEvidence.photoId, p.id), eq(photoEvidence.labId, actor.labId)));
    const scale = input.mode === "keep" ? { pxPerMm: before?.pxPerMm ?? null, scaleSource: before?.scaleSource ?? null }
      : { pxPerMm: input.scale?.pxPerMm ?? null, scaleSource: input.scale?.source ?? null };
    // A series scale is the series' own; the photo keeps no copy of it.
    const own = input.forSeries ? { pxPerMm: null, scaleSource: null } : scale;
    const values = { protocolConfirmed: input.protocolConfirmed, ...own, recordedBy: actor.userId, updatedAt: new Date() };
    await tx.insert(photoEvidence).values({ photoId: p.id, labId: actor.labId, trialId: p.trialId, ...values })
      .onConflictDoUpdate({ target: photoEvidence.photoId, set: values });
    const missing = missingProtocolPoints(trial.photoProtocol, input.protocolConfirmed);
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "photo_evidence", entityId: p.id, trialId: p.trialId, action: before ? "update" : "create",
      summary: `Photo protocol and scale recorded: ${missing.length ? `${missing.length} protocol point${missing.length === 1 ? "" : "s"} not followed` : "every protocol point followed"}${own.pxPerMm ? `, ${own.pxPerMm.toFixed(2)} px/mm` : ""}`,
      before: before ? { protocolConfirmed: before.protocolConfirmed, pxPerMm: before.pxPerMm, scaleSource: before.scaleSource } : null,
      after: { protocolConfirmed: input.protocolConfirmed, pxPerMm: own.pxPerMm, scaleSource: own.scaleSource },
    });
    if (input.forSeries && input.scale) {
      const key = and(eq(seriesScales.labId, actor.labId), eq(seriesScales.trialId, p.trialId), eq(seriesScales.specimenId, p.specimenId));
      const [old] = await tx.select().from(seriesScales).where(key);
      const set = { pxPerMm: input.scale.pxPerMm, scaleSource: input.scale.source, setBy: actor.userId, updatedAt: new Date() };
      const [row] = await tx.insert(seriesScales).values({ labId: actor.labId, trialId: p.trialId, specimenId: p.specimenId, ...set })
        .onConflictDoUpdate({ target: [seriesScales.labId, seriesScales.trialId, seriesScales.specimenId], set }).returning({ id: seriesScales.id });
      await recordAudit(tx, {
        labId: actor.labId, userId: actor.userId, entity: "series_scale", entityId: row.id, trialId: p.trialId, action: old ? "update" : "create",
        summary: `Series scale ${input.scale.pxPerMm.toFixed(2)} px/mm for the photos of the specimen in this trial without their own scale`,
        before: old ? { pxPerMm: old.pxPerMm, scaleSource: old.scaleSource } : null, after: { specimenId: p.specimenId, pxPerMm: input.scale.pxPerMm, scaleSource: input.scale.source },
      });
    }
    return { trialId: p.trialId, inspectionId: p.inspectionId, missing: missing.length, pxPerMm: scale.pxPerMm };
  });
}

export type PhotoEvidenceView = {
  confirmed: string[];
  missing: string[];
  recorded: boolean;
  ownPxPerMm: number | null;
  scale: { pxPerMm: number; from: "photo" | "series" } | null;
  ownSource: (typeof photoEvidence.$inferSelect)["scaleSource"];
};

/** Evidence for photos of one trial (photoIds of that trial only), keyed by photo id. */
export async function loadPhotoEvidence({ labId, trialId, protocol, photoRows }: {
  labId: string; trialId: string; protocol: string[]; photoRows: { id: string; specimenId: string }[];
}): Promise<Map<string, PhotoEvidenceView>> {
  const ids = photoRows.map((p) => p.id);
  const specimenIds = [...new Set(photoRows.map((p) => p.specimenId))];
  const [ev, series] = await Promise.all([
    ids.length ? db.select().from(photoEvidence).where(and(eq(photoEvidence.labId, labId), eq(photoEvidence.trialId, trialId), inArray(photoEvidence.photoId, ids))) : [],
    specimenIds.length
      ? db.select().from(seriesScales).where(and(eq(seriesScales.labId, labId), eq(seriesScales.trialId, trialId), inArray(seriesScales.specimenId, specimenIds)))
      : [],
  ]);
  const evBy = new Map(ev.map((e) => [e.photoId, e]));
  const seriesBy = new Map(series.map((s) => [s.specimenId, s.pxPerMm]));
  return new Map(photoRows.map((p) => {
    const e = evBy.get(p.id);
    return [p.id, {
      confirmed: e?.protocolConfirmed ?? [], missing: missingProtocolPoints(protocol, e?.protocolConfirmed), recorded: !!e,
      ownPxPerMm: e?.pxPerMm ?? null, scale: effectivePxPerMm(e?.pxPerMm, seriesBy.get(p.specimenId)), ownSource: e?.scaleSource ?? null,
    }];
  }));
}

export type ScaledRecord = ScaledScore & {
  specimenId: string; inspectionId: string; dayNumber: number; areaPercent: number; spotCount: number; photoId: string | null;
  pxPerMm: number | null;
  /** Protocol points not followed; null when nothing was recorded for the photo (as the photo's own flag says). */
  protocolMissing: string[] | null;
};

type ScoreRowIn = { photoId: string | null; scorerId: string | null; areaPercent: number; photoSpecimenId: string | null };

/**
 * Scores (any scorer's) with their area in mm² and spots by size class: the face outline on the
 * score's photo (the scorer's own, else the first drawn), the scorer's spots, and the photo's scale. Rows of one trial; the result is in the rows' order.
 */
export async function scaleScoreRows({ labId, trialId, protocol = [], rows }: { labId: string; trialId: string; protocol?: string[]; rows: readonly ScoreRowIn[] }) {
  const photoIds = [...new Set(rows.flatMap((r) => (r.photoId ? [r.photoId] : [])))];
  const [evidence, markRows] = await Promise.all([
    loadPhotoEvidence({ labId, trialId, protocol, photoRows: rows.flatMap((r) => (r.photoId && r.photoSpecimenId ? [{ id: r.photoId, specimenId: r.photoSpecimenId }] : [])) }),
    photoIds.length ? db.select({ photoId: marks.photoId, scorerId: marks.scorerId, role: marks.role, geometry: marks.geometry }).from(marks)
      .where(and(eq(marks.labId, labId), inArray(marks.photoId, photoIds))).orderBy(asc(marks.seq), asc(marks.createdAt)) : [],
  ]);
  const byPhoto = new Map<string, typeof markRows>();
  for (const m of markRows) byPhoto.set(m.photoId, [...(byPhoto.get(m.photoId) ?? []), m]);
  return rows.map((r) => {
    const ev = r.photoId ? evidence.get(r.photoId) : undefined;
    const onPhoto = (r.photoId ? byPhoto.get(r.photoId) : undefined) ?? [];
    // The face is the specimen's, whoever outlined it; the spots are the scorer's own.
    const faceRow = onPhoto.find((m) => m.role === "face" && m.scorerId === r.scorerId) ?? onPhoto.find((m) => m.role === "face");
    const face = faceRow && "points" in faceRow.geometry ? (faceRow.geometry.points as Point[]) : null;
    const spots = onPhoto.filter((m) => m.role === "spot" && m.scorerId === (r.scorerId ?? faceRow?.scorerId)).map((m) => m.geometry as Mark);
    const pxPerMm = ev?.scale?.pxPerMm ?? null;
    return { pxPerMm, protocolMissing: ev?.recorded ? ev.missing : null, ...scaleScore({ areaPercent: r.areaPercent, face, spots, pxPerMm }) };
  });
}

/**
 * Every score of record of a trial with its area in mm² (when its photo has a scale and a face
 * outline) and spot counts by size class (scaleScoreRows).
 */
export async function loadScaledRecords({ labId, trialId, inspectionId, protocol = [] }: { labId: string; trialId: string; inspectionId?: string; protocol?: string[] }) {
  const rows = await db
    .select({ specimenId: scores.specimenId, inspectionId: scores.inspectionId, dayNumber: inspections.dayNumber, areaPercent: scores.areaPercent,
      spotCount: scores.spotCount, photoId: scores.photoId, scorerId: scores.scorerId, photoSpecimenId: photos.specimenId })
    .from(scores)
    .innerJoin(inspections, eq(inspections.id, scores.inspectionId))
    .leftJoin(photos, and(eq(photos.id, scores.photoId), eq(photos.labId, labId)))
    .where(and(eq(scores.labId, labId), eq(scores.trialId, trialId), eq(scores.isRecord, true), inspectionId ? eq(scores.inspectionId, inspectionId) : undefined))
    .orderBy(asc(inspections.dayNumber));
  const scaled = await scaleScoreRows({ labId, trialId, protocol, rows });
  const records: ScaledRecord[] = rows.map((r, i) => ({
    specimenId: r.specimenId, inspectionId: r.inspectionId, dayNumber: r.dayNumber, areaPercent: r.areaPercent, spotCount: r.spotCount, photoId: r.photoId,
    ...scaled[i],
  }));
  return { records, areaMm2: new Map(records.map((r) => [areaKey(r.inspectionId, r.specimenId), r.areaMm2])) };
}

/** Final area in mm² and growth in mm² per day for each placement of the trial's outcomes. */
export async function loadOutcomeAreas({ labId, trialId, outcomes }: { labId: string; trialId: string; outcomes: Parameters<typeof outcomeAreasMm2>[0] }) {
  const { areaMm2 } = await loadScaledRecords({ labId, trialId });
  return outcomeAreasMm2(outcomes, areaMm2);
}
