// Photo upload settings from the environment, plus the accepted image types. Read on every call
// so tests (and an operator restarting with new values) see changes without a code edit.

export type PhotoContentType = "image/jpeg" | "image/png" | "image/tiff" | "image/heic";

export const PHOTO_TYPES: Record<PhotoContentType, { ext: string; label: string; previewable: boolean }> = {
  "image/jpeg": { ext: "jpg", label: "JPEG", previewable: true },
  "image/png": { ext: "png", label: "PNG", previewable: true },
  "image/tiff": { ext: "tif", label: "TIFF", previewable: true },
  // Stored and its EXIF read, but the bundled image library cannot decode HEVC, so no previews.
  "image/heic": { ext: "heic", label: "HEIC", previewable: false },
};

export const PHOTO_CONTENT_TYPES = Object.keys(PHOTO_TYPES) as PhotoContentType[];

const EXT_TO_TYPE: Record<string, PhotoContentType> = {
  jpg: "image/jpeg", jpeg: "image/jpeg", jpe: "image/jpeg",
  png: "image/png",
  tif: "image/tiff", tiff: "image/tiff",
  heic: "image/heic", heif: "image/heic", hif: "image/heic",
};

export function isPhotoContentType(t: string): t is PhotoContentType {
  return Object.hasOwn(PHOTO_TYPES, t);
}

/**
 * The content type to claim for a file: the browser's own type when it is one we accept, else
 * from the extension (browsers often report HEIC, and sometimes TIFF, as an empty type).
 */
export function contentTypeFor(fileName: string, browserType: string): PhotoContentType | null {
  const t = browserType.toLowerCase().trim();
  if (t === "image/jpg" || t === "image/pjpeg") return "image/jpeg";
  if (t === "image/heif") return "image/heic";
  if (isPhotoContentType(t)) return t;
  if (t && t !== "application/octet-stream") return null;
  const ext = fileName.toLowerCase().match(/\.([a-z0-9]+)$/)?.[1] ?? "";
  return EXT_TO_TYPE[ext] ?? null;
}

export type PhotoConfig = {
  maxBytes: number;
  /** Capture time further than this from the inspection time is flagged. */
  toleranceH: number;
  /** Lifetime of a presigned upload URL. */
  uploadUrlTtlS: number;
  /** How long an upload may be finalised after it was approved; below the sweep age. */
  finalizeWindowS: number;
  /** Objects under labs/x/photos with no photo row and older than this are swept. */
  orphanAgeMs: number;
  /** Lifetime of a signed download URL handed to a browser. */
  downloadUrlTtlS: number;
};

function positive(raw: string | undefined, fallback: number): number {
  const n = raw == null || raw.trim() === "" ? NaN : Number(raw);
  return Number.isFinite(n) && n > 0 ? n : fallback;
}

export function readPhotoConfig(env: NodeJS.ProcessEnv = process.env): PhotoConfig {
  return {
    maxBytes: Math.floor(positive(env.PHOTO_MAX_BYTES, 40 * 1024 * 1024)),
    toleranceH: positive(env.PHOTO_TIME_TOLERANCE_H, 12),
    uploadUrlTtlS: 300,
    finalizeWindowS: 55 * 60,
    orphanAgeMs: 3_600_000,
    downloadUrlTtlS: 300,
  };
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(0)} KB`;
  return `${(n / 1024 / 1024).toFixed(1)} MB`;
}
