import "server-only";
// The aligned photo series of a specimen in a trial: control points per photo (placed on the align
// page), the fit of each photo to the first one (lib/photos/align) and the rust that is new since
// the previous inspection (lib/photos/new-since). The first photo is the earliest ready photo of the
// specimen in the trial (earliest inspection, then earliest upload).
import { and, asc, eq, inArray } from "drizzle-orm";
import { recordAudit } from "@/db/audit";
import { db, type DbOrTx } from "@/db/client";
import { inspections, photoControlPoints, photos, scores, specimens } from "@/db/schema";
import { AppError } from "@/lib/auth/errors";
import { alignStateOf, controlPointProblem, fitAlignment, type Affine, type AlignState } from "@/lib/photos/align";
import { newSinceLast, type NewSinceResult } from "@/lib/photos/new-since";
import { loadPhotoEvidence } from "./photo-evidence";
import type { Mark, Point } from "@/lib/scoring/geometry";
import { assertWritable } from "@/lib/trials/lock";
import { isUuid } from "@/lib/ids";
import { marksOnPhoto } from "./scores-read";
import { lockTrial } from "./trial-access";

type Actor = { labId: string; userId: string };
type PhotoRow = typeof photos.$inferSelect;
const noPhoto = () => new AppError("not-found", "No such photo in this trial.");

/** The first ready photo of a specimen in a trial: the frame every later photo is registered to. */
export async function referencePhotoOf(q: DbOrTx, { labId, trialId, specimenId }: { labId: string; trialId: string; specimenId: string }): Promise<PhotoRow | null> {
  const [row] = await q.select({ p: photos }).from(photos)
    .innerJoin(inspections, eq(inspections.id, photos.inspectionId))
    .where(and(eq(photos.labId, labId), eq(photos.trialId, trialId), eq(photos.specimenId, specimenId), eq(photos.status, "ready")))
    .orderBy(asc(inspections.plannedAt), asc(photos.createdAt))
    .limit(1);
  return row?.p ?? null;
}

async function pointsOf(q: DbOrTx, labId: string, photoIds: string[]) {
  if (!photoIds.length) return new Map<string, { points: Point[]; referencePhotoId: string }>();
  const rows = await q.select().from(photoControlPoints).where(and(eq(photoControlPoints.labId, labId), inArray(photoControlPoints.photoId, photoIds)));
  return new Map(rows.map((r) => [r.photoId, { points: r.points, referencePhotoId: r.referencePhotoId }]));
}

/** What the align page needs: the photo, the first photo, and the points on both. */
export async function getAlignPage({ labId, trialId, photoId }: { labId: string; trialId: string; photoId: string }) {
  if (!isUuid(photoId)) throw noPhoto();
  const [row] = await db.select({ p: photos, label: specimens.label, dayNumber: inspections.dayNumber }).from(photos)
    .innerJoin(specimens, eq(specimens.id, photos.specimenId))
    .innerJoin(inspections, eq(inspections.id, photos.inspectionId))
    .where(and(eq(photos.id, photoId), eq(photos.labId, labId), eq(photos.trialId, trialId)));
  if (!row) throw noPhoto();
  const ref = await referencePhotoOf(db, { labId, trialId, specimenId: row.p.specimenId });
  const [refDay] = ref?.inspectionId ? await db.select({ dayNumber: inspections.dayNumber }).from(inspections).where(eq(inspections.id, ref.inspectionId)) : [];
  const pts = await pointsOf(db, labId, [photoId, ...(ref ? [ref.id] : [])]);
  const view = (p: PhotoRow) => ({ id: p.id, width: p.width, height: p.height, status: p.status, src: p.derivatives.display ? `/api/photos/${p.id}/file?variant=display` : null });
  return {
    photo: view(row.p), specimen: { id: row.p.specimenId, label: row.label }, dayNumber: row.dayNumber,
    points: pts.get(photoId)?.points ?? [],
    reference: ref ? { ...view(ref), dayNumber: refDay?.dayNumber ?? null, points: pts.get(ref.id)?.points ?? [] } : null,
    state: alignStateOf(photoId, ref?.id ?? null, pts),
  };
}

