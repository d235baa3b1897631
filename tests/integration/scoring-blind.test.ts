// Blind scoring: the queue shows photo ids only, in an order seeded per scorer; blind scores are kept
// apart from the open ones; and the HTTP API gives a blind scorer no label, treatment or chamber.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { saveScore } from "@/db/queries/scores";
import { assignScorer } from "@/db/queries/scores-agreement";
import { getBlindPhoto, listScoringQueue } from "@/db/queries/scores-queue";
import { saveScoreSchema } from "@/lib/validation/scores";
import { DEMO_PASSWORD } from "@/experiments/demo-lab";
import { assignScorerAction } from "@/app/_actions/scorers";
import { createTestLab, type TestLab } from "../support/db";
import { signedInClient } from "../support/http";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { createReadyPhoto, createScoringTrial, type MadePhoto, type ScoringTrial } from "./scoring-fixtures";

let s3: S3Fake;
let lab: TestLab;
let t: ScoringTrial;
const made: MadePhoto[] = [];
let labels: string[] = [];
let names: string[] = [];

beforeAll(async () => {
  s3 = await ensureS3Fake();
  lab = await createTestLab("Scoring blind");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id, specimens: 3, days: [0, 7, 14] });
  for (const inspectionId of t.inspectionIds) {
    for (const specimenId of t.specimenIds) {
      made.push(await createReadyPhoto({ labId: lab.labId, trialId: t.trialId, inspectionId, specimenId, uploadedBy: lab.users.technician.id, width: 320, height: 240, filename: `label-in-name-${specimenId}.jpg` }));
    }
  }
  const sp = await db.select().from(s.specimens).where(eq(s.specimens.labId, lab.labId));
  labels = sp.map((r) => r.label);
  const [chamber] = await db.select().from(s.chambers).where(eq(s.chambers.id, t.chamberId));
  const [treatment] = await db.select().from(s.treatments).where(eq(s.treatments.id, t.treatmentId));
  names = [chamber.name, treatment.name];
  await assignScorer({ labId: lab.labId, userId: lab.users.lead.id }, { trialId: t.trialId, userId: lab.users.technician.id, blind: false });
  await assignScorer({ labId: lab.labId, userId: lab.users.lead.id }, { trialId: t.trialId, userId: lab.users.researcher.id, blind: true });
  await assignScorer({ labId: lab.labId, userId: lab.users.lead.id }, { trialId: t.trialId, userId: lab.users.lead.id, blind: true });
});
afterAll(async () => {
  await closeDb();
  await s3?.stop();
});

function leaks(payload: unknown): string[] {
  const text = JSON.stringify(payload);
  return [...labels, ...names, ...t.specimenIds, ...t.inspectionIds, "label-in-name", "dayNumber", "treatment", "chamber"].filter((x) => text.includes(x));
}

