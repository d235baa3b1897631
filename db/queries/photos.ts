import "server-only";
// Photo reads: the inspection an upload targets, who was placed when, photo views for pages, and
// which stored file a viewer may get a signed URL for (storage/photo-urls signs it).
import { and, asc, desc, eq, gt, inArray, isNull, lte, or } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { db } from "@/db/client";
import { inspections, photos, placements, specimens, trials, users } from "@/db/schema";
import { AppError } from "@/lib/auth/errors";
import { can, type Role } from "@/lib/auth/permissions";
import { checkCaptureTime, type CaptureCheck } from "@/lib/photos/capture-check";
import { photoForBlindViewer } from "@/lib/trials/access";
import { blindTrialIds } from "./trial-access";
import { readPhotoConfig } from "@/lib/photos/config";
import type { PhotoVariant } from "@/lib/photos/schemas";
import type { PhotoFileTarget } from "@/storage/photo-urls";

type PhotoRow = typeof photos.$inferSelect;
export type Reference = { at: Date; kind: "done" | "planned" };

/** The time a photo of this inspection should have been taken near: done time, else planned time. */
export function referenceTime(i: { doneAt: Date | null; plannedAt: Date }): Reference {
  return i.doneAt ? { at: i.doneAt, kind: "done" } : { at: i.plannedAt, kind: "planned" };
}

export async function getInspectionForPhotos({ labId, inspectionId, trialId }: { labId: string; inspectionId: string; trialId?: string }) {
  const rows = await db
    .select({ inspection: inspections, trial: trials })
    .from(inspections)
    .innerJoin(trials, eq(trials.id, inspections.trialId))
    .where(and(eq(inspections.id, inspectionId), eq(inspections.labId, labId), trialId ? eq(trials.id, trialId) : undefined));
  return rows[0] ?? null;
}

function placedAt(at: Date) {
  return and(or(isNull(placements.fromAt), lte(placements.fromAt, at)), or(isNull(placements.toAt), gt(placements.toAt, at)));
}

/** Specimens placed in the trial at `at`, by label. */
export async function placedSpecimens({ labId, trialId, at }: { labId: string; trialId: string; at: Date }) {
  const rows = await db
    .selectDistinct({ id: specimens.id, label: specimens.label, materialClass: specimens.materialClass })
    .from(placements)
    .innerJoin(specimens, eq(specimens.id, placements.specimenId))
    .where(and(eq(placements.labId, labId), eq(placements.trialId, trialId), placedAt(at)));
  return rows.sort((a, b) => a.label.localeCompare(b.label, undefined, { numeric: true }));
}

export async function isSpecimenPlaced({ labId, trialId, specimenId, at }: { labId: string; trialId: string; specimenId: string; at: Date }) {
  const rows = await db.select({ id: placements.id }).from(placements)
    .where(and(eq(placements.labId, labId), eq(placements.trialId, trialId), eq(placements.specimenId, specimenId), placedAt(at))).limit(1);
  return rows.length > 0;
}

/** What pages and the API show of a photo. Location only for roles with photos.gps. */
export type PhotoView = {
  id: string;
  filename: string;
  specimenId: string;
  inspectionId: string | null;
  status: "pending" | "ready" | "failed";
  processingNote: string | null;
  contentType: string;
  sizeBytes: number;
  sha256: string | null;
  width: number | null;
  height: number | null;
  capturedAtRaw: string | null;
  capturedOffset: string | null;
  capturedAt: string | null;
  camera: string | null;
  lens: string | null;
  exposure: string | null;
  orientation: number | null;
  gps: { lat: number; lon: number } | null;
  /** True when the photo has a location that this viewer may not see. */
  gpsHidden: boolean;
  check: CaptureCheck | null;
  /** The capture-time warning was looked at: the note, who wrote it (name) and when. */
  checkAck: { note: string; by: string | null; at: string } | null;
  thumbUrl: string | null;
  displayUrl: string | null;
  originalUrl: string | null;
  uploadedAt: string;
  uploadedBy: string | null;
};

export function toPhotoView(p: PhotoRow, opts: { role: Role; reference: Reference | null; uploadedBy?: string | null; checkAckBy?: string | null }): PhotoView {
  const seesGps = can(opts.role, "photos.gps");
  const file = (v: PhotoVariant) => `/api/photos/${p.id}/file?variant=${v}`;
  const check = opts.reference
    ? checkCaptureTime({ capturedAtRaw: p.capturedAtRaw, capturedOffset: p.capturedOffset, referenceAt: opts.reference.at, referenceKind: opts.reference.kind, toleranceH: readPhotoConfig().toleranceH })
    : null;
  return {
    id: p.id, filename: p.filename, specimenId: p.specimenId, inspectionId: p.inspectionId, status: p.status, processingNote: p.processingNote,
    contentType: p.contentType, sizeBytes: p.sizeBytes, sha256: p.sha256, width: p.width, height: p.height,
    capturedAtRaw: p.capturedAtRaw, capturedOffset: p.capturedOffset, capturedAt: p.capturedAt?.toISOString() ?? null,
    camera: p.camera, lens: p.lens, exposure: p.exposure, orientation: p.orientation,
    gps: seesGps ? p.gps ?? null : null,
    gpsHidden: !seesGps && p.gps != null,
    check,
    checkAck: p.checkAckNote && p.checkAckAt ? { note: p.checkAckNote, by: opts.checkAckBy ?? null, at: p.checkAckAt.toISOString() } : null,
    thumbUrl: p.derivatives.thumb ? file("thumb") : null,
    displayUrl: p.derivatives.display ? file("display") : null,
    // The original keeps its EXIF, location included, so only roles that may see the location get it.
    originalUrl: seesGps ? file("original") : null,
    uploadedAt: p.createdAt.toISOString(),
    uploadedBy: opts.uploadedBy ?? null,
  };
}

