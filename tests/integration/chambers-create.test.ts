// Chamber definition through the action chain (session → membership → permission → zod → handler).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import { auditEvents, chambers } from "@/db/schema";
import { createChamber, getChamber, updateChamber } from "@/db/queries/chambers";
import { runLabAction } from "@/lib/auth/action";
import { chamberSchema, chamberUpdateSchema } from "@/lib/validation/chambers";
import { createTestLab, type TestLab } from "../support/db";

let lab: TestLab;
let other: TestLab;

const create = (identity: { userId: string; labId: string }, input: Record<string, unknown>) =>
  runLabAction(identity, "chambers.write", chamberSchema, input, async (ctx, data) => {
    const row = await createChamber({ labId: ctx.labId, userId: ctx.userId, values: data });
    return { data: row };
  });

const nacl = (name: string, tempC: string) => ({ name, kind: "saturated-salt", saltId: "NaCl", nominalTempC: tempC, volumeL: "2", setpointRhPercent: "", toleranceRhPercent: "", notes: "" });

async function countByName(labId: string, name: string) {
  return (await db.select().from(chambers).where(and(eq(chambers.labId, labId), eq(chambers.name, name)))).length;
}

beforeAll(async () => {
  lab = await createTestLab("Chambers create");
  other = await createTestLab("Chambers other");
});
afterAll(async () => {
  await closeDb();
});

describe("define a chamber", () => {
  it("gives a saturated NaCl chamber at 22 °C the equilibrium RH as its setpoint, and audits it", async () => {
    const r = await create(lab.as("researcher"), nacl("NaCl jar 22", "22"));
    expect(r.ok).toBe(true);
    const row = r.data!;
    // Greenspan 1977 fit for NaCl at 22 °C: 75.5164 + 0.0398321·22 − 2.65459e-3·22² + 2.848e-5·22³ = 75.41 %RH
    expect(row.setpointRhPercent).toBeCloseTo(75.4, 5);
    expect(row.toleranceRhPercent).toBe(2);
    expect(row.saltId).toBe("NaCl");
    const audit = await db.select().from(auditEvents).where(and(eq(auditEvents.labId, lab.labId), eq(auditEvents.entityId, row.id)));
    expect(audit).toHaveLength(1);
    expect(audit[0].action).toBe("create");
  });

  it("keeps a setpoint the user typed", async () => {
    const r = await create(lab.as("lead"), { ...nacl("NaCl jar typed", "25"), setpointRhPercent: "75", toleranceRhPercent: "1,5" });
    expect(r.ok).toBe(true);
    expect(r.data!.setpointRhPercent).toBe(75);
    expect(r.data!.toleranceRhPercent).toBe(1.5);
  });

  it("refuses a temperature outside the salt's fit range with a field error naming the range, and stores nothing", async () => {
    const r = await create(lab.as("researcher"), nacl("NaCl jar too hot", "95"));
    expect(r.ok).toBe(false);
    // Greenspan 1977 NaCl fit range 0–80 °C (recalled)
    expect(r.errors?.nominalTempC?.join(" ")).toMatch(/0–80 °C/);
    expect(r.values?.nominalTempC).toBe("95");
    expect(await countByName(lab.labId, "NaCl jar too hot")).toBe(0);
  });

  it("defaults a pure-water jar to 96 ± 4 %RH and requires a desiccant's kind and mass", async () => {
    const water = await create(lab.as("researcher"), { name: "Water jar", kind: "water", nominalTempC: "21", notes: "" });
    expect(water.ok).toBe(true);
    expect([water.data!.setpointRhPercent, water.data!.toleranceRhPercent]).toEqual([96, 4]);
    const dry = await create(lab.as("researcher"), { name: "Sieve jar", kind: "desiccant", nominalTempC: "21", setpointRhPercent: "2" });
    expect(dry.ok).toBe(false);
    expect(dry.errors?.desiccantKind).toBeDefined();
    expect(dry.errors?.desiccantMassG).toBeDefined();
  });

  it("refuses observers and technicians (chambers.write) and stores nothing", async () => {
    for (const role of ["observer", "technician"] as const) {
      const r = await create(lab.as(role), nacl(`NaCl by ${role}`, "22"));
      expect(r.ok).toBe(false);
      expect(r.message).toMatch(new RegExp(`role \\(${role}\\)`));
      expect(await countByName(lab.labId, `NaCl by ${role}`)).toBe(0);
    }
  });

  it("answers not-found for another lab's chamber and leaves it unchanged", async () => {
    const mine = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: chamberSchema.parse(nacl("Private jar", "20")) });
    const r = await runLabAction(other.as("researcher"), "chambers.write", chamberUpdateSchema, { chamberId: mine.id, ...nacl("Taken over", "20") }, async (ctx, data) => {
      const { chamberId, ...values } = data;
      await updateChamber({ labId: ctx.labId, userId: ctx.userId, chamberId, values });
    });
    expect(r.ok).toBe(false);
    expect(r.message).toMatch(/No such chamber/);
    await expect(getChamber({ labId: other.labId, chamberId: mine.id })).rejects.toMatchObject({ code: "not-found" });
    expect((await getChamber({ labId: lab.labId, chamberId: mine.id })).name).toBe("Private jar");
  });

  it("edits a chamber with before/after in the audit trail", async () => {
    const mine = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: chamberSchema.parse(nacl("Editable jar", "20")) });
    const r = await runLabAction(lab.as("researcher"), "chambers.write", chamberUpdateSchema, { chamberId: mine.id, ...nacl("Editable jar", "30") }, async (ctx, data) => {
      const { chamberId, ...values } = data;
      return { data: await updateChamber({ labId: ctx.labId, userId: ctx.userId, chamberId, values }) };
    });
    expect(r.ok).toBe(true);
    // Greenspan 1977 NaCl at 30 °C: 75.09 %RH, Table 1
    expect((r.data as { setpointRhPercent: number }).setpointRhPercent).toBeCloseTo(75.1, 5);
    const [ev] = await db.select().from(auditEvents).where(and(eq(auditEvents.entityId, mine.id), eq(auditEvents.action, "update")));
    expect((ev.before as { nominalTempC: number }).nominalTempC).toBe(20);
    expect((ev.after as { nominalTempC: number }).nominalTempC).toBe(30);
  });

  it("stores a silica gel's colour indicator, and refuses a KOH jar below its fit range at the temperature field", async () => {
    const gel = await create(lab.as("researcher"), {
      name: "Cobalt gel jar", kind: "desiccant", desiccantKind: "silica-gel", desiccantIndicator: "cobalt-chloride",
      desiccantMassG: "150", nominalTempC: "20", volumeL: "2", setpointRhPercent: "15", toleranceRhPercent: "", roomRhPercent: "50", airExchangePerDay: "0.5", notes: "",
    });
    expect(gel.ok).toBe(true);
    const stored = await getChamber({ labId: lab.labId, chamberId: gel.data!.id });
    expect(stored.desiccantIndicator).toBe("cobalt-chloride");

    const koh = await create(lab.as("researcher"), { name: "KOH jar cold", kind: "saturated-salt", saltId: "KOH", nominalTempC: "3", volumeL: "1", setpointRhPercent: "", toleranceRhPercent: "", notes: "" });
    expect(koh.ok).toBe(false);
    // Our fit to Greenspan 1977 Table 1 (from memory) covers KOH 5–50 °C
    expect(koh.errors?.nominalTempC?.join(" ")).toMatch(/Potassium hydroxide \(KOH\).*5–50 °C/);
    expect(await countByName(lab.labId, "KOH jar cold")).toBe(0);
  });
});
