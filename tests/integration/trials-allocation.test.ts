// Allocation as stored in the database: balanced within material-class blocks, reproducible from the
// seed, re-rolled only while draft, and manual swaps need a reason that lands in the audit trail.
import { and, desc, eq, isNotNull } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { allocateAction, createTrialAction, swapAction, updateTrialAction } from "@/app/_actions/trials";
import { allocateDetailed } from "@/lib/allocation/allocate";
import { createTestLab, type TestLab } from "../support/db";
import { addChambers, addSpecimens, addTreatments, designInput } from "./trials-fixtures";

let a: TestLab;
let chamberIds: string[];
let treatmentIds: string[];
let sp: { id: string; materialClass: string }[];

beforeAll(async () => {
  a = await createTestLab("Allocation");
  chamberIds = await addChambers(a, 2);
  treatmentIds = await addTreatments(a, ["Bare control", "Wax", "Lacquer"]);
  // Uneven blocks on purpose: 13 iron, 8 stony-iron, 3 archaeological = 24 specimens, 6 arms.
  sp = await addSpecimens(a, { "iron-meteorite": 13, "stony-iron": 8, "archaeological-iron": 3 });
});
afterAll(() => closeDb());

async function draftTrial(replicates: number) {
  const r = await createTrialAction.withIdentity(a.as("researcher"), designInput({ chamberIds, treatmentIds, replicatesPerArm: replicates }));
  expect(r.ok, r.message).toBe(true);
  return (r.data as { id: string }).id;
}

async function stored(trialId: string) {
  return db.select().from(s.trialAllocations).where(eq(s.trialAllocations.trialId, trialId));
}

function counts<T>(items: T[], key: (t: T) => string) {
  const m = new Map<string, number>();
  for (const i of items) m.set(key(i), (m.get(key(i)) ?? 0) + 1);
  return m;
}

