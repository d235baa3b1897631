// Control points through the real action chain and PostgreSQL: bad points refused at the field with
// nothing saved, a saved series fitted to the first photo, and the rust new since the previous
// inspection measured from scores saved through the product's own score action. Reference values are
// built here from known transforms (scale·rotation + shift) and elementary areas (πR², π(R² − r²)).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, inArray } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { loadAlignedSeries } from "@/db/queries/photo-align";
import { saveControlPointsAction } from "@/app/_actions/photo-align";
import { saveScoreAction } from "@/app/_actions/scores";
import type { Affine } from "@/lib/photos/align";
import { createTestLab, type TestLab } from "../support/db";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { createReadyPhoto, createScoringTrial, squareFace, type MadePhoto, type ScoringTrial } from "./scoring-fixtures";

let s3: S3Fake;
let lab: TestLab;
let t: ScoringTrial;
const photos: MadePhoto[] = [];

beforeAll(async () => {
  s3 = await ensureS3Fake();
  lab = await createTestLab("Photo align");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id, days: [0, 7, 14] });
  for (const inspectionId of t.inspectionIds) {
    photos.push(await createReadyPhoto({ labId: lab.labId, trialId: t.trialId, inspectionId, specimenId: t.specimenIds[0], uploadedBy: lab.users.technician.id, width: 400, height: 300, spots: 0 }));
  }
});
afterAll(async () => {
  await closeDb();
  await s3?.stop();
});

const save = (photoId: string, points: { x: number; y: number }[]) =>
  saveControlPointsAction.withIdentity(lab.as("technician"), { trialId: t.trialId, photoId, points: JSON.stringify(points) });
const saved = async () => (await db.select().from(s.photoControlPoints).where(eq(s.photoControlPoints.labId, lab.labId))).length;
const audits = async () => (await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, lab.labId), inArray(s.auditEvents.entityId, photos.map((p) => p.photoId))))).length;

function similarity(scale: number, deg: number, dx: number, dy: number): Affine {
  const r = (deg * Math.PI) / 180;
  return { a: scale * Math.cos(r), b: -scale * Math.sin(r), c: dx, d: scale * Math.sin(r), e: scale * Math.cos(r), f: dy };
}
const at = (m: Affine, p: { x: number; y: number }) => ({ x: m.a * p.x + m.b * p.y + m.c, y: m.d * p.x + m.e * p.y + m.f });
// Photo k → first photo. The later photos' points are where the first photo's features appear on them.
const refPoints = [{ x: 80, y: 60 }, { x: 320, y: 220 }];
const moves = [similarity(1, 0, 0, 0), similarity(1.1, 6, -20, 12), similarity(0.9, -4, 15, -8)];
const inverse = (m: Affine): Affine => {
  const det = m.a * m.e - m.b * m.d;
  const a = m.e / det, b = -m.b / det, d = -m.d / det, e = m.a / det;
  return { a, b, c: -(a * m.c + b * m.f), d, e, f: -(d * m.c + e * m.f) };
};
const pointsOn = (k: number) => refPoints.map((p) => at(inverse(moves[k]), p));

describe("control points refused with a clear message, nothing saved", () => {
  it.each([
    ["one point", [{ x: 10, y: 10 }], /at least 2 control points \(1 placed\)/],
    ["coincident points", [{ x: 100, y: 100 }, { x: 103, y: 101 }], /Points 1 and 2 are less than 8 px apart/],
    ["a point outside the photo", [{ x: 10, y: 10 }, { x: 401, y: 100 }], /Point 2 \(401, 100\) lies outside the photo \(400 × 300 px\)/],
    ["three collinear points", [{ x: 0, y: 0 }, { x: 200, y: 150 }, { x: 400, y: 300 }], /lie on one line/],
    ["four points", [{ x: 1, y: 1 }, { x: 100, y: 1 }, { x: 1, y: 100 }, { x: 100, y: 100 }], /at most 3/],
  ])("%s", async (_what, points, message) => {
    const r = await save(photos[0].photoId, points);
    expect(r).toMatchObject({ ok: false, code: "invalid" });
    expect(r.errors?.points?.join(" ")).toMatch(message);
    expect(await saved()).toBe(0);
    expect(await audits()).toBe(0);
  });

  it("a later photo before the first photo has points", async () => {
    const r = await save(photos[1].photoId, pointsOn(1));
    expect(r.errors?.points?.join(" ")).toMatch(/first photo of this specimen first/);
    expect(await saved()).toBe(0);
  });

  it("an observer may not place points", async () => {
    const r = await saveControlPointsAction.withIdentity(lab.as("observer"), { trialId: t.trialId, photoId: photos[0].photoId, points: JSON.stringify(refPoints) });
    expect(r.ok).toBe(false);
    expect(await saved()).toBe(0);
  });
});

