// The pure pieces of the photo flow on real bytes: EXIF capture time with its offset read from JPEGs
// written by sharp (independent of the process time zone), the capture-time check, magic bytes,
// file-name → label matching, the upload receipt, and the demo photos' rust planning.
import { afterEach, describe, expect, it } from "vitest";
import { renderSpecimenFace, specimenFaceOutline } from "@/lib/demo-images/specimen-face";
import { formatCaptureTime } from "@/lib/format";
import { checkCaptureTime } from "@/lib/photos/capture-check";
import { contentTypeFor, readPhotoConfig } from "@/lib/photos/config";
import { createSpotPlanner } from "@/lib/photos/demo-spots";
import { exifInstant, extractPhotoExif, normaliseOffset } from "@/lib/photos/exif";
import { cleanFileName, matchSpecimenLabel } from "@/lib/photos/label-match";
import { sniffImageType } from "@/lib/photos/magic";
import { signUploadToken, verifyUploadToken, type UploadClaim } from "@/lib/photos/upload-token";
import { cameraJpeg, pngBytes } from "./photos-fixtures";

const savedTz = process.env.TZ;
afterEach(() => {
  if (savedTz === undefined) delete process.env.TZ;
  else process.env.TZ = savedTz;
  delete process.env.PHOTO_TIME_TOLERANCE_H;
  delete process.env.PHOTO_MAX_BYTES;
});

describe("EXIF capture time", () => {
  it("reads DateTimeOriginal and OffsetTimeOriginal as written, whatever the process time zone", async () => {
    const shotAt = new Date("2026-10-22T15:54:12Z");
    const bytes = await cameraJpeg({ shotAt, offsetH: -5, gps: true });
    for (const tz of ["UTC", "Pacific/Auckland", "America/Los_Angeles"]) {
      process.env.TZ = tz; // exifr's revived Dates would shift with this; the raw text must not
      const exif = await extractPhotoExif(bytes);
      expect(exif.capturedAtRaw).toBe("2026:10:22 10:54:12");
      expect(exif.capturedOffset).toBe("-05:00");
      expect(exif.capturedAt?.toISOString()).toBe("2026-10-22T15:54:12.000Z");
    }
    const exif = await extractPhotoExif(bytes);
    expect(exif.camera).toBe("Testcam Bench 2"); // model already names the make
    expect(exif.lens).toBe("Bench 50 mm");
    expect(exif.exposure).toBe("1/125 s · f/8 · ISO 100");
    expect(exif.gps).toEqual({ lat: -33.85, lon: 151.21 }); // 33° 51′ S, 151° 12′ 36″ E
  });

  it("shows the capture time like every other time (UTC, minutes), whatever the process time zone", async () => {
    // 10:54:12 at UTC−05:00 is 15:54:12 UTC (ISO 8601 offsets, from memory).
    const bytes = await cameraJpeg({ shotAt: new Date("2026-10-22T15:54:12Z"), offsetH: -5 });
    for (const tz of ["UTC", "Pacific/Auckland", "America/Los_Angeles", "Asia/Kolkata"]) {
      process.env.TZ = tz;
      const exif = await extractPhotoExif(bytes);
      expect(formatCaptureTime(exif)).toBe("2026-10-22 15:54 UTC (camera clock at UTC-05:00)");
      // The same once it went through the database and JSON as an ISO string.
      expect(formatCaptureTime({ ...exif, capturedAt: exif.capturedAt!.toISOString() })).toBe("2026-10-22 15:54 UTC (camera clock at UTC-05:00)");
    }
    const local = await extractPhotoExif(await cameraJpeg({ shotAt: new Date("2026-12-02T00:00:00Z"), offsetH: 1, withOffset: false }));
    expect(local.capturedAtRaw).toBe("2026:12:02 01:00:00");
    expect(formatCaptureTime(local)).toBe("2026-12-02 01:00 camera clock, zone not recorded");
    expect(formatCaptureTime({ capturedAt: null, capturedAtRaw: null, capturedOffset: null })).toBe("not recorded");
  });

  it("keeps the local text but no instant when the camera recorded no offset", async () => {
    const exif = await extractPhotoExif(await cameraJpeg({ shotAt: new Date("2026-10-22T09:00:00Z"), offsetH: 2, withOffset: false }));
    expect(exif.capturedAtRaw).toBe("2026:10:22 11:00:00");
    expect(exif.capturedOffset).toBeNull();
    expect(exif.capturedAt).toBeNull();
  });

  it("reads orientation, and a file without EXIF gives an empty summary rather than an error", async () => {
    const turned = await extractPhotoExif(await cameraJpeg({ shotAt: new Date(), orientation: 8 }));
    expect(turned.orientation).toBe(8);
    const none = await extractPhotoExif(await pngBytes());
    expect(none.capturedAtRaw).toBeNull();
    expect(none.gps).toBeNull();
    expect((await extractPhotoExif(new Uint8Array([1, 2, 3]))).camera).toBeNull();
  });

  it("builds instants from EXIF text and refuses impossible dates (EXIF 2.32 DateTime format, OffsetTime '±HH:MM')", () => {
    expect(exifInstant("2026:03:01 00:30:00", "+02:00")?.toISOString()).toBe("2026-02-28T22:30:00.000Z");
    expect(exifInstant("2026:03:01 00:30:00.25", "-09:30")?.toISOString()).toBe("2026-03-01T10:00:00.250Z");
    expect(exifInstant("2026:02:30 10:00:00", "+00:00")).toBeNull();
    expect(exifInstant("0000:00:00 00:00:00", "+00:00")).toBeNull();
    expect(normaliseOffset("Z")).toBe("+00:00");
    expect(normaliseOffset("+0530")).toBe("+05:30");
    expect(normaliseOffset("+25:00")).toBeNull();
  });
});