describe("blind scorer's queue", () => {
  it("has photo ids only: no specimen label, treatment, chamber, day or ids that link photos to specimens", async () => {
    const q = await listScoringQueue({ labId: lab.labId, userId: lab.users.researcher.id, trialId: t.trialId, page: 1, show: "all" });
    expect(q.blind).toBe(true);
    expect(q.total).toBe(9);
    for (const item of q.items) expect(Object.keys(item).sort()).toEqual(["photoId", "position", "scored", "thumbUrl"]);
    expect(leaks(q)).toEqual([]);
    const view = await getBlindPhoto({ labId: lab.labId, userId: lab.users.researcher.id, trialId: t.trialId, photoId: q.items[0].photoId });
    expect(leaks({ ...view, photo: { ...view.photo, url: null } })).toEqual([]);
  });

  it("an open scorer's queue names specimen, treatment and chamber", async () => {
    const q = await listScoringQueue({ labId: lab.labId, userId: lab.users.technician.id, trialId: t.trialId, page: 1, show: "all" });
    if (q.blind) throw new Error("an open scorer got the blind queue");
    expect(q.items.every((i) => labels.includes(i.specimenLabel))).toBe(true);
    expect(JSON.stringify(q)).toContain(names[0]);
  });

  it("is shuffled with a seed per scorer: the same order on every visit, a different one for another scorer", async () => {
    const order = async (userId: string) => (await listScoringQueue({ labId: lab.labId, userId, trialId: t.trialId, page: 1, show: "all" })).items.map((i) => i.photoId);
    const a1 = await order(lab.users.researcher.id);
    const a2 = await order(lab.users.researcher.id);
    const b = await order(lab.users.lead.id);
    expect(a2).toEqual(a1);
    expect(b).not.toEqual(a1);
    expect([...b].sort()).toEqual([...a1].sort());
  });

  it("keeps each scorer's score apart; a blind score is flagged blind and does not displace the primary's record", async () => {
    const q = await listScoringQueue({ labId: lab.labId, userId: lab.users.researcher.id, trialId: t.trialId, page: 1, show: "todo" });
    const photoId = q.items[0].photoId;
    const target = made.find((m) => m.photoId === photoId)!;
    const [row] = await db.select().from(s.photos).where(eq(s.photos.id, target.photoId));
    const base = { trialId: t.trialId, spotCount: "3", areaPercent: "2", astmLetter: "S", silicateChange: "none" };
    await saveScore({ labId: lab.labId, userId: lab.users.technician.id }, saveScoreSchema.parse({ ...base, inspectionId: row.inspectionId, specimenId: row.specimenId }));
    // The blind scorer knows only the photo id; the server works out what it shows.
    const blindSave = await saveScore({ labId: lab.labId, userId: lab.users.researcher.id }, saveScoreSchema.parse({ ...base, areaPercent: "2.5", photoId }));
    expect(blindSave.blind).toBe(true);
    const pair = await db.select().from(s.scores).where(and(eq(s.scores.inspectionId, row.inspectionId!), eq(s.scores.specimenId, row.specimenId)));
    expect(pair.map((p) => [p.scorerId, p.blind, p.isRecord, p.areaPercent]).sort()).toEqual([
      [lab.users.researcher.id, true, false, 2.5],
      [lab.users.technician.id, false, true, 2],
    ].sort());
    const after = await listScoringQueue({ labId: lab.labId, userId: lab.users.researcher.id, trialId: t.trialId, page: 1, show: "todo" });
    expect(after.todo).toBe(q.todo - 1);
    expect(after.items.map((i) => i.photoId)).not.toContain(photoId);
  });
});

describe("assigning scorers", () => {
  it("is for leads only, refuses observers as scorers, and sets the blind flag", async () => {
    const input = { trialId: t.trialId, userId: lab.users.technician.id, blind: "on" };
    const refused = await assignScorerAction.withIdentity(lab.as("researcher"), input);
    expect(refused.ok).toBe(false);
    const observer = await assignScorerAction.withIdentity(lab.as("lead"), { ...input, userId: lab.users.observer.id });
    expect(observer.errors?.userId?.[0]).toMatch(/Observers cannot score/);
    const ok = await assignScorerAction.withIdentity(lab.as("lead"), input);
    expect(ok.ok).toBe(true);
    const [row] = await db.select().from(s.trialMembers).where(and(eq(s.trialMembers.trialId, t.trialId), eq(s.trialMembers.userId, lab.users.technician.id), eq(s.trialMembers.role, "scorer")));
    expect(row.blind).toBe(true);
    // Back to open for the other tests in this file.
    expect((await assignScorerAction.withIdentity(lab.as("lead"), { ...input, blind: "" })).ok).toBe(true);
  });
});

