// Fault: the SMTP server is down when a reminder is due. The reminder stays queued (pg-boss retries
// in the running worker) and is delivered once the mail server is back. Runs against the worker
// that npm test starts.
import { afterAll, beforeAll, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { getBoss, QUEUES, stopBoss } from "@/db/jobs/queue";
import { listMessages } from "@/lib/mail-store";
import { createTestLab, type TestLab } from "../support/db";
import { ensureMailFake } from "../support/mail";
import { startMailFake, stopMailFake } from "../support/services";

let lab: TestLab;
let mailDir: string;

beforeAll(async () => {
  mailDir = (await ensureMailFake()).mailDir;
  lab = await createTestLab("Mail outage");
});
afterAll(async () => {
  await stopBoss();
  await closeDb();
});

async function until<T>(what: string, fn: () => Promise<T | null | undefined | false>, ms = 60_000): Promise<T> {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    const v = await fn();
    if (v) return v;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`timed out waiting for ${what}`);
}

it("keeps a reminder queued while the mail server is down and delivers it when it returns", async () => {
  const [trial] = await db.insert(s.trials).values({ labId: lab.labId, title: "Outage trial", question: "Does mail survive?", status: "running", schedulePlan: { kind: "custom", days: [0] }, startedAt: new Date() }).returning();
  await db.insert(s.trialMembers).values({ trialId: trial.id, userId: lab.users.technician.id, labId: lab.labId, role: "technician" });

  stopMailFake();
  try {
    const [insp] = await db.insert(s.inspections).values({ labId: lab.labId, trialId: trial.id, dayNumber: 1, plannedAt: new Date(Date.now() + 3 * 3_600_000) }).returning();
    const boss = await getBoss();
    await boss.send(QUEUES.reminderScan, {});
    const claimed = await until("the worker to claim and try the reminder", async () => {
      const [row] = await db.select().from(s.reminderLog).where(and(eq(s.reminderLog.inspectionId, insp.id), eq(s.reminderLog.userId, lab.users.technician.id)));
      return row && row.attempts >= 1 ? row : null;
    });
    expect(claimed.kind).toBe("day-before");
    expect(claimed.sentAt).toBeNull(); // the mail server refused: not marked sent
    expect(await listMessages(mailDir, { to: lab.users.technician.email })).toHaveLength(0);
  } finally {
    await startMailFake();
  }
  const mail = await until("the retried reminder to arrive", async () => (await listMessages(mailDir, { to: lab.users.technician.email }))[0]);
  expect(mail.subject).toMatch(/Inspection tomorrow: Outage trial, day 1/);
  expect(mail.text).toMatch(/\/trials\/[0-9a-f-]{36}\/inspections\/[0-9a-f-]{36}/);
  const [log] = await db.select().from(s.reminderLog).where(eq(s.reminderLog.userId, lab.users.technician.id));
  expect(log.sentAt).not.toBeNull();
}, 120_000);

it("re-queues a claimed reminder that was never sent (worker stopped between claim and send), once per period", async () => {
  const { reclaimStaleReminders } = await import("@/db/jobs/reminders");
  const [trial] = await db.insert(s.trials).values({ labId: lab.labId, title: "Stale claim", question: "?", status: "running", schedulePlan: { kind: "custom", days: [0] }, startedAt: new Date() }).returning();
  const [insp] = await db.insert(s.inspections).values({ labId: lab.labId, trialId: trial.id, dayNumber: 0, plannedAt: new Date(Date.now() + 3_600_000) }).returning();
  const twoHoursAgo = new Date(Date.now() - 2 * 3_600_000);
  await db.insert(s.reminderLog).values({ inspectionId: insp.id, userId: lab.users.technician.id, kind: "day-before", queuedAt: twoHoursAgo });
  const now = new Date();
  const jobs = await reclaimStaleReminders(now);
  expect(jobs).toContainEqual({ inspectionId: insp.id, userId: lab.users.technician.id, kind: "day-before" });
  expect((await reclaimStaleReminders(now)).filter((j) => j.inspectionId === insp.id)).toHaveLength(0);
});
