// Signed GET URLs for photos: the one place that turns a photo's stored keys into a URL the browser
// can load. Callers have done the lab and permission checks (db/queries/photos photoFileTarget, the
// scoring loaders); a key outside the photo's lab is never signed.
import { keyBelongsToLab } from "./keys";
import { presignGet } from "./presign";

// Long enough for a scoring session; pages sign new URLs on every load.
const DISPLAY_URL_SECONDS = 3600;

type StoredPhoto = { labId: string; objectKey: string; derivatives: { thumb?: string | null; display?: string | null } | null };

/** Signed GET URL of a photo's display copy or thumbnail (the original as fallback), or null. */
export async function photoUrl(photo: StoredPhoto, size: "display" | "thumb" = "display"): Promise<string | null> {
  const d = photo.derivatives ?? {};
  const key = (size === "thumb" ? d.thumb ?? d.display : d.display) ?? photo.objectKey;
  if (!keyBelongsToLab(key, photo.labId)) return null;
  return presignGet({ key, expiresInS: DISPLAY_URL_SECONDS });
}

/** What to sign for one variant of a photo, as decided after the checks. */
export type PhotoFileTarget = { key: string; expiresInS: number; disposition: "inline" | "attachment"; filename?: string };

/** A signed URL for a checked target. */
export async function signPhotoFile(target: PhotoFileTarget): Promise<{ url: string; expiresInS: number }> {
  return { url: await presignGet(target), expiresInS: target.expiresInS };
}
