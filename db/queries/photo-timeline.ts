import "server-only";
// The two photo-comparison views: one specimen through every inspection (timeline) and every
// specimen of a trial at one inspection (grid), each with the score of record beside the photo.
// A blind scorer of the trial sees neither treatments nor scores of record.
import { and, asc, eq, gt, inArray, isNull, lte, or } from "drizzle-orm";
import { db } from "@/db/client";
import { inspections, photos, placements, scores, specimens, trialArms, trials } from "@/db/schema";
import type { Role } from "@/lib/auth/permissions";
import { referenceTime, toPhotoView, type PhotoView, type RecordScore } from "./photos";
import { AppError } from "@/lib/auth/errors";
import { photoInListForViewer } from "@/lib/trials/access";
import { blindTrialIds, getTrialAccess } from "./trial-access";

type InspectionRow = typeof inspections.$inferSelect;
export type InspectionLite = { id: string; dayNumber: number; plannedAt: string; doneAt: string | null };

function lite(i: InspectionRow): InspectionLite {
  return { id: i.id, dayNumber: i.dayNumber, plannedAt: i.plannedAt.toISOString(), doneAt: i.doneAt?.toISOString() ?? null };
}

const scoreColumns = {
  inspectionId: scores.inspectionId, specimenId: scores.specimenId, areaPercent: scores.areaPercent,
  astmGrade: scores.astmGrade, astmLetter: scores.astmLetter, weeping: scores.weeping, spotCount: scores.spotCount, photoId: scores.photoId,
};

function toScore(s: RecordScore): RecordScore {
  return { areaPercent: s.areaPercent, astmGrade: s.astmGrade, astmLetter: s.astmLetter, weeping: s.weeping, spotCount: s.spotCount, photoId: s.photoId };
}

/** The photo to show for a specimen at an inspection: the one scored, else the latest with a preview. */
export function representativePhoto(photos: PhotoView[], score: RecordScore | null): PhotoView | null {
  return photos.find((p) => p.id === score?.photoId && p.thumbUrl) ?? [...photos].reverse().find((p) => p.thumbUrl) ?? photos[photos.length - 1] ?? null;
}

export type TimelineEntry = { inspection: InspectionLite; photos: PhotoView[]; score: RecordScore | null };
export type TimelineTrial = { id: string; title: string; status: string; blind: boolean; armLabel: string | null; entries: TimelineEntry[]; upcoming: number };

export async function getSpecimenTimeline({ labId, specimenId, userId, role }: { labId: string; specimenId: string; userId: string; role: Role }) {
  if (!/^[0-9a-f-]{36}$/i.test(specimenId)) return null;
  const [specimen] = await db.select().from(specimens).where(and(eq(specimens.id, specimenId), eq(specimens.labId, labId)));
  if (!specimen) return null;
  const placed = await db
    .select({ trialId: trials.id, title: trials.title, status: trials.status, startedAt: trials.startedAt, armLabel: trialArms.label })
    .from(placements)
    .innerJoin(trials, eq(trials.id, placements.trialId))
    .leftJoin(trialArms, eq(trialArms.id, placements.armId))
    .where(and(eq(placements.labId, labId), eq(placements.specimenId, specimenId)))
    .orderBy(asc(placements.fromAt));
  const trialIds = [...new Set(placed.map((p) => p.trialId))];
  const [insp, photoRows, scoreRows, blind] = await Promise.all([
    trialIds.length ? db.select().from(inspections).where(and(eq(inspections.labId, labId), inArray(inspections.trialId, trialIds))).orderBy(asc(inspections.plannedAt)) : [],
    db.select().from(photos).where(and(eq(photos.labId, labId), eq(photos.specimenId, specimenId))).orderBy(asc(photos.createdAt)),
    db.select(scoreColumns).from(scores).where(and(eq(scores.labId, labId), eq(scores.specimenId, specimenId), eq(scores.isRecord, true))),
    blindTrialIds({ labId, userId }),
  ]);
  const scoreBy = new Map(scoreRows.map((s) => [s.inspectionId, toScore(s)]));
  const trialsOut: TimelineTrial[] = trialIds.map((tid) => {
    const t = placed.find((p) => p.trialId === tid)!;
    const isBlind = blind.has(tid);
    const all = insp.filter((i) => i.trialId === tid);
    const entries = all
      .map((i) => ({
        inspection: lite(i),
        photos: photoRows.filter((p) => p.inspectionId === i.id).map((p) => photoInListForViewer(toPhotoView(p, { role, reference: referenceTime(i) }), { blind: isBlind })),
        score: isBlind ? null : scoreBy.get(i.id) ?? null,
      }))
      .filter((e) => e.inspection.doneAt || e.photos.length);
    return { id: tid, title: t.title, status: t.status, blind: isBlind, armLabel: isBlind ? null : t.armLabel, entries, upcoming: all.length - entries.length };
  });
  return { specimen: { id: specimen.id, label: specimen.label, materialClass: specimen.materialClass, findName: specimen.findName, face: specimen.face }, trials: trialsOut };
}

