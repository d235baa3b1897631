import "server-only";
import { and, asc, desc, eq, gt, isNotNull, isNull, lt, lte, or, sql, type SQL } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { formatDateTime } from "@/lib/format";
import { inspectionStatus, OVERDUE_GRACE_HOURS } from "@/lib/schedule/status";
import { recordAudit } from "../audit";
import { db } from "../client";
import { chambers, inspections, placements, reminderLog, specimens, treatments, trials, users } from "../schema";
import { assertAllowed, isUuid, type Actor } from "./specimens";
import { assertWritable } from "@/lib/trials/lock";
import { lockTrial } from "./trial-access";

export type InspectionFilter = "open" | "done" | "overdue" | "all";
export const COUNT_CAP = 1_000;

const columns = {
  id: inspections.id, trialId: inspections.trialId, trialTitle: trials.title, trialStatus: trials.status, dayNumber: inspections.dayNumber,
  plannedAt: inspections.plannedAt, doneAt: inspections.doneAt, doneBy: users.name, notes: inspections.notes, rescheduleReason: inspections.rescheduleReason,
};

function withStatus<T extends { plannedAt: Date; doneAt: Date | null }>(row: T, now: Date) {
  return { ...row, status: inspectionStatus(row, now, OVERDUE_GRACE_HOURS) };
}

/**
 * Inspections of the lab, earliest planned first (done ones newest first). "open" and "overdue" only
 * count running trials: a draft has none and a concluded trial's record is closed.
 */
export async function listInspections({ labId, trialId, status = "all", before, page = 1, pageSize = 50, now = new Date() }: {
  labId: string; trialId?: string; status?: InspectionFilter; before?: Date; page?: number; pageSize?: number; now?: Date;
}) {
  const where: SQL[] = [eq(inspections.labId, labId)];
  if (trialId) where.push(eq(inspections.trialId, trialId));
  if (status === "open" || status === "overdue") where.push(isNull(inspections.doneAt), eq(trials.status, "running"));
  if (status === "overdue") where.push(lt(inspections.plannedAt, new Date(now.getTime() - OVERDUE_GRACE_HOURS * 3_600_000)));
  if (status === "done") where.push(isNotNull(inspections.doneAt));
  if (before) where.push(lte(inspections.plannedAt, before));
  const w = and(...where);
  const order = status === "done" ? [desc(inspections.doneAt), asc(inspections.id)] : [asc(inspections.plannedAt), asc(inspections.id)];
  // The count rides along as an uncorrelated scalar subquery (computed once), so a page costs one round
  // trip instead of two; only a page past the end needs the count on its own.
  // Ordered like the page, so PostgreSQL walks the same index and stops at the cap: unordered, it
  // estimated "open" and "planned before next week" as independent and scanned the whole table
  // (7.5 ms on the large demo instead of 0.4 ms).
  const counted = db.select({ one: sql`1` }).from(inspections).innerJoin(trials, eq(trials.id, inspections.trialId)).where(w).orderBy(...order).limit(COUNT_CAP + 1);
  const rows = await db.select({ ...columns, total: sql<number>`(select count(*)::int from (${counted}) as capped)` })
    .from(inspections).innerJoin(trials, eq(trials.id, inspections.trialId)).leftJoin(users, eq(users.id, inspections.doneBy))
    .where(w).orderBy(...order).limit(pageSize).offset((page - 1) * pageSize);
  const total = rows.length ? rows[0].total : page === 1 ? 0 : (await db.select({ total: sql<number>`count(*)::int` }).from(counted.as("capped")))[0].total;
  return {
    rows: rows.map(({ total: _total, ...r }) => withStatus(r, now)),
    total: Math.min(total, COUNT_CAP), totalCapped: total > COUNT_CAP, page, pageSize,
  };
}

export async function getInspection({ labId, inspectionId, now = new Date() }: { labId: string; inspectionId: string; now?: Date }) {
  if (!isUuid(inspectionId)) return null;
  const [row] = await db.select(columns).from(inspections).innerJoin(trials, eq(trials.id, inspections.trialId)).leftJoin(users, eq(users.id, inspections.doneBy))
    .where(and(eq(inspections.labId, labId), eq(inspections.id, inspectionId))).limit(1);
  return row ? withStatus(row, now) : null;
}

export async function requireInspection(args: { labId: string; inspectionId: string }) {
  const row = await getInspection(args);
  if (!row) throw new AppError("not-found", "No such inspection in this lab.");
  return row;
}

