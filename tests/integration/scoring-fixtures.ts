// Fixtures for the scoring tests (integration and e2e): a running trial with placed specimens and
// done inspections, and ready photos made here (synthetic face → JPEG → S3 fake → photos row), so
// the tests do not depend on the photo-upload code.
import { randomUUID } from "node:crypto";
import sharp from "sharp";
import { db } from "@/db/client";
import * as s from "@/db/schema";
import type { GreyPatch, LightingShift } from "@/lib/demo-images/photo-effects";
import { renderSpecimenFace, scatterRustSpots, specimenFaceOutline, type RustSpot } from "@/lib/demo-images/specimen-face";
import type { Point } from "@/lib/scoring/geometry";
import { derivativeKey, photoKey } from "@/storage/keys";
import { putObject } from "@/storage/objects";

const DAY = 86_400_000;

export type ScoringTrial = {
  trialId: string;
  specimenIds: string[];
  inspectionIds: string[];
  days: number[];
  chamberId: string;
  treatmentId: string;
};

/** A running trial in `labId` with `specimens` placed specimens and done inspections on `days`. */
export async function createScoringTrial(opts: {
  labId: string;
  createdBy: string;
  primaryScorerId?: string | null;
  scoreRule?: "primary-scorer" | "consensus";
  specimens?: number;
  days?: number[];
  tag?: string;
}): Promise<ScoringTrial> {
  const tag = opts.tag ?? randomUUID().slice(0, 8);
  const days = opts.days ?? [0, 7, 14, 28];
  const start = new Date(Date.now() - 60 * DAY);
  const [chamber] = await db.insert(s.chambers).values({
    labId: opts.labId, name: `Jar ${tag}`, kind: "water", nominalTempC: 21, setpointRhPercent: 96, toleranceRhPercent: 4,
  }).returning();
  const [treatment] = await db.insert(s.treatments).values({ labId: opts.labId, name: `Bare ${tag}`, kind: "control" }).returning();
  const specimenRows = await db.insert(s.specimens).values(
    Array.from({ length: opts.specimens ?? 2 }, (_, i) => ({ labId: opts.labId, label: `SC-${tag}-${i + 1}`, materialClass: "iron-meteorite" as const })),
  ).returning();
  const [trial] = await db.insert(s.trials).values({
    labId: opts.labId, title: `Scoring trial ${tag}`, question: "Does it rust?", status: "running",
    schedulePlan: { kind: "custom", days }, scoreRule: opts.scoreRule ?? "primary-scorer",
    primaryScorerId: opts.primaryScorerId ?? null, startedAt: start, createdBy: opts.createdBy,
  }).returning();
  const [arm] = await db.insert(s.trialArms).values({ labId: opts.labId, trialId: trial.id, chamberId: chamber.id, treatmentId: treatment.id, label: `arm ${tag}` }).returning();
  await db.insert(s.placements).values(specimenRows.map((sp) => ({
    labId: opts.labId, trialId: trial.id, specimenId: sp.id, armId: arm.id, chamberId: chamber.id, treatmentId: treatment.id, fromAt: start,
  })));
  const inspectionRows = await db.insert(s.inspections).values(days.map((d) => ({
    labId: opts.labId, trialId: trial.id, dayNumber: d, plannedAt: new Date(start.getTime() + d * DAY), doneAt: new Date(start.getTime() + d * DAY + 3_600_000),
  }))).returning();
  return {
    trialId: trial.id,
    specimenIds: specimenRows.map((r) => r.id),
    inspectionIds: inspectionRows.sort((a, b) => a.dayNumber - b.dayNumber).map((r) => r.id),
    days,
    chamberId: chamber.id,
    treatmentId: treatment.id,
  };
}

export type MadePhoto = { photoId: string; width: number; height: number; face: Point[]; objectKey: string; displayKey: string };

/**
 * A ready photo of a synthetic specimen face: original (width × height) and a half-size display copy
 * in the S3 fake, and a photos row pointing at both.
 */
export async function createReadyPhoto(opts: {
  labId: string; trialId: string; inspectionId: string; specimenId: string; uploadedBy: string;
  width?: number; height?: number; seed?: string; spots?: number; filename?: string;
  /** Passed to the generator: a colour card's grey patch, a change of light, spots placed by hand. */
  greyPatch?: GreyPatch; lighting?: LightingShift; rustSpots?: RustSpot[];
}): Promise<MadePhoto> {
  const width = opts.width ?? 800;
  const height = opts.height ?? 600;
  const seed = opts.seed ?? randomUUID();
  const face = specimenFaceOutline(width, height, seed);
  const rustSpots = opts.rustSpots ?? scatterRustSpots(face, { count: opts.spots ?? 4, rMin: width / 60, rMax: width / 25, seed });
  const img = renderSpecimenFace({ width, height, seed, kind: "iron", rustSpots, greyPatch: opts.greyPatch, lighting: opts.lighting });
  const raw = { raw: { width, height, channels: 4 as const } };
  const original = await sharp(Buffer.from(img.data.buffer), raw).jpeg({ quality: 92 }).toBuffer();
  const display = await sharp(original).resize({ width: Math.round(width / 2) }).jpeg({ quality: 88 }).toBuffer();
  const thumb = await sharp(original).resize({ width: 240 }).jpeg({ quality: 80 }).toBuffer();
  const photoId = randomUUID();
  const objectKey = photoKey({ labId: opts.labId, photoId, ext: "jpg" });
  const displayKey = derivativeKey(objectKey, "display");
  const thumbKey = derivativeKey(objectKey, "thumb");
  await putObject({ key: objectKey, body: original, contentType: "image/jpeg" });
  await putObject({ key: displayKey, body: display, contentType: "image/jpeg" });
  await putObject({ key: thumbKey, body: thumb, contentType: "image/jpeg" });
  await db.insert(s.photos).values({
    id: photoId, labId: opts.labId, trialId: opts.trialId, inspectionId: opts.inspectionId, specimenId: opts.specimenId,
    objectKey, filename: opts.filename ?? `face-${seed.slice(0, 8)}.jpg`, status: "ready", contentType: "image/jpeg",
    sizeBytes: original.byteLength, width, height, derivatives: { display: displayKey, thumb: thumbKey }, uploadedBy: opts.uploadedBy,
  });
  return { photoId, width, height, face, objectKey, displayKey };
}

/** A square face outline and helpers for marks with a known area. */
export function squareFace(x0: number, y0: number, side: number): Point[] {
  return [{ x: x0, y: y0 }, { x: x0 + side, y: y0 }, { x: x0 + side, y: y0 + side }, { x: x0, y: y0 + side }];
}
