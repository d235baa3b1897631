import "server-only";
// Draft allocation of specimens to arms (seeded, optionally blocked by material class) and manual
// swaps. Split from trials.ts to keep files short; the same lock rules apply (lockTrial).
import { and, eq, inArray } from "drizzle-orm";
import { allocateByLabel, blockKeyOf, blockText, type BlockFactor } from "@/lib/allocation/allocate";
import { AppError } from "@/lib/auth/errors";
import { recordAudit } from "../audit";
import { db } from "../client";
import { specimens, trialAllocations, trialArms, trials } from "../schema";
import { assertAllowed, type Actor } from "./specimens";
import { loadHistoryFactors } from "./specimen-history";
import { assertWritable } from "@/lib/trials/lock";
import { lockTrial } from "./trial-access";

/** A fresh seed for the form: short, readable, and written down with the allocation. */
export function newSeed() {
  const words = ["tarn", "scar", "rigg", "holm", "fell", "beck", "gill", "knot", "moss", "rake", "syke", "wyke"];
  const bytes = crypto.getRandomValues(new Uint8Array(4));
  return `${words[bytes[0] % words.length]}-${words[bytes[1] % words.length]}-${(bytes[2] * 256 + bytes[3]) % 10000}`;
}

export async function allocateTrial({ actor, trialId, specimenIds, seed, blockByMaterial, blockFactors = [] }: {
  actor: Actor; trialId: string; specimenIds: string[]; seed: string; blockByMaterial: boolean;
  /** Specimen-history factors blocked on beside the material class. */
  blockFactors?: readonly ("parentPiece" | "chlorideState")[];
}) {
  const factors: BlockFactor[] = [...(blockByMaterial ? ["materialClass" as const] : []), ...new Set(blockFactors)];
  assertAllowed(actor, "trials.write");
  return db.transaction(async (tx) => {
    const trial = await lockTrial(tx, actor.labId, trialId);
    assertWritable(trial, "draft");
    const unique = [...new Set(specimenIds)];
    const [arms, chosen] = await Promise.all([
      tx.select({ id: trialArms.id, label: trialArms.label, chamberId: trialArms.chamberId }).from(trialArms).where(eq(trialArms.trialId, trialId)),
      tx.select({ id: specimens.id, label: specimens.label, materialClass: specimens.materialClass, parentPiece: specimens.parentPiece }).from(specimens)
        .where(and(eq(specimens.labId, actor.labId), inArray(specimens.id, unique))),
    ]);
    if (chosen.length !== unique.length) throw new AppError("invalid", "A chosen specimen is not in this lab.", { specimenIds: ["Choose specimens of this lab."] });
    if (arms.length === 0) throw new AppError("invalid", "The trial has no arms yet; pick chambers and treatments first.");
    const needed = arms.length * trial.replicatesPerArm;
    if (chosen.length < needed) {
      throw new AppError("invalid", `${arms.length} arms × ${trial.replicatesPerArm} replicates need ${needed} specimens; ${chosen.length} chosen.`, { specimenIds: [`Choose at least ${needed} specimens.`] });
    }
    // Keyed by the printed labels, not database ids, so anyone holding the allocation table and the
    // seed can recompute it with lib/allocation (labels are unique per lab and per trial).
    // The chloride state is the latest test's result when allocating (lib/specimens/history.ts).
    const history = factors.includes("chlorideState") ? await loadHistoryFactors({ labId: actor.labId, specimenIds: unique }) : null;
    const withHistory = chosen.map((c) => ({ ...c, chlorideState: history?.get(c.id)?.chlorideState ?? "untested" }));
    const result = allocateByLabel({ specimens: withHistory, arms, seed, blockBy: factors, replicatesPerArm: trial.replicatesPerArm });
    const { byLabel } = result;
    const keyOf = new Map(withHistory.map((c) => [c.id, blockKeyOf(c, factors)]));
    const previous = await tx.delete(trialAllocations).where(eq(trialAllocations.trialId, trialId)).returning();
    const rows = [
      ...result.assignments.map((a) => ({ labId: actor.labId, trialId, specimenId: a.specimenId, armId: a.armId, blockKey: keyOf.get(a.specimenId)! })),
      ...result.unallocated.map((id) => ({ labId: actor.labId, trialId, specimenId: id, armId: null, blockKey: keyOf.get(id)! })),
    ];
    for (let i = 0; i < rows.length; i += 1000) await tx.insert(trialAllocations).values(rows.slice(i, i + 1000));
    const [after] = await tx.update(trials).set({ allocationSeed: seed, blockByMaterial, blockFactors: factors.filter((f) => f !== "materialClass"), updatedAt: new Date() }).where(eq(trials.id, trialId)).returning();
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "trial", entityId: trialId, action: "update",
      summary: `${previous.length ? "Re-allocated" : "Allocated"} ${result.assignments.length} specimens with seed "${seed}"${factors.length ? `, ${blockText({ blockByMaterial, blockFactors })}` : ""}`,
      before: previous.length ? { seed: trial.allocationSeed, assignments: previous.map((p) => ({ specimenId: p.specimenId, armId: p.armId })) } : null,
      // The label form is what reproduces it: allocateDetailed with these labels, arm labels and seed.
      after: { seed, blockByMaterial, blockFactors: factors, chlorideStates: history ? Object.fromEntries(withHistory.map((c) => [c.label, c.chlorideState])) : undefined, replicatesPerArm: trial.replicatesPerArm, byLabel: byLabel.assignments, leftOverLabels: byLabel.unallocated, assignments: result.assignments },
    });
    return { trial: after, assigned: result.assignments.length, unallocated: result.unallocated.length };
  });
}

/** Exchange the arms of two specimens (either may be a left-over one). Needs a reason; audited. */
export async function swapAllocation({ actor, trialId, specimenA, specimenB, reason }: { actor: Actor; trialId: string; specimenA: string; specimenB: string; reason: string }) {
  assertAllowed(actor, "trials.write");
  return db.transaction(async (tx) => {
    const trial = await lockTrial(tx, actor.labId, trialId);
    assertWritable(trial, "draft");
    const rows = await tx.select().from(trialAllocations)
      .where(and(eq(trialAllocations.trialId, trialId), inArray(trialAllocations.specimenId, [specimenA, specimenB])));
    const a = rows.find((r) => r.specimenId === specimenA);
    const b = rows.find((r) => r.specimenId === specimenB);
    if (!a || !b) throw new AppError("invalid", "Both specimens must be in this trial's allocation.", { specimenB: ["Choose two allocated specimens."] });
    if (a.armId === b.armId) throw new AppError("invalid", "The two specimens are already in the same arm; swapping changes nothing.", { specimenB: ["Choose a specimen in another arm."] });
    await tx.update(trialAllocations).set({ armId: b.armId, swapReason: reason }).where(eq(trialAllocations.id, a.id));
    await tx.update(trialAllocations).set({ armId: a.armId, swapReason: reason }).where(eq(trialAllocations.id, b.id));
    const labels = await tx.select({ id: specimens.id, label: specimens.label }).from(specimens).where(inArray(specimens.id, [specimenA, specimenB]));
    const name = (id: string) => labels.find((l) => l.id === id)?.label ?? id;
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "trial", entityId: trialId, action: "update",
      summary: `Swapped ${name(specimenA)} and ${name(specimenB)} in the allocation: ${reason}`,
      before: [{ specimenId: specimenA, armId: a.armId }, { specimenId: specimenB, armId: b.armId }],
      after: [{ specimenId: specimenA, armId: b.armId }, { specimenId: specimenB, armId: a.armId }, { reason }],
    });
  });
}
