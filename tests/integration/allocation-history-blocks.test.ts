// Allocation blocked by specimen history in the database: parent piece and the latest chloride test
// (recorded through the history action) make the blocks, every block is balanced across the arms as
// trials-allocation.test.ts checks for material classes, the trial keeps its factors, and the stored
// allocation is recomputed from the labels, the audit record's chloride states and the seed.
import { and, desc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { addSpecimenHistoryAction } from "@/app/_actions/specimen-history";
import { allocateAction, createTrialAction } from "@/app/_actions/trials";
import { allocateDetailed } from "@/lib/allocation/allocate";
import { createTestLab, type TestLab } from "../support/db";
import { addChambers, addSpecimens, addTreatments, designInput } from "./trials-fixtures";

let a: TestLab;
let chamberIds: string[];
let treatmentIds: string[];
let sp: { id: string; label: string }[];

beforeAll(async () => {
  a = await createTestLab("History blocks");
  chamberIds = await addChambers(a, 1);
  treatmentIds = await addTreatments(a, ["Bare control", "Wax", "Lacquer"]);
  // 20 slices of three parent pieces (9, 7, 4), chloride found on every third slice.
  sp = await addSpecimens(a, { "iron-meteorite": 20 });
  for (const [i, x] of sp.entries()) {
    await db.update(s.specimens).set({ parentPiece: i < 9 ? "Tarrow main mass" : i < 16 ? "Tarrow end piece" : "Tarrow fragment", slice: `S${i + 1}` }).where(eq(s.specimens.id, x.id));
    if (i % 3 === 0) {
      const r = await addSpecimenHistoryAction.withIdentity(a.as("researcher"), { specimenId: x.id, kind: "chloride", testedOn: "2026-01-05", method: "chloride-strip", result: "present" });
      expect(r.ok, r.message).toBe(true);
    }
  }
});
afterAll(() => closeDb());

describe("allocation blocked by specimen history", () => {
  it("balances every parent-piece × chloride block across the arms and can be recomputed", async () => {
    const t = await createTrialAction.withIdentity(a.as("researcher"), designInput({ chamberIds, treatmentIds, replicatesPerArm: 6 }));
    const trialId = (t.data as { id: string }).id;
    const r = await allocateAction.withIdentity(a.as("researcher"), { trialId, "specimenIds[]": sp.map((x) => x.id), seed: "history-1", blockByMaterial: "", "blockFactors[]": ["parentPiece", "chlorideState"] });
    expect(r.ok, r.message).toBe(true);
    const rows = await db.select({ label: s.specimens.label, parentPiece: s.specimens.parentPiece, blockKey: s.trialAllocations.blockKey, armId: s.trialAllocations.armId, arm: s.trialArms.label })
      .from(s.trialAllocations).innerJoin(s.specimens, eq(s.specimens.id, s.trialAllocations.specimenId))
      .leftJoin(s.trialArms, eq(s.trialArms.id, s.trialAllocations.armId)).where(eq(s.trialAllocations.trialId, trialId));
    const arms = await db.select().from(s.trialArms).where(eq(s.trialArms.trialId, trialId));
    expect(arms).toHaveLength(3);
    expect(new Set(rows.map((x) => x.blockKey))).toEqual(new Set([
      "Tarrow main mass · present", "Tarrow main mass · untested", "Tarrow end piece · present", "Tarrow end piece · untested", "Tarrow fragment · present", "Tarrow fragment · untested",
    ]));
    const assigned = rows.filter((x) => x.armId);
    expect(assigned).toHaveLength(18); // 3 arms × 6 replicates of 20
    for (const key of new Set(assigned.map((x) => x.blockKey))) {
      const perArm = arms.map((arm) => assigned.filter((x) => x.blockKey === key && x.armId === arm.id).length);
      expect(Math.max(...perArm) - Math.min(...perArm), key).toBeLessThanOrEqual(1);
    }
    const [trial] = await db.select().from(s.trials).where(eq(s.trials.id, trialId));
    expect(trial).toMatchObject({ blockByMaterial: false, blockFactors: ["parentPiece", "chlorideState"] });

    const [audit] = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.entityId, trialId), eq(s.auditEvents.entity, "trial"))).orderBy(desc(s.auditEvents.id)).limit(1);
    expect(audit.summary).toMatch(/blocked by parent piece and chloride test result$/);
    const states = (audit.after as { chlorideStates: Record<string, string> }).chlorideStates;
    const again = allocateDetailed({
      specimens: rows.map((x) => ({ id: x.label, materialClass: "iron-meteorite", parentPiece: x.parentPiece, chlorideState: states[x.label] })),
      arms: arms.map((x) => ({ id: x.label })), seed: "history-1", blockBy: ["parentPiece", "chlorideState"], replicatesPerArm: 6,
    });
    expect(Object.fromEntries(again.assignments.map((x) => [x.specimenId, x.armId]))).toEqual(Object.fromEntries(assigned.map((x) => [x.label, x.arm])));
  });

  it("refuses an unknown block factor at the field", async () => {
    const t = await createTrialAction.withIdentity(a.as("researcher"), designInput({ chamberIds, treatmentIds, replicatesPerArm: 2 }));
    const trialId = (t.data as { id: string }).id;
    const r = await allocateAction.withIdentity(a.as("researcher"), { trialId, "specimenIds[]": sp.map((x) => x.id), seed: "x", "blockFactors[]": ["colour"] });
    expect(r).toMatchObject({ ok: false, code: "invalid" });
    expect(Object.keys(r.errors ?? {}).join()).toMatch(/blockFactors/);
    expect(await db.select().from(s.trialAllocations).where(eq(s.trialAllocations.trialId, trialId))).toHaveLength(0);
  });
});
