import "server-only";
// A scorer's queue of photos for one trial. Blind scorers get photo ids only, in an order seeded per
// scorer: no specimen label, treatment, chamber, inspection day or anyone's earlier scores.
import { and, asc, desc, eq, isNotNull } from "drizzle-orm";
import { hashSeed } from "@/lib/allocation/prng";
import { AppError } from "@/lib/auth/errors";
import { db } from "../client";
import { chambers, inspections, photos, placements, scores, specimens, treatments } from "../schema";
import { photoUrl } from "@/storage/photo-urls";
import { marksOnPhoto, type PhotoForScoring } from "./scores-read";
import { getTrial, getTrialAccess } from "./trial-access";

export const QUEUE_PAGE_SIZE = 24;

export type BlindQueueItem = { photoId: string; position: number; thumbUrl: string | null; scored: boolean };
export type OpenQueueItem = BlindQueueItem & {
  inspectionId: string;
  specimenId: string;
  specimenLabel: string;
  dayNumber: number;
  treatment: string | null;
  chamber: string | null;
  myAreaPercent: number | null;
};
type QueuePage<T> = { items: T[]; total: number; todo: number; page: number; pages: number };
export type ScoringQueue = ({ blind: true } & QueuePage<BlindQueueItem>) | ({ blind: false } & QueuePage<OpenQueueItem>);

/** Latest ready photo per specimen × inspection of the trial, with the caller's score if any. */
async function queuePhotos(labId: string, trialId: string, userId: string) {
  const rows = await db
    .selectDistinctOn([photos.inspectionId, photos.specimenId], {
      photo: photos, dayNumber: inspections.dayNumber, plannedAt: inspections.plannedAt,
    })
    .from(photos)
    .innerJoin(inspections, eq(inspections.id, photos.inspectionId))
    .where(and(eq(photos.labId, labId), eq(inspections.trialId, trialId), eq(photos.status, "ready"), isNotNull(photos.inspectionId)))
    .orderBy(asc(photos.inspectionId), asc(photos.specimenId), desc(photos.createdAt));
  const mine = await db.select({ inspectionId: scores.inspectionId, specimenId: scores.specimenId, areaPercent: scores.areaPercent })
    .from(scores).where(and(eq(scores.labId, labId), eq(scores.trialId, trialId), eq(scores.scorerId, userId)));
  const mineBy = new Map(mine.map((s) => [`${s.inspectionId}|${s.specimenId}`, s]));
  return rows.map((r) => ({ ...r, mine: mineBy.get(`${r.photo.inspectionId}|${r.photo.specimenId}`) ?? null }));
}

/** Order for a blind scorer: a hash of scorer and photo, so adding photos does not reshuffle the rest. */
export function blindOrder<T extends { photoId: string }>(items: readonly T[], trialId: string, userId: string): T[] {
  const key = (id: string) => hashSeed(`blind-queue:${trialId}:${userId}:${id}`);
  return [...items].sort((a, b) => key(a.photoId) - key(b.photoId) || a.photoId.localeCompare(b.photoId));
}

function pageOf<T>(all: T[], page: number): { items: T[]; page: number; pages: number } {
  const pages = Math.max(1, Math.ceil(all.length / QUEUE_PAGE_SIZE));
  const p = Math.min(Math.max(1, page), pages);
  return { items: all.slice((p - 1) * QUEUE_PAGE_SIZE, p * QUEUE_PAGE_SIZE), page: p, pages };
}

