import "server-only";
import { and, asc, count, eq, ilike, sql, type SQL } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import type { TreatmentInput } from "@/lib/validation/treatments";
import { recordAudit } from "../audit";
import { db } from "../client";
import { treatments, trialArms, trials } from "../schema";
import { assertAllowed, isUuid, type Actor } from "./specimens";

export type Treatment = typeof treatments.$inferSelect;

export async function listTreatments({ labId, q, kind, page = 1, pageSize = 200 }: { labId: string; q?: string; kind?: string; page?: number; pageSize?: number }) {
  const where: SQL[] = [eq(treatments.labId, labId)];
  if (q) where.push(ilike(treatments.name, `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`));
  if (kind) where.push(eq(treatments.kind, kind as Treatment["kind"]));
  const w = and(...where);
  const [rows, [{ total }]] = await Promise.all([
    db.select({
      id: treatments.id, name: treatments.name, kind: treatments.kind, description: treatments.description, protocol: treatments.protocol,
      createdAt: treatments.createdAt, updatedAt: treatments.updatedAt,
      trials: sql<number>`(select count(distinct ${trialArms.trialId})::int from ${trialArms} where ${trialArms.treatmentId} = ${treatments.id})`,
    }).from(treatments).where(w).orderBy(asc(treatments.name)).limit(pageSize).offset((page - 1) * pageSize),
    db.select({ total: count() }).from(treatments).where(w),
  ]);
  return { rows, total, page, pageSize };
}

export async function getTreatment({ labId, treatmentId }: { labId: string; treatmentId: string }) {
  if (!isUuid(treatmentId)) return null;
  const [row] = await db.select().from(treatments).where(and(eq(treatments.labId, labId), eq(treatments.id, treatmentId))).limit(1);
  return row ?? null;
}

export async function requireTreatment(args: { labId: string; treatmentId: string }) {
  const row = await getTreatment(args);
  if (!row) throw new AppError("not-found", "No such treatment in this lab.");
  return row;
}

/** Trials that use a treatment, so its page can say where a protocol change would matter. */
export async function listTreatmentTrials({ labId, treatmentId }: { labId: string; treatmentId: string }) {
  return db.selectDistinct({ id: trials.id, title: trials.title, status: trials.status })
    .from(trialArms).innerJoin(trials, eq(trials.id, trialArms.trialId))
    .where(and(eq(trialArms.labId, labId), eq(trialArms.treatmentId, treatmentId)));
}

async function nameTaken(labId: string, name: string, exceptId?: string) {
  const rows = await db.select({ id: treatments.id }).from(treatments)
    .where(and(eq(treatments.labId, labId), sql`lower(${treatments.name}) = lower(${name})`)).limit(2);
  return rows.some((r) => r.id !== exceptId);
}

const nameConflict = () => new AppError("conflict", "A treatment with this name already exists.", { name: ["This name is already used in this lab."] });

export async function createTreatment({ actor, input }: { actor: Actor; input: TreatmentInput }) {
  assertAllowed(actor, "treatments.write");
  if (await nameTaken(actor.labId, input.name)) throw nameConflict();
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(treatments).values({ ...input, labId: actor.labId, createdBy: actor.userId }).returning();
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "treatment", entityId: row.id, action: "create", summary: `Treatment "${row.name}" added`, after: row });
    return row;
  });
}

export async function updateTreatment({ actor, treatmentId, input }: { actor: Actor; treatmentId: string; input: Partial<TreatmentInput> }) {
  assertAllowed(actor, "treatments.write");
  if (!isUuid(treatmentId)) throw new AppError("not-found", "No such treatment in this lab.");
  if (input.name && (await nameTaken(actor.labId, input.name, treatmentId))) throw nameConflict();
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(treatments).where(and(eq(treatments.labId, actor.labId), eq(treatments.id, treatmentId))).for("update");
    if (!before) throw new AppError("not-found", "No such treatment in this lab.");
    const patch = Object.fromEntries(Object.entries(input).filter(([, v]) => v !== undefined));
    const [after] = await tx.update(treatments).set({ ...patch, updatedAt: new Date() }).where(eq(treatments.id, treatmentId)).returning();
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "treatment", entityId: treatmentId, action: "update", summary: `Treatment "${after.name}" edited`, before, after });
    return after;
  });
}