describe("blind payload over HTTP (the running app, demo lab)", () => {
  it("GET /api/scores/queue and POST /api/scores answer scorer@ (blind on the demo trial) without label, treatment or chamber", async () => {
    const [demoTrial] = await db.select().from(s.trials).where(eq(s.trials.title, "Storage humidity × surface treatment, 2026 slices")).limit(1);
    const [placement] = await db.select().from(s.placements).where(eq(s.placements.trialId, demoTrial.id)).limit(1);
    const [inspection] = await db.select().from(s.inspections).where(eq(s.inspections.trialId, demoTrial.id)).limit(1);
    const [sp] = await db.select().from(s.specimens).where(eq(s.specimens.id, placement.specimenId));
    const [ch] = await db.select().from(s.chambers).where(eq(s.chambers.id, placement.chamberId));
    const [tr] = await db.select().from(s.treatments).where(eq(s.treatments.id, placement.treatmentId));
    const [tech] = await db.select().from(s.users).where(eq(s.users.email, "technician@tarrow.example"));
    const photo = await createReadyPhoto({ labId: demoTrial.labId, trialId: demoTrial.id, inspectionId: inspection.id, specimenId: sp.id, uploadedBy: tech.id, width: 320, height: 240 });

    const client = await signedInClient("scorer@tarrow.example", DEMO_PASSWORD);
    const ids: string[] = [];
    for (let page = 1, pages = 1; page <= pages; page++) {
      const res = await client.fetch(`/api/scores/queue?trialId=${demoTrial.id}&show=all&page=${page}`);
      expect(res.status).toBe(200);
      const body = await res.json();
      expect(body.blind).toBe(true);
      const text = JSON.stringify(body);
      for (const secret of [sp.label, ch.name, tr.name, sp.id, inspection.id]) expect(text).not.toContain(secret);
      for (const item of body.items) expect(Object.keys(item).sort()).toEqual(["photoId", "position", "scored", "thumbUrl"]);
      ids.push(...body.items.map((i: { photoId: string }) => i.photoId));
      pages = body.pages;
    }
    expect(ids).toContain(photo.photoId);

    const save = await client.fetch("/api/scores", {
      method: "POST", headers: { "content-type": "application/json" },
      body: JSON.stringify({ trialId: demoTrial.id, photoId: photo.photoId, spotCount: 0, areaPercent: 0, silicateChange: "none", notes: "" }),
    });
    expect(save.status).toBe(200);
    const saved = await save.json();
    expect(saved.score).toMatchObject({ blind: true, astmGrade: 10, isoDegree: 0 });
    expect(Object.keys(saved.score)).not.toContain("specimenId");
    expect(JSON.stringify(saved)).not.toContain(sp.id);

    // Marks: the caller's own on a photo of their lab; another lab's photo answers 404.
    const own = await client.fetch(`/api/marks?photoId=${photo.photoId}`);
    expect(own.status).toBe(200);
    expect(await own.json()).toMatchObject({ photoId: photo.photoId, face: null, marks: [] });
    expect((await client.fetch(`/api/marks?photoId=${made[0].photoId}`)).status).toBe(404);
  });

  it("an observer's POST /api/scores is refused with 403 and writes nothing", async () => {
    const [demoTrial] = await db.select().from(s.trials).where(eq(s.trials.title, "Storage humidity × surface treatment, 2026 slices")).limit(1);
    const [inspection] = await db.select().from(s.inspections).where(eq(s.inspections.trialId, demoTrial.id)).limit(1);
    const [placement] = await db.select().from(s.placements).where(eq(s.placements.trialId, demoTrial.id)).limit(1);
    const client = await signedInClient("observer@tarrow.example", DEMO_PASSWORD);
    const res = await client.fetch("/api/scores", {
      method: "POST", headers: { "content-type": "application/json" },
      body: JSON.stringify({ trialId: demoTrial.id, inspectionId: inspection.id, specimenId: placement.specimenId, spotCount: 1, areaPercent: 5, astmLetter: "G", silicateChange: "none" }),
    });
    expect(res.status).toBe(403);
    const [observer] = await db.select().from(s.users).where(eq(s.users.email, "observer@tarrow.example"));
    expect(await db.select().from(s.scores).where(eq(s.scores.scorerId, observer.id))).toEqual([]);
  });
});
