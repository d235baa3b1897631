// Desiccant exhaustion reminders: a few days before a desiccant chamber's charge is projected to be
// spent (water budget from lib/humidity/desiccant, counted from the last charge/regeneration), e-mail
// the lab's technicians and leads. Like the inspection reminders, the scan claims (charge event,
// recipient) once in desiccant_reminders; sending marks the claim, and a claim whose mail failed stays
// unsent, so the scan job throws (pg-boss retries it) and every later scan tries again.
import { and, asc, eq, gt, inArray, isNull, lt, sql } from "drizzle-orm";
import { formatDate } from "@/lib/format";
import { appUrl, sendMail } from "@/lib/mail/send";
import { REMIND_DAYS_BEFORE } from "@/lib/validation/chambers";
import { db } from "../client";
import { desiccantStatus } from "@/lib/humidity/desiccant-status";
import { chambers, desiccantEvents, desiccantReminders, memberships, users } from "../schema";

export const MAX_SEND_ATTEMPTS = 25;
const DAY_MS = 86_400_000;

export type DesiccantReminderJob = { eventId: string; userId: string };

/** Claim reminders for every desiccant chamber whose projected exhaustion is within REMIND_DAYS_BEFORE days. */
export async function claimDesiccantReminders(now = new Date(), labId?: string): Promise<DesiccantReminderJob[]> {
  const where = [eq(chambers.kind, "desiccant"), isNull(chambers.archivedAt)];
  if (labId) where.push(eq(chambers.labId, labId));
  const list = await db.select().from(chambers).where(and(...where));
  const jobs: DesiccantReminderJob[] = [];
  for (const chamber of list) {
    const events = await db.select().from(desiccantEvents).where(eq(desiccantEvents.chamberId, chamber.id));
    const status = desiccantStatus(chamber, events);
    if (!status.exhaustionAt || !status.lastCharge) continue;
    if (status.exhaustionAt.getTime() - REMIND_DAYS_BEFORE * DAY_MS > now.getTime()) continue;
    const recipients = await db
      .select({ userId: users.id })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.labId, chamber.labId), inArray(memberships.role, ["technician", "lead"]), eq(users.remindersOptOut, false)));
    for (const r of recipients) {
      const claimed = await db
        .insert(desiccantReminders)
        .values({ eventId: status.lastCharge.id, userId: r.userId, labId: chamber.labId, chamberId: chamber.id, exhaustionAt: status.exhaustionAt })
        .onConflictDoNothing()
        .returning();
      if (claimed.length) jobs.push({ eventId: status.lastCharge.id, userId: r.userId });
    }
  }
  return jobs;
}

/** Send one claimed reminder; throws when the mail server refuses, leaving the claim unsent. */
export async function sendDesiccantReminder(job: DesiccantReminderJob): Promise<"sent" | "skipped" | "already-sent"> {
  const key = and(eq(desiccantReminders.eventId, job.eventId), eq(desiccantReminders.userId, job.userId));
  const [claim] = await db.select().from(desiccantReminders).where(key);
  if (!claim || claim.sentAt) return "already-sent";
  const [info] = await db
    .select({ email: users.email, name: users.name, optOut: users.remindersOptOut, chamberName: chambers.name, labId: chambers.labId, archivedAt: chambers.archivedAt, desiccantKind: chambers.desiccantKind })
    .from(chambers)
    .innerJoin(users, eq(users.id, job.userId))
    .where(eq(chambers.id, claim.chamberId));
  // A newer charge since the claim means someone already dealt with it.
  const [charge] = await db.select({ at: desiccantEvents.at }).from(desiccantEvents).where(eq(desiccantEvents.id, job.eventId));
  const [newer] = charge
    ? await db
        .select({ id: desiccantEvents.id })
        .from(desiccantEvents)
        .where(and(eq(desiccantEvents.chamberId, claim.chamberId), inArray(desiccantEvents.kind, ["charged", "regenerated", "replaced"]), gt(desiccantEvents.at, charge.at)))
        .limit(1)
    : [];
  if (!info || info.archivedAt || info.optOut || newer) {
    await db.update(desiccantReminders).set({ sentAt: new Date() }).where(key);
    return "skipped";
  }
  await db.update(desiccantReminders).set({ attempts: sql`${desiccantReminders.attempts} + 1` }).where(key);
  const when = formatDate(claim.exhaustionAt);
  const past = claim.exhaustionAt.getTime() < Date.now();
  await sendMail({
    to: info.email,
    labId: info.labId,
    subject: past ? `Desiccant may be spent: ${info.chamberName}` : `Desiccant due for regeneration by ${when}: ${info.chamberName}`,
    text:
      `Hello ${info.name},\n\nThe desiccant in "${info.chamberName}" is projected to be spent ${past ? "since" : "on"} ${when}, ` +
      `counted from its last charge or regeneration (the water budget, or the weighed uptake where that is sooner).\n\n` +
      `The projection rests on the jar volume, room RH and air exchange entered for the chamber; check the jar's RH readings ` +
      `and regenerate or replace the desiccant, then log it so the next projection starts from there.\n\n` +
      `Open the chamber: ${appUrl(`/chambers/${claim.chamberId}`)}\n\n` +
      `You get this because you are a technician or lead of the lab. Turn reminders off in Lab settings.`,
  });
  await db.update(desiccantReminders).set({ sentAt: new Date() }).where(and(key, isNull(desiccantReminders.sentAt)));
  return "sent";
}

/** The scheduled job: claim what is due, then try every unsent claim; throw if any mail failed so the queue retries. */
export async function runDesiccantScan(now = new Date(), labId?: string) {
  const claimed = await claimDesiccantReminders(now, labId);
  const where = [isNull(desiccantReminders.sentAt), lt(desiccantReminders.attempts, MAX_SEND_ATTEMPTS)];
  if (labId) where.push(eq(desiccantReminders.labId, labId));
  const unsent = await db.select({ eventId: desiccantReminders.eventId, userId: desiccantReminders.userId }).from(desiccantReminders).where(and(...where)).orderBy(asc(desiccantReminders.queuedAt));
  let sent = 0;
  const failed: string[] = [];
  for (const job of unsent) {
    try {
      if ((await sendDesiccantReminder(job)) === "sent") sent++;
    } catch (err) {
      failed.push(`${job.eventId}/${job.userId}: ${(err as Error).message}`);
    }
  }
  if (failed.length) throw new Error(`${failed.length} desiccant reminder(s) not sent, will retry: ${failed[0]}`);
  return { claimed: claimed.length, sent };
}