export type GridCell = { specimen: { id: string; label: string; materialClass: string }; armLabel: string | null; photos: PhotoView[]; score: RecordScore | null };

export async function getTrialGrid({ labId, trialId, inspectionId, userId, role }: { labId: string; trialId: string; inspectionId?: string; userId: string; role: Role }) {
  // The one loader and view rule: another lab's or a malformed id is "no grid".
  const found = await getTrialAccess({ labId, trialId, userId }).catch((err) => {
    if (err instanceof AppError && err.code === "not-found") return null;
    throw err;
  });
  if (!found) return null;
  const { trial, access } = found;
  const all = await db.select().from(inspections).where(and(eq(inspections.labId, labId), eq(inspections.trialId, trialId))).orderBy(asc(inspections.plannedAt));
  const lastDone = [...all].reverse().find((i) => i.doneAt);
  const chosen = all.find((i) => i.id === inspectionId) ?? lastDone ?? all[0] ?? null;
  const isBlind = access.blind;
  const base = { trial: { id: trial.id, title: trial.title, status: trial.status }, inspections: all.map(lite), blind: isBlind };
  if (!chosen) return { ...base, inspection: null, cells: [] as GridCell[] };
  const ref = referenceTime(chosen);
  const placed = await db
    .selectDistinctOn([specimens.id], { id: specimens.id, label: specimens.label, materialClass: specimens.materialClass, armLabel: trialArms.label })
    .from(placements)
    .innerJoin(specimens, eq(specimens.id, placements.specimenId))
    .leftJoin(trialArms, eq(trialArms.id, placements.armId))
    .where(and(eq(placements.labId, labId), eq(placements.trialId, trialId),
      or(isNull(placements.fromAt), lte(placements.fromAt, ref.at)), or(isNull(placements.toAt), gt(placements.toAt, ref.at))));
  const ids = placed.map((p) => p.id);
  const [photoRows, scoreRows] = await Promise.all([
    ids.length ? db.select().from(photos).where(and(eq(photos.labId, labId), eq(photos.inspectionId, chosen.id), inArray(photos.specimenId, ids))).orderBy(asc(photos.createdAt)) : [],
    isBlind ? [] : db.select(scoreColumns).from(scores).where(and(eq(scores.labId, labId), eq(scores.inspectionId, chosen.id), eq(scores.isRecord, true))),
  ]);
  const scoreBy = new Map(scoreRows.map((s) => [s.specimenId, toScore(s)]));
  const cells: GridCell[] = placed
    .map((p) => ({
      specimen: { id: p.id, label: p.label, materialClass: p.materialClass },
      armLabel: isBlind ? null : p.armLabel,
      photos: photoRows.filter((r) => r.specimenId === p.id).map((r) => photoInListForViewer(toPhotoView(r, { role, reference: ref }), { blind: isBlind })),
      score: scoreBy.get(p.id) ?? null,
    }))
    .sort((a, b) => a.specimen.label.localeCompare(b.specimen.label, undefined, { numeric: true }));
  return { ...base, inspection: lite(chosen), cells };
}
