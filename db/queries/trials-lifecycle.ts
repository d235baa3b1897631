import "server-only";
// Status changes (draft → running → concluded), placements while running, and appended notes.
import { and, eq, inArray, isNotNull, isNull, ne, sql } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { formatDateTime } from "@/lib/format";
import { buildSchedule, planDays } from "@/lib/schedule/plans";
import { recordAudit } from "../audit";
import { db } from "../client";
import { inspections, placements, specimens, trialAllocations, trialArms, trialNotes, trials } from "../schema";
import { assertAllowed, type Actor } from "./specimens";
import { assertWritable, lockedError } from "@/lib/trials/lock";
import { lockTrial } from "./trial-access";

const DAY = 86_400_000;
export const MAX_START_AHEAD_DAYS = 30;
export const MAX_START_BACK_DAYS = 365;

/**
 * Start: the allocation becomes placements from startAt, the plan becomes inspections. startAt may
 * lie ahead (specimens go into the jars tomorrow morning) or a little back (recorded late).
 */
export async function startTrial({ actor, trialId, startAt = new Date() }: { actor: Actor; trialId: string; startAt?: Date }) {
  assertAllowed(actor, "trials.write");
  const now = Date.now();
  if (startAt.getTime() > now + MAX_START_AHEAD_DAYS * DAY) throw new AppError("invalid", `The start can be at most ${MAX_START_AHEAD_DAYS} days ahead.`, { startAt: [`At most ${MAX_START_AHEAD_DAYS} days ahead.`] });
  if (startAt.getTime() < now - MAX_START_BACK_DAYS * DAY) throw new AppError("invalid", `The start can be at most ${MAX_START_BACK_DAYS} days back.`, { startAt: [`At most ${MAX_START_BACK_DAYS} days back.`] });
  return db.transaction(async (tx) => {
    const trial = await lockTrial(tx, actor.labId, trialId);
    assertWritable(trial, "draft");
    const alloc = await tx.select({ specimenId: trialAllocations.specimenId, armId: trialAllocations.armId, chamberId: trialArms.chamberId, treatmentId: trialArms.treatmentId })
      .from(trialAllocations).innerJoin(trialArms, eq(trialArms.id, trialAllocations.armId))
      .where(and(eq(trialAllocations.trialId, trialId), isNotNull(trialAllocations.armId)));
    if (alloc.length === 0) throw new AppError("conflict", "Allocate specimens to the arms before starting the trial.");
    // A specimen sits in one jar at a time: refuse those still placed in another running trial.
    const busy = await tx.select({ label: specimens.label, trialTitle: trials.title }).from(placements)
      .innerJoin(trials, eq(trials.id, placements.trialId)).innerJoin(specimens, eq(specimens.id, placements.specimenId))
      .where(and(eq(placements.labId, actor.labId), inArray(placements.specimenId, alloc.map((a) => a.specimenId)), isNull(placements.toAt), isNotNull(placements.fromAt), eq(trials.status, "running"), ne(trials.id, trialId)));
    if (busy.length) {
      throw new AppError("conflict", `Still placed in another running trial: ${busy.slice(0, 5).map((b) => `${b.label} (${b.trialTitle})`).join(", ")}${busy.length > 5 ? ` and ${busy.length - 5} more` : ""}. Move them out or re-allocate.`);
    }
    const days = planDays(trial.schedulePlan);
    const dates = buildSchedule(trial.schedulePlan, startAt);
    const reason = `Random allocation (seed "${trial.allocationSeed ?? ""}")`;
    for (let i = 0; i < alloc.length; i += 1000) {
      await tx.insert(placements).values(alloc.slice(i, i + 1000).map((a) => ({
        labId: actor.labId, trialId, specimenId: a.specimenId, armId: a.armId, chamberId: a.chamberId, treatmentId: a.treatmentId, fromAt: startAt, reason,
      })));
    }
    for (let i = 0; i < days.length; i += 1000) {
      await tx.insert(inspections).values(days.slice(i, i + 1000).map((d, j) => ({ labId: actor.labId, trialId, dayNumber: d, plannedAt: dates[i + j] })));
    }
    const [after] = await tx.update(trials).set({ status: "running", startedAt: startAt, updatedAt: new Date() }).where(eq(trials.id, trialId)).returning();
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "trial", entityId: trialId, action: "update",
      summary: `Trial started ${formatDateTime(startAt)}: ${alloc.length} specimens placed, ${days.length} inspections planned`,
      before: { status: trial.status }, after: { status: "running", startedAt: startAt, placements: alloc.length, inspections: days },
    });
    return { trial: after, placements: alloc.length, inspections: days.length };
  });
}

