import "server-only";
import { and, asc, count, desc, eq, ilike, inArray, isNull, sql, type SQL } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { assertWritable } from "@/lib/trials/lock";
import { assertTeamChange } from "@/lib/trials/team";
import type { TrialDesign } from "@/lib/validation/trials";
import { recordAudit } from "../audit";
import { db, type Tx } from "../client";
import {
  chambers, memberships, placements, specimens, treatments, trialAllocations, trialArms, trialMembers, trialNotes, trials, users,
} from "../schema";
import { assertAllowed, type Actor } from "./specimens";
import { assertPrimaryIsScorer, assertTeamPeople } from "./team";
import { lockTrial, type Trial } from "./trial-access";

export type { Trial };

// ---- reads ----

export async function listTrials({ labId, status, q, page = 1, pageSize = 25 }: { labId: string; status?: Trial["status"]; q?: string; page?: number; pageSize?: number }) {
  const where: SQL[] = [eq(trials.labId, labId)];
  if (status) where.push(eq(trials.status, status));
  if (q) where.push(ilike(trials.title, `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`));
  const w = and(...where);
  const [rows, [{ total }]] = await Promise.all([
    db.select({
      id: trials.id, title: trials.title, status: trials.status, question: trials.question, replicatesPerArm: trials.replicatesPerArm,
      startedAt: trials.startedAt, concludedAt: trials.concludedAt, createdAt: trials.createdAt,
      // Qualified by hand: inside a select list Drizzle writes bare column names, which the subquery
      // would resolve against its own table. A started trial counts its placed specimens, a draft its allocation.
      arms: sql<number>`(select count(*)::int from trial_arms a where a.trial_id = "trials"."id")`,
      specimens: sql<number>`(case when "trials"."status" = 'draft'
        then (select count(*)::int from trial_allocations x where x.trial_id = "trials"."id" and x.arm_id is not null)
        else (select count(distinct p.specimen_id)::int from placements p where p.trial_id = "trials"."id") end)`,
    }).from(trials).where(w).orderBy(desc(trials.createdAt)).limit(pageSize).offset((page - 1) * pageSize),
    db.select({ total: count() }).from(trials).where(w),
  ]);
  return { rows, total, page, pageSize };
}

export async function listArms({ labId, trialId }: { labId: string; trialId: string }) {
  return db.select({
    id: trialArms.id, label: trialArms.label, chamberId: chambers.id, chamberName: chambers.name, setpointRhPercent: chambers.setpointRhPercent,
    nominalTempC: chambers.nominalTempC, treatmentId: treatments.id, treatmentName: treatments.name, treatmentKind: treatments.kind,
  }).from(trialArms)
    .innerJoin(chambers, eq(chambers.id, trialArms.chamberId))
    .innerJoin(treatments, eq(treatments.id, trialArms.treatmentId))
    .where(and(eq(trialArms.labId, labId), eq(trialArms.trialId, trialId)))
    .orderBy(asc(chambers.name), asc(treatments.name));
}

export async function listTrialMembers({ labId, trialId }: { labId: string; trialId: string }) {
  return db.select({ userId: users.id, name: users.name, email: users.email, role: trialMembers.role, blind: trialMembers.blind })
    .from(trialMembers).innerJoin(users, eq(users.id, trialMembers.userId))
    .where(and(eq(trialMembers.labId, labId), eq(trialMembers.trialId, trialId)))
    .orderBy(asc(users.name));
}

export async function listChamberChoices({ labId }: { labId: string }) {
  return db.select({ id: chambers.id, name: chambers.name, kind: chambers.kind, setpointRhPercent: chambers.setpointRhPercent, nominalTempC: chambers.nominalTempC })
    .from(chambers).where(and(eq(chambers.labId, labId), isNull(chambers.archivedAt))).orderBy(asc(chambers.name));
}

export async function listPeopleChoices({ labId }: { labId: string }) {
  return db.select({ userId: users.id, name: users.name, role: memberships.role })
    .from(memberships).innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.labId, labId)).orderBy(asc(users.name));
}

