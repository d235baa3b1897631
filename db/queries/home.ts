import "server-only";
import { and, asc, count, desc, eq, isNull, lte } from "drizzle-orm";
import { db } from "../client";
import { inspections, placements, trials } from "../schema";

export async function listRunningTrials({ labId }: { labId: string }) {
  return db
    .select({ id: trials.id, title: trials.title, startedAt: trials.startedAt, specimens: count(placements.id) })
    .from(trials)
    .leftJoin(placements, and(eq(placements.trialId, trials.id), isNull(placements.toAt)))
    .where(and(eq(trials.labId, labId), eq(trials.status, "running")))
    .groupBy(trials.id)
    .orderBy(desc(trials.startedAt));
}

/** Open inspections of running trials planned before `until` (overdue ones included). */
export async function listDueInspections({ labId, until, limit = 200 }: { labId: string; until: Date; limit?: number }) {
  return db
    .select({ id: inspections.id, trialId: trials.id, trialTitle: trials.title, dayNumber: inspections.dayNumber, plannedAt: inspections.plannedAt })
    .from(inspections)
    .innerJoin(trials, eq(trials.id, inspections.trialId))
    .where(and(eq(inspections.labId, labId), isNull(inspections.doneAt), lte(inspections.plannedAt, until), eq(trials.status, "running")))
    .orderBy(asc(inspections.plannedAt))
    .limit(limit);
}
