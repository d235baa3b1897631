// A desiccant reminder whose mail fails stays claimed but unsent: the scan throws (so pg-boss
// retries it) and the next scan sends it — exactly once.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import { desiccantReminders } from "@/db/schema";
import { addDesiccantEvent, createChamber } from "@/db/queries/chambers";
import { desiccantStatus } from "@/lib/humidity/desiccant-status";
import { chamberSchema } from "@/lib/validation/chambers";
import { createTestLab, type TestLab } from "../support/db";

const sent: string[] = [];
let failNext = 0;
vi.mock("@/lib/mail/send", () => ({
  appUrl: (p: string) => `http://localhost${p}`,
  sendMail: async (m: { to: string }) => {
    if (failNext > 0) {
      failNext--;
      throw new Error("connect ECONNREFUSED 127.0.0.1:2525");
    }
    sent.push(m.to);
  },
}));
const { runDesiccantScan } = await import("@/db/jobs/desiccant");

let lab: TestLab;
const DAY = 86_400_000;

beforeAll(async () => {
  lab = await createTestLab("Chambers desiccant retry");
});
afterAll(async () => {
  await closeDb();
});

describe("desiccant reminder retry", () => {
  it("keeps a failed reminder unsent, throws for the queue, and sends it on the next scan", async () => {
    const values = chamberSchema.parse({ name: "Retry jar", kind: "desiccant", desiccantKind: "silica-gel", desiccantMassG: "50", nominalTempC: "21", volumeL: "1", setpointRhPercent: "30", roomRhPercent: "60", airExchangePerDay: "2" });
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values });
    const life = desiccantStatus(c, []).budget!.daysUntilSpent!;
    await addDesiccantEvent({ labId: lab.labId, userId: lab.users.technician.id, chamberId: c.id, kind: "charged", at: new Date(Date.now() - (life + 1) * DAY), massG: 50, notes: "" });
    failNext = 1;
    await expect(runDesiccantScan(new Date(), lab.labId)).rejects.toThrow(/not sent, will retry/);
    const after1 = await db.select().from(desiccantReminders).where(eq(desiccantReminders.chamberId, c.id));
    expect(after1).toHaveLength(2);
    expect(after1.filter((x) => x.sentAt === null)).toHaveLength(1);
    expect(sent).toHaveLength(1);
    const second = await runDesiccantScan(new Date(), lab.labId);
    expect(second).toEqual({ claimed: 0, sent: 1 });
    expect(new Set(sent)).toEqual(new Set([lab.users.technician.email, lab.users.lead.email]));
    expect(await runDesiccantScan(new Date(), lab.labId)).toEqual({ claimed: 0, sent: 0 });
  });
});
