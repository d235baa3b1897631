// Who can see a photo: signed URLs only after the lab check (another lab's member gets 404), the
// original (which keeps its EXIF location) only for roles with photos.gps, no location for
// observers anywhere, and no treatment or score of record for a blind scorer.
import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import exifr from "exifr";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "@/db/client";
import { processPhoto, type PhotoProcessJob } from "@/db/jobs/photos";
import { finalizePhotoUpload, presignPhotoUpload } from "@/db/queries/photo-uploads";
import { getSpecimenTimeline, getTrialGrid } from "@/db/queries/photo-timeline";
import { listInspectionPhotos, photoDetails, photoFileTarget } from "@/db/queries/photos";
import { signPhotoFile } from "@/storage/photo-urls";
import * as s from "@/db/schema";
import { AppError } from "@/lib/auth/errors";
import { labPrefix } from "@/storage/keys";
import { deleteKeys, listKeys } from "@/storage/objects";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { browserPut, cameraJpeg, createPhotoFixture, type PhotoFixture } from "./photos-fixtures";

/** What the file route does: the checked target, then its signed URL. */
const photoFileUrl = async (args: Parameters<typeof photoFileTarget>[0]) => signPhotoFile(await photoFileTarget(args));

let s3: S3Fake;
let fx: PhotoFixture;
let other: PhotoFixture;
let photoId = "";

beforeAll(async () => {
  s3 = await ensureS3Fake();
  fx = await createPhotoFixture("Access lab");
  other = await createPhotoFixture("Other access lab");
  const bytes = await cameraJpeg({ shotAt: fx.doneAt, gps: true });
  const caller = await fx.ctx("technician");
  const pre = await presignPhotoUpload({ caller, input: { inspectionId: fx.inspectionId, specimenId: fx.specimenIds[0], filename: "a.jpg", contentType: "image/jpeg", sizeBytes: bytes.byteLength, sha256: createHash("sha256").update(bytes).digest("hex") } });
  expect((await browserPut(pre, bytes)).status).toBe(200);
  const jobs: PhotoProcessJob[] = [];
  const r = await finalizePhotoUpload({ caller, token: pre.token, enqueue: async (j) => { jobs.push(j); } });
  photoId = r.photo.id;
  expect(await processPhoto(jobs[0])).toBe("ready");
});

afterAll(async () => {
  for (const f of [fx, other]) {
    if (!f) continue;
    const left = await listKeys(labPrefix(f.lab.labId)).catch(() => []);
    if (left.length) await deleteKeys(left).catch(() => undefined);
  }
  await s3?.stop();
});

async function codeOf(p: Promise<unknown>) {
  const e = await p.then(() => null, (err: unknown) => err);
  return e instanceof AppError ? e.code : e;
}

describe("signed URLs", () => {
  it("a member of another lab cannot get a signed URL or the record of this lab's photo (404)", async () => {
    for (const role of ["lead", "technician", "observer"] as const) {
      const ctx = await other.ctx(role);
      for (const variant of ["thumb", "display", "original"] as const) {
        expect(await codeOf(photoFileUrl({ ctx, photoId, variant }))).toBe("not-found");
      }
      expect(await codeOf(photoDetails({ ctx, photoId }))).toBe("not-found");
      expect(await getSpecimenTimeline({ labId: ctx.labId, specimenId: fx.specimenIds[0], userId: ctx.userId, role })).toBeNull();
      expect(await getTrialGrid({ labId: ctx.labId, trialId: fx.trialId, userId: ctx.userId, role })).toBeNull();
    }
  });

  it("every member of the lab gets a short-lived preview URL that the private bucket honours", async () => {
    const { url, expiresInS } = await photoFileUrl({ ctx: await fx.ctx("observer"), photoId, variant: "thumb" });
    expect(expiresInS).toBe(300);
    expect(new URL(url).searchParams.get("X-Amz-Expires")).toBe("300");
    const res = await fetch(url);
    expect(res.status).toBe(200);
    const bytes = new Uint8Array(await res.arrayBuffer());
    expect([bytes[0], bytes[1], bytes[2]]).toEqual([0xff, 0xd8, 0xff]);
    // The same key without a signature is refused: the bucket is private.
    const bare = new URL(url);
    bare.search = "";
    expect((await fetch(bare)).status).toBe(403);
  });
});