describe("capture-time check", () => {
  const ref = new Date("2026-10-22T10:00:00Z");
  it("passes within the tolerance and warns beyond it (default 12 h, PHOTO_TIME_TOLERANCE_H)", () => {
    const tol = readPhotoConfig().toleranceH;
    expect(tol).toBe(12);
    expect(checkCaptureTime({ capturedAtRaw: "2026:10:22 22:00:00", capturedOffset: "+01:00", referenceAt: ref, referenceKind: "done", toleranceH: tol }).status).toBe("ok");
    const far = checkCaptureTime({ capturedAtRaw: "2026:10:23 00:00:00", capturedOffset: "+01:00", referenceAt: ref, referenceKind: "done", toleranceH: tol });
    expect(far.status).toBe("far");
    expect(far.differenceH).toBe(13);
    process.env.PHOTO_TIME_TOLERANCE_H = "24";
    expect(readPhotoConfig().toleranceH).toBe(24);
  });

  it("without an offset, warns only when no time zone (UTC−12 … UTC+14) brings the photo within tolerance", () => {
    const base = { capturedOffset: null, referenceAt: ref, referenceKind: "planned" as const, toleranceH: 12 };
    expect(checkCaptureTime({ ...base, capturedAtRaw: "2026:10:23 08:00:00" }).status).toBe("no-offset");
    const far = checkCaptureTime({ ...base, capturedAtRaw: "2026:10:25 10:00:00" });
    expect(far.status).toBe("far");
    expect(far.message).toMatch(/at least/);
    expect(checkCaptureTime({ ...base, capturedAtRaw: null }).status).toBe("no-time");
  });
});

describe("magic bytes and types", () => {
  it("recognises JPEG, PNG, TIFF (both byte orders) and HEIC by their signatures", async () => {
    expect(sniffImageType(await cameraJpeg({ shotAt: new Date() }))).toBe("image/jpeg");
    expect(sniffImageType(await pngBytes())).toBe("image/png");
    expect(sniffImageType(Uint8Array.from([0x49, 0x49, 0x2a, 0x00, 8, 0, 0, 0, 0, 0, 0, 0]))).toBe("image/tiff");
    expect(sniffImageType(Uint8Array.from([0x4d, 0x4d, 0x00, 0x2a, 0, 0, 0, 8, 0, 0, 0, 0]))).toBe("image/tiff");
    const heic = Buffer.concat([Buffer.from([0, 0, 0, 0x18]), Buffer.from("ftypheic"), Buffer.from([0, 0, 0, 0]), Buffer.from("mif1heic")]);
    expect(sniffImageType(heic)).toBe("image/heic");
    const mp4 = Buffer.concat([Buffer.from([0, 0, 0, 0x14]), Buffer.from("ftypisom"), Buffer.from([0, 0, 2, 0]), Buffer.from("isom")]);
    expect(sniffImageType(mp4)).toBeNull();
    expect(sniffImageType(Buffer.from("GIF89a......"))).toBeNull();
  });

  it("claims a type from the browser's type, else the extension", () => {
    expect(contentTypeFor("a.HEIC", "")).toBe("image/heic");
    expect(contentTypeFor("a.tif", "application/octet-stream")).toBe("image/tiff");
    expect(contentTypeFor("a.jpg", "image/jpg")).toBe("image/jpeg");
    expect(contentTypeFor("a.gif", "image/gif")).toBeNull();
    expect(readPhotoConfig().maxBytes).toBe(40 * 1024 * 1024);
  });
});

