// Inspection reminders: the day before and when overdue, e-mail each technician of the trial
// (trial_members with role "technician" who are still lab members and have not opted out).
// The scan claims (inspection, user, kind) rows in reminder_log so a reminder is queued once;
// the send job marks it sent, and the queue retries while the mail server is unreachable.
import { and, eq, gt, isNull, lt, sql } from "drizzle-orm";
import { appUrl, sendMail } from "@/lib/mail/send";
import { formatDateTime } from "@/lib/format";
import { OVERDUE_GRACE_HOURS } from "@/lib/schedule/status";
import { db } from "../client";
import { inspections, memberships, reminderLog, trialMembers, trials, users } from "../schema";

export type ReminderKind = "day-before" | "overdue";
export type ReminderJob = { inspectionId: string; userId: string; kind: ReminderKind };

/** Find reminders that are due now and claim them; returns the jobs to send. */
export async function claimDueReminders(now = new Date()): Promise<ReminderJob[]> {
  const in24h = new Date(now.getTime() + 24 * 3_600_000);
  const overdueBefore = new Date(now.getTime() - OVERDUE_GRACE_HOURS * 3_600_000);
  const rows = await db
    .select({ inspectionId: inspections.id, plannedAt: inspections.plannedAt, userId: trialMembers.userId })
    .from(inspections)
    .innerJoin(trials, eq(trials.id, inspections.trialId))
    .innerJoin(trialMembers, and(eq(trialMembers.trialId, trials.id), eq(trialMembers.role, "technician")))
    .innerJoin(users, eq(users.id, trialMembers.userId))
    // Only people still in the lab: someone removed from it keeps no trial mail.
    .innerJoin(memberships, and(eq(memberships.userId, trialMembers.userId), eq(memberships.labId, trials.labId)))
    .where(and(eq(trials.status, "running"), isNull(inspections.doneAt), lt(inspections.plannedAt, in24h), eq(users.remindersOptOut, false)));
  const jobs: ReminderJob[] = [];
  for (const r of rows) {
    const kind: ReminderKind = r.plannedAt < overdueBefore ? "overdue" : r.plannedAt > now ? "day-before" : "overdue";
    if (kind === "overdue" && r.plannedAt >= overdueBefore) continue; // within the grace period
    const claimed = await db.insert(reminderLog).values({ inspectionId: r.inspectionId, userId: r.userId, kind }).onConflictDoNothing().returning();
    if (claimed.length) jobs.push({ inspectionId: r.inspectionId, userId: r.userId, kind });
  }
  return jobs;
}

/** Send one claimed reminder; throws when the mail server refuses, so the queue retries. */
export async function sendReminder(job: ReminderJob) {
  const [log] = await db.select().from(reminderLog).where(and(eq(reminderLog.inspectionId, job.inspectionId), eq(reminderLog.userId, job.userId), eq(reminderLog.kind, job.kind)));
  if (!log || log.sentAt) return "already-sent";
  const [info] = await db
    .select({ email: users.email, name: users.name, optOut: users.remindersOptOut, trialId: trials.id, labId: trials.labId, trialTitle: trials.title, trialStatus: trials.status, dayNumber: inspections.dayNumber, plannedAt: inspections.plannedAt, doneAt: inspections.doneAt })
    .from(inspections)
    .innerJoin(trials, eq(trials.id, inspections.trialId))
    .innerJoin(users, eq(users.id, job.userId))
    .where(eq(inspections.id, job.inspectionId));
  // Done, opted out, or the trial concluded meanwhile: nothing to remind about any more.
  if (!info || info.doneAt || info.optOut || info.trialStatus !== "running") {
    await db.update(reminderLog).set({ sentAt: new Date() }).where(and(eq(reminderLog.inspectionId, job.inspectionId), eq(reminderLog.userId, job.userId), eq(reminderLog.kind, job.kind)));
    return "skipped";
  }
  await db.update(reminderLog).set({ attempts: sql`${reminderLog.attempts} + 1` }).where(and(eq(reminderLog.inspectionId, job.inspectionId), eq(reminderLog.userId, job.userId), eq(reminderLog.kind, job.kind)));
  const link = appUrl(`/trials/${info.trialId}/inspections/${job.inspectionId}`);
  const when = formatDateTime(info.plannedAt);
  await sendMail({
    to: info.email,
    labId: info.labId,
    subject: job.kind === "overdue" ? `Overdue inspection: ${info.trialTitle}, day ${info.dayNumber}` : `Inspection tomorrow: ${info.trialTitle}, day ${info.dayNumber}`,
    text: `Hello ${info.name},\n\n${job.kind === "overdue" ? "This inspection is overdue" : "This inspection is due"}: ${info.trialTitle}, day ${info.dayNumber}, planned for ${when}.\n\nOpen it: ${link}\n\nYou get these because you are a technician on this trial. Turn them off in Lab settings.`,
  });
  await db.update(reminderLog).set({ sentAt: new Date() }).where(and(eq(reminderLog.inspectionId, job.inspectionId), eq(reminderLog.userId, job.userId), eq(reminderLog.kind, job.kind), isNull(reminderLog.sentAt)));
  return "sent";
}

/**
 * Claimed reminders still unsent after `staleMinutes` (the worker stopped between claim and send, or
 * the queue gave up while mail was down). Their claim time is renewed so each is re-queued at most
 * once per period; sending checks sent_at first, so a duplicate job sends nothing twice.
 */
export async function reclaimStaleReminders(now = new Date(), staleMinutes = 30): Promise<ReminderJob[]> {
  const rows = await db
    .update(reminderLog)
    .set({ queuedAt: now })
    .where(and(isNull(reminderLog.sentAt), lt(reminderLog.queuedAt, new Date(now.getTime() - staleMinutes * 60_000)), gt(reminderLog.queuedAt, new Date(now.getTime() - 14 * 86_400_000))))
    .returning();
  return rows.map((r) => ({ inspectionId: r.inspectionId, userId: r.userId, kind: r.kind as ReminderKind }));
}
