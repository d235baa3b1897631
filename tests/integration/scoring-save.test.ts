// Saving a score: grades computed on the server, marks + score + audit in one transaction, role and
// lab refusals, the locked concluded trial, and exactly one score of record per specimen × inspection.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, asc, eq, inArray } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { saveConsensusScore, saveScore } from "@/db/queries/scores";
import { setScoreRule } from "@/db/queries/scores-agreement";
import { getLabPhoto } from "@/db/queries/scores-read";
import { AppError } from "@/lib/auth/errors";
import { saveScoreSchema } from "@/lib/validation/scores";
import { saveScoreAction } from "@/app/_actions/scores";
import { createTestLab, type TestLab } from "../support/db";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { createReadyPhoto, createScoringTrial, squareFace, type MadePhoto, type ScoringTrial } from "./scoring-fixtures";

let s3: S3Fake;
let lab: TestLab;
let other: TestLab;
let t: ScoringTrial;
let photo: MadePhoto;

beforeAll(async () => {
  s3 = await ensureS3Fake();
  lab = await createTestLab("Scoring save");
  other = await createTestLab("Scoring other lab");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id });
  photo = await createReadyPhoto({ labId: lab.labId, trialId: t.trialId, inspectionId: t.inspectionIds[1], specimenId: t.specimenIds[0], uploadedBy: lab.users.technician.id });
});
afterAll(async () => {
  await closeDb();
  await s3?.stop();
});

// A 200 × 200 px face and a 20 × 20 px square spot: exactly 1 % of the face.
const face = squareFace(100, 100, 200);
const spot = { kind: "polygon" as const, points: squareFace(150, 150, 20) };

function input(over: Record<string, unknown> = {}) {
  return {
    trialId: t.trialId, photoId: photo.photoId, spotCount: "1", areaPercent: "1", astmLetter: "S", silicateChange: "none",
    notes: "", areaSource: "marks", face: JSON.stringify(face), marks: JSON.stringify([spot]), ...over,
  };
}

const auditCount = async (entityIds: string[]) =>
  (await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, lab.labId), inArray(s.auditEvents.entityId, entityIds)))).length;

