// The score page and the comparison show the same first-rust interval for every demo specimen:
// both come from the one derivation (db/queries/analysis loadSpecimenOutcomes → lib/analysis/derive).
import { and, asc, eq, isNotNull } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { getTrialAnalysis } from "@/db/queries/analysis";
import { getScorePage } from "@/db/queries/scores-read";

let labId: string;
let trialId: string;
let technicianId: string;
let scorerId: string;
let inspectionId: string;

beforeAll(async () => {
  const [lab] = await db.select().from(s.labs).where(eq(s.labs.name, "Tarrow Valley Natural History Collection"));
  labId = lab.id;
  const [trial] = await db.select().from(s.trials).where(and(eq(s.trials.labId, labId), eq(s.trials.status, "running")));
  trialId = trial.id;
  technicianId = trial.primaryScorerId!;
  const [blind] = await db.select().from(s.trialMembers).where(and(eq(s.trialMembers.trialId, trialId), eq(s.trialMembers.blind, true)));
  scorerId = blind.userId;
  const [insp] = await db.select().from(s.inspections).where(and(eq(s.inspections.trialId, trialId), isNotNull(s.inspections.doneAt))).orderBy(asc(s.inspections.plannedAt)).limit(1);
  inspectionId = insp.id;
});
afterAll(() => closeDb());

describe("time to first rust has one source", () => {
  it("the score page and the comparison agree for every demo specimen, and some specimens have rusted", async () => {
    const analysis = await getTrialAnalysis({ labId, trialId, groupBy: "treatment" });
    const specimenIds = [...new Set(analysis.outcomes.map((o) => o.specimenId))];
    expect(specimenIds.length).toBe(24);
    let rusted = 0;
    for (const specimenId of specimenIds) {
      const page = await getScorePage({ labId, userId: technicianId, trialId, inspectionId, specimenId });
      const fromComparison = analysis.outcomes.filter((o) => o.specimenId === specimenId).map((o) => o.interval);
      const fromScorePage = page.firstRust!.map((o) => o.interval);
      expect({ specimenId, interval: fromScorePage }).toEqual({ specimenId, interval: fromComparison });
      if (fromComparison.some((i) => i?.upper != null)) rusted++;
    }
    expect(rusted).toBeGreaterThan(0);
  }, 120_000);

  it("a blind scorer's score page carries no first-rust interval, arm or other scorer's score", async () => {
    const [sp] = await db.select().from(s.placements).where(eq(s.placements.trialId, trialId)).limit(1);
    const page = await getScorePage({ labId, userId: scorerId, trialId, inspectionId, specimenId: sp.specimenId });
    expect(page.access.blind).toBe(true);
    expect(page.firstRust).toBeNull();
    expect(page.placement).toBeNull();
    expect(page.record).toBeNull();
    expect(page.pairScores.every((r) => r.score.scorerId === scorerId)).toBe(true);
  });
});
