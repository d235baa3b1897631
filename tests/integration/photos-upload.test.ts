// The upload flow end to end against the real database and the SigV4-verifying S3 fake: presign →
// browser-style PUT → finalize → previews; and every way an upload can go wrong leaving no photo row.
// HTTP statuses of refused S3 requests follow the Amazon S3 API Reference, "Error responses" (from memory).
import { createHash } from "node:crypto";
import { and, count, eq } from "drizzle-orm";
import exifr from "exifr";
import sharp from "sharp";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { db } from "@/db/client";
import { finalizePhotoUpload, presignPhotoUpload } from "@/db/queries/photo-uploads";
import { processPhoto, type PhotoProcessJob } from "@/db/jobs/photos";
import * as s from "@/db/schema";
import { AppError } from "@/lib/auth/errors";
import { requireLab } from "@/lib/auth/context";
import { labPrefix } from "@/storage/keys";
import { deleteKeys, getObjectBytes, headObject, listKeys } from "@/storage/objects";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { browserPut, cameraJpeg, createPhotoFixture, pngBytes, type PhotoFixture } from "./photos-fixtures";

let s3: S3Fake;
let fx: PhotoFixture;
let queued: PhotoProcessJob[] = [];
const enqueue = async (job: PhotoProcessJob) => { queued.push(job); };

beforeAll(async () => {
  s3 = await ensureS3Fake();
  fx = await createPhotoFixture();
});
beforeEach(() => { queued = []; delete process.env.PHOTO_MAX_BYTES; });
afterAll(async () => {
  if (fx) {
    const left = await listKeys(labPrefix(fx.lab.labId)).catch(() => []);
    if (left.length) await deleteKeys(left).catch(() => undefined);
  }
  await s3?.stop();
});

async function photoRows() {
  const [{ n }] = await db.select({ n: count() }).from(s.photos).where(eq(s.photos.labId, fx.lab.labId));
  return n;
}
async function photoAudits() {
  const [{ n }] = await db.select({ n: count() }).from(s.auditEvents).where(and(eq(s.auditEvents.labId, fx.lab.labId), eq(s.auditEvents.entity, "photo")));
  return n;
}

async function presign(bytes: Uint8Array, over: Partial<{ contentType: string; sizeBytes: number; specimenId: string; inspectionId: string; filename: string }> = {}, expiresInS?: number) {
  const caller = await fx.ctx("technician");
  return presignPhotoUpload({
    caller,
    expiresInS,
    input: { inspectionId: fx.inspectionId, specimenId: fx.specimenIds[0], filename: `${fx.labels[0]}_day14.jpg`, contentType: "image/jpeg", sizeBytes: bytes.byteLength, sha256: createHash("sha256").update(bytes).digest("hex"), ...over },
  });
}

async function expectAppError(p: Promise<unknown>, code: AppError["code"], message?: RegExp) {
  const err = await p.then(() => null, (e: unknown) => e);
  expect(err).toBeInstanceOf(AppError);
  expect((err as AppError).code).toBe(code);
  if (message) expect((err as AppError).message).toMatch(message);
}

