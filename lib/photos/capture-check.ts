// Is the photo's capture time plausibly from this inspection? A photo taken far from the inspection
// usually means the wrong memory card, the wrong day's folder or a camera clock that was never set.
import { exifInstant } from "./exif";

export type CaptureCheck =
  | { status: "ok"; differenceH: number; message: string }
  | { status: "far"; differenceH: number; message: string }
  | { status: "no-offset"; differenceH: number | null; message: string }
  | { status: "no-time"; differenceH: null; message: string };

// Civil time zones run from UTC−12 to UTC+14.
const MIN_OFFSET = "-12:00";
const MAX_OFFSET = "+14:00";

function hours(ms: number): number {
  return Math.round((ms / 3_600_000) * 10) / 10;
}

function describe(diffH: number): string {
  const abs = Math.abs(diffH);
  const span = abs >= 48 ? `${Math.round(abs / 24)} days` : `${abs} h`;
  return diffH < 0 ? `${span} before` : `${span} after`;
}

/**
 * Compare the capture time with the inspection's reference time (done time, else planned time).
 * Without an offset the instant is unknown; we warn only if no time zone on Earth brings it within
 * tolerance, and say that the zone was not recorded.
 */
export function checkCaptureTime(input: {
  capturedAtRaw: string | null;
  capturedOffset: string | null;
  referenceAt: Date;
  referenceKind: "done" | "planned";
  toleranceH: number;
}): CaptureCheck {
  const { capturedAtRaw, capturedOffset, referenceAt, referenceKind, toleranceH } = input;
  const ref = `the inspection's ${referenceKind} time`;
  if (!capturedAtRaw) {
    return { status: "no-time", differenceH: null, message: "No capture time in the photo's EXIF; it cannot be checked against the inspection." };
  }
  if (capturedOffset) {
    const at = exifInstant(capturedAtRaw, capturedOffset);
    if (!at) return { status: "no-time", differenceH: null, message: `The capture time "${capturedAtRaw}" is not a valid date.` };
    const diffH = hours(at.getTime() - referenceAt.getTime());
    if (Math.abs(diffH) > toleranceH) {
      return { status: "far", differenceH: diffH, message: `Taken ${describe(diffH)} ${ref} (tolerance ${toleranceH} h). Wrong card or wrong day?` };
    }
    return { status: "ok", differenceH: diffH, message: `Taken ${describe(diffH)} ${ref}.` };
  }
  // Earliest possible instant is at the easternmost zone, latest at the westernmost.
  const earliest = exifInstant(capturedAtRaw, MAX_OFFSET);
  const latest = exifInstant(capturedAtRaw, MIN_OFFSET);
  if (!earliest || !latest) return { status: "no-time", differenceH: null, message: `The capture time "${capturedAtRaw}" is not a valid date.` };
  const r = referenceAt.getTime();
  const tol = toleranceH * 3_600_000;
  if (latest.getTime() < r - tol || earliest.getTime() > r + tol) {
    const diffH = hours((latest.getTime() < r ? latest.getTime() : earliest.getTime()) - r);
    return { status: "far", differenceH: diffH, message: `Taken at least ${describe(diffH)} ${ref} in any time zone (tolerance ${toleranceH} h; the camera recorded no zone). Wrong card or wrong day?` };
  }
  return { status: "no-offset", differenceH: null, message: `The camera recorded local time ${capturedAtRaw} without a zone; it fits ${ref} only if the zone is right.` };
}