export async function listScoringQueue(input: { labId: string; userId: string; trialId: string; page: number; show: "todo" | "all" }): Promise<ScoringQueue> {
  const { labId, userId, trialId } = input;
  const { access } = await getTrialAccess({ labId, trialId, userId });
  const rows = await queuePhotos(labId, trialId, userId);
  const todo = rows.filter((r) => !r.mine).length;

  if (access.blind) {
    const ordered = blindOrder(rows.map((r) => ({ photoId: r.photo.id, scored: !!r.mine, row: r })), trialId, userId)
      .map((r, i) => ({ ...r, position: i + 1 }));
    const shown = input.show === "todo" ? ordered.filter((r) => !r.scored) : ordered;
    const pg = pageOf(shown, input.page);
    // Build each item field by field: nothing of the row beyond the photo id may reach a blind scorer.
    const items = await Promise.all(pg.items.map(async (r): Promise<BlindQueueItem> => ({
      photoId: r.photoId, position: r.position, scored: r.scored, thumbUrl: await photoUrl(r.row.photo, "thumb"),
    })));
    return { blind: true, items, total: rows.length, todo, page: pg.page, pages: pg.pages };
  }

  const specimenIds = [...new Set(rows.map((r) => r.photo.specimenId))];
  const labels = specimenIds.length === 0 ? [] : await db
    .selectDistinctOn([placements.specimenId], { specimenId: placements.specimenId, label: specimens.label, treatment: treatments.name, chamber: chambers.name })
    .from(placements)
    .innerJoin(specimens, eq(specimens.id, placements.specimenId))
    .innerJoin(treatments, eq(treatments.id, placements.treatmentId))
    .innerJoin(chambers, eq(chambers.id, placements.chamberId))
    .where(and(eq(placements.labId, labId), eq(placements.trialId, trialId)))
    .orderBy(asc(placements.specimenId), asc(placements.fromAt));
  const bySpecimen = new Map(labels.map((l) => [l.specimenId, l]));
  const ordered = rows
    .map((r) => ({ r, info: bySpecimen.get(r.photo.specimenId) }))
    .sort((a, b) => b.r.dayNumber - a.r.dayNumber || (a.info?.label ?? "").localeCompare(b.info?.label ?? ""))
    .map(({ r, info }, i) => ({ r, info, position: i + 1 }));
  const shown = input.show === "todo" ? ordered.filter((x) => !x.r.mine) : ordered;
  const pg = pageOf(shown, input.page);
  const items = await Promise.all(pg.items.map(async ({ r, info, position }): Promise<OpenQueueItem> => ({
    photoId: r.photo.id, position, scored: !!r.mine, thumbUrl: await photoUrl(r.photo, "thumb"),
    inspectionId: r.photo.inspectionId!, specimenId: r.photo.specimenId, specimenLabel: info?.label ?? "—", dayNumber: r.dayNumber,
    treatment: info?.treatment ?? null, chamber: info?.chamber ?? null, myAreaPercent: r.mine?.areaPercent ?? null,
  })));
  return { blind: false, items, total: rows.length, todo, page: pg.page, pages: pg.pages };
}

export type BlindPhotoView = {
  photo: PhotoForScoring;
  position: number;
  total: number;
  nextPhotoId: string | null;
  mine: { spotCount: number; areaPercent: number; astmGrade: number | null; astmLetter: string | null; isoDegree: number | null; weeping: boolean;
    silicateChange: "none" | "slight" | "marked"; notes: string; autoEstimatePercent: number | null; areaSource: string | null; updatedAt: Date } | null;
  myMarks: Awaited<ReturnType<typeof marksOnPhoto>>;
};

/** One photo for blind scoring: the image and the caller's own work on it, nothing else. */
export async function getBlindPhoto({ labId, userId, trialId, photoId }: { labId: string; userId: string; trialId: string; photoId: string }): Promise<BlindPhotoView> {
  await getTrial({ labId, trialId });
  // Any ready photo of this trial may be opened (an older one of the same specimen and day too);
  // photos of other trials or labs answer 404.
  const [found] = await db.select({ photo: photos }).from(photos)
    .innerJoin(inspections, eq(inspections.id, photos.inspectionId))
    .where(and(eq(photos.id, photoId), eq(photos.labId, labId), eq(inspections.trialId, trialId), eq(photos.status, "ready")));
  if (!found) throw new AppError("not-found", "That photo is not in this trial's scoring queue.");
  const p = found.photo;
  const rows = await queuePhotos(labId, trialId, userId);
  const ordered = blindOrder(rows.map((r) => ({ photoId: r.photo.id, row: r })), trialId, userId);
  const index = ordered.findIndex((r) => r.row.photo.inspectionId === p.inspectionId && r.row.photo.specimenId === p.specimenId);
  const after = index < 0 ? ordered : [...ordered.slice(index + 1), ...ordered.slice(0, index)];
  const next = after.find((r) => !r.row.mine && r.photoId !== p.id) ?? null;
  const [myScore] = await db.select().from(scores)
    .where(and(eq(scores.labId, labId), eq(scores.inspectionId, p.inspectionId!), eq(scores.specimenId, p.specimenId), eq(scores.scorerId, userId)));
  return {
    photo: { id: p.id, url: await photoUrl(p), width: p.width, height: p.height, filename: "photo", capturedAt: null },
    position: index + 1,
    total: ordered.length,
    nextPhotoId: next?.photoId ?? null,
    mine: myScore ? {
      spotCount: myScore.spotCount, areaPercent: myScore.areaPercent, astmGrade: myScore.astmGrade, astmLetter: myScore.astmLetter,
      isoDegree: myScore.isoDegree, weeping: myScore.weeping, silicateChange: myScore.silicateChange, notes: myScore.notes,
      autoEstimatePercent: myScore.autoEstimatePercent, areaSource: myScore.areaSource, updatedAt: myScore.updatedAt,
    } : null,
    myMarks: await marksOnPhoto({ labId, photoId: p.id, scorerId: userId }),
  };
}
