// Protocol points and scale recorded with a photo: saved with an audit event, refused at the field for a
// zero-length or non-numeric scale with nothing saved, a series scale for fixed framing, another lab's
// photo unknown; and the scaled areas (mm², size classes, growth per day) recomputed from the rows.
import { createHash } from "node:crypto";
import { linearRegression } from "simple-statistics";
import { and, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { loadOutcomeAreas, loadPhotoEvidence, loadScaledRecords } from "@/db/queries/photo-evidence";
import { loadExportRows, loadSpecimenOutcomes } from "@/db/queries/analysis";
import { getTrial } from "@/db/queries/trial-access";
import { savePhotoEvidenceAction } from "@/app/_actions/photo-evidence";
import { saveScoreAction } from "@/app/_actions/scores";
import { areaKey } from "@/lib/scoring/scaled-areas";
import { createTestLab, type TestLab } from "../support/db";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { finalizePhotoUpload, presignPhotoUpload } from "@/db/queries/photo-uploads";
import { createReadyPhoto, createScoringTrial, squareFace, type MadePhoto, type ScoringTrial } from "./scoring-fixtures";
import { browserPut, cameraJpeg, createPhotoFixture } from "./photos-fixtures";

const PROTOCOL = ["Scale bar in frame", "Colour card in frame", "Two lamps at 45°, no flash"];

let s3: S3Fake;
let lab: TestLab;
let other: TestLab;
let t: ScoringTrial;
const photos: MadePhoto[] = [];

beforeAll(async () => {
  s3 = await ensureS3Fake();
  lab = await createTestLab("Photo evidence");
  other = await createTestLab("Photo evidence other lab");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id });
  await db.update(s.trials).set({ photoProtocol: PROTOCOL }).where(eq(s.trials.id, t.trialId));
  for (const i of [1, 2, 3]) {
    photos.push(await createReadyPhoto({ labId: lab.labId, trialId: t.trialId, inspectionId: t.inspectionIds[i], specimenId: t.specimenIds[0], uploadedBy: lab.users.technician.id, width: 400, height: 300 }));
  }
});
afterAll(async () => {
  await closeDb();
  await s3?.stop();
});

const evidenceRow = async (photoId: string) => (await db.select().from(s.photoEvidence).where(eq(s.photoEvidence.photoId, photoId)))[0] ?? null;
const auditCount = async () => (await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, lab.labId), inArray(s.auditEvents.entity, ["photo_evidence", "series_scale"])))).length;

