// Fixtures for the photo tests: a fresh lab with a running trial, one done inspection, placed
// specimens, and helpers that do what the browser does with a presigned upload.
import { randomUUID } from "node:crypto";
import sharp from "sharp";
import { db } from "@/db/client";
import * as s from "@/db/schema";
import { requireLab } from "@/lib/auth/context";
import type { Role } from "@/lib/auth/permissions";
import type { PresignResult } from "@/db/queries/photo-uploads";
import { createTestLab, type TestLab } from "../support/db";

const DAY = 86_400_000;

export type PhotoFixture = {
  lab: TestLab;
  trialId: string;
  inspectionId: string;
  doneAt: Date;
  specimenIds: string[];
  labels: string[];
  /** The caller as the route handlers see it after session → membership → permission. */
  ctx: (role: Role) => Promise<{ labId: string; userId: string; role: Role }>;
};

export async function createPhotoFixture(name = "Photo lab"): Promise<PhotoFixture> {
  const lab = await createTestLab(name);
  const tag = randomUUID().slice(0, 6);
  const start = new Date(Date.UTC(2026, 9, 8, 9));
  const [chamber] = await db.insert(s.chambers).values({ labId: lab.labId, name: `Jar ${tag}`, kind: "water", nominalTempC: 21, setpointRhPercent: 96, toleranceRhPercent: 4 }).returning();
  const [treatment] = await db.insert(s.treatments).values({ labId: lab.labId, name: `Bare ${tag}`, kind: "control" }).returning();
  const labels = [`PH-${tag}-001`, `PH-${tag}-002`];
  const specimens = await db.insert(s.specimens).values(labels.map((label) => ({ labId: lab.labId, label, materialClass: "iron-meteorite" as const }))).returning();
  const [trial] = await db.insert(s.trials).values({
    labId: lab.labId, title: `Photo trial ${tag}`, question: "Does it rust?", status: "running",
    schedulePlan: { kind: "custom", days: [0, 14] }, startedAt: start, photoProtocol: ["Scale bar in frame"],
  }).returning();
  await db.insert(s.placements).values(specimens.map((sp) => ({ labId: lab.labId, trialId: trial.id, specimenId: sp.id, chamberId: chamber.id, treatmentId: treatment.id, fromAt: start })));
  const doneAt = new Date(start.getTime() + 14 * DAY + 3_600_000);
  const [inspection] = await db.insert(s.inspections).values({ labId: lab.labId, trialId: trial.id, dayNumber: 14, plannedAt: new Date(start.getTime() + 14 * DAY), doneAt }).returning();
  return {
    lab, trialId: trial.id, inspectionId: inspection.id, doneAt, specimenIds: specimens.map((x) => x.id), labels,
    ctx: async (role) => {
      const c = await requireLab(lab.as(role), "lab.read");
      return { labId: c.labId, userId: c.userId, role: c.role };
    },
  };
}

/** "YYYY:MM:DD HH:MM:SS" wall-clock text of an instant at a whole-hour offset. */
export function exifText(at: Date, offsetH: number): string {
  const t = new Date(at.getTime() + offsetH * 3_600_000).toISOString();
  return `${t.slice(0, 10).replace(/-/g, ":")} ${t.slice(11, 19)}`;
}

export function offsetText(offsetH: number): string {
  return `${offsetH < 0 ? "-" : "+"}${String(Math.abs(offsetH)).padStart(2, "0")}:00`;
}

/** A JPEG as a camera would write it: capture time with offset, camera, lens, exposure, optional GPS and orientation. */
export async function cameraJpeg(opts: { shotAt: Date; offsetH?: number; gps?: boolean; orientation?: number; width?: number; height?: number; withOffset?: boolean }) {
  const offsetH = opts.offsetH ?? 1;
  let img = sharp({ create: { width: opts.width ?? 400, height: opts.height ?? 300, channels: 3, background: { r: 140, g: 120, b: 100 } } });
  if (opts.orientation) img = img.withMetadata({ orientation: opts.orientation });
  return img
    .jpeg({ quality: 80 })
    .withExifMerge({
      IFD0: { Make: "Testcam", Model: "Testcam Bench 2", Software: "photos tests" },
      IFD2: {
        DateTimeOriginal: exifText(opts.shotAt, offsetH),
        ...(opts.withOffset === false ? {} : { OffsetTimeOriginal: offsetText(offsetH) }),
        ExposureTime: "1/125", FNumber: "8/1", ISOSpeedRatings: "100", LensModel: "Bench 50 mm",
      },
      ...(opts.gps ? { IFD3: { GPSLatitudeRef: "S", GPSLatitude: "33/1 51/1 0/1", GPSLongitudeRef: "E", GPSLongitude: "151/1 12/1 36/1" } } : {}),
    })
    .toBuffer();
}

export async function pngBytes() {
  return sharp({ create: { width: 64, height: 48, channels: 3, background: { r: 10, g: 200, b: 30 } } }).png().toBuffer();
}

/** PUT bytes to a presigned upload as the browser does (fetch sets Content-Length from the body). */
export function browserPut(pre: PresignResult, body: Uint8Array, headers: Record<string, string> = pre.upload.headers) {
  return fetch(pre.upload.url, { method: "PUT", headers, body: new Uint8Array(body) });
}