export async function listInspectionPhotos({ labId, inspectionId, role, reference }: { labId: string; inspectionId: string; role: Role; reference: Reference }) {
  const acker = alias(users, "acker");
  const rows = await db
    .select({ p: photos, specimenLabel: specimens.label, uploader: users.name, acker: acker.name })
    .from(photos)
    .innerJoin(specimens, eq(specimens.id, photos.specimenId))
    .leftJoin(users, eq(users.id, photos.uploadedBy))
    .leftJoin(acker, eq(acker.id, photos.checkAckBy))
    .where(and(eq(photos.labId, labId), eq(photos.inspectionId, inspectionId)))
    .orderBy(asc(specimens.label), asc(photos.createdAt));
  return rows.map((r) => ({ ...toPhotoView(r.p, { role, reference, uploadedBy: r.uploader, checkAckBy: r.acker }), specimenLabel: r.specimenLabel }));
}

/** One photo of the caller's lab, or not-found (also for another lab's photo). */
export async function getPhotoForLab({ labId, photoId }: { labId: string; photoId: string }) {
  if (!/^[0-9a-f-]{36}$/i.test(photoId)) return null;
  const rows = await db
    .select({ p: photos, plannedAt: inspections.plannedAt, doneAt: inspections.doneAt, specimenLabel: specimens.label })
    .from(photos)
    .innerJoin(specimens, eq(specimens.id, photos.specimenId))
    .leftJoin(inspections, eq(inspections.id, photos.inspectionId))
    .where(and(eq(photos.id, photoId), eq(photos.labId, labId)));
  return rows[0] ?? null;
}

/** Is the viewer blind for the trial this photo belongs to (not concluded)? */
async function blindFor(ctx: { labId: string; userId: string }, trialId: string | null) {
  return !!trialId && (await blindTrialIds({ labId: ctx.labId, userId: ctx.userId })).has(trialId);
}

export async function photoDetails({ ctx, photoId }: { ctx: { labId: string; userId: string; role: Role }; photoId: string }) {
  const row = await getPhotoForLab({ labId: ctx.labId, photoId });
  if (!row) throw new AppError("not-found", "No such photo in this lab.");
  const reference = row.plannedAt ? referenceTime({ plannedAt: row.plannedAt, doneAt: row.doneAt }) : null;
  const view = { ...toPhotoView(row.p, { role: ctx.role, reference }), specimenLabel: row.specimenLabel };
  return (await blindFor(ctx, row.p.trialId)) ? photoForBlindViewer(view) : view;
}

/**
 * Which stored file one variant of a photo is, after the lab check, for a signed URL that lives
 * readPhotoConfig().downloadUrlTtlS. Previews are open to every member; the original carries EXIF
 * location, so it needs photos.gps.
 */
export async function photoFileTarget({ ctx, photoId, variant }: { ctx: { labId: string; userId: string; role: Role }; photoId: string; variant: PhotoVariant }): Promise<PhotoFileTarget> {
  const row = await getPhotoForLab({ labId: ctx.labId, photoId });
  if (!row) throw new AppError("not-found", "No such photo in this lab.");
  const p = row.p;
  const expiresInS = readPhotoConfig().downloadUrlTtlS;
  if (variant === "original") {
    if (!can(ctx.role, "photos.gps")) throw new AppError("forbidden", "Your role sees previews only; the original file carries its location.");
    // The original file name carries the specimen label: a blind scorer's download is named by photo id.
    const filename = (await blindFor(ctx, p.trialId)) ? `${p.id}${p.filename.match(/\.[A-Za-z0-9]{1,8}$/)?.[0] ?? ""}` : p.filename;
    return { key: p.objectKey, expiresInS, filename, disposition: "attachment" };
  }
  const key = p.derivatives[variant];
  if (!key) throw new AppError("not-found", p.status === "failed" ? p.processingNote ?? "No preview for this photo." : "The preview is still being made.");
  return { key, expiresInS, disposition: "inline" };
}

/** The score of record; photoId is the photo it was made on, when the scorer said so. */
export type RecordScore = { areaPercent: number; astmGrade: number | null; astmLetter: string | null; weeping: boolean; spotCount: number; photoId: string | null };

export async function latestDoneInspection({ labId, trialId }: { labId: string; trialId: string }) {
  const rows = await db.select().from(inspections)
    .where(and(eq(inspections.labId, labId), eq(inspections.trialId, trialId)))
    .orderBy(desc(inspections.doneAt), desc(inspections.plannedAt));
  return rows.find((r) => r.doneAt) ?? rows[rows.length - 1] ?? null;
}

export async function photosOfSpecimens({ labId, specimenIds, inspectionIds }: { labId: string; specimenIds: string[]; inspectionIds: string[] }) {
  if (!specimenIds.length || !inspectionIds.length) return [];
  return db.select().from(photos)
    .where(and(eq(photos.labId, labId), inArray(photos.specimenId, specimenIds), inArray(photos.inspectionId, inspectionIds)))
    .orderBy(asc(photos.createdAt));
}