describe("recording a photo's protocol points and scale", () => {
  it("saves the ticked points and the scale from two points on the bar, with an audit event", async () => {
    const r = await savePhotoEvidenceAction.withIdentity(lab.as("technician"), {
      photoId: photos[0].photoId, "protocol[]": PROTOCOL.slice(0, 2), scaleMode: "points", x1: "10", y1: "280", x2: "210", y2: "280", lengthMm: "10",
    });
    expect(r.ok, r.message).toBe(true);
    expect(r.message).toContain("1 protocol point is marked as not followed");
    const row = await evidenceRow(photos[0].photoId);
    // 200 px between the ends of a 10 mm bar: 20 px/mm (direct recomputation).
    expect(row).toMatchObject({ pxPerMm: 20, protocolConfirmed: PROTOCOL.slice(0, 2), scaleSource: { kind: "points", lengthMm: 10 } });
    expect(await auditCount()).toBe(1);
    const ev = await loadPhotoEvidence({ labId: lab.labId, trialId: t.trialId, protocol: PROTOCOL, photoRows: photos.map((p) => ({ id: p.photoId, specimenId: t.specimenIds[0] })) });
    expect(ev.get(photos[0].photoId)).toMatchObject({ missing: [PROTOCOL[2]], recorded: true, scale: { pxPerMm: 20, from: "photo" } });
    // A photo with no record misses every point and has no scale yet.
    expect(ev.get(photos[2].photoId)).toMatchObject({ missing: PROTOCOL, recorded: false, scale: null });
  });

  it.each([
    ["two identical points", { scaleMode: "points", x1: "50", y1: "50", x2: "50", y2: "50", lengthMm: "10" }, "points", /same point/],
    ["a length of 0 mm", { scaleMode: "points", x1: "0", y1: "0", x2: "100", y2: "0", lengthMm: "0" }, "lengthMm", /more than 0 mm/],
    ["a non-numeric point", { scaleMode: "points", x1: "left", y1: "0", x2: "100", y2: "0", lengthMm: "10" }, "points", /numbers/],
    ["0 px per mm", { scaleMode: "typed", pxPerMm: "0" }, "pxPerMm", /greater than 0/],
    ["negative px per mm", { scaleMode: "typed", pxPerMm: "-4" }, "pxPerMm", /greater than 0/],
    ["non-numeric px per mm", { scaleMode: "typed", pxPerMm: "about twenty" }, "pxPerMm", /as a number/],
    ["a series without a scale", { scaleMode: "none", forSeries: "on" }, "forSeries", /Give a scale/],
  ])("refuses %s at its field and saves nothing", async (_what, scale, field, message) => {
    const before = await evidenceRow(photos[0].photoId);
    const audits = await auditCount();
    const r = await savePhotoEvidenceAction.withIdentity(lab.as("technician"), { photoId: photos[0].photoId, "protocol[]": PROTOCOL, ...scale });
    expect(r.ok).toBe(false);
    expect(r.errors?.[field]?.join(" ")).toMatch(message);
    expect(await evidenceRow(photos[0].photoId)).toEqual(before);
    expect(await auditCount()).toBe(audits);
  });

  it("refuses a protocol point that is not in the trial's protocol", async () => {
    const r = await savePhotoEvidenceAction.withIdentity(lab.as("technician"), { photoId: photos[0].photoId, "protocol[]": ["Something else"], scaleMode: "keep" });
    expect(r.ok).toBe(false);
    expect(r.errors?.["protocol[]"]).toBeDefined();
  });

  it("answers another lab's photo as unknown and leaves it untouched", async () => {
    const before = await evidenceRow(photos[0].photoId);
    const r = await savePhotoEvidenceAction.withIdentity(other.as("lead"), { photoId: photos[0].photoId, scaleMode: "typed", pxPerMm: "5" });
    expect(r).toMatchObject({ ok: false, code: "not-found" });
    expect(await evidenceRow(photos[0].photoId)).toEqual(before);
  });

  it("a series scale holds for every photo of the specimen in the trial; a photo's own scale wins", async () => {
    const r = await savePhotoEvidenceAction.withIdentity(lab.as("technician"), { photoId: photos[1].photoId, "protocol[]": PROTOCOL, scaleMode: "typed", pxPerMm: "25", forSeries: "on" });
    expect(r.ok, r.message).toBe(true);
    const series = await db.select().from(s.seriesScales).where(eq(s.seriesScales.trialId, t.trialId));
    expect(series).toHaveLength(1);
    expect(series[0]).toMatchObject({ specimenId: t.specimenIds[0], pxPerMm: 25 });
    expect((await evidenceRow(photos[1].photoId))?.pxPerMm).toBeNull();
    const ev = await loadPhotoEvidence({ labId: lab.labId, trialId: t.trialId, protocol: PROTOCOL, photoRows: photos.map((p) => ({ id: p.photoId, specimenId: t.specimenIds[0] })) });
    expect(ev.get(photos[0].photoId)?.scale).toEqual({ pxPerMm: 20, from: "photo" });
    expect(ev.get(photos[1].photoId)?.scale).toEqual({ pxPerMm: 25, from: "series" });
    expect(ev.get(photos[2].photoId)?.scale).toEqual({ pxPerMm: 25, from: "series" });
    expect(ev.get(photos[1].photoId)?.missing).toEqual([]);
  });
});