export async function listAllocation({ labId, trialId }: { labId: string; trialId: string }) {
  return db.select({
    specimenId: specimens.id, label: specimens.label, materialClass: specimens.materialClass, findName: specimens.findName,
    blockKey: trialAllocations.blockKey, armId: trialAllocations.armId, armLabel: trialArms.label,
    chamberName: chambers.name, treatmentName: treatments.name, swapReason: trialAllocations.swapReason,
  }).from(trialAllocations)
    .innerJoin(specimens, eq(specimens.id, trialAllocations.specimenId))
    .leftJoin(trialArms, eq(trialArms.id, trialAllocations.armId))
    .leftJoin(chambers, eq(chambers.id, trialArms.chamberId))
    .leftJoin(treatments, eq(treatments.id, trialArms.treatmentId))
    .where(and(eq(trialAllocations.labId, labId), eq(trialAllocations.trialId, trialId)))
    .orderBy(sql`${trialArms.label} asc nulls last`, asc(specimens.label));
}

export async function listTrialPlacements({ labId, trialId }: { labId: string; trialId: string }) {
  return db.select({
    id: placements.id, specimenId: specimens.id, label: specimens.label, materialClass: specimens.materialClass, armId: placements.armId,
    chamberName: chambers.name, treatmentName: treatments.name, fromAt: placements.fromAt, toAt: placements.toAt, reason: placements.reason,
  }).from(placements)
    .innerJoin(specimens, eq(specimens.id, placements.specimenId))
    .innerJoin(chambers, eq(chambers.id, placements.chamberId))
    .innerJoin(treatments, eq(treatments.id, placements.treatmentId))
    .where(and(eq(placements.labId, labId), eq(placements.trialId, trialId)))
    .orderBy(asc(specimens.label), asc(placements.fromAt));
}

export async function listTrialNotes({ labId, trialId }: { labId: string; trialId: string }) {
  return db.select({ id: trialNotes.id, body: trialNotes.body, createdAt: trialNotes.createdAt, author: users.name })
    .from(trialNotes).leftJoin(users, eq(users.id, trialNotes.createdBy))
    .where(and(eq(trialNotes.labId, labId), eq(trialNotes.trialId, trialId))).orderBy(asc(trialNotes.createdAt));
}

// ---- design ----

async function checkIds(tx: Tx, labId: string, d: Pick<TrialDesign, "chamberIds" | "treatmentIds">) {
  const [cs, ts] = await Promise.all([
    d.chamberIds.length ? tx.select({ id: chambers.id, name: chambers.name }).from(chambers).where(and(eq(chambers.labId, labId), inArray(chambers.id, d.chamberIds))) : [],
    d.treatmentIds.length ? tx.select({ id: treatments.id, name: treatments.name }).from(treatments).where(and(eq(treatments.labId, labId), inArray(treatments.id, d.treatmentIds))) : [],
  ]);
  if (cs.length !== new Set(d.chamberIds).size) throw new AppError("invalid", "A chosen chamber is not in this lab.", { chamberIds: ["Pick chambers of this lab."] });
  if (ts.length !== new Set(d.treatmentIds).size) throw new AppError("invalid", "A chosen treatment is not in this lab.", { treatmentIds: ["Pick treatments of this lab."] });
  return { chamberName: new Map(cs.map((c) => [c.id, c.name])), treatmentName: new Map(ts.map((t) => [t.id, t.name])) };
}

async function writeMembers(tx: Tx, labId: string, trialId: string, role: "technician" | "scorer", rows: { userId: string; blind?: boolean }[]) {
  await tx.delete(trialMembers).where(and(eq(trialMembers.trialId, trialId), eq(trialMembers.role, role)));
  const unique = [...new Map(rows.map((r) => [r.userId, r])).values()];
  if (unique.length) await tx.insert(trialMembers).values(unique.map((r) => ({ trialId, labId, userId: r.userId, role, blind: role === "scorer" ? !!r.blind : false })));
}

