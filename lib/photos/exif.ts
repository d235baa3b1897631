// EXIF of an uploaded photo: capture time *with its offset*, camera, lens, exposure, orientation, GPS.
// exifr turns EXIF dates into Date objects in the *process* time zone, which silently shifts the
// instant; we read the raw "YYYY:MM:DD HH:MM:SS" strings (reviveValues: false) and the
// OffsetTime* tags (EXIF 2.31) and build the instant ourselves.
import exifr from "exifr";

export type PhotoGps = { lat: number; lon: number };

export type PhotoExif = {
  /** The camera's own wall-clock text, e.g. "2026:10:22 10:54:12". */
  capturedAtRaw: string | null;
  /** "+01:00" style, or null when the camera recorded no offset. */
  capturedOffset: string | null;
  /** The instant, only when both the time and its offset are known. */
  capturedAt: Date | null;
  camera: string | null;
  lens: string | null;
  exposure: string | null;
  orientation: number | null;
  gps: PhotoGps | null;
};

export const EMPTY_EXIF: PhotoExif = {
  capturedAtRaw: null, capturedOffset: null, capturedAt: null, camera: null, lens: null, exposure: null, orientation: null, gps: null,
};

const EXIF_DATE = /^(\d{4}):(\d{2}):(\d{2})[ T](\d{2}):(\d{2}):(\d{2})(?:\.(\d+))?/;
const OFFSET = /^([+-])(\d{2}):?(\d{2})$/;

/** Normalise an OffsetTime value to "+HH:MM" ("Z" → "+00:00"); null when absent or malformed. */
export function normaliseOffset(raw: unknown): string | null {
  if (typeof raw !== "string") return null;
  const t = raw.trim();
  if (t === "Z") return "+00:00";
  const m = t.match(OFFSET);
  if (!m) return null;
  const h = Number(m[2]);
  const min = Number(m[3]);
  if (h > 14 || min > 59) return null;
  return `${m[1]}${m[2]}:${m[3]}`;
}

/** The instant of an EXIF date string at an offset; null for blank or impossible dates ("0000:00:00 …"). */
export function exifInstant(raw: string, offset: string): Date | null {
  const m = raw.trim().match(EXIF_DATE);
  const off = normaliseOffset(offset);
  if (!m || !off) return null;
  const [, y, mo, d, h, mi, s, frac] = m;
  const ms = frac ? Math.round(Number(`0.${frac}`) * 1000) : 0;
  const local = Date.UTC(Number(y), Number(mo) - 1, Number(d), Number(h), Number(mi), Number(s), ms);
  const check = new Date(local);
  // Date.UTC rolls 2026-02-30 over to March; refuse instead of inventing a day.
  if (check.getUTCFullYear() !== Number(y) || check.getUTCMonth() !== Number(mo) - 1 || check.getUTCDate() !== Number(d) || Number(y) < 1900) return null;
  if (Number(h) > 23 || Number(mi) > 59 || Number(s) > 60) return null;
  const sign = off[0] === "-" ? -1 : 1;
  const offMs = sign * (Number(off.slice(1, 3)) * 60 + Number(off.slice(4, 6))) * 60_000;
  return new Date(local - offMs);
}

export function isExifDateText(raw: unknown): raw is string {
  return typeof raw === "string" && EXIF_DATE.test(raw.trim()) && !raw.startsWith("0000");
}

function text(v: unknown): string | null {
  if (typeof v !== "string") return null;
  const t = v.replace(/\0/g, "").trim();
  return t ? t.slice(0, 120) : null;
}

function num(v: unknown): number | null {
  if (typeof v === "number" && Number.isFinite(v)) return v;
  if (Array.isArray(v) && typeof v[0] === "number") return v[0];
  return null;
}

function dms(v: unknown): number | null {
  if (!Array.isArray(v) || v.length === 0 || !v.every((x) => typeof x === "number" && Number.isFinite(x))) return null;
  const [d, m = 0, s = 0] = v as number[];
  return d + m / 60 + s / 3600;
}