describe("presigned upload round trip", () => {
  it("uploads through the fake, records checksum, EXIF and an audit event, then makes stripped, oriented previews", async () => {
    const shotAt = new Date(fx.doneAt.getTime() - 20 * 60_000);
    // Orientation 6 = rotate 90° clockwise to display (EXIF 2.32, tag 0x0112).
    const bytes = await cameraJpeg({ shotAt, offsetH: -5, gps: true, orientation: 6, width: 400, height: 300 });
    const pre = await presign(bytes);
    expect(pre.key.startsWith(`labs/${fx.lab.labId}/photos/`)).toBe(true);
    expect(new URL(pre.upload.url).searchParams.get("X-Amz-Expires")).toBe("300");
    expect(new URL(pre.upload.url).searchParams.get("X-Amz-SignedHeaders")?.split(";")).toEqual(expect.arrayContaining(["content-length", "content-type"]));
    expect(await photoRows()).toBe(0); // presign records nothing

    const put = await browserPut(pre, bytes);
    expect(put.status).toBe(200);
    const caller = await fx.ctx("technician");
    const r = await finalizePhotoUpload({ caller, token: pre.token, enqueue });
    expect(r.alreadyFinalized).toBe(false);
    expect(r.photo.sha256).toBe(createHash("sha256").update(bytes).digest("hex"));
    expect(r.photo.capturedOffset).toBe("-05:00");
    expect(r.check.status).toBe("ok");
    expect(r.warnings).toEqual([]);
    expect(queued).toEqual([{ photoId: r.photo.id, labId: fx.lab.labId }]);

    const [row] = await db.select().from(s.photos).where(eq(s.photos.id, r.photo.id));
    expect(row).toMatchObject({ status: "pending", specimenId: fx.specimenIds[0], inspectionId: fx.inspectionId, sizeBytes: bytes.byteLength, camera: "Testcam Bench 2", lens: "Bench 50 mm", orientation: 6 });
    expect(row.capturedAt?.toISOString()).toBe(new Date(Math.floor(shotAt.getTime() / 1000) * 1000).toISOString());
    expect(row.gps).toEqual({ lat: -33.85, lon: 151.21 });
    const [audit] = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.entity, "photo"), eq(s.auditEvents.entityId, row.id)));
    expect(audit.action).toBe("create");
    expect(JSON.stringify(audit.after)).not.toMatch(/151\.21|33\.85/); // observers read the audit trail

    expect(await processPhoto(queued[0])).toBe("ready");
    const [ready] = await db.select().from(s.photos).where(eq(s.photos.id, r.photo.id));
    expect(ready.status).toBe("ready");
    expect([ready.width, ready.height]).toEqual([300, 400]); // turned upright
    for (const [name, px] of [["thumb", 320], ["display", 1600]] as const) {
      const d = await getObjectBytes(ready.derivatives[name]);
      expect(d).not.toBeNull();
      const meta = await sharp(d!).metadata();
      expect(meta.format).toBe("jpeg");
      expect(Math.max(meta.width!, meta.height!)).toBe(Math.min(px, 400));
      expect(meta.height! > meta.width!).toBe(true); // orientation applied to the pixels
      expect(meta.exif).toBeUndefined(); // metadata stripped: no EXIF, so no GPS
      expect(await exifr.gps(d!).catch(() => undefined)).toBeUndefined();
    }
    expect(await processPhoto(queued[0])).toBe("already");
  });

  it("finalising twice is harmless: one row, one audit event, the same photo", async () => {
    const bytes = await cameraJpeg({ shotAt: fx.doneAt });
    const pre = await presign(bytes);
    expect((await browserPut(pre, bytes)).status).toBe(200);
    const caller = await fx.ctx("technician");
    const before = await photoRows();
    const [a, b] = await Promise.all([finalizePhotoUpload({ caller, token: pre.token, enqueue }), finalizePhotoUpload({ caller, token: pre.token, enqueue })]);
    const c = await finalizePhotoUpload({ caller, token: pre.token, enqueue });
    expect(new Set([a.photo.id, b.photo.id, c.photo.id]).size).toBe(1);
    expect([a.alreadyFinalized, b.alreadyFinalized].sort()).toEqual([false, true]);
    expect(c.alreadyFinalized).toBe(true);
    expect(await photoRows()).toBe(before + 1);
    const [{ n }] = await db.select({ n: count() }).from(s.auditEvents).where(and(eq(s.auditEvents.entity, "photo"), eq(s.auditEvents.entityId, a.photo.id)));
    expect(n).toBe(1);
    expect(queued).toHaveLength(1);
  });

  it("warns when the capture time is far from the inspection, and about a file uploaded before", async () => {
    const bytes = await cameraJpeg({ shotAt: new Date(fx.doneAt.getTime() - 2 * 86_400_000) });
    const caller = await fx.ctx("technician");
    const results = [];
    for (let i = 0; i < 2; i++) {
      const pre = await presign(bytes);
      expect((await browserPut(pre, bytes)).status).toBe(200);
      results.push(await finalizePhotoUpload({ caller, token: pre.token, enqueue }));
    }
    expect(results[0].check.status).toBe("far");
    expect(results[0].warnings[0]).toMatch(/2 days before the inspection's done time \(tolerance 12 h\)/);
    expect(results[1].warnings.some((w) => /same file was uploaded before/.test(w))).toBe(true);
  });
  it("keeps a HEIC photo and its record, but marks that no preview can be made on this server", async () => {
    // ISO-BMFF "ftyp" box with the HEIC brand (ISO/IEC 23008-12), then filler: enough for the checks.
    const heic = new Uint8Array(Buffer.concat([Buffer.from([0, 0, 0, 0x18]), Buffer.from("ftypheic"), Buffer.from([0, 0, 0, 0]), Buffer.from("mif1heic"), Buffer.alloc(2000, 7)]));
    const pre = await presign(heic, { contentType: "image/heic", filename: `${fx.labels[1]}.heic` });
    expect(pre.key.endsWith(".heic")).toBe(true);
    expect((await browserPut(pre, heic)).status).toBe(200);
    const r = await finalizePhotoUpload({ caller: await fx.ctx("technician"), token: pre.token, enqueue });
    expect(r.check.status).toBe("no-time");
    expect(await processPhoto(queued[0])).toBe("failed");
    const [row] = await db.select().from(s.photos).where(eq(s.photos.id, r.photo.id));
    expect(row.status).toBe("failed");
    expect(row.processingNote).toMatch(/cannot decode HEIC/);
    expect(await headObject(row.objectKey)).not.toBeNull(); // the original is kept
  });
});

