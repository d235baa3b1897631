// "Save and next" on the open score page: the next photo of the inspection the caller has not scored,
// after the current specimen in label order, wrapping round; never the current one; none when done.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { saveScoreAction } from "@/app/_actions/scores";
import { nextUnscoredPhoto } from "@/db/queries/scores-read";
import { createTestLab, type TestLab } from "../support/db";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { createReadyPhoto, createScoringTrial, type MadePhoto, type ScoringTrial } from "./scoring-fixtures";

let s3: S3Fake;
let lab: TestLab;
let t: ScoringTrial;
const photos: MadePhoto[] = [];

beforeAll(async () => {
  s3 = await ensureS3Fake();
  lab = await createTestLab("Save and next");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id, specimens: 4, days: [0, 7] });
  // Specimens 1, 2 and 4 have a ready photo at day 7; specimen 3 only a pending one.
  for (const i of [0, 1, 3]) photos[i] = await createReadyPhoto({ labId: lab.labId, trialId: t.trialId, inspectionId: t.inspectionIds[1], specimenId: t.specimenIds[i], uploadedBy: lab.users.technician.id, width: 300, height: 200 });
  const pending = await createReadyPhoto({ labId: lab.labId, trialId: t.trialId, inspectionId: t.inspectionIds[1], specimenId: t.specimenIds[2], uploadedBy: lab.users.technician.id, width: 300, height: 200 });
  await db.update(s.photos).set({ status: "pending" }).where(eq(s.photos.id, pending.photoId));
});
afterAll(async () => {
  await closeDb();
  await s3?.stop();
});

const next = (specimen: number, userId = lab.users.technician.id) =>
  nextUnscoredPhoto({ labId: lab.labId, userId, trialId: t.trialId, inspectionId: t.inspectionIds[1], specimenId: t.specimenIds[specimen] });

describe("the next unscored photo of an inspection", () => {
  it("goes forward in label order, skips specimens without a ready photo and wraps round", async () => {
    expect(await next(0)).toMatchObject({ specimenId: t.specimenIds[1], photoId: photos[1].photoId });
    expect(await next(1)).toMatchObject({ specimenId: t.specimenIds[3], photoId: photos[3].photoId });
    expect(await next(3)).toMatchObject({ specimenId: t.specimenIds[0], photoId: photos[0].photoId });
  });

  it("skips what the caller scored, counts only the caller's own scores, and ends with null", async () => {
    const save = (i: number) => saveScoreAction.withIdentity(lab.as("technician"), {
      trialId: t.trialId, photoId: photos[i].photoId, spotCount: "0", areaPercent: "0", silicateChange: "none", notes: "", areaSource: "manual",
    });
    expect((await save(1)).ok).toBe(true);
    expect(await next(0)).toMatchObject({ specimenId: t.specimenIds[3] });
    // Another person's view is unchanged by the technician's score.
    expect(await next(0, lab.users.lead.id)).toMatchObject({ specimenId: t.specimenIds[1] });
    expect((await save(3)).ok).toBe(true);
    expect(await next(0)).toBeNull();
    // From a scored specimen, the one unscored photo left is the answer.
    expect(await next(1)).toMatchObject({ specimenId: t.specimenIds[0] });
  });
});
