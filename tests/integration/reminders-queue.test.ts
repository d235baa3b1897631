// Reminders through the real queue: a running trial whose day-0 inspection is due "tomorrow", two
// trial technicians (one opted out). claimDueReminders → pg-boss send-reminder jobs → a worker in this
// test → the SMTP fake. The mail carries the inspection link; the opted-out technician gets none.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { getBoss, QUEUES, stopBoss } from "@/db/jobs/queue";
import { claimDueReminders, sendReminder, type ReminderJob } from "@/db/jobs/reminders";
import { createTrial } from "@/db/queries/trials";
import { allocateTrial } from "@/db/queries/trials-allocation";
import { startTrial } from "@/db/queries/trials-lifecycle";
import { listMessages } from "@/lib/mail-store";
import { planFromFields } from "@/lib/validation/trials";
import { createTestLab, type TestLab } from "../support/db";
import { ensureMailFake, type MailFake } from "../support/mail";
import { addChambers, addSpecimens, addTreatments } from "./trials-fixtures";

const HOUR = 3_600_000;
let lab: TestLab;
let mail: MailFake;
let trialId: string;
let inspectionId: string;
let plannedAt: Date;

beforeAll(async () => {
  mail = await ensureMailFake();
  process.env.SMTP_URL = mail.smtpUrl; // lib/mail/send reads it at the first send
  lab = await createTestLab("Reminders");
  const chamberIds = await addChambers(lab, 1);
  const treatmentIds = await addTreatments(lab, ["Bare control"]);
  const specimens = await addSpecimens(lab, { "iron-meteorite": 2 });
  // The researcher is a trial technician too, but has turned reminders off.
  await db.update(s.users).set({ remindersOptOut: true }).where(eq(s.users.id, lab.users.researcher.id));
  const lead = { userId: lab.users.lead.id, labId: lab.labId, role: "lead" as const };
  const trial = await createTrial({ actor: lead, input: {
    title: "Reminder trial", question: "Does the reminder arrive with its link?", hypothesis: "", primaryOutcome: "time-to-first-rust",
    chamberIds, treatmentIds, replicatesPerArm: 2, technicianIds: [lab.users.technician.id, lab.users.researcher.id], photoProtocol: [],
    plan: planFromFields({ planKind: "fixed", intervalDays: 7, fixedCount: 2 }) as { kind: "fixed"; intervalDays: number; count: number },
  } });
  trialId = trial.id;
  await allocateTrial({ actor: lead, trialId, specimenIds: specimens.map((x) => x.id), seed: "remind", blockByMaterial: true });
  // Day 0 is 30 h ahead: the always-running worker (real clock, 24 h window) leaves it alone, and
  // this test scans as if 10 h had passed, when it is due tomorrow.
  await startTrial({ actor: lead, trialId, startAt: new Date(Date.now() + 30 * HOUR) });
  const [first] = await db.select().from(s.inspections).where(and(eq(s.inspections.trialId, trialId), eq(s.inspections.dayNumber, 0)));
  inspectionId = first.id;
  plannedAt = first.plannedAt;
}, 60_000);

afterAll(async () => {
  await stopBoss();
  await mail?.stop();
  await closeDb();
});

/** Scan at a simulated time; claims for other tests' trials are released again, so only ours stay claimed. */
async function claimOurs(at: Date) {
  const jobs = await claimDueReminders(at);
  for (const j of jobs.filter((x) => x.inspectionId !== inspectionId)) {
    await db.delete(s.reminderLog).where(and(eq(s.reminderLog.inspectionId, j.inspectionId), eq(s.reminderLog.userId, j.userId), eq(s.reminderLog.kind, j.kind)));
  }
  return jobs.filter((j) => j.inspectionId === inspectionId);
}

async function waitForMail(to: string, timeoutMs = 20_000) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const found = await listMessages(mail.mailDir, { to });
    if (found.length) return found;
    await new Promise((r) => setTimeout(r, 250));
  }
  return [];
}

describe("inspection reminders through pg-boss", () => {
  it("queues one day-before reminder per opted-in technician and the worker mails it with the link", async () => {
    const scanAt = new Date(plannedAt.getTime() - 20 * HOUR);
    const mine = await claimOurs(scanAt);
    expect(mine).toEqual([{ inspectionId, userId: lab.users.technician.id, kind: "day-before" }]);
    // Claimed once: a second scan queues nothing more for it.
    expect(await claimOurs(scanAt)).toEqual([]);

    const boss = await getBoss();
    await boss.work<ReminderJob>(QUEUES.sendReminder, { pollingIntervalSeconds: 0.5 }, async ([job]) => {
      await sendReminder(job.data);
    });
    for (const job of mine) await boss.send(QUEUES.sendReminder, job, { retryLimit: 5, retryDelay: 1 });

    const received = await waitForMail(lab.users.technician.email);
    expect(received).toHaveLength(1);
    const [m] = received;
    expect(m.subject).toBe("Inspection tomorrow: Reminder trial, day 0");
    expect(m.text).toMatch(new RegExp(`https?://[^\\s]+/trials/${trialId}/inspections/${inspectionId}`));
    expect(m.text).toContain(`planned for ${plannedAt.toISOString().slice(0, 16).replace("T", " ")} UTC`);

    const [log] = await db.select().from(s.reminderLog).where(and(eq(s.reminderLog.inspectionId, inspectionId), eq(s.reminderLog.userId, lab.users.technician.id)));
    expect(log.sentAt).not.toBeNull();
  }, 60_000);

  it("an opted-out technician is never claimed and gets no mail", async () => {
    const logs = await db.select().from(s.reminderLog).where(and(eq(s.reminderLog.inspectionId, inspectionId), eq(s.reminderLog.userId, lab.users.researcher.id)));
    expect(logs).toEqual([]);
    expect(await listMessages(mail.mailDir, { to: lab.users.researcher.email })).toEqual([]);
  });

  it("someone who opts out after the claim is skipped when the job runs", async () => {
    // Overdue scan for the same inspection: the technician is claimed, then opts out before sending.
    const lateScan = new Date(plannedAt.getTime() + 7 * HOUR);
    const jobs = await claimOurs(lateScan);
    expect(jobs).toEqual([{ inspectionId, userId: lab.users.technician.id, kind: "overdue" }]);
    await db.update(s.users).set({ remindersOptOut: true }).where(eq(s.users.id, lab.users.technician.id));
    expect(await sendReminder(jobs[0])).toBe("skipped");
    expect(await listMessages(mail.mailDir, { to: lab.users.technician.email })).toHaveLength(1); // still only the first one
  });
});
