// The storage half of a photo upload: a PUT URL bound to one fresh key, type, length and SHA-256,
// and the check at finalise that storage holds exactly those bytes (size, content sniffed from the
// first bytes, SHA-256 read in ranged chunks). A file that fails is removed. The database half
// (who may upload where, the photo row, its audit event) is db/queries/photo-uploads.ts.
import { createHash, randomUUID } from "node:crypto";
import { AppError } from "@/lib/auth/errors";
import { formatBytes, isPhotoContentType, PHOTO_TYPES, type PhotoContentType } from "@/lib/photos/config";
import { describeSniffed, sniffImageType } from "@/lib/photos/magic";
import { photoKey } from "./keys";
import { deleteObject, getObjectRange, headObject } from "./objects";
import { presignPut } from "./presign";

/** A PUT URL for a new photo of the lab under a fresh random key. */
export async function signPhotoUpload({ labId, contentType, sizeBytes, sha256, expiresInS }: { labId: string; contentType: PhotoContentType; sizeBytes: number; sha256: string; expiresInS: number }) {
  const key = photoKey({ labId, photoId: randomUUID(), ext: PHOTO_TYPES[contentType].ext });
  const upload = await presignPut({ key, contentType, contentLength: sizeBytes, sha256, expiresInS });
  return { key, upload };
}

const CHUNK_BYTES = 8 * 1024 * 1024;
const JPEG_EXIF_BYTES = 256 * 1024; // a JPEG's EXIF (APP1) is limited to 64 KB and sits at the start

/** SHA-256 of the object read in ranged chunks (bounded memory), plus the bytes EXIF needs. */
async function hashObject(key: string, sizeBytes: number, keepAll: boolean): Promise<{ sha256: string; head: Uint8Array }> {
  const hash = createHash("sha256");
  const kept: Uint8Array[] = [];
  let keptBytes = 0;
  for (let start = 0; start < sizeBytes; start += CHUNK_BYTES) {
    const end = Math.min(sizeBytes, start + CHUNK_BYTES) - 1;
    const chunk = await getObjectRange(key, start, end);
    if (!chunk || chunk.byteLength !== end - start + 1) throw new AppError("conflict", "The file changed in storage while it was being checked. Upload it again.");
    hash.update(chunk);
    if (keepAll || keptBytes < JPEG_EXIF_BYTES) {
      kept.push(chunk);
      keptBytes += chunk.byteLength;
    }
  }
  const head = Buffer.concat(kept);
  return { sha256: hash.digest("hex"), head: keepAll ? head : head.subarray(0, JPEG_EXIF_BYTES) };
}

/**
 * Storage holds the approved file: its size, its content (sniffed) and its SHA-256. Returns the hash
 * and the bytes EXIF is read from; otherwise removes the object and throws a message for the user.
 */
export async function verifyStoredUpload(claim: { key: string; sizeBytes: number; contentType: string; sha256: string }) {
  const info = await headObject(claim.key);
  if (!info) throw new AppError("not-found", "The file did not arrive in storage, so nothing was recorded. Upload it again.");
  if (info.sizeBytes !== claim.sizeBytes) {
    await deleteObject(claim.key);
    throw new AppError("invalid", `Storage holds ${formatBytes(info.sizeBytes)}, not the ${formatBytes(claim.sizeBytes)} approved; the file was removed and nothing was recorded.`);
  }
  const magic = await getObjectRange(claim.key, 0, 63);
  const sniffed = magic ? sniffImageType(magic) : null;
  if (sniffed !== claim.contentType) {
    await deleteObject(claim.key);
    const claimed = isPhotoContentType(claim.contentType) ? PHOTO_TYPES[claim.contentType].label : claim.contentType;
    throw new AppError("invalid", `The file's content is ${describeSniffed(sniffed)}, not the ${claimed} it was sent as. It was removed and nothing was recorded.`);
  }
  const { sha256, head } = await hashObject(claim.key, claim.sizeBytes, claim.contentType !== "image/jpeg");
  if (sha256 !== claim.sha256) {
    // Storage that checks x-amz-checksum-sha256 never gets here; one that does not is caught now.
    await deleteObject(claim.key);
    throw new AppError("invalid", "The stored file is not the one approved for upload (its SHA-256 differs); it was removed and nothing was recorded.");
  }
  return { sha256, head };
}
