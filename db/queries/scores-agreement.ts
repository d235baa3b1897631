import "server-only";
// Scorer assignment per trial (lead only) and agreement between scorers on the same photos.
import { and, asc, eq, isNotNull } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { blandAltman, cohensKappa, type BlandAltmanResult } from "@/lib/stats/agreement";
import { isRusted } from "@/lib/stats/outcomes";
import { assertWritable } from "@/lib/trials/lock";
import { recordAudit } from "../audit";
import { db, type Tx } from "../client";
import { scores, trialMembers, trials, users } from "../schema";
import { applyRecordRuleToTrial, type ScoreActor } from "./scores";
import { assertPrimaryIsScorer, assertTeamPeople } from "./team";
import { lockTrial } from "./trial-access";

/** ASTM D610 grades 0…10 are the kappa categories (11 of them, equally spaced for the weights). */
export const ASTM_CATEGORIES = 11;

export async function listTrialScorers({ labId, trialId }: { labId: string; trialId: string }) {
  return db
    .select({ userId: users.id, name: users.name, email: users.email, blind: trialMembers.blind })
    .from(trialMembers)
    .innerJoin(users, eq(users.id, trialMembers.userId))
    .where(and(eq(trialMembers.labId, labId), eq(trialMembers.trialId, trialId), eq(trialMembers.role, "scorer")))
    .orderBy(asc(users.name));
}

async function trialOfLab(tx: Tx, labId: string, trialId: string) {
  const trial = await lockTrial(tx, labId, trialId);
  assertWritable(trial);
  return trial;
}

/** Assign (or re-flag) a lab member as a scorer of the trial. Only staff who may score qualify. */
export async function assignScorer(actor: ScoreActor, input: { trialId: string; userId: string; blind: boolean }) {
  return db.transaction(async (tx) => {
    await trialOfLab(tx, actor.labId, input.trialId);
    await assertTeamPeople(tx, actor.labId, { scorers: [{ userId: input.userId }] }, { scorers: "userId" });
    const key = and(eq(trialMembers.trialId, input.trialId), eq(trialMembers.userId, input.userId), eq(trialMembers.role, "scorer"));
    const [before] = await tx.select().from(trialMembers).where(key);
    if (before) await tx.update(trialMembers).set({ blind: input.blind }).where(key);
    else await tx.insert(trialMembers).values({ trialId: input.trialId, userId: input.userId, labId: actor.labId, role: "scorer", blind: input.blind });
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "trial_member", entityId: `${input.trialId}:${input.userId}:scorer`,
      action: before ? "update" : "create", summary: `${before ? "Changed" : "Assigned"} a ${input.blind ? "blind " : ""}scorer`,
      before: before ?? null, after: { trialId: input.trialId, userId: input.userId, role: "scorer", blind: input.blind },
    });
  });
}

export async function removeScorer(actor: ScoreActor, input: { trialId: string; userId: string }) {
  return db.transaction(async (tx) => {
    await trialOfLab(tx, actor.labId, input.trialId);
    const key = and(eq(trialMembers.labId, actor.labId), eq(trialMembers.trialId, input.trialId), eq(trialMembers.userId, input.userId), eq(trialMembers.role, "scorer"));
    const [before] = await tx.delete(trialMembers).where(key).returning();
    if (!before) throw new AppError("not-found", "That person is not a scorer of this trial.");
    // Their scores stay: they were made and may be the record; the audit trail shows the change.
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "trial_member", entityId: `${input.trialId}:${input.userId}:scorer`, action: "delete", summary: "Removed a scorer", before });
  });
}

/** Set how the score of record is chosen, then re-apply it to every score of the trial. */
export async function setScoreRule(actor: ScoreActor, input: { trialId: string; scoreRule: "primary-scorer" | "consensus"; primaryScorerId?: string }) {
  return db.transaction(async (tx) => {
    const before = await trialOfLab(tx, actor.labId, input.trialId);
    await assertTeamPeople(tx, actor.labId, { primaryScorerId: input.primaryScorerId });
    // A newly chosen primary scorer must score the trial (keeping the current one is no new choice).
    if (input.primaryScorerId && input.primaryScorerId !== before.primaryScorerId) await assertPrimaryIsScorer(tx, before.id, { primaryScorerId: input.primaryScorerId, currentPrimaryId: before.primaryScorerId });
    const [trial] = await tx.update(trials)
      .set({ scoreRule: input.scoreRule, primaryScorerId: input.primaryScorerId ?? before.primaryScorerId, updatedAt: new Date() })
      .where(eq(trials.id, before.id)).returning();
    const records = await applyRecordRuleToTrial(tx, trial);
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "trial", entityId: trial.id, action: "update",
      summary: `Score of record: ${input.scoreRule === "consensus" ? "consensus after discussion" : "primary scorer"} (${records} scores of record re-derived)`,
      before: { scoreRule: before.scoreRule, primaryScorerId: before.primaryScorerId },
      after: { scoreRule: trial.scoreRule, primaryScorerId: trial.primaryScorerId },
    });
    return trial;
  });
}

