// A desiccant reminder whose mail fails stays claimed but unsent: the scan throws (so pg-boss
// retries it) and the next scan sends it — exactly once. The failure is real: the mail fake is
// stopped (connection refused) and started again, as in the mail-outage fault test.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import { desiccantReminders } from "@/db/schema";
import { addDesiccantEvent, createChamber } from "@/db/queries/chambers";
import { runDesiccantScan } from "@/db/jobs/desiccant";
import { desiccantStatus } from "@/lib/humidity/desiccant-status";
import { listMessages } from "@/lib/mail-store";
import { chamberSchema } from "@/lib/validation/chambers";
import { createTestLab, type TestLab } from "../support/db";
import { ensureMailFake, type MailFake } from "../support/mail";
import { startMailFake, stopMailFake } from "../support/services";

let lab: TestLab;
let mail: MailFake;
const DAY = 86_400_000;

beforeAll(async () => {
  mail = await ensureMailFake();
  lab = await createTestLab("Chambers desiccant retry");
});
afterAll(async () => {
  await closeDb();
});

const inbox = async (to: string) => (await listMessages(mail.mailDir, { to })).filter((m) => /desiccant/i.test(`${m.subject} ${m.text}`));

describe("desiccant reminder retry", () => {
  it("keeps reminders unsent while the mail server is down, throws for the queue, and sends each once when it is back", async () => {
    const values = chamberSchema.parse({ name: "Retry jar", kind: "desiccant", desiccantKind: "silica-gel", desiccantMassG: "50", nominalTempC: "21", volumeL: "1", setpointRhPercent: "30", roomRhPercent: "60", airExchangePerDay: "2" });
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values });
    const life = desiccantStatus(c, []).budget!.daysUntilSpent!;
    await addDesiccantEvent({ labId: lab.labId, userId: lab.users.technician.id, chamberId: c.id, kind: "charged", at: new Date(Date.now() - (life + 1) * DAY), massG: 50, notes: "" });
    const recipients = [lab.users.technician.email, lab.users.lead.email];

    stopMailFake();
    try {
      await expect(runDesiccantScan(new Date(), lab.labId)).rejects.toThrow(/2 desiccant reminder\(s\) not sent, will retry/);
    } finally {
      await startMailFake();
    }
    const after1 = await db.select().from(desiccantReminders).where(eq(desiccantReminders.chamberId, c.id));
    expect(after1).toHaveLength(2);
    expect(after1.filter((x) => x.sentAt === null)).toHaveLength(2);
    expect(after1.every((x) => x.attempts >= 1)).toBe(true);
    for (const to of recipients) expect(await inbox(to)).toHaveLength(0);

    expect(await runDesiccantScan(new Date(), lab.labId)).toEqual({ claimed: 0, sent: 2 });
    for (const to of recipients) expect(await inbox(to)).toHaveLength(1);
    expect(await runDesiccantScan(new Date(), lab.labId)).toEqual({ claimed: 0, sent: 0 });
    for (const to of recipients) expect(await inbox(to)).toHaveLength(1);
    const after3 = await db.select().from(desiccantReminders).where(eq(desiccantReminders.chamberId, c.id));
    expect(after3.every((x) => x.sentAt !== null)).toBe(true);
  });
});