async function syncArms(tx: Tx, labId: string, trialId: string, d: Pick<TrialDesign, "chamberIds" | "treatmentIds">) {
  const names = await checkIds(tx, labId, d);
  const existing = await tx.select().from(trialArms).where(eq(trialArms.trialId, trialId));
  const want = new Set(d.chamberIds.flatMap((c) => d.treatmentIds.map((t) => `${c}|${t}`)));
  const have = new Set(existing.map((a) => `${a.chamberId}|${a.treatmentId}`));
  const remove = existing.filter((a) => !want.has(`${a.chamberId}|${a.treatmentId}`));
  const add = [...want].filter((k) => !have.has(k));
  if (remove.length) await tx.delete(trialArms).where(inArray(trialArms.id, remove.map((a) => a.id)));
  if (add.length) {
    await tx.insert(trialArms).values(add.map((k) => {
      const [chamberId, treatmentId] = k.split("|");
      return { labId, trialId, chamberId, treatmentId, label: `${names.chamberName.get(chamberId)} / ${names.treatmentName.get(treatmentId)}` };
    }));
  }
  return remove.length + add.length > 0;
}

function designValues(d: Partial<TrialDesign>) {
  const v: Partial<typeof trials.$inferInsert> = {};
  if (d.title !== undefined) v.title = d.title;
  if (d.question !== undefined) v.question = d.question;
  if (d.hypothesis !== undefined) v.hypothesis = d.hypothesis;
  if (d.primaryOutcome !== undefined) v.primaryOutcome = d.primaryOutcome;
  if (d.replicatesPerArm !== undefined) v.replicatesPerArm = d.replicatesPerArm;
  if (d.photoProtocol !== undefined) v.photoProtocol = d.photoProtocol;
  if (d.plan !== undefined) v.schedulePlan = d.plan;
  if (d.scoreRule !== undefined) v.scoreRule = d.scoreRule;
  if (d.primaryScorerId !== undefined) v.primaryScorerId = d.primaryScorerId;
  return v;
}

export async function createTrial({ actor, input }: { actor: Actor; input: TrialDesign }) {
  assertAllowed(actor, "trials.write");
  assertTeamChange(actor.role, input);
  return db.transaction(async (tx) => {
    await assertTeamPeople(tx, actor.labId, input);
    const [t] = await tx.insert(trials).values({
      labId: actor.labId, createdBy: actor.userId, title: input.title, question: input.question, schedulePlan: input.plan,
      ...designValues(input),
    }).returning();
    await syncArms(tx, actor.labId, t.id, input);
    await writeMembers(tx, actor.labId, t.id, "technician", input.technicianIds.map((userId) => ({ userId })));
    if (input.scorers) await writeMembers(tx, actor.labId, t.id, "scorer", input.scorers);
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "trial", entityId: t.id, action: "create", summary: `Trial "${t.title}" drafted`, after: { ...t, chamberIds: input.chamberIds, treatmentIds: input.treatmentIds, technicianIds: input.technicianIds, scorers: input.scorers } });
    return t;
  });
}