export type PairAgreement = {
  a: { id: string; name: string };
  b: { id: string; name: string };
  /** Items (specimen × inspection) both scored with a grade. */
  n: number;
  /** Kappa on the rust / no-rust call (isRusted) over every item both scored; null when undefined. */
  rustCall: { n: number; kappa: number | null; agreed: number };
  kappa: { none: number; linear: number; quadratic: number } | null;
  /** Area % of a minus b; null when fewer than two paired areas. */
  blandAltman: BlandAltmanResult | null;
  /** Exact grade matches. */
  exactMatches: number;
  points: { mean: number; diff: number }[];
};

/** Kappa on the rust call and on ASTM grades, and Bland–Altman (area %), for every pair of scorers who scored the same items. */
export async function scorerAgreement({ labId, trialId }: { labId: string; trialId: string }): Promise<{ scorers: { id: string; name: string; n: number }[]; pairs: PairAgreement[] }> {
  const rows = await db
    .select({
      scorerId: scores.scorerId, name: users.name, inspectionId: scores.inspectionId, specimenId: scores.specimenId,
      grade: scores.astmGrade, area: scores.areaPercent, spotCount: scores.spotCount, weeping: scores.weeping,
    })
    .from(scores)
    .innerJoin(users, eq(users.id, scores.scorerId))
    .where(and(eq(scores.labId, labId), eq(scores.trialId, trialId), isNotNull(scores.scorerId)));
  const byScorer = new Map<string, { name: string; items: Map<string, { grade: number | null; area: number; rusted: boolean }> }>();
  for (const r of rows) {
    const s = byScorer.get(r.scorerId!) ?? { name: r.name, items: new Map() };
    s.items.set(`${r.inspectionId}|${r.specimenId}`, { grade: r.grade, area: r.area, rusted: isRusted({ spotCount: r.spotCount, areaPercent: r.area, weeping: r.weeping }) });
    byScorer.set(r.scorerId!, s);
  }
  const scorers = [...byScorer.entries()].map(([id, s]) => ({ id, name: s.name, n: s.items.size })).sort((x, y) => x.name.localeCompare(y.name) || x.id.localeCompare(y.id));
  const pairs: PairAgreement[] = [];
  for (let i = 0; i < scorers.length; i++) {
    for (let j = i + 1; j < scorers.length; j++) {
      const A = byScorer.get(scorers[i].id)!.items;
      const B = byScorer.get(scorers[j].id)!.items;
      const keys = [...A.keys()].filter((k) => B.has(k)).sort();
      const graded = keys.filter((k) => A.get(k)!.grade != null && B.get(k)!.grade != null);
      const ga = graded.map((k) => A.get(k)!.grade!);
      const gb = graded.map((k) => B.get(k)!.grade!);
      const aa = keys.map((k) => A.get(k)!.area);
      const ab = keys.map((k) => B.get(k)!.area);
      const kappa = graded.length === 0 ? null : {
        none: cohensKappa(ga, gb, { categories: ASTM_CATEGORIES, weights: "none" }),
        linear: cohensKappa(ga, gb, { categories: ASTM_CATEGORIES, weights: "linear" }),
        quadratic: cohensKappa(ga, gb, { categories: ASTM_CATEGORIES, weights: "quadratic" }),
      };
      if (keys.length === 0) continue;
      const ca = keys.map((k) => (A.get(k)!.rusted ? 1 : 0));
      const cb = keys.map((k) => (B.get(k)!.rusted ? 1 : 0));
      const callKappa = cohensKappa(ca, cb, { categories: 2 });
      pairs.push({
        a: { id: scorers[i].id, name: scorers[i].name }, b: { id: scorers[j].id, name: scorers[j].name },
        n: graded.length, kappa, exactMatches: ga.filter((g, k) => g === gb[k]).length,
        rustCall: { n: keys.length, kappa: Number.isFinite(callKappa) ? callKappa : null, agreed: ca.filter((x, k) => x === cb[k]).length },
        blandAltman: keys.length >= 2 ? blandAltman(aa, ab) : null,
        points: aa.map((x, k) => ({ mean: (x + ab[k]) / 2, diff: x - ab[k] })),
      });
    }
  }
  return { scorers, pairs };
}
