// The orphan sweep: objects under labs/<lab>/photos/ with no photo row are deleted once older than
// an hour (uploads approved but never finalised); objects of recorded photos and fresh uploads stay.
import { createHash, randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "@/db/client";
import { sweepOrphanPhotos, type PhotoProcessJob } from "@/db/jobs/photos";
import { finalizePhotoUpload, presignPhotoUpload } from "@/db/queries/photo-uploads";
import * as s from "@/db/schema";
import { derivativeKey, labPrefix, photoKey } from "@/storage/keys";
import { deleteKeys, headObject, listKeys, putObject } from "@/storage/objects";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { browserPut, cameraJpeg, createPhotoFixture, type PhotoFixture } from "./photos-fixtures";

let s3: S3Fake;
let fx: PhotoFixture;

beforeAll(async () => {
  s3 = await ensureS3Fake();
  fx = await createPhotoFixture("Sweep lab");
});
afterAll(async () => {
  if (fx) {
    const left = await listKeys(labPrefix(fx.lab.labId)).catch(() => []);
    if (left.length) await deleteKeys(left).catch(() => undefined);
  }
  await s3?.stop();
});

describe("orphan sweep", () => {
  it("deletes abandoned uploads older than an hour and keeps recorded photos and fresh uploads", async () => {
    const caller = await fx.ctx("technician");
    const bytes = await cameraJpeg({ shotAt: fx.doneAt });
    const input = { inspectionId: fx.inspectionId, specimenId: fx.specimenIds[0], filename: "k.jpg", contentType: "image/jpeg", sizeBytes: bytes.byteLength, sha256: createHash("sha256").update(bytes).digest("hex") };
    const kept = await presignPhotoUpload({ caller, input });
    expect((await browserPut(kept, bytes)).status).toBe(200);
    await finalizePhotoUpload({ caller, token: kept.token, enqueue: async () => {} });
    const keptPreview = derivativeKey(kept.key, 320);
    await putObject({ key: keptPreview, body: new Uint8Array([1]), contentType: "image/jpeg" });

    const abandoned = await presignPhotoUpload({ caller, input });
    expect((await browserPut(abandoned, bytes)).status).toBe(200);
    const strayPreview = derivativeKey(photoKey({ labId: fx.lab.labId, photoId: randomUUID(), ext: "jpg" }), 1600);
    await putObject({ key: strayPreview, body: new Uint8Array([2]), contentType: "image/jpeg" });

    // Straight away nothing is old enough.
    const now = await sweepOrphanPhotos({ prefix: labPrefix(fx.lab.labId), enqueue: async () => {} });
    expect(now.deleted).toEqual([]);
    expect(await headObject(abandoned.key)).not.toBeNull();

    // Two hours later the abandoned upload and the stray preview go; the recorded photo stays.
    const later = await sweepOrphanPhotos({ prefix: labPrefix(fx.lab.labId), now: new Date(Date.now() + 2 * 3_600_000), enqueue: async () => {} });
    expect(later.deleted.sort()).toEqual([abandoned.key, strayPreview].sort());
    expect(await headObject(abandoned.key)).toBeNull();
    expect(await headObject(strayPreview)).toBeNull();
    expect(await headObject(kept.key)).not.toBeNull();
    expect(await headObject(keptPreview)).not.toBeNull();
  });

  it("queues previews again for photos still pending after ten minutes", async () => {
    const caller = await fx.ctx("technician");
    const bytes = await cameraJpeg({ shotAt: fx.doneAt });
    const pre = await presignPhotoUpload({ caller, input: { inspectionId: fx.inspectionId, specimenId: fx.specimenIds[1], filename: "p.jpg", contentType: "image/jpeg", sizeBytes: bytes.byteLength, sha256: createHash("sha256").update(bytes).digest("hex") } });
    expect((await browserPut(pre, bytes)).status).toBe(200);
    const r = await finalizePhotoUpload({ caller, token: pre.token, enqueue: async () => { throw new Error("queue is down"); } });
    const [row] = await db.select().from(s.photos).where(eq(s.photos.id, r.photo.id));
    expect(row.status).toBe("pending"); // recorded even though the queue refused
    const jobs: PhotoProcessJob[] = [];
    await sweepOrphanPhotos({ prefix: labPrefix(fx.lab.labId), now: new Date(Date.now() + 11 * 60_000), enqueue: async (j) => { jobs.push(j); } });
    expect(jobs).toContainEqual({ photoId: r.photo.id, labId: fx.lab.labId });
  });
});
