// Fault: the S3 server stops during an upload. The browser's PUT fails, finalising answers a clear
// "storage unreachable" error, and nothing is recorded (no photo row, no audit event).
import { createHash } from "node:crypto";
import { afterAll, beforeAll, expect, it } from "vitest";
import { and, count, eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { finalizePhotoUpload, presignPhotoUpload } from "@/db/queries/photo-uploads";
import { toAppError } from "@/lib/auth/errors";
import { browserPut, cameraJpeg, createPhotoFixture, type PhotoFixture } from "./photos-fixtures";
import { startS3Fake, stopS3Fake } from "../support/services";

let fx: PhotoFixture;

beforeAll(async () => {
  fx = await createPhotoFixture("Storage outage");
});
afterAll(() => closeDb());

it("fails the upload with a clear message and records nothing while storage is down", async () => {
  const bytes = await cameraJpeg({ shotAt: fx.doneAt });
  const caller = await fx.ctx("technician");
  const pre = await presignPhotoUpload({ caller, input: { inspectionId: fx.inspectionId, specimenId: fx.specimenIds[0], filename: `${fx.labels[0]}.jpg`, contentType: "image/jpeg", sizeBytes: bytes.byteLength, sha256: createHash("sha256").update(bytes).digest("hex") } });
  stopS3Fake();
  let putError: unknown = null;
  let finalizeError: unknown = null;
  try {
    putError = await browserPut(pre, bytes).then(() => null, (e: unknown) => e);
    finalizeError = await finalizePhotoUpload({ caller, token: pre.token, enqueue: async () => undefined }).then(() => null, (e: unknown) => e);
  } finally {
    await startS3Fake();
  }
  expect(putError).toBeInstanceOf(Error); // the browser's upload fails (connection refused)
  // What the finalize route handler answers (jsonError → toAppError): 503 with a plain message.
  const answered = toAppError(finalizeError);
  expect(answered.code).toBe("unavailable");
  expect(answered.message).toMatch(/storage is not reachable.*Nothing was recorded/);
  const [{ n: photos }] = await db.select({ n: count() }).from(s.photos).where(eq(s.photos.labId, fx.lab.labId));
  const [{ n: audits }] = await db.select({ n: count() }).from(s.auditEvents).where(and(eq(s.auditEvents.labId, fx.lab.labId), eq(s.auditEvents.entity, "photo")));
  expect({ photos, audits }).toEqual({ photos: 0, audits: 0 });
}, 60_000);