describe("an aligned series", () => {
  it("saves the first photo's points, then refuses a later photo with another count", async () => {
    expect((await save(photos[0].photoId, refPoints)).ok).toBe(true);
    const r = await save(photos[1].photoId, [...pointsOn(1), { x: 10, y: 280 }]);
    expect(r.errors?.points?.join(" ")).toMatch(/first photo has 2 control points; place 2 here/);
    expect(await saved()).toBe(1);
    expect(await audits()).toBe(1);
  });

  it("fits each later photo to the known transform and measures the new rust in the first frame", async () => {
    expect((await save(photos[1].photoId, pointsOn(1))).ok).toBe(true);
    expect((await save(photos[2].photoId, pointsOn(2))).ok).toBe(true);
    // One spot at (200, 150) in the first frame grows from r = 20 to 30 to 45; each photo's scorer
    // draws it where it appears on that photo (radius divided by that photo's scale).
    const radii = [20, 30, 45];
    const face = squareFace(40, 40, 320);
    for (const [k, p] of photos.entries()) {
      const c = at(inverse(moves[k]), { x: 200, y: 150 });
      const scale = Math.sqrt(moves[k].a ** 2 + moves[k].d ** 2);
      const faceHere = face.map((q) => at(inverse(moves[k]), q));
      const r = await saveScoreAction.withIdentity(lab.as("technician"), {
        trialId: t.trialId, photoId: p.photoId, spotCount: "1", areaPercent: "1", astmLetter: "S", silicateChange: "none", notes: "", areaSource: "manual",
        face: JSON.stringify(faceHere), marks: JSON.stringify([{ kind: "circle", cx: c.x, cy: c.y, r: radii[k] / scale }]),
      });
      expect(r.ok).toBe(true);
    }
    const series = await loadAlignedSeries({
      labId: lab.labId, trialId: t.trialId, specimenId: t.specimenIds[0], withMarks: true,
      photos: photos.map((p, k) => ({ id: p.photoId, inspectionId: t.inspectionIds[k] })),
    });
    expect(series.entries.map((e) => e.state.status)).toEqual(["reference", "aligned", "aligned"]);
    for (const k of [1, 2]) {
      const got = series.entries[k].state.transform!;
      for (const key of ["a", "b", "c", "d", "e", "f"] as const) expect(got[key]).toBeCloseTo(moves[k][key], 6);
    }
    const wanted = [Math.PI * 20 ** 2, Math.PI * (30 ** 2 - 20 ** 2), Math.PI * (45 ** 2 - 30 ** 2)]; // πr², then annuli π(R² − r²)
    series.entries.forEach((e, k) => {
      expect(Math.abs(e.newSince!.newAreaPx2 - wanted[k])).toBeLessThan(e.newSince!.errorBoundPx2);
      expect(Math.abs(e.newSince!.newAreaPx2 - wanted[k]) / wanted[k]).toBeLessThan(0.03);
    });
    // With a series scale of 20 px/mm the same areas read in mm²: px² ÷ (px/mm)².
    expect(series.entries.every((e) => e.newSince!.newAreaMm2 === null)).toBe(true);
    await db.insert(s.seriesScales).values({ labId: lab.labId, trialId: t.trialId, specimenId: t.specimenIds[0], pxPerMm: 20, scaleSource: { kind: "typed" } });
    const scaled = await loadAlignedSeries({
      labId: lab.labId, trialId: t.trialId, specimenId: t.specimenIds[0], withMarks: true,
      photos: photos.map((p, k) => ({ id: p.photoId, inspectionId: t.inspectionIds[k] })),
    });
    scaled.entries.forEach((e, k) => expect(e.newSince!.newAreaMm2).toBeCloseTo(series.entries[k].newSince!.newAreaPx2 / 400, 9));
    // A blind viewer's series carries no marks and no areas.
    const blind = await loadAlignedSeries({ labId: lab.labId, trialId: t.trialId, specimenId: t.specimenIds[0], withMarks: false, photos: [] });
    expect(blind.entries.every((e) => e.marks === null && e.newSince === null)).toBe(true);
  });
});
