// Desiccant upkeep: the log, the projected exhaustion date and the reminder e-mail to the lab's
// technicians and leads (claimed once, sent through the mail fake).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import { auditEvents, desiccantReminders } from "@/db/schema";
import { addDesiccantEvent, createChamber, listDesiccantEvents } from "@/db/queries/chambers";
import { desiccantStatus } from "@/lib/humidity/desiccant-status";
import { runDesiccantScan } from "@/db/jobs/desiccant";
import { runLabAction } from "@/lib/auth/action";
import { listMessages } from "@/lib/mail-store";
import { chamberSchema, desiccantEventSchema } from "@/lib/validation/chambers";
import { createTestLab, type TestLab } from "../support/db";
import { ensureMailFake, type MailFake } from "../support/mail";

let lab: TestLab;
let mail: MailFake;
const DAY = 86_400_000;

const sieveJar = (name: string) => chamberSchema.parse({
  name, kind: "desiccant", desiccantKind: "molecular-sieve-4a", desiccantMassG: "100", nominalTempC: "21", volumeL: "2",
  setpointRhPercent: "2", toleranceRhPercent: "2", roomRhPercent: "50", airExchangePerDay: "1",
});

async function waitForMail(to: string, subject: RegExp, timeoutMs = 5000) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const found = (await listMessages(mail.mailDir, { to })).filter((m) => subject.test(m.subject));
    if (found.length) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
  return [];
}

beforeAll(async () => {
  mail = await ensureMailFake();
  process.env.SMTP_URL = mail.smtpUrl;
  lab = await createTestLab("Chambers desiccant");
});
afterAll(async () => {
  await mail?.stop();
  await closeDb();
});

describe("desiccant upkeep", () => {
  it("projects exhaustion from the water budget counted from the last charge", async () => {
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: sieveJar("Budget jar") });
    const at = new Date(Date.UTC(2025, 0, 1));
    await addDesiccantEvent({ labId: lab.labId, userId: lab.users.technician.id, chamberId: c.id, kind: "charged", at, massG: 100, notes: "" });
    const status = desiccantStatus(c, await listDesiccantEvents({ labId: lab.labId, chamberId: c.id }));
    expect(status.budget).not.toBeNull();
    // Budget arithmetic (lib/humidity/desiccant): 1 exchange/day of a 2 L jar brings (ρv(21 °C, 50 %) − ρv(21 °C, 2 %)) ≈ 8.8 g/m³ → ≈17.6 mg/day;
    // sieve 4A ≈ 0.185 g/g at 2 %RH (manufacturers' isotherms, from memory) × 100 g ≈ 18.5 g → about 1050 days.
    expect(status.budget!.daysUntilSpent!).toBeGreaterThan(900);
    expect(status.budget!.daysUntilSpent!).toBeLessThan(1200);
    expect(status.exhaustionAt!.getTime()).toBeCloseTo(at.getTime() + status.budget!.daysUntilSpent! * DAY, -3);
  });

  it("uses the weighed uptake when it projects an earlier date", async () => {
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: sieveJar("Weighed jar") });
    const at = new Date(Date.UTC(2025, 0, 1));
    await addDesiccantEvent({ labId: lab.labId, userId: lab.users.technician.id, chamberId: c.id, kind: "charged", at, massG: 100, notes: "" });
    await addDesiccantEvent({ labId: lab.labId, userId: lab.users.technician.id, chamberId: c.id, kind: "checked", at: new Date(at.getTime() + 10 * DAY), massG: 101, notes: "" });
    const status = desiccantStatus(c, await listDesiccantEvents({ labId: lab.labId, chamberId: c.id }));
    expect(status.measured!.gPerDay).toBeCloseTo(0.1, 6);
    // 0.1 g/day against ≈18.5 g capacity: ≈185 days, well before the budget's ≈1050
    expect(status.exhaustionAt!.getTime()).toBe(status.measured!.exhaustionAt!.getTime());
    expect((status.exhaustionAt!.getTime() - at.getTime()) / DAY).toBeGreaterThan(150);
    expect((status.exhaustionAt!.getTime() - at.getTime()) / DAY).toBeLessThan(220);
  });

  it("lets technicians log upkeep (audited) and refuses observers", async () => {
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: sieveJar("Logged jar") });
    const input = { chamberId: c.id, kind: "regenerated", at: "2025-02-01T09:30", timeZone: "UTC", massG: "99,5", notes: "250 °C, 4 h" };
    const handler = async (ctx: { labId: string; userId: string }, d: { chamberId: string; kind: "regenerated"; at: Date; massG?: number; notes: string }) => {
      await addDesiccantEvent({ labId: ctx.labId, userId: ctx.userId, chamberId: d.chamberId, kind: d.kind, at: d.at, massG: d.massG, notes: d.notes });
    };
    const denied = await runLabAction(lab.as("observer"), "desiccant.write", desiccantEventSchema, input, handler as never);
    expect(denied.ok).toBe(false);
    const ok = await runLabAction(lab.as("technician"), "desiccant.write", desiccantEventSchema, input, handler as never);
    expect(ok.ok).toBe(true);
    const events = await listDesiccantEvents({ labId: lab.labId, chamberId: c.id });
    expect(events).toHaveLength(1);
    expect([events[0].massG, events[0].at.toISOString()]).toEqual([99.5, "2025-02-01T09:30:00.000Z"]);
    expect(await db.select().from(auditEvents).where(eq(auditEvents.entityId, events[0].id))).toHaveLength(1);
  });

  it("e-mails technicians and leads a few days before exhaustion, once per charge", async () => {
    const lab = await createTestLab("Chambers reminders"); // its own lab: the scan looks at every chamber of a lab
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: sieveJar("Reminder jar") });
    const now = new Date();
    // Charged 1,048 days ago with a ≈1,050-day budget: due within the 3-day warning window.
    const status0 = desiccantStatus(c, []);
    const lifeDays = status0.budget!.daysUntilSpent!;
    await addDesiccantEvent({ labId: lab.labId, userId: lab.users.technician.id, chamberId: c.id, kind: "charged", at: new Date(now.getTime() - (lifeDays - 2) * DAY), massG: 100, notes: "" });
    const first = await runDesiccantScan(now, lab.labId);
    expect(first).toEqual({ claimed: 2, sent: 2 });
    for (const role of ["technician", "lead"] as const) {
      const got = await waitForMail(lab.users[role].email, /Reminder jar/);
      expect(got).toHaveLength(1);
      expect(got[0].text).toContain(`/chambers/${c.id}`);
    }
    for (const role of ["researcher", "observer"] as const) expect(await waitForMail(lab.users[role].email, /Reminder jar/, 300)).toHaveLength(0);
    const again = await runDesiccantScan(now, lab.labId);
    expect(again).toEqual({ claimed: 0, sent: 0 });
    const claims = await db.select().from(desiccantReminders).where(eq(desiccantReminders.chamberId, c.id));
    expect(claims.every((x) => x.sentAt !== null && x.attempts === 1)).toBe(true);
  });

  it("does not remind while exhaustion is further away than the warning window", async () => {
    const lab = await createTestLab("Chambers no reminder");
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: sieveJar("Fresh jar") });
    await addDesiccantEvent({ labId: lab.labId, userId: lab.users.technician.id, chamberId: c.id, kind: "charged", at: new Date(), massG: 100, notes: "" });
    expect(await runDesiccantScan(new Date(), lab.labId)).toEqual({ claimed: 0, sent: 0 });
  });
});
