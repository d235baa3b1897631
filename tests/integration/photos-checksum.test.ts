// A photo's bytes cannot be replaced after finalise checked their type and SHA-256, even while the
// presigned PUT is still valid and even once the trial is concluded: the URL signs the checksum
// header and storage compares it with the body. Written as someone replaying the URL they were given.
// AWS S3 API reference: PutObject, x-amz-checksum-sha256 (base64 SHA-256 of the body; a mismatch
// answers 400 BadDigest) and "Checking object integrity"; Signature Version 4, signed headers.
import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "@/db/client";
import { finalizePhotoUpload, presignPhotoUpload } from "@/db/queries/photo-uploads";
import type { PhotoProcessJob } from "@/db/jobs/photos";
import * as s from "@/db/schema";
import { AppError } from "@/lib/auth/errors";
import { presignRequestSchema } from "@/lib/photos/schemas";
import { labPrefix } from "@/storage/keys";
import { deleteKeys, getObjectBytes, headObject, listKeys, putObject } from "@/storage/objects";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { browserPut, cameraJpeg, createPhotoFixture, type PhotoFixture } from "./photos-fixtures";

let s3: S3Fake;
let fx: PhotoFixture;
const enqueue = async (_job: PhotoProcessJob) => {};
const sha256 = (b: Uint8Array) => createHash("sha256").update(b).digest();

beforeAll(async () => {
  s3 = await ensureS3Fake();
  fx = await createPhotoFixture("Checksum lab");
});
afterAll(async () => {
  if (fx) {
    const left = await listKeys(labPrefix(fx.lab.labId)).catch(() => []);
    if (left.length) await deleteKeys(left).catch(() => undefined);
  }
  await s3?.stop();
});

async function presign(bytes: Uint8Array, claimed = sha256(bytes).toString("hex")) {
  return presignPhotoUpload({
    caller: await fx.ctx("technician"),
    input: { inspectionId: fx.inspectionId, specimenId: fx.specimenIds[0], filename: `${fx.labels[0]}.jpg`, contentType: "image/jpeg", sizeBytes: bytes.byteLength, sha256: claimed },
  });
}

/** Another camera JPEG of exactly the same length, so content-length alone cannot tell them apart. */
function sameLengthOther(bytes: Uint8Array): Uint8Array {
  const other = new Uint8Array(bytes);
  other[other.length - 3] ^= 0xff; // inside the entropy-coded data, before the end marker
  return other;
}

describe("presigned PUT bound to a SHA-256", () => {
  it("signs x-amz-checksum-sha256 into the URL and hands the browser the header to send", async () => {
    const bytes = await cameraJpeg({ shotAt: fx.doneAt });
    const pre = await presign(bytes);
    expect(pre.upload.headers["x-amz-checksum-sha256"]).toBe(sha256(bytes).toString("base64"));
    expect(new URL(pre.upload.url).searchParams.get("X-Amz-SignedHeaders")!.split(";")).toContain("x-amz-checksum-sha256");
  });

  it("after finalise, and after the trial is concluded, a second PUT with other bytes is refused and the photo stays as checked", async () => {
    const bytes = await cameraJpeg({ shotAt: fx.doneAt });
    const pre = await presign(bytes);
    expect((await browserPut(pre, bytes)).status).toBe(200);
    const done = await finalizePhotoUpload({ caller: await fx.ctx("technician"), token: pre.token, enqueue });
    expect(done.photo.sha256).toBe(sha256(bytes).toString("hex"));
    await db.update(s.trials).set({ status: "concluded", concludedAt: new Date() }).where(eq(s.trials.id, fx.trialId));

    const swapped = sameLengthOther(bytes);
    // The same URL and headers, other bytes: the checksum no longer matches the body.
    const replay = await browserPut(pre, swapped);
    expect(replay.status).toBe(400);
    expect(await replay.text()).toContain("<Code>BadDigest</Code>");
    // The same URL with the checksum of the new bytes: the signed header changed.
    const reHashed = await browserPut(pre, swapped, { ...pre.upload.headers, "x-amz-checksum-sha256": sha256(swapped).toString("base64") });
    expect(reHashed.status).toBe(403);
    expect(await reHashed.text()).toContain("SignatureDoesNotMatch");
    // The same URL with the checksum header left out.
    const bare = await browserPut(pre, swapped, { "Content-Type": pre.upload.headers["Content-Type"] });
    expect(bare.status).toBe(403);

    const stored = await getObjectBytes(pre.key);
    expect(sha256(stored!).toString("hex")).toBe(done.photo.sha256);
  });

  it("a browser whose file changed after hashing cannot store the changed bytes, so nothing is recorded", async () => {
    await db.update(s.trials).set({ status: "running", concludedAt: null }).where(eq(s.trials.id, fx.trialId));
    const bytes = await cameraJpeg({ shotAt: fx.doneAt });
    const pre = await presign(bytes);
    expect((await browserPut(pre, sameLengthOther(bytes))).status).toBe(400);
    const err = await finalizePhotoUpload({ caller: await fx.ctx("technician"), token: pre.token, enqueue }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(AppError);
    expect((err as AppError).code).toBe("not-found");
  });

  it("finalise refuses bytes other than the signed checksum, as a store that skips the check would keep them", async () => {
    const bytes = await cameraJpeg({ shotAt: fx.doneAt });
    const pre = await presign(bytes);
    // Written past the presigned URL, as a store that ignores x-amz-checksum-sha256 would accept.
    await putObject({ key: pre.key, body: sameLengthOther(bytes), contentType: "image/jpeg" });
    const err = await finalizePhotoUpload({ caller: await fx.ctx("technician"), token: pre.token, enqueue }).catch((e: unknown) => e);
    expect((err as AppError).code).toBe("invalid");
    expect((err as AppError).message).toMatch(/SHA-256 differs/);
    expect(await headObject(pre.key)).toBeNull();
  });

  it("refuses a presign request without a well-formed SHA-256", () => {
    const base = { inspectionId: fx.inspectionId, specimenId: fx.specimenIds[0], filename: "a.jpg", contentType: "image/jpeg", sizeBytes: 10 };
    expect(presignRequestSchema.safeParse(base).success).toBe(false);
    expect(presignRequestSchema.safeParse({ ...base, sha256: "ab".repeat(31) }).success).toBe(false);
    expect(presignRequestSchema.safeParse({ ...base, sha256: "zz".repeat(32) }).success).toBe(false);
    expect(presignRequestSchema.safeParse({ ...base, sha256: "AB".repeat(32) }).data?.sha256).toBe("ab".repeat(32));
  });
});