describe("scaled areas of scores of record", () => {
  // A 200 × 200 px face; square spots of 20, 30 and 40 px: 1 %, 2.25 % and 4 % of the face.
  const face = squareFace(100, 50, 200);
  const sides = [20, 30, 40];

  beforeAll(async () => {
    for (const [i, p] of photos.entries()) {
      const spot = { kind: "polygon" as const, points: squareFace(150, 100, sides[i]) };
      const r = await saveScoreAction.withIdentity(lab.as("technician"), {
        trialId: t.trialId, photoId: p.photoId, spotCount: "1", areaPercent: String((100 * sides[i] ** 2) / 200 ** 2), astmLetter: "S", silicateChange: "none",
        notes: "", areaSource: "marks", face: JSON.stringify(face), marks: JSON.stringify([spot]),
      });
      expect(r.ok, r.message).toBe(true);
    }
  });

  it("gives mm² as the scored share of the outlined face over px/mm squared, and spots by size class", async () => {
    const { records } = await loadScaledRecords({ labId: lab.labId, trialId: t.trialId, protocol: PROTOCOL });
    const byInspection = new Map(records.map((r) => [r.inspectionId, r]));
    const first = byInspection.get(t.inspectionIds[1])!;
    // Direct recomputation: the face is (200 px / 20 px/mm)² = 100 mm²; 1 % of it is 1 mm².
    expect(first.faceAreaMm2).toBeCloseTo(100, 6);
    expect(first.areaMm2).toBeCloseTo((first.areaPercent / 100) * 100, 6);
    expect(first.areaMm2).toBeCloseTo(1, 1);
    // The 20 px spot is 1 mm², the diameter of an equal circle 2·√(1/π) = 1.13 mm: the 1–3 mm class.
    expect(first.sizeClasses).toEqual({ "under-0.5": 0, "0.5-1": 0, "1-3": 1, "3-up": 0 });
    expect(first.protocolMissing).toEqual([PROTOCOL[2]]);
    // One inspection only (the grid's view): the same figures.
    const one = await loadScaledRecords({ labId: lab.labId, trialId: t.trialId, inspectionId: t.inspectionIds[1] });
    expect(one.records.map((r) => r.areaMm2)).toEqual([first.areaMm2]);
    // The series scale: (200 / 25)² = 64 mm² of face.
    const second = byInspection.get(t.inspectionIds[2])!;
    expect(second.faceAreaMm2).toBeCloseTo(64, 6);
    expect(second.areaMm2).toBeCloseTo((second.areaPercent / 100) * 64, 6);
  });

  it("gives growth in mm² per day as the least-squares slope simple-statistics finds over the outcome's days", async () => {
    const trial = await getTrial({ labId: lab.labId, trialId: t.trialId });
    const { outcomes } = await loadSpecimenOutcomes({ labId: lab.labId, trial });
    const areas = await loadOutcomeAreas({ labId: lab.labId, trialId: t.trialId, outcomes });
    const { areaMm2 } = await loadScaledRecords({ labId: lab.labId, trialId: t.trialId });
    const o = outcomes.find((x) => x.specimenId === t.specimenIds[0])!;
    const pts = o.observations.map((ob) => [ob.day, areaMm2.get(areaKey(ob.inspectionId, o.specimenId))!] as [number, number]);
    expect(pts).toHaveLength(3);
    expect(areas.get(o.placementId)?.growthMm2PerDay).toBeCloseTo(linearRegression(pts).m, 10);
    expect(areas.get(o.placementId)?.finalAreaMm2).toBeCloseTo(pts[2][1], 10);
    // The data package's scores table carries the same mm² beside area_percent.
    const exported = await loadExportRows({ labId: lab.labId, trial });
    for (const ob of o.observations) {
      const row = exported.scoreRows.find((r) => r.inspectionId === ob.inspectionId && r.specimenId === o.specimenId && r.isRecord)!;
      expect(row.areaMm2).toBeCloseTo(areaMm2.get(areaKey(ob.inspectionId, o.specimenId))!, 10);
    }
    // The unscored second specimen has neither figure.
    const unscored = outcomes.find((x) => x.specimenId === t.specimenIds[1])!;
    expect(areas.get(unscored.placementId)).toEqual({ finalAreaMm2: null, growthMm2PerDay: null });
  });
});

describe("protocol points ticked at upload", () => {
  it("are recorded with the photo in the same transaction; points not in the trial's protocol are dropped", async () => {
    const fx = await createPhotoFixture("Protocol at upload");
    const caller = await fx.ctx("technician");
    const upload = async (protocol?: string[]) => {
      const bytes = await cameraJpeg({ shotAt: fx.doneAt, width: 64 + (protocol?.length ?? 0), height: 48 });
      const pre = await presignPhotoUpload({ caller, input: { inspectionId: fx.inspectionId, specimenId: fx.specimenIds[0], filename: "p.jpg", contentType: "image/jpeg", sizeBytes: bytes.byteLength, sha256: createHash("sha256").update(bytes).digest("hex") } });
      expect((await browserPut(pre, bytes)).status).toBe(200);
      return (await finalizePhotoUpload({ caller, token: pre.token, protocol, enqueue: async () => undefined })).photo.id;
    };
    // createPhotoFixture's trial protocol is ["Scale bar in frame"].
    const ticked = await upload(["Scale bar in frame", "Not one of ours"]);
    expect((await evidenceRow(ticked))?.protocolConfirmed).toEqual(["Scale bar in frame"]);
    const [audit] = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.entityId, ticked), eq(s.auditEvents.entity, "photo")));
    expect((audit.after as { protocolConfirmed: string[] }).protocolConfirmed).toEqual(["Scale bar in frame"]);
    // Without ticks sent, nothing is recorded: the photo is flagged as having no protocol record.
    const unticked = await upload();
    expect(await evidenceRow(unticked)).toBeNull();
    const ev = await loadPhotoEvidence({ labId: fx.lab.labId, trialId: fx.trialId, protocol: ["Scale bar in frame"], photoRows: [ticked, unticked].map((id) => ({ id, specimenId: fx.specimenIds[0] })) });
    expect(ev.get(ticked)).toMatchObject({ missing: [], recorded: true });
    expect(ev.get(unticked)).toMatchObject({ missing: ["Scale bar in frame"], recorded: false });
  });
});