function exposureText(tags: Record<string, unknown>): string | null {
  const parts: string[] = [];
  const t = num(tags.ExposureTime);
  if (t != null && t > 0) parts.push(t >= 1 ? `${Math.round(t * 10) / 10} s` : `1/${Math.round(1 / t)} s`);
  const f = num(tags.FNumber);
  if (f != null && f > 0) parts.push(`f/${Math.round(f * 10) / 10}`);
  const iso = num(tags.ISO) ?? num(tags.ISOSpeedRatings) ?? num(tags.PhotographicSensitivity);
  if (iso != null && iso > 0) parts.push(`ISO ${iso}`);
  const fl = num(tags.FocalLength);
  if (fl != null && fl > 0) parts.push(`${Math.round(fl)} mm`);
  return parts.length ? parts.join(" · ") : null;
}

/** Map exifr's raw (un-revived, untranslated) tags to what we keep. Pure; exported for tests. */
export function summariseExifTags(tags: Record<string, unknown> | null | undefined): PhotoExif {
  if (!tags) return { ...EMPTY_EXIF };
  // DateTimeOriginal is when the shutter fired; CreateDate (digitised) is the same on cameras and
  // the scan time for film. ModifyDate is the last edit, so it is never taken as a capture time.
  let capturedAtRaw: string | null = null;
  let capturedOffset: string | null = null;
  if (isExifDateText(tags.DateTimeOriginal)) {
    capturedAtRaw = tags.DateTimeOriginal.trim();
    capturedOffset = normaliseOffset(tags.OffsetTimeOriginal) ?? normaliseOffset(tags.OffsetTime);
  } else if (isExifDateText(tags.CreateDate)) {
    capturedAtRaw = tags.CreateDate.trim();
    capturedOffset = normaliseOffset(tags.OffsetTimeDigitized) ?? normaliseOffset(tags.OffsetTime);
  }
  const subSec = typeof tags.SubSecTimeOriginal === "string" || typeof tags.SubSecTimeOriginal === "number" ? String(tags.SubSecTimeOriginal).trim() : "";
  const withSubSec = capturedAtRaw && /^\d+$/.test(subSec) && !capturedAtRaw.includes(".") ? `${capturedAtRaw}.${subSec}` : capturedAtRaw;
  const capturedAt = withSubSec && capturedOffset ? exifInstant(withSubSec, capturedOffset) : null;

  const make = text(tags.Make);
  const model = text(tags.Model);
  const camera = make && model ? (model.toLowerCase().startsWith(make.toLowerCase()) ? model : `${make} ${model}`) : make ?? model;
  const lensModel = text(tags.LensModel);
  const lensMake = text(tags.LensMake);
  const lens = lensModel ? (lensMake && !lensModel.toLowerCase().startsWith(lensMake.toLowerCase()) ? `${lensMake} ${lensModel}` : lensModel) : null;
  const orientationRaw = num(tags.Orientation);
  const orientation = orientationRaw != null && orientationRaw >= 1 && orientationRaw <= 8 ? orientationRaw : null;

  let gps: PhotoGps | null = null;
  const lat = dms(tags.GPSLatitude) ?? num(tags.latitude);
  const lon = dms(tags.GPSLongitude) ?? num(tags.longitude);
  if (lat != null && lon != null) {
    const la = String(tags.GPSLatitudeRef ?? "N").toUpperCase().startsWith("S") && Array.isArray(tags.GPSLatitude) ? -lat : lat;
    const lo = String(tags.GPSLongitudeRef ?? "E").toUpperCase().startsWith("W") && Array.isArray(tags.GPSLongitude) ? -lon : lon;
    if (Math.abs(la) <= 90 && Math.abs(lo) <= 180 && !(la === 0 && lo === 0)) gps = { lat: Math.round(la * 1e6) / 1e6, lon: Math.round(lo * 1e6) / 1e6 };
  }
  return { capturedAtRaw, capturedOffset, capturedAt, camera, lens, exposure: exposureText(tags), orientation, gps };
}

/** Read the EXIF we keep from image bytes (JPEG, PNG, TIFF, HEIC). A file without EXIF is not an error. */
export async function extractPhotoExif(bytes: Uint8Array): Promise<PhotoExif> {
  try {
    const tags = await exifr.parse(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), {
      tiff: true, exif: true, gps: true, ifd1: false, interop: false,
      xmp: false, icc: false, iptc: false, jfif: false, ihdr: false,
      reviveValues: false, translateValues: false, translateKeys: true, mergeOutput: true,
    });
    return summariseExifTags(tags as Record<string, unknown> | undefined);
  } catch {
    return { ...EMPTY_EXIF };
  }
}
