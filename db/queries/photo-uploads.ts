import "server-only";
// The upload flow. Presign checks everything it can (role, lab, inspection, specimen, type, size),
// has storage/photo-uploads sign a PUT bound to one key, type, length and SHA-256 (so the bytes
// checked at finalise are the only bytes storage will ever take under that key), and writes nothing:
// the browser then uploads
// straight to storage. Finalise proves the upload happened and is what it claimed to be, and only
// then creates the row (with its audit event). An abandoned upload leaves an object with no row,
// which the hourly sweep removes.
import { and, eq, ne } from "drizzle-orm";
import { recordAudit } from "@/db/audit";
import { db } from "@/db/client";
import { enqueuePhotoProcess, type PhotoProcessJob } from "@/db/jobs/photos";
import { inspections, photoEvidence, photos, specimens } from "@/db/schema";
import { AppError } from "@/lib/auth/errors";
import { checkCaptureTime, type CaptureCheck } from "@/lib/photos/capture-check";
import { readPhotoConfig } from "@/lib/photos/config";
import { acceptedPhotoType } from "@/lib/photos/upload-rules";
import { extractPhotoExif } from "@/lib/photos/exif";
import { assertWritable } from "@/lib/trials/lock";
import { cleanFileName } from "@/lib/photos/label-match";
import type { PresignRequest } from "@/lib/photos/schemas";
import { signUploadToken, verifyUploadToken, type UploadClaim } from "@/lib/photos/upload-token";
import { keyBelongsToLab } from "@/storage/keys";
import { signPhotoUpload, verifyStoredUpload } from "@/storage/photo-uploads";
import type { PresignedUpload } from "@/storage/presign";
import { getInspectionForPhotos, isSpecimenPlaced, referenceTime } from "./photos";
import { lockTrial } from "./trial-access";

type Caller = { labId: string; userId: string };

function tokenSecret(): string {
  const s = process.env.NEXTAUTH_SECRET;
  if (!s) throw new AppError("unavailable", "Uploads are not configured on this server (no signing secret).");
  return s;
}

export type PresignResult = { key: string; upload: PresignedUpload; token: string; expiresAt: string };

export async function presignPhotoUpload({ caller, input, expiresInS }: { caller: Caller; input: PresignRequest; expiresInS?: number }): Promise<PresignResult> {
  const cfg = readPhotoConfig();
  const contentType = acceptedPhotoType(input, cfg.maxBytes);
  const target = await getInspectionForPhotos({ labId: caller.labId, inspectionId: input.inspectionId });
  if (!target) throw new AppError("not-found", "That inspection does not exist in this lab.");
  assertWritable(target.trial);
  const placed = await isSpecimenPlaced({ labId: caller.labId, trialId: target.trial.id, specimenId: input.specimenId, at: referenceTime(target.inspection).at });
  if (!placed) throw new AppError("invalid", "That specimen was not in this trial at this inspection.", { specimenId: ["Choose a specimen placed in the trial at this inspection."] });

  const { key, upload } = await signPhotoUpload({ labId: caller.labId, contentType, sizeBytes: input.sizeBytes, sha256: input.sha256, expiresInS: expiresInS ?? cfg.uploadUrlTtlS });
  const claim: UploadClaim = {
    key, labId: caller.labId, userId: caller.userId, trialId: target.trial.id, inspectionId: target.inspection.id,
    specimenId: input.specimenId, contentType, sizeBytes: input.sizeBytes, sha256: input.sha256, filename: cleanFileName(input.filename),
    exp: Math.floor(Date.now() / 1000) + cfg.finalizeWindowS,
  };
  return { key, upload, token: signUploadToken(claim, tokenSecret()), expiresAt: upload.expiresAt };
}

export type FinalizedPhoto = {
  id: string;
  filename: string;
  specimenId: string;
  specimenLabel: string;
  status: "pending" | "ready" | "failed";
  capturedAtRaw: string | null;
  capturedOffset: string | null;
  /** The capture instant (ISO), when the camera recorded its zone. */
  capturedAt: string | null;
  sha256: string | null;
};
export type FinalizeResult = { photo: FinalizedPhoto; alreadyFinalized: boolean; check: CaptureCheck; warnings: string[] };

function claimFromToken(token: string, caller: Caller): UploadClaim {
  const v = verifyUploadToken(token, tokenSecret());
  if (!v.ok) {
    throw new AppError("invalid", v.reason === "expired"
      ? "This upload was approved too long ago to be recorded. Upload the file again."
      : "This upload receipt is not valid, so nothing was recorded. Upload the file again.");
  }
  // Another lab's (or another person's) receipt is treated as if it did not exist.
  if (v.claim.labId !== caller.labId || v.claim.userId !== caller.userId || !keyBelongsToLab(v.claim.key, caller.labId)) {
    throw new AppError("not-found", "No such upload in this lab.");
  }
  return v.claim;
}

