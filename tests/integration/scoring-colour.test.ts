// The grey patch saved with a score: the patch per photo and the estimate's colour basis commit with
// the score or not at all; a clipped, coloured or out-of-frame patch is refused at its field with
// nothing saved; the next photo of the specimen starts from the previous photo's patch.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, inArray } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { colourPatchForPage } from "@/db/queries/photo-colour";
import { saveScoreAction } from "@/app/_actions/scores";
import { renderSpecimenFace } from "@/lib/demo-images/specimen-face";
import { measurePatch, patchGains } from "@/lib/scoring/colour-normalise";
import { createTestLab, type TestLab } from "../support/db";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { createReadyPhoto, createScoringTrial, squareFace, type MadePhoto, type ScoringTrial } from "./scoring-fixtures";

let s3: S3Fake;
let lab: TestLab;
let other: TestLab;
let t: ScoringTrial;
let first: MadePhoto;
let second: MadePhoto;

beforeAll(async () => {
  s3 = await ensureS3Fake();
  lab = await createTestLab("Scoring colour");
  other = await createTestLab("Scoring colour other lab");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id });
  const base = { labId: lab.labId, trialId: t.trialId, specimenId: t.specimenIds[0], uploadedBy: lab.users.technician.id };
  first = await createReadyPhoto({ ...base, inspectionId: t.inspectionIds[1] });
  second = await createReadyPhoto({ ...base, inspectionId: t.inspectionIds[2] });
});
afterAll(async () => {
  await closeDb();
  await s3?.stop();
});

// A real reading: the demo generator's grey patch (L* 50) photographed under a warm lamp.
const PATCH = { x: 8, y: 8, width: 40, height: 30, lightness: 50 };
const RECT = { x: 12, y: 12, width: 32, height: 22 };
const LIGHT: [number, number, number] = [1.18, 1.0, 0.72];
const scene = renderSpecimenFace({
  width: 320, height: 240, seed: "colour-int", kind: "iron", rustSpots: [], greyPatch: PATCH, lighting: { gains: LIGHT },
});
const reading = measurePatch(scene, RECT);
const goodPatch = { ...RECT, patchLightness: 50, ...reading };

const face = squareFace(100, 100, 200);
function input(over: Record<string, unknown> = {}) {
  return {
    trialId: t.trialId, photoId: first.photoId, spotCount: "0", areaPercent: "2.5", astmLetter: "G", silicateChange: "none", notes: "",
    areaSource: "estimate", autoEstimatePercent: "2.5", face: JSON.stringify(face), marks: "[]",
    colourPatch: JSON.stringify(goodPatch), estimateNormalised: "1", ...over,
  };
}

const nothingSaved = async () => {
  const [scores, marks, patches, audits] = await Promise.all([
    db.select().from(s.scores).where(eq(s.scores.labId, lab.labId)),
    db.select().from(s.marks).where(eq(s.marks.labId, lab.labId)),
    db.select().from(s.photoColourPatches).where(eq(s.photoColourPatches.labId, lab.labId)),
    db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, lab.labId), inArray(s.auditEvents.entity, ["score", "marks", "colour-patch"]))),
  ]);
  return scores.length + marks.length + patches.length + audits.length === 0;
};