describe("saving a score", () => {
  it("computes ASTM D610 and ISO 4628-3 grades and writes marks, score and audit events together", async () => {
    const r = await saveScoreAction.withIdentity(lab.as("technician"), input());
    expect(r.ok).toBe(true);
    // ASTM D610 Table 1: 1 % is the upper bound of grade 6; ISO 4628-3: Ri 3 = 1 %.
    expect(r.message).toContain("ASTM D610 6-S");
    expect(r.message).toContain("Ri 3");
    const [score] = await db.select().from(s.scores).where(and(eq(s.scores.inspectionId, t.inspectionIds[1]), eq(s.scores.specimenId, t.specimenIds[0])));
    expect(score).toMatchObject({ scorerId: lab.users.technician.id, astmGrade: 6, astmLetter: "S", isoDegree: 3, areaPercent: 1, spotCount: 1, isRecord: true, blind: false, photoId: photo.photoId });
    const rows = await db.select().from(s.marks).where(eq(s.marks.photoId, photo.photoId)).orderBy(asc(s.marks.seq));
    expect(rows.map((m) => [m.role, m.seq, m.geometry.kind])).toEqual([["face", 0, "polygon"], ["spot", 1, "polygon"]]);
    const audits = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, lab.labId), inArray(s.auditEvents.entityId, [score.id, photo.photoId])));
    expect(audits.map((a) => a.entity).sort()).toEqual(["marks", "score"]);
    // The marks' own area, measured on the server from the stored geometry, is in the audit record.
    const marksAudit = audits.find((a) => a.entity === "marks")!.after as { areaFromMarksPercent: number };
    expect(marksAudit.areaFromMarksPercent).toBeCloseTo(1, 2);
  });

  it("a failing write inside the transaction leaves the earlier marks, score and audit trail untouched", async () => {
    const before = await db.select().from(s.marks).where(eq(s.marks.photoId, photo.photoId)).orderBy(asc(s.marks.seq));
    const [scoreBefore] = await db.select().from(s.scores).where(eq(s.scores.photoId, photo.photoId));
    const audits = await auditCount([scoreBefore.id, photo.photoId]);
    // 2^31 passes the query function (the schema would refuse it) but not PostgreSQL's integer column,
    // so the score update fails after the marks were already replaced inside the transaction.
    const data = saveScoreSchema.parse(input({ marks: JSON.stringify([spot, { kind: "circle", cx: 250, cy: 250, r: 10 }]) }));
    await expect(saveScore({ labId: lab.labId, userId: lab.users.technician.id }, { ...data, spotCount: 2 ** 31 })).rejects.toThrow();
    const after = await db.select().from(s.marks).where(eq(s.marks.photoId, photo.photoId)).orderBy(asc(s.marks.seq));
    expect(after.map((m) => m.id)).toEqual(before.map((m) => m.id));
    const [scoreAfter] = await db.select().from(s.scores).where(eq(s.scores.id, scoreBefore.id));
    expect(scoreAfter).toEqual(scoreBefore);
    expect(await auditCount([scoreBefore.id, photo.photoId])).toBe(audits);
  });

  it("refuses marks without a face outline and a rusted area without a distribution letter, saving nothing", async () => {
    const r = await saveScoreAction.withIdentity(lab.as("researcher"), input({ face: "", astmLetter: "" }));
    expect(r.ok).toBe(false);
    expect(r.errors?.face?.[0]).toMatch(/Outline the specimen face/);
    expect(r.errors?.astmLetter?.[0]).toMatch(/distributed/);
    const mine = await db.select().from(s.scores).where(eq(s.scores.scorerId, lab.users.researcher.id));
    expect(mine).toEqual([]);
  });

  it("observers cannot score", async () => {
    const r = await saveScoreAction.withIdentity(lab.as("observer"), input());
    expect(r.ok).toBe(false);
    expect(r.message).toMatch(/observer.*does not allow/i);
    expect(await db.select().from(s.scores).where(eq(s.scores.scorerId, lab.users.observer.id))).toEqual([]);
  });

  it("another lab's photo answers 404 (not-found), whether scored or read", async () => {
    const t2 = await createScoringTrial({ labId: other.labId, createdBy: other.users.researcher.id });
    const foreign = await createReadyPhoto({ labId: other.labId, trialId: t2.trialId, inspectionId: t2.inspectionIds[0], specimenId: t2.specimenIds[0], uploadedBy: other.users.technician.id });
    const r = await saveScoreAction.withIdentity(lab.as("technician"), input({ photoId: foreign.photoId }));
    expect(r.ok).toBe(false);
    expect(r.message).toBe("That photo does not exist.");
    await expect(getLabPhoto({ labId: lab.labId, photoId: foreign.photoId })).rejects.toMatchObject({ code: "not-found" });
    expect(await db.select().from(s.marks).where(eq(s.marks.photoId, foreign.photoId))).toEqual([]);
  });

  it("a concluded trial refuses score writes as locked", async () => {
    const t3 = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id });
    await db.update(s.trials).set({ status: "concluded", concludedAt: new Date() }).where(eq(s.trials.id, t3.trialId));
    const data = saveScoreSchema.parse({ trialId: t3.trialId, inspectionId: t3.inspectionIds[0], specimenId: t3.specimenIds[0], spotCount: "0", areaPercent: "0", silicateChange: "none" });
    const err = await saveScore({ labId: lab.labId, userId: lab.users.technician.id }, data).catch((e) => e);
    expect(err).toBeInstanceOf(AppError);
    expect(err.code).toBe("locked");
  });
});

describe("score of record", () => {
  it("is exactly one per specimen × inspection: the primary scorer's, then the consensus score under that rule", async () => {
    const ids = { trialId: t.trialId, inspectionId: t.inspectionIds[2], specimenId: t.specimenIds[1] };
    const base = { ...ids, spotCount: "2", areaPercent: "0.5", astmLetter: "G", silicateChange: "slight", notes: "" };
    // The lead scores first: until the primary scorer has scored, the first open score stands.
    expect((await saveScoreAction.withIdentity(lab.as("lead"), base)).ok).toBe(true);
    expect((await saveScoreAction.withIdentity(lab.as("technician"), { ...base, areaPercent: "0.4" })).ok).toBe(true);
    const records = async () => (await db.select().from(s.scores).where(and(eq(s.scores.inspectionId, ids.inspectionId), eq(s.scores.specimenId, ids.specimenId)))).filter((r) => r.isRecord);
    expect((await records()).map((r) => r.scorerId)).toEqual([lab.users.technician.id]);

    await setScoreRule({ labId: lab.labId, userId: lab.users.lead.id }, { trialId: t.trialId, scoreRule: "consensus", primaryScorerId: lab.users.technician.id });
    // No consensus score yet: the primary scorer's still stands in.
    expect((await records()).map((r) => r.scorerId)).toEqual([lab.users.technician.id]);
    const { score } = await saveConsensusScore({ labId: lab.labId, userId: lab.users.lead.id }, { ...ids, spotCount: 2, areaPercent: 0.45, astmLetter: "G", weeping: false, silicateChange: "slight", notes: "agreed" });
    expect((await records()).map((r) => r.id)).toEqual([score.id]);
    expect(score.scorerId).toBeNull();

    await setScoreRule({ labId: lab.labId, userId: lab.users.lead.id }, { trialId: t.trialId, scoreRule: "primary-scorer", primaryScorerId: lab.users.technician.id });
    expect((await records()).map((r) => r.scorerId)).toEqual([lab.users.technician.id]);
  });
});
