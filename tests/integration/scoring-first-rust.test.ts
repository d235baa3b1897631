// First rust is derived from the scores of record each time (never stored), so a correction moves it.
// The score page and the comparison share the one derivation (loadSpecimenOutcomes → lib/analysis/derive).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/client";
import { loadSpecimenOutcomes } from "@/db/queries/analysis";
import { getTrial } from "@/db/queries/trial-access";
import { saveScore } from "@/db/queries/scores";
import { saveScoreSchema } from "@/lib/validation/scores";
import { createTestLab, type TestLab } from "../support/db";
import { createScoringTrial, type ScoringTrial } from "./scoring-fixtures";

let lab: TestLab;
let t: ScoringTrial;

beforeAll(async () => {
  lab = await createTestLab("Scoring first rust");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id, days: [0, 7, 14, 28] });
});
afterAll(() => closeDb());

async function score(day: number, over: Record<string, string> = {}, specimen = 0) {
  const data = saveScoreSchema.parse({
    trialId: t.trialId, inspectionId: t.inspectionIds[t.days.indexOf(day)], specimenId: t.specimenIds[specimen],
    spotCount: "0", areaPercent: "0", silicateChange: "none", ...over,
  });
  return saveScore({ labId: lab.labId, userId: lab.users.technician.id }, data);
}
async function firstRust(specimen = 0) {
  const trial = await getTrial({ labId: lab.labId, trialId: t.trialId });
  const { outcomes } = await loadSpecimenOutcomes({ labId: lab.labId, trial, specimenId: t.specimenIds[specimen] });
  expect(outcomes).toHaveLength(1); // one placement
  return { interval: outcomes[0].interval, scoredInspections: outcomes[0].observations.length };
}

describe("first-rust interval", () => {
  it("is (previous inspection, first rusted inspection] and moves when a score is corrected", async () => {
    expect((await firstRust()).interval).toBeNull();
    await score(0);
    await score(7);
    expect((await firstRust()).interval).toEqual({ lower: 7, upper: null });
    await score(14, { spotCount: "2", areaPercent: "0.2", astmLetter: "S" });
    await score(28, { spotCount: "5", areaPercent: "1.5", astmLetter: "S" });
    expect(await firstRust()).toEqual({ interval: { lower: 7, upper: 14 }, scoredInspections: 4 });

    // A second look finds a spot already at day 7: the interval moves earlier.
    await score(7, { spotCount: "1", areaPercent: "0.02", astmLetter: "P" });
    expect((await firstRust()).interval).toEqual({ lower: 0, upper: 7 });

    // …and correcting it back restores the original interval.
    await score(7);
    expect((await firstRust()).interval).toEqual({ lower: 7, upper: 14 });
  });

  it("counts weeping alone as rust (isRusted), and a blind score that is not the record does not move it", async () => {
    await score(0, {}, 1);
    await score(7, { weeping: "on" }, 1);
    expect((await firstRust(1)).interval).toEqual({ lower: 0, upper: 7 });
    // Another (non-primary) scorer calling day 0 rusted changes nothing: only scores of record count.
    await saveScore({ labId: lab.labId, userId: lab.users.lead.id }, saveScoreSchema.parse({
      trialId: t.trialId, inspectionId: t.inspectionIds[0], specimenId: t.specimenIds[1], spotCount: "3", areaPercent: "0.5", astmLetter: "S", silicateChange: "none",
    }));
    expect((await firstRust(1)).interval).toEqual({ lower: 0, upper: 7 });
  });
});