/** Save (replace) the control points of one photo. Checked against the photo's size and the first photo's points. */
export async function saveControlPoints({ actor, trialId, photoId, points }: { actor: Actor; trialId: string; photoId: string; points: Point[] }) {
  return db.transaction(async (tx) => {
    assertWritable(await lockTrial(tx, actor.labId, trialId, "share"));
    const [p] = await tx.select().from(photos).where(and(eq(photos.id, photoId), eq(photos.labId, actor.labId), eq(photos.trialId, trialId))).for("update");
    if (!p) throw noPhoto();
    if (p.status !== "ready" || !p.width || !p.height) throw new AppError("conflict", "This photo is not processed yet (its size is unknown); place points once its preview shows.");
    const invalid = (msg: string) => new AppError("invalid", msg, { points: [msg] });
    const problem = controlPointProblem(points, { width: p.width, height: p.height });
    if (problem) throw invalid(problem);
    const ref = await referencePhotoOf(tx, { labId: actor.labId, trialId, specimenId: p.specimenId });
    if (!ref) throw noPhoto();
    if (ref.id !== p.id) {
      const [refPts] = await tx.select().from(photoControlPoints).where(and(eq(photoControlPoints.labId, actor.labId), eq(photoControlPoints.photoId, ref.id)));
      if (!refPts) throw invalid("Place control points on the first photo of this specimen first; every later photo is matched to them.");
      try { fitAlignment(points, refPts.points); } catch (e) { throw invalid(e instanceof Error ? e.message : String(e)); }
    }
    const [before] = await tx.select().from(photoControlPoints).where(eq(photoControlPoints.photoId, p.id));
    const values = { photoId: p.id, labId: actor.labId, referencePhotoId: ref.id, points, updatedBy: actor.userId, updatedAt: new Date() };
    await tx.insert(photoControlPoints).values(values).onConflictDoUpdate({ target: photoControlPoints.photoId, set: values });
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "photo", entityId: p.id, trialId, action: before ? "update" : "create",
      summary: `Control points (${points.length}) placed on photo ${p.filename}${ref.id === p.id ? " (first photo of the series)" : ""}`,
      before: before ? { points: before.points, referencePhotoId: before.referencePhotoId } : null,
      after: { points, referencePhotoId: ref.id },
    });
    return { specimenId: p.specimenId, isReference: ref.id === p.id };
  });
}

export type AlignedEntry = { photoId: string; state: AlignState; marks: Mark[] | null; face: Point[] | null; newSince: NewSinceResult | null };

/**
 * The aligned series for the timeline: for each shown photo (one per inspection, in order) its fit
 * and, when marks may be shown (not to a blind scorer), the record's marks and the rust new since the
 * previous inspection's photo, measured in the first photo's frame.
 */
export async function loadAlignedSeries({ labId, trialId, specimenId, photos: asked, withMarks }: {
  labId: string; trialId: string; specimenId: string; photos: { id: string; inspectionId: string | null }[]; withMarks: boolean;
}) {
  const ref = await referencePhotoOf(db, { labId, trialId, specimenId });
  // The first photo stands for its inspection, so the series starts from the frame it defines.
  const shown = ref ? [ref.id, ...asked.filter((p) => p.id !== ref.id && p.inspectionId !== ref.inspectionId).map((p) => p.id)] : asked.map((p) => p.id);
  const pts = await pointsOf(db, labId, shown);
  const record = withMarks && shown.length
    ? await db.select({ photoId: scores.photoId, scorerId: scores.scorerId }).from(scores)
      .where(and(eq(scores.labId, labId), eq(scores.trialId, trialId), eq(scores.specimenId, specimenId), eq(scores.isRecord, true), inArray(scores.photoId, shown)))
    : [];
  const markBy = new Map(await Promise.all(record.filter((r) => r.photoId && r.scorerId)
    .map(async (r) => [r.photoId!, await marksOnPhoto({ labId, photoId: r.photoId!, scorerId: r.scorerId! })] as const)));
  // Areas are measured in the first photo's frame, so its scale (own or the series') turns px² into mm².
  const refScale = ref ? (await loadPhotoEvidence({ labId, trialId, protocol: [], photoRows: [{ id: ref.id, specimenId }] })).get(ref.id)?.scale ?? null : null;
  const entries: AlignedEntry[] = [];
  // The previous inspection's photo must itself be aligned and scored, else "new since" is unknown.
  let previous: { marks: Mark[]; toReference: Affine } | null | undefined = null;
  for (const photoId of shown) {
    const state = alignStateOf(photoId, ref?.id ?? null, pts);
    const m = markBy.get(photoId) ?? null;
    const here = state.transform && m ? { marks: m.marks, face: m.face, toReference: state.transform } : undefined;
    const newSince = here && previous !== undefined ? newSinceLast(here, previous, { samples: 400, pxPerMm: refScale?.pxPerMm ?? null }) : null;
    entries.push({ photoId, state, marks: m?.marks ?? null, face: m?.face ?? null, newSince });
    previous = here;
  }
  return { referencePhotoId: ref?.id ?? null, reference: ref ? { width: ref.width, height: ref.height, inspectionId: ref.inspectionId } : null, entries };
}
