// Display formats used across pages. Times show in UTC with the zone named, so colleagues in
// different places read the same instant.
export function formatDateTime(d: Date | string): string {
  const date = typeof d === "string" ? new Date(d) : d;
  return `${date.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

export function formatDate(d: Date | string): string {
  const date = typeof d === "string" ? new Date(d) : d;
  return date.toISOString().slice(0, 10);
}

export function formatNumber(x: number | null | undefined, digits = 1, unit = ""): string {
  if (x == null || !Number.isFinite(x)) return "—";
  return `${x.toFixed(digits)}${unit ? `\u202f${unit}` : ""}`;
}

const EXIF_TEXT = /^(\d{4}):(\d{2}):(\d{2})[ T](\d{2}):(\d{2})/;

/**
 * A photo's capture time as other times are shown: the instant in UTC when the camera recorded its
 * zone, else the camera's own wall-clock time, said to be so. `capturedAt` is the instant computed from
 * the EXIF text and offset on the server (never exifr's Date, which follows the process time zone).
 */
export function formatCaptureTime(p: { capturedAt: Date | string | null; capturedAtRaw: string | null; capturedOffset: string | null }): string {
  if (p.capturedAt) return `${formatDateTime(p.capturedAt)}${p.capturedOffset ? ` (camera clock at UTC${p.capturedOffset})` : ""}`;
  if (!p.capturedAtRaw) return "not recorded";
  const m = p.capturedAtRaw.match(EXIF_TEXT);
  if (!m) return `${p.capturedAtRaw} (camera clock, not a valid date)`;
  return `${m[1]}-${m[2]}-${m[3]} ${m[4]}:${m[5]} camera clock, zone not recorded`;
}