describe("file name → specimen label", () => {
  const specimens = [{ id: "1", label: "TV-M-001" }, { id: "2", label: "TV-M-0012" }, { id: "3", label: "TV-S-003" }, { id: "4", label: "A-1" }, { id: "5", label: "A-1-b" }];
  it.each([
    ["TV-M-001_day14.jpg", "1"],
    ["tv_m_001 day 14.JPG", "1"],
    ["TVM001.jpg", "1"],
    ["IMG_1234 TV-M-0012.jpg", "2"],
    ["folder/TV-S-003.heic", "3"],
    ["A-1-b_day2.png", "5"],
  ])("%s → specimen %s", (name, id) => {
    const m = matchSpecimenLabel(name, specimens);
    expect(m.kind === "match" && m.id).toBe(id);
  });
  it("finds nothing in an unrelated name, and does not take a label that runs on into more digits", () => {
    expect(matchSpecimenLabel("IMG_2231.jpg", specimens).kind).toBe("none");
    expect(matchSpecimenLabel("TV-M-0013.jpg", specimens).kind).toBe("none");
    expect(matchSpecimenLabel("TV-M-001 and TV-S-003.jpg", specimens).kind).toBe("ambiguous");
    expect(cleanFileName("C:\\photos\\x\u0007.jpg")).toBe("x.jpg");
  });
});

describe("upload receipt", () => {
  const claim: UploadClaim = { key: "labs/l/photos/r/p.jpg", labId: "l", userId: "u", trialId: "t", inspectionId: "i", specimenId: "s", contentType: "image/jpeg", sizeBytes: 10, sha256: "ab".repeat(32), filename: "x.jpg", exp: 2_000_000_000 };
  it("verifies its own signature and refuses changed, foreign-secret or expired receipts", () => {
    const token = signUploadToken(claim, "secret-a");
    expect(verifyUploadToken(token, "secret-a", 1_900_000_000)).toEqual({ ok: true, claim });
    expect(verifyUploadToken(token, "secret-b", 1_900_000_000)).toEqual({ ok: false, reason: "bad-signature" });
    expect(verifyUploadToken(token, "secret-a", 2_000_000_001)).toEqual({ ok: false, reason: "expired" });
    const [, sig] = token.split(".");
    const changed = `${Buffer.from(JSON.stringify({ v: 2, ...claim, sizeBytes: 10_000 })).toString("base64url")}.${sig}`;
    expect(verifyUploadToken(changed, "secret-a", 1_900_000_000).ok).toBe(false);
    expect(verifyUploadToken("not-a-token", "secret-a").ok).toBe(false);
  });
});

describe("demo photo rust", () => {
  it("paints the scored area and never shrinks a spot as the area grows", () => {
    const [w, h] = [400, 300];
    const face = specimenFaceOutline(w, h, "t");
    const planner = createSpotPlanner({ face, width: w, height: h, seed: "t" });
    let previous = planner.spotsFor(0);
    expect(previous).toEqual([]);
    for (const area of [0.05, 0.4, 2, 8, 25]) {
      const spots = planner.spotsFor(area);
      for (const [i, p] of previous.entries()) {
        expect(spots[i].x).toBe(p.x);
        expect(spots[i].r).toBeGreaterThanOrEqual(p.r);
      }
      const img = renderSpecimenFace({ width: w, height: h, seed: "t", kind: "iron", rustSpots: spots });
      // Painted rust within 15 % (relative) or 0.05 points of the target: blobs are not exact circles.
      expect(Math.abs(img.trueRustFraction * 100 - area)).toBeLessThan(Math.max(0.05, area * 0.15));
      previous = spots;
    }
  });
});