async function buildResult(photoId: string, caller: Caller, alreadyFinalized: boolean, extraWarnings: string[] = []): Promise<FinalizeResult> {
  const [row] = await db
    .select({ p: photos, specimenLabel: specimens.label, plannedAt: inspections.plannedAt, doneAt: inspections.doneAt })
    .from(photos)
    .innerJoin(specimens, eq(specimens.id, photos.specimenId))
    .innerJoin(inspections, eq(inspections.id, photos.inspectionId))
    .where(and(eq(photos.id, photoId), eq(photos.labId, caller.labId)));
  if (!row) throw new AppError("not-found", "No such photo in this lab.");
  const ref = referenceTime(row);
  const check = checkCaptureTime({ capturedAtRaw: row.p.capturedAtRaw, capturedOffset: row.p.capturedOffset, referenceAt: ref.at, referenceKind: ref.kind, toleranceH: readPhotoConfig().toleranceH });
  const warnings = [...(check.status === "far" || check.status === "no-time" ? [check.message] : []), ...extraWarnings];
  const p = row.p;
  return {
    photo: { id: p.id, filename: p.filename, specimenId: p.specimenId, specimenLabel: row.specimenLabel, status: p.status, capturedAtRaw: p.capturedAtRaw, capturedOffset: p.capturedOffset, capturedAt: p.capturedAt?.toISOString() ?? null, sha256: p.sha256 },
    alreadyFinalized,
    check,
    warnings,
  };
}

export async function finalizePhotoUpload({
  caller,
  token,
  protocol,
  enqueue = enqueuePhotoProcess,
}: {
  caller: Caller;
  token: string;
  /** Protocol points ticked at upload; recorded with the photo (points not in the trial's protocol are dropped). */
  protocol?: string[];
  /** Queues the preview job; tests pass their own. */
  enqueue?: (job: PhotoProcessJob) => Promise<void>;
}): Promise<FinalizeResult> {
  const claim = claimFromToken(token, caller);
  const existing = await db.select({ id: photos.id }).from(photos).where(and(eq(photos.objectKey, claim.key), eq(photos.labId, caller.labId)));
  if (existing[0]) return buildResult(existing[0].id, caller, true);

  const { sha256, head } = await verifyStoredUpload(claim);
  const exif = await extractPhotoExif(head);

  const inserted = await db.transaction(async (tx) => {
    // Share-locked: a conclusion arriving meanwhile waits for this insert, or refuses it first.
    const trial = await lockTrial(tx, caller.labId, claim.trialId, "share");
    assertWritable(trial);
    const rows = await tx.insert(photos).values({
      labId: caller.labId, trialId: claim.trialId, inspectionId: claim.inspectionId, specimenId: claim.specimenId,
      objectKey: claim.key, filename: claim.filename, status: "pending", contentType: claim.contentType, sizeBytes: claim.sizeBytes,
      sha256, capturedAtRaw: exif.capturedAtRaw, capturedOffset: exif.capturedOffset, capturedAt: exif.capturedAt,
      camera: exif.camera, lens: exif.lens, exposure: exif.exposure, orientation: exif.orientation, gps: exif.gps,
      uploadedBy: caller.userId,
    }).onConflictDoNothing({ target: photos.objectKey }).returning({ id: photos.id });
    if (!rows[0]) return null;
    const protocolConfirmed = protocol?.filter((l) => trial.photoProtocol.includes(l));
    if (protocolConfirmed) {
      await tx.insert(photoEvidence).values({ photoId: rows[0].id, labId: caller.labId, trialId: claim.trialId, protocolConfirmed, recordedBy: caller.userId });
    }
    // The audit trail is readable by observers, so the location is recorded only as present or not.
    await recordAudit(tx, {
      labId: caller.labId, userId: caller.userId, entity: "photo", entityId: rows[0].id, trialId: claim.trialId, action: "create",
      summary: `Photo ${claim.filename} uploaded`,
      after: { filename: claim.filename, inspectionId: claim.inspectionId, specimenId: claim.specimenId, contentType: claim.contentType, sizeBytes: claim.sizeBytes, sha256, capturedAtRaw: exif.capturedAtRaw, capturedOffset: exif.capturedOffset, hasGps: exif.gps != null, protocolConfirmed: protocolConfirmed ?? null },
    });
    return rows[0].id;
  });
  if (!inserted) {
    // A concurrent finalise of the same upload won the race; answer as the repeat it is.
    const [row] = await db.select({ id: photos.id }).from(photos).where(and(eq(photos.objectKey, claim.key), eq(photos.labId, caller.labId)));
    return buildResult(row.id, caller, true);
  }
  try {
    await enqueue({ photoId: inserted, labId: caller.labId });
  } catch (err) {
    // The photo is recorded; the sweep re-queues photos whose previews are still missing.
    console.error("[photos] could not queue previews:", (err as Error).message);
  }
  const twins = await db.select({ filename: photos.filename }).from(photos)
    .where(and(eq(photos.labId, caller.labId), eq(photos.sha256, sha256), ne(photos.id, inserted))).limit(3);
  const dupWarnings = twins.length ? [`The same file was uploaded before as ${twins.map((t) => `"${t.filename}"`).join(", ")}.`] : [];
  return buildResult(inserted, caller, false, dupWarnings);
}