describe("refused uploads record nothing", () => {
  it("refuses types other than JPEG, PNG, TIFF and HEIC at presign", async () => {
    const before = await photoRows();
    await expectAppError(presign(new Uint8Array(100), { contentType: "image/gif" }), "invalid", /Only JPEG, PNG, TIFF, HEIC/);
    await expectAppError(presign(new Uint8Array(100), { contentType: "application/pdf" }), "invalid");
    expect(await photoRows()).toBe(before);
  });

  it("refuses files over PHOTO_MAX_BYTES at presign, and a body longer than the signed length at storage", async () => {
    process.env.PHOTO_MAX_BYTES = "5000";
    await expectAppError(presign(new Uint8Array(5001)), "too-large", /limit is 5 KB/);
    const bytes = await cameraJpeg({ shotAt: fx.doneAt });
    const pre = await presign(bytes.subarray(0, 100));
    const before = await photoRows();
    const put = await fetch(pre.upload.url, { method: "PUT", headers: { ...pre.upload.headers }, body: new Uint8Array(bytes) });
    expect(put.status).toBe(403); // content-length is signed: SignatureDoesNotMatch
    expect(await headObject(pre.key)).toBeNull();
    await expectAppError(finalizePhotoUpload({ caller: await fx.ctx("technician"), token: pre.token, enqueue }), "not-found", /did not arrive/);
    expect(await photoRows()).toBe(before);
  });

  it("refuses a tampered signature, another content type and an expired URL at storage; finalize then finds nothing", async () => {
    const bytes = await cameraJpeg({ shotAt: fx.doneAt });
    const caller = await fx.ctx("technician");
    const before = [await photoRows(), await photoAudits()];

    const tampered = await presign(bytes);
    const url = new URL(tampered.upload.url);
    const sig = url.searchParams.get("X-Amz-Signature")!;
    url.searchParams.set("X-Amz-Signature", sig.slice(0, -1) + (sig.endsWith("0") ? "1" : "0"));
    expect((await fetch(url, { method: "PUT", headers: tampered.upload.headers, body: new Uint8Array(bytes) })).status).toBe(403);

    const wrongType = await presign(bytes);
    expect((await browserPut(wrongType, bytes, { "Content-Type": "image/png" })).status).toBe(403);

    const expired = await presign(bytes, {}, 1);
    await new Promise((r) => setTimeout(r, 2100));
    const late = await browserPut(expired, bytes);
    expect(late.status).toBe(403);
    expect(await late.text()).toContain("Request has expired");

    for (const pre of [tampered, wrongType, expired]) {
      expect(await headObject(pre.key)).toBeNull();
      await expectAppError(finalizePhotoUpload({ caller, token: pre.token, enqueue }), "not-found");
    }
    expect([await photoRows(), await photoAudits()]).toEqual(before);
    expect(queued).toEqual([]);
  });

  it("refuses a forged or altered receipt, and another person's or lab's receipt", async () => {
    const bytes = await cameraJpeg({ shotAt: fx.doneAt });
    const pre = await presign(bytes);
    expect((await browserPut(pre, bytes)).status).toBe(200);
    const before = await photoRows();
    const [payload, sig] = pre.token.split(".");
    const claim = JSON.parse(Buffer.from(payload, "base64url").toString());
    const altered = `${Buffer.from(JSON.stringify({ ...claim, specimenId: fx.specimenIds[1] })).toString("base64url")}.${sig}`;
    await expectAppError(finalizePhotoUpload({ caller: await fx.ctx("technician"), token: altered, enqueue }), "invalid", /not valid/);
    await expectAppError(finalizePhotoUpload({ caller: await fx.ctx("researcher"), token: pre.token, enqueue }), "not-found");
    const other = await createPhotoFixture("Other lab");
    await expectAppError(finalizePhotoUpload({ caller: await other.ctx("technician"), token: pre.token, enqueue }), "not-found");
    expect(await photoRows()).toBe(before);
  });

  it("refuses content whose magic bytes do not match the claimed type, and deletes the object", async () => {
    const png = await pngBytes();
    const pre = await presign(png, { contentType: "image/jpeg", filename: "looks-like.jpg" });
    expect((await browserPut(pre, png)).status).toBe(200);
    expect(await headObject(pre.key)).not.toBeNull();
    const before = await photoRows();
    await expectAppError(finalizePhotoUpload({ caller: await fx.ctx("technician"), token: pre.token, enqueue }), "invalid", /content is a PNG, not the JPEG/);
    expect(await headObject(pre.key)).toBeNull();
    expect(await photoRows()).toBe(before);
  });

  it("checks role, lab, inspection, specimen placement and a concluded trial before signing anything", async () => {
    await expectAppError(requireLab(fx.lab.as("observer"), "photos.upload"), "forbidden");
    const other = await createPhotoFixture("Stranger lab");
    await expectAppError(presign(new Uint8Array(10), { inspectionId: other.inspectionId }), "not-found");
    await expectAppError(presign(new Uint8Array(10), { specimenId: other.specimenIds[0] }), "invalid", /not in this trial/);
    await db.update(s.trials).set({ status: "concluded" }).where(eq(s.trials.id, other.trialId));
    await expectAppError(presignPhotoUpload({ caller: await other.ctx("technician"), input: { inspectionId: other.inspectionId, specimenId: other.specimenIds[0], filename: "x.jpg", contentType: "image/jpeg", sizeBytes: 10, sha256: "ab".repeat(32) } }), "locked");
  });
});