/** Draft only. Changing arms or replicates discards the allocation, which no longer fits. */
export async function updateTrialDesign({ actor, trialId, input }: { actor: Actor; trialId: string; input: Partial<TrialDesign> }) {
  assertAllowed(actor, "trials.write");
  assertTeamChange(actor.role, input);
  return db.transaction(async (tx) => {
    const before = await lockTrial(tx, actor.labId, trialId);
    assertWritable(before, "draft");
    await assertTeamPeople(tx, actor.labId, input);
    await assertPrimaryIsScorer(tx, trialId, { primaryScorerId: input.primaryScorerId, scorers: input.scorers, currentPrimaryId: before.primaryScorerId });
    let allocationCleared = false;
    if (input.chamberIds || input.treatmentIds || (input.replicatesPerArm !== undefined && input.replicatesPerArm !== before.replicatesPerArm)) {
      const arms = await tx.select().from(trialArms).where(eq(trialArms.trialId, trialId));
      const armsChanging = !!(input.chamberIds || input.treatmentIds);
      const current = { chamberIds: [...new Set(arms.map((a) => a.chamberId))], treatmentIds: [...new Set(arms.map((a) => a.treatmentId))] };
      const next = { chamberIds: input.chamberIds ?? current.chamberIds, treatmentIds: input.treatmentIds ?? current.treatmentIds };
      const wouldChange = armsChanging && (next.chamberIds.length * next.treatmentIds.length !== arms.length
        || arms.some((a) => !next.chamberIds.includes(a.chamberId) || !next.treatmentIds.includes(a.treatmentId)));
      if (wouldChange || input.replicatesPerArm !== undefined && input.replicatesPerArm !== before.replicatesPerArm) {
        const deleted = await tx.delete(trialAllocations).where(eq(trialAllocations.trialId, trialId)).returning({ id: trialAllocations.id });
        allocationCleared = deleted.length > 0;
      }
      if (armsChanging) await syncArms(tx, actor.labId, trialId, next);
    }
    if (input.technicianIds) await writeMembers(tx, actor.labId, trialId, "technician", input.technicianIds.map((userId) => ({ userId })));
    if (input.scorers) await writeMembers(tx, actor.labId, trialId, "scorer", input.scorers);
    const [after] = await tx.update(trials).set({ ...designValues(input), ...(allocationCleared ? { allocationSeed: null } : {}), updatedAt: new Date() }).where(eq(trials.id, trialId)).returning();
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "trial", entityId: trialId, action: "update", summary: `Trial design edited${allocationCleared ? "; allocation discarded" : ""}`, before, after: { ...after, ...input } });
    return { trial: after, allocationCleared };
  });
}

/** Technicians and the photo protocol may change while a trial runs (not once concluded); scorers only in draft. */
export async function updateTrialTeam({ actor, trialId, technicianIds, scorers, scoreRule, primaryScorerId, photoProtocol }: {
  actor: Actor; trialId: string; technicianIds?: string[]; scorers?: { userId: string; blind: boolean }[];
  scoreRule?: Trial["scoreRule"]; primaryScorerId?: string | null; photoProtocol?: string[];
}) {
  assertAllowed(actor, "trials.write");
  assertTeamChange(actor.role, { technicianIds, scorers, scoreRule, primaryScorerId, photoProtocol });
  return db.transaction(async (tx) => {
    const before = await lockTrial(tx, actor.labId, trialId);
    assertWritable(before);
    // Once scores can exist, the Scoring tab owns scorers and the rule: it re-derives the scores of record.
    if ((scorers !== undefined || scoreRule !== undefined || primaryScorerId !== undefined) && before.status !== "draft") {
      throw new AppError("conflict", "Once a trial runs, scorers and the score-of-record rule are changed on its Scoring tab (which re-derives the scores of record).");
    }
    await assertTeamPeople(tx, actor.labId, { technicianIds, scorers, primaryScorerId });
    await assertPrimaryIsScorer(tx, trialId, { primaryScorerId, scorers, currentPrimaryId: before.primaryScorerId });
    const beforeMembers = await tx.select().from(trialMembers).where(eq(trialMembers.trialId, trialId));
    if (technicianIds) await writeMembers(tx, actor.labId, trialId, "technician", technicianIds.map((userId) => ({ userId })));
    if (scorers) await writeMembers(tx, actor.labId, trialId, "scorer", scorers);
    const patch = designValues({ scoreRule, primaryScorerId, photoProtocol });
    const [after] = await tx.update(trials).set({ ...patch, updatedAt: new Date() }).where(eq(trials.id, trialId)).returning();
    const afterMembers = await tx.select().from(trialMembers).where(eq(trialMembers.trialId, trialId));
    const what = [technicianIds && "technicians", scorers && "scorers", scoreRule && "score rule", primaryScorerId !== undefined && "primary scorer", photoProtocol && "photo protocol"].filter(Boolean).join(", ");
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "trial", entityId: trialId, action: "update", summary: `Trial ${what || "team"} changed`, before: { ...before, members: beforeMembers }, after: { ...after, members: afterMembers } });
    return after;
  });
}

export async function hasAllocation({ labId, trialId }: { labId: string; trialId: string }) {
  const [row] = await db.select({ id: trialAllocations.id }).from(trialAllocations).where(and(eq(trialAllocations.labId, labId), eq(trialAllocations.trialId, trialId))).limit(1);
  return !!row;
}