/** Specimens placed in the trial at a moment (the inspection's done time, else its planned time). */
export async function listSpecimensAt({ labId, trialId, at }: { labId: string; trialId: string; at: Date }) {
  return db.select({
    specimenId: specimens.id, label: specimens.label, materialClass: specimens.materialClass, face: specimens.face,
    chamberName: chambers.name, treatmentName: treatments.name, fromAt: placements.fromAt, toAt: placements.toAt,
  }).from(placements)
    .innerJoin(specimens, eq(specimens.id, placements.specimenId))
    .innerJoin(chambers, eq(chambers.id, placements.chamberId))
    .innerJoin(treatments, eq(treatments.id, placements.treatmentId))
    .where(and(eq(placements.labId, labId), eq(placements.trialId, trialId), lte(placements.fromAt, at), or(isNull(placements.toAt), gt(placements.toAt, at))))
    .orderBy(asc(specimens.label));
}

export async function listTrialInspections({ labId, trialId, now = new Date() }: { labId: string; trialId: string; now?: Date }) {
  const rows = await db.select(columns).from(inspections).innerJoin(trials, eq(trials.id, inspections.trialId)).leftJoin(users, eq(users.id, inspections.doneBy))
    .where(and(eq(inspections.labId, labId), eq(inspections.trialId, trialId))).orderBy(asc(inspections.plannedAt), asc(inspections.dayNumber));
  return rows.map((r) => withStatus(r, now));
}

async function lockInspection(actor: Actor, inspectionId: string, tx: Parameters<Parameters<typeof db.transaction>[0]>[0]) {
  if (!isUuid(inspectionId)) throw new AppError("not-found", "No such inspection in this lab.");
  const [insp] = await tx.select().from(inspections).where(and(eq(inspections.labId, actor.labId), eq(inspections.id, inspectionId))).for("update");
  if (!insp) throw new AppError("not-found", "No such inspection in this lab.");
  const trial = await lockTrial(tx, actor.labId, insp.trialId);
  assertWritable(trial, "running");
  return { insp, trial };
}

/** Mark an inspection done (by the caller, at doneAt or now) with optional notes. */
export async function recordInspection({ actor, inspectionId, doneAt = new Date(), notes = "" }: { actor: Actor; inspectionId: string; doneAt?: Date; notes?: string }) {
  assertAllowed(actor, "inspections.record");
  if (doneAt.getTime() > Date.now() + 5 * 60_000) throw new AppError("invalid", "An inspection cannot be marked done in the future.", { doneAt: ["Use the time it was done (UTC)."] });
  return db.transaction(async (tx) => {
    const { insp, trial } = await lockInspection(actor, inspectionId, tx);
    if (insp.doneAt) throw new AppError("conflict", `This inspection was already marked done at ${formatDateTime(insp.doneAt)}.`);
    if (trial.startedAt && doneAt < trial.startedAt) throw new AppError("invalid", "That is before the trial started.", { doneAt: [`Not before ${formatDateTime(trial.startedAt)}.`] });
    const [after] = await tx.update(inspections).set({ doneAt, doneBy: actor.userId, notes }).where(eq(inspections.id, insp.id)).returning();
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "inspection", entityId: insp.id, trialId: insp.trialId, action: "update", summary: `Inspection day ${insp.dayNumber} of "${trial.title}" marked done`, before: insp, after });
    return after;
  });
}

/** Move the planned time (reason required, audited); reminders for the old time are forgotten. */
export async function rescheduleInspection({ actor, inspectionId, plannedAt, reason }: { actor: Actor; inspectionId: string; plannedAt: Date; reason: string }) {
  assertAllowed(actor, "inspections.reschedule");
  return db.transaction(async (tx) => {
    const { insp, trial } = await lockInspection(actor, inspectionId, tx);
    if (insp.doneAt) throw new AppError("conflict", "This inspection is already done; it cannot be rescheduled.");
    if (trial.startedAt && plannedAt < trial.startedAt) throw new AppError("invalid", "That is before the trial started.", { plannedAt: [`Not before ${formatDateTime(trial.startedAt)}.`] });
    const [after] = await tx.update(inspections).set({ plannedAt, rescheduleReason: reason }).where(eq(inspections.id, insp.id)).returning();
    await tx.delete(reminderLog).where(eq(reminderLog.inspectionId, insp.id));
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "inspection", entityId: insp.id, trialId: insp.trialId, action: "update",
      summary: `Inspection day ${insp.dayNumber} of "${trial.title}" moved from ${formatDateTime(insp.plannedAt)} to ${formatDateTime(plannedAt)}: ${reason}`, before: insp, after,
    });
    return after;
  });
}