describe("refusing a grey patch that cannot measure the light", () => {
  it("a clipped patch: a message at the field and nothing saved", async () => {
    const clipped = { ...goodPatch, clippedFraction: 0.4 };
    const r = await saveScoreAction.withIdentity(lab.as("technician"), input({ colourPatch: JSON.stringify(clipped) }));
    expect(r.ok).toBe(false);
    expect(r.errors?.colourPatch?.join(" ")).toMatch(/clipped: 40 % of its pixels/);
    expect(await nothingSaved()).toBe(true);
  });

  it("a coloured patch (not neutral): a message at the field and nothing saved", async () => {
    // Mean of an orange-brown rust colour (170, 88, 38) in linear light (IEC 61966-2-1 decoding).
    const rust = { ...goodPatch, meanLinear: [0.402, 0.0976, 0.0194] };
    const r = await saveScoreAction.withIdentity(lab.as("technician"), input({ colourPatch: JSON.stringify(rust) }));
    expect(r.ok).toBe(false);
    expect(r.errors?.colourPatch?.join(" ")).toMatch(/not neutral grey \(chroma C\*/);
    expect(await nothingSaved()).toBe(true);
  });

  it("a patch outside the frame: refused after the marks were written, and the marks go back too", async () => {
    const outside = { ...goodPatch, x: first.width - 10 };
    const r = await saveScoreAction.withIdentity(lab.as("technician"), input({ colourPatch: JSON.stringify(outside) }));
    expect(r.ok).toBe(false);
    expect(r.errors?.colourPatch?.join(" ")).toMatch(/reaches outside the photo \(800 × 600 px\)/);
    expect(await nothingSaved()).toBe(true);
  });

  it("an estimate said to be normalised without a patch", async () => {
    const r = await saveScoreAction.withIdentity(lab.as("technician"), input({ colourPatch: "" }));
    expect(r.ok).toBe(false);
    expect(r.errors?.colourPatch?.join(" ")).toMatch(/no grey patch came with it/);
    expect(await nothingSaved()).toBe(true);
  });
});

describe("saving the patch with the score", () => {
  it("keeps the patch on the photo and the estimate's basis, with the gains that undo the lamp", async () => {
    const r = await saveScoreAction.withIdentity(lab.as("technician"), input());
    expect(r.ok).toBe(true);
    const [patch] = await db.select().from(s.photoColourPatches).where(eq(s.photoColourPatches.photoId, first.photoId));
    expect(patch).toMatchObject({ labId: lab.labId, x: 12, y: 12, width: 32, height: 22, patchLightness: 50, markedBy: lab.users.technician.id });
    const [score] = await db.select().from(s.scores).where(and(eq(s.scores.labId, lab.labId), eq(s.scores.photoId, first.photoId)));
    const basis = score.autoEstimateColour;
    expect(basis?.normalised).toBe(true);
    if (!basis?.normalised) throw new Error("expected a normalised basis");
    // The gains are the inverse of the lamp the generator applied (within the patch's rounding and noise).
    basis.gains.forEach((g, c) => expect(g * LIGHT[c]).toBeCloseTo(1, 1));
    expect(basis.gains).toEqual(patchGains(reading, 50));
    const audits = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, lab.labId), eq(s.auditEvents.entity, "colour-patch")));
    expect(audits.map((a) => a.action)).toEqual(["create"]);
  });

  it("records an estimate read without a patch as not normalised, and no basis without an estimate", async () => {
    await saveScoreAction.withIdentity(lab.as("technician"), input({ estimateNormalised: "", colourPatch: "" }));
    const row = async () => (await db.select().from(s.scores).where(and(eq(s.scores.labId, lab.labId), eq(s.scores.photoId, first.photoId))))[0];
    expect((await row()).autoEstimateColour).toEqual({ normalised: false });
    await saveScoreAction.withIdentity(lab.as("technician"), input({ estimateNormalised: "", colourPatch: "", autoEstimatePercent: "", areaSource: "manual" }));
    expect((await row()).autoEstimateColour).toBeNull();
  });

  it("the specimen's next photo starts from this photo's patch, except when scoring blind; another lab sees none", async () => {
    const p1 = { photoId: first.photoId, previous: true };
    const p2 = { photoId: second.photoId, previous: true };
    expect(await colourPatchForPage({ labId: lab.labId, ...p1 })).toEqual({ ...RECT, patchLightness: 50, from: "this-photo" });
    expect(await colourPatchForPage({ labId: lab.labId, ...p2 })).toEqual({ ...RECT, patchLightness: 50, from: "previous-photo" });
    // Blind: no carrying over, which would tie the photo to the specimen's earlier ones.
    expect(await colourPatchForPage({ labId: lab.labId, ...p2, previous: false })).toBeNull();
    expect(await colourPatchForPage({ labId: other.labId, ...p1 })).toBeNull();
    expect(await colourPatchForPage({ labId: other.labId, ...p2 })).toBeNull();
  });
});