describe("allocation in the database", () => {
  it("is balanced within each material-class block and overall", async () => {
    const trialId = await draftTrial(4);
    const r = await allocateAction.withIdentity(a.as("researcher"), { trialId, "specimenIds[]": sp.map((x) => x.id), seed: "balance-1", blockByMaterial: "on" });
    expect(r.ok, r.message).toBe(true);
    const rows = await stored(trialId);
    const arms = await db.select().from(s.trialArms).where(eq(s.trialArms.trialId, trialId));
    expect(arms).toHaveLength(6);
    expect(rows.every((x) => x.armId)).toBe(true); // 6 arms × 4 = all 24
    const overall = counts(rows, (x) => x.armId!);
    expect([...overall.values()]).toEqual(Array(6).fill(4));
    for (const cls of ["iron-meteorite", "stony-iron", "archaeological-iron"]) {
      const inBlock = rows.filter((x) => x.blockKey === cls);
      const c = counts(inBlock, (x) => x.armId!);
      const perArm = arms.map((arm) => c.get(arm.id) ?? 0);
      expect(Math.max(...perArm) - Math.min(...perArm), cls).toBeLessThanOrEqual(1);
    }
    const [t] = await db.select().from(s.trials).where(eq(s.trials.id, trialId));
    expect(t).toMatchObject({ allocationSeed: "balance-1", blockByMaterial: true });
  });

  it("the same seed gives the same allocation, in another trial and in any input order; a new seed re-rolls", async () => {
    const one = await draftTrial(2);
    const two = await draftTrial(2);
    const ids = sp.map((x) => x.id);
    await allocateAction.withIdentity(a.as("researcher"), { trialId: one, "specimenIds[]": ids, seed: "repeatable", blockByMaterial: "on" });
    await allocateAction.withIdentity(a.as("researcher"), { trialId: two, "specimenIds[]": [...ids].reverse(), seed: "repeatable", blockByMaterial: "on" });
    // Arms differ between trials, so compare by (chamber, treatment) combination.
    const byCombo = async (trialId: string) => {
      const rows = await db.select({ specimenId: s.trialAllocations.specimenId, chamberId: s.trialArms.chamberId, treatmentId: s.trialArms.treatmentId })
        .from(s.trialAllocations).leftJoin(s.trialArms, eq(s.trialArms.id, s.trialAllocations.armId)).where(eq(s.trialAllocations.trialId, trialId));
      return Object.fromEntries(rows.map((r) => [r.specimenId, r.chamberId ? `${r.chamberId}|${r.treatmentId}` : null]));
    };
    const first = await byCombo(one);
    expect(Object.values(first).filter(Boolean)).toHaveLength(12); // 6 arms × 2
    expect(Object.values(first).filter((v) => v === null)).toHaveLength(12); // left over, kept as selected
    // Keyed by specimen and arm labels, so the same seed maps each specimen to the same chamber × treatment.
    expect(await byCombo(two)).toEqual(first);

    await allocateAction.withIdentity(a.as("researcher"), { trialId: one, "specimenIds[]": ids, seed: "repeatable", blockByMaterial: "on" });
    expect(await byCombo(one)).toEqual(first);
    const reroll = await allocateAction.withIdentity(a.as("researcher"), { trialId: one, "specimenIds[]": ids, seed: "another-seed", blockByMaterial: "on" });
    expect(reroll.ok).toBe(true);
    expect(await byCombo(one)).not.toEqual(first);
    const audit = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.entityId, one), eq(s.auditEvents.entity, "trial"))).orderBy(desc(s.auditEvents.id)).limit(1);
    expect(audit[0].summary).toMatch(/^Re-allocated 12 specimens with seed "another-seed"/);
  });

  it("anyone can recompute the stored allocation from the printed labels and the seed", async () => {
    const trialId = await draftTrial(3);
    await allocateAction.withIdentity(a.as("researcher"), { trialId, "specimenIds[]": sp.map((x) => x.id), seed: "reviewer-check", blockByMaterial: "on" });
    const rows = await db.select({ label: s.specimens.label, materialClass: s.specimens.materialClass, arm: s.trialArms.label })
      .from(s.trialAllocations).innerJoin(s.specimens, eq(s.specimens.id, s.trialAllocations.specimenId))
      .leftJoin(s.trialArms, eq(s.trialArms.id, s.trialAllocations.armId)).where(eq(s.trialAllocations.trialId, trialId));
    const armLabels = (await db.select({ label: s.trialArms.label }).from(s.trialArms).where(eq(s.trialArms.trialId, trialId))).map((x) => ({ id: x.label }));
    const again = allocateDetailed({ specimens: rows.map((r) => ({ id: r.label, materialClass: r.materialClass })), arms: armLabels, seed: "reviewer-check", blockBy: "materialClass", replicatesPerArm: 3 });
    expect(Object.fromEntries(again.assignments.map((x) => [x.specimenId, x.armId]))).toEqual(Object.fromEntries(rows.filter((r) => r.arm).map((r) => [r.label, r.arm])));
    expect(again.unallocated.sort()).toEqual(rows.filter((r) => !r.arm).map((r) => r.label).sort());
  });

  it("refuses too few specimens, and discards the allocation when the arms change", async () => {
    const trialId = await draftTrial(4);
    const few = await allocateAction.withIdentity(a.as("researcher"), { trialId, "specimenIds[]": sp.slice(0, 10).map((x) => x.id), seed: "x", blockByMaterial: "on" });
    expect(few.ok).toBe(false);
    expect(few.message).toMatch(/need 24 specimens; 10 chosen/);
    await allocateAction.withIdentity(a.as("researcher"), { trialId, "specimenIds[]": sp.map((x) => x.id), seed: "x", blockByMaterial: "" });
    expect(await stored(trialId)).toHaveLength(24);
    const edit = await updateTrialAction.withIdentity(a.as("researcher"), { trialId, ...designInput({ chamberIds, treatmentIds: treatmentIds.slice(0, 2), replicatesPerArm: 4 }) });
    expect(edit.ok, edit.message).toBe(true);
    expect(edit.message).toMatch(/allocation was discarded/);
    expect(await stored(trialId)).toHaveLength(0);
    expect(await db.select().from(s.trialArms).where(eq(s.trialArms.trialId, trialId))).toHaveLength(4);
  });

  it("a manual swap needs a reason, exchanges the two arms and is audited", async () => {
    const trialId = await draftTrial(2);
    await allocateAction.withIdentity(a.as("researcher"), { trialId, "specimenIds[]": sp.map((x) => x.id), seed: "swap", blockByMaterial: "on" });
    const rows = await db.select().from(s.trialAllocations).where(and(eq(s.trialAllocations.trialId, trialId), isNotNull(s.trialAllocations.armId)));
    const x = rows[0];
    const y = rows.find((r) => r.armId !== x.armId)!;
    const noReason = await swapAction.withIdentity(a.as("researcher"), { trialId, specimenA: x.specimenId, specimenB: y.specimenId, reason: "" });
    expect(noReason.ok).toBe(false);
    expect(noReason.errors?.reason).toBeDefined();
    const ok = await swapAction.withIdentity(a.as("researcher"), { trialId, specimenA: x.specimenId, specimenB: y.specimenId, reason: "X has a crack across the face" });
    expect(ok.ok, ok.message).toBe(true);
    const after = await stored(trialId);
    expect(after.find((r) => r.specimenId === x.specimenId)?.armId).toBe(y.armId);
    expect(after.find((r) => r.specimenId === y.specimenId)?.armId).toBe(x.armId);
    const [ev] = await db.select().from(s.auditEvents).where(eq(s.auditEvents.entityId, trialId)).orderBy(desc(s.auditEvents.id)).limit(1);
    expect(ev.summary).toMatch(/^Swapped .* in the allocation: X has a crack across the face$/);
    expect(ev.before).toEqual([{ specimenId: x.specimenId, armId: x.armId }, { specimenId: y.specimenId, armId: y.armId }]);
  });
});