/** Lead only. Locks the record: open placements close now; afterwards only notes may be added. */
export async function concludeTrial({ actor, trialId, note = "" }: { actor: Actor; trialId: string; note?: string }) {
  assertAllowed(actor, "trials.conclude");
  return db.transaction(async (tx) => {
    const trial = await lockTrial(tx, actor.labId, trialId);
    if (trial.status === "concluded") throw lockedError(trial);
    if (trial.status !== "running") throw new AppError("conflict", "Only a running trial can be concluded.");
    const at = new Date();
    // A trial concluded before its planned start closes its placements at their start, never before it.
    const closed = await tx.update(placements).set({ toAt: sql`greatest(${placements.fromAt}, ${at.toISOString()}::timestamptz)` })
      .where(and(eq(placements.trialId, trialId), isNull(placements.toAt))).returning({ id: placements.id });
    const [after] = await tx.update(trials).set({ status: "concluded", concludedAt: at, updatedAt: at }).where(eq(trials.id, trialId)).returning();
    if (note) await tx.insert(trialNotes).values({ labId: actor.labId, trialId, body: note, createdBy: actor.userId });
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "trial", entityId: trialId, action: "update",
      summary: `Trial concluded and locked; ${closed.length} placements closed`, before: { status: trial.status }, after: { status: "concluded", concludedAt: at, note },
    });
    return after;
  });
}

/** Notes may be appended in any status, also after the conclusion; they are never edited. */
export async function addTrialNote({ actor, trialId, body }: { actor: Actor; trialId: string; body: string }) {
  assertAllowed(actor, "trials.notes");
  return db.transaction(async (tx) => {
    await lockTrial(tx, actor.labId, trialId);
    const [row] = await tx.insert(trialNotes).values({ labId: actor.labId, trialId, body, createdBy: actor.userId }).returning();
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "trial-note", entityId: row.id, action: "create", summary: "Note added to a trial", after: row });
    return row;
  });
}

/** Move a specimen while running: closes its open placement and (unless withdrawn) opens another. */
export async function moveSpecimen({ actor, trialId, specimenId, armId, at = new Date(), reason }: {
  actor: Actor; trialId: string; specimenId: string; armId: string; at?: Date; reason: string;
}) {
  assertAllowed(actor, "trials.write");
  if (at.getTime() > Date.now() + 3_600_000) throw new AppError("invalid", "A move cannot be recorded in the future.", { at: ["Use the time the specimen was moved."] });
  return db.transaction(async (tx) => {
    const trial = await lockTrial(tx, actor.labId, trialId);
    assertWritable(trial, "running");
    const [open] = await tx.select().from(placements)
      .where(and(eq(placements.trialId, trialId), eq(placements.specimenId, specimenId), isNull(placements.toAt))).for("update");
    if (!open) throw new AppError("invalid", "That specimen is not currently placed in this trial.", { specimenId: ["Choose a specimen placed in this trial."] });
    if (open.fromAt && at <= open.fromAt) throw new AppError("invalid", `The move must come after the current placement began (${formatDateTime(open.fromAt)}).`, { at: ["Later than the current placement's start."] });
    let arm: typeof trialArms.$inferSelect | undefined;
    if (armId) {
      [arm] = await tx.select().from(trialArms).where(and(eq(trialArms.trialId, trialId), eq(trialArms.id, armId)));
      if (!arm) throw new AppError("invalid", "Choose an arm of this trial.", { armId: ["Choose an arm of this trial."] });
      if (arm.id === open.armId) throw new AppError("invalid", "The specimen is already in that arm.", { armId: ["Choose a different arm."] });
    }
    const [closed] = await tx.update(placements).set({ toAt: at }).where(eq(placements.id, open.id)).returning();
    const [opened] = arm
      ? await tx.insert(placements).values({ labId: actor.labId, trialId, specimenId, armId: arm.id, chamberId: arm.chamberId, treatmentId: arm.treatmentId, fromAt: at, reason }).returning()
      : [null];
    const [sp] = await tx.select({ label: specimens.label }).from(specimens).where(eq(specimens.id, specimenId));
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity: "placement", entityId: opened?.id ?? closed.id, action: opened ? "create" : "update",
      summary: opened ? `${sp?.label} moved to ${arm!.label}: ${reason}` : `${sp?.label} taken out of the trial: ${reason}`,
      before: open, after: { closed, opened },
    });
    return { closed, opened };
  });
}