describe("location (GPS) is for photos.gps roles only", () => {
  it("observers get no coordinates and no original; technicians get both, and the original keeps the location", async () => {
    const asObserver = await photoDetails({ ctx: await fx.ctx("observer"), photoId });
    expect(asObserver.gps).toBeNull();
    expect(asObserver.gpsHidden).toBe(true);
    expect(asObserver.originalUrl).toBeNull();
    expect(JSON.stringify(asObserver)).not.toMatch(/151\.21|-33\.85/);
    expect(await codeOf(photoFileUrl({ ctx: await fx.ctx("observer"), photoId, variant: "original" }))).toBe("forbidden");

    const asTech = await photoDetails({ ctx: await fx.ctx("technician"), photoId });
    expect(asTech.gps).toEqual({ lat: -33.85, lon: 151.21 });
    expect(asTech.gpsHidden).toBe(false);
    const original = await fetch((await photoFileUrl({ ctx: await fx.ctx("technician"), photoId, variant: "original" })).url);
    expect(original.status).toBe(200);
    const gps = await exifr.gps(new Uint8Array(await original.arrayBuffer()));
    expect(gps.latitude).toBeCloseTo(-33.85, 4);
  });

  it("the inspection list, timeline and grid carry no coordinates for observers", async () => {
    const obs = await fx.ctx("observer");
    const [inspection] = await db.select().from(s.inspections).where(eq(s.inspections.id, fx.inspectionId));
    const list = await listInspectionPhotos({ labId: fx.lab.labId, inspectionId: fx.inspectionId, role: "observer", reference: { at: inspection.doneAt!, kind: "done" } });
    const timeline = await getSpecimenTimeline({ labId: obs.labId, specimenId: fx.specimenIds[0], userId: obs.userId, role: "observer" });
    const grid = await getTrialGrid({ labId: obs.labId, trialId: fx.trialId, userId: obs.userId, role: "observer" });
    const all = [...list, ...timeline!.trials.flatMap((t) => t.entries.flatMap((e) => e.photos)), ...grid!.cells.flatMap((c) => c.photos)];
    expect(all.length).toBe(3);
    for (const p of all) {
      expect(p.gps).toBeNull();
      expect(p.gpsHidden).toBe(true);
    }
  });
});

describe("blind scorers", () => {
  it("see photos but not the treatment arm or the score of record", async () => {
    const [placement] = await db.select().from(s.placements).where(eq(s.placements.trialId, fx.trialId));
    const [arm] = await db.insert(s.trialArms).values({ labId: fx.lab.labId, trialId: fx.trialId, chamberId: placement.chamberId, treatmentId: placement.treatmentId, label: "Wet / bare" }).returning();
    await db.update(s.placements).set({ armId: arm.id }).where(eq(s.placements.trialId, fx.trialId));
    await db.insert(s.scores).values({ labId: fx.lab.labId, trialId: fx.trialId, inspectionId: fx.inspectionId, specimenId: fx.specimenIds[0], scorerId: fx.lab.users.technician.id, areaPercent: 1.5, astmGrade: 6, astmLetter: "S", isRecord: true });
    await db.insert(s.trialMembers).values({ trialId: fx.trialId, userId: fx.lab.users.researcher.id, labId: fx.lab.labId, role: "scorer", blind: true });

    const tech = await getSpecimenTimeline({ labId: fx.lab.labId, specimenId: fx.specimenIds[0], userId: fx.lab.users.technician.id, role: "technician" });
    expect(tech!.trials[0].armLabel).toBe("Wet / bare");
    expect(tech!.trials[0].entries[0].score?.areaPercent).toBe(1.5);
    const blind = await getSpecimenTimeline({ labId: fx.lab.labId, specimenId: fx.specimenIds[0], userId: fx.lab.users.researcher.id, role: "researcher" });
    expect(blind!.trials[0].blind).toBe(true);
    expect(blind!.trials[0].armLabel).toBeNull();
    expect(blind!.trials[0].entries[0].score).toBeNull();
    expect(blind!.trials[0].entries[0].photos).toHaveLength(1);
    const grid = await getTrialGrid({ labId: fx.lab.labId, trialId: fx.trialId, userId: fx.lab.users.researcher.id, role: "researcher" });
    expect(grid!.cells.every((c) => c.score === null && c.armLabel === null)).toBe(true);
  });
});
