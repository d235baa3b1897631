// Storage rules on the seeded demo's humidity ladder: who may accept one, that the stored threshold
// is the one the humidity response computes, versions and the audit trail, the data package, and
// that each jar's measured mean RH equals a direct time-weighted mean over its raw readings.
import JSZip from "jszip";
import Papa from "papaparse";
import { and, asc, eq, gte, lte } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import { buildTrialDataPackage } from "@/db/queries/analysis";
import { loadHumidityResponse } from "@/db/queries/humidity-response";
import { acceptStorageRule, enterStorageRule, listStorageRules } from "@/db/queries/storage-rules";
import { getTrial, type Trial } from "@/db/queries/trial-access";
import { auditEvents, chambers, labs, memberships, placements, readings, storageRules, trials, users } from "@/db/schema";
import { enterRuleSchema, responseOptions } from "@/lib/validation/storage-rules";

type Actor = { userId: string; labId: string; role: "lead" | "researcher" | "technician" | "observer" };
let labId: string;
let trial: Trial;
let lead: Actor;
let researcher: Actor;
const choice = { share: 10, horizon: 10, pool: [] as string[], note: "" };

beforeAll(async () => {
  const [lab] = await db.select().from(labs).where(eq(labs.name, "Tarrow Valley Natural History Collection"));
  labId = lab.id;
  const [t] = await db.select().from(trials).where(and(eq(trials.labId, labId), eq(trials.title, "Humidity ladder, bare and waxed slices, 2026")));
  trial = await getTrial({ labId, trialId: t.id });
  const member = async (email: string) => {
    const [row] = await db.select({ userId: users.id, role: memberships.role }).from(users)
      .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.labId, labId))).where(eq(users.email, email));
    return { userId: row.userId, labId, role: row.role } as Actor;
  };
  lead = await member("lead@tarrow.example");
  researcher = await member("researcher@tarrow.example");
});
afterAll(async () => {
  await closeDb();
});

async function stonyWaxed() {
  const { response } = await loadHumidityResponse({ labId, trial, options: responseOptions(choice) });
  const combo = response.combos.find((c) => c.materialClass === "stony-iron" && c.treatmentName === "Microcrystalline wax")!;
  return { response, combo };
}

describe("accepting a storage rule", () => {
  it("has a humidity response with a threshold for every material and treatment of the ladder", async () => {
    const { response } = await stonyWaxed();
    expect(response.fit).not.toBeNull();
    expect(response.levels).toHaveLength(5);
    expect(response.combos).toHaveLength(4);
    expect(response.combos.every((c) => c.threshold.status === "found")).toBe(true);
  });

  it("is refused to a researcher, and changes nothing", async () => {
    const { combo } = await stonyWaxed();
    const before = await db.$count(storageRules, eq(storageRules.labId, labId));
    await expect(acceptStorageRule({ actor: researcher, input: { ...choice, trialId: trial.id, materialClass: combo.materialClass, treatmentId: combo.treatmentId } }))
      .rejects.toMatchObject({ code: "forbidden" });
    expect(await db.$count(storageRules, eq(storageRules.labId, labId))).toBe(before);
  });

  it("refuses a material and treatment that are not in the analysis", async () => {
    const { combo } = await stonyWaxed();
    await expect(acceptStorageRule({ actor: lead, input: { ...choice, trialId: trial.id, materialClass: "chondrite", treatmentId: combo.treatmentId } }))
      .rejects.toMatchObject({ code: "invalid", fieldErrors: { materialClass: ["Not in this analysis."] } });
  });

  it("stores the threshold the humidity response computes, then versions it and audits both", async () => {
    const { combo } = await stonyWaxed();
    const input = { ...choice, trialId: trial.id, materialClass: combo.materialClass, treatmentId: combo.treatmentId };
    const first = await acceptStorageRule({ actor: lead, input: { ...input, note: "first" } });
    expect(first.thresholdRhPercent).toBeCloseTo(combo.threshold.rhPercent!, 9);
    expect(first.lower95RhPercent).toBeCloseTo(combo.threshold.lower95!, 9);
    expect(first.statement).toBe(combo.sentence);
    expect(first.sourceTrialIds).toEqual([trial.id]);
    const second = await acceptStorageRule({ actor: lead, input: { ...input, share: 5, note: "stricter share" } });
    expect(second.version).toBe(first.version + 1);
    expect(second.thresholdRhPercent).toBeLessThan(first.thresholdRhPercent);

    const versions = await db.select().from(storageRules).where(eq(storageRules.id, first.id));
    expect(versions[0].supersededAt).not.toBeNull();
    const listed = await listStorageRules({ labId, userId: lead.userId, trialId: trial.id });
    expect(listed.filter((r) => r.materialClass === "stony-iron" && r.treatmentName === "Microcrystalline wax" && r.current).map((r) => r.id)).toEqual([second.id]);

    const trail = await db.select().from(auditEvents).where(and(eq(auditEvents.labId, labId), eq(auditEvents.entity, "storage_rule"))).orderBy(asc(auditEvents.id));
    const mine = trail.filter((e) => e.entityId === first.id || e.entityId === second.id);
    expect(mine.map((e) => e.action).sort()).toEqual(["create", "create", "update"]);
    expect(mine.every((e) => e.trialId === trial.id && e.userId === lead.userId)).toBe(true);
  });

  it("puts every version into the trial's data package", async () => {
    const zip = await JSZip.loadAsync((await buildTrialDataPackage({ labId, trial })).zip);
    const csv = await zip.file("data/storage_rules.csv")!.async("string");
    const { data } = Papa.parse<Record<string, string>>(csv.trim(), { header: true });
    const stony = data.filter((r) => r.material_class === "stony-iron" && r.treatment === "Microcrystalline wax");
    expect(stony.length).toBeGreaterThanOrEqual(2);
    expect(stony.every((r) => r.source_trial_ids === trial.id)).toBe(true);
    expect(stony.filter((r) => r.superseded_at === "")).toHaveLength(1);
  });
});

describe("entering a storage rule by hand", () => {
  const form = { materialClass: "steel-coupon", treatmentId: "any", thresholdRhPercent: "30", sourceDate: "2019-05-01", note: "" };

  it("refuses a rule without a source, naming the field, and saves nothing", async () => {
    const before = await db.$count(storageRules, eq(storageRules.labId, labId));
    const parsed = enterRuleSchema.safeParse({ ...form, source: "  " });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues.map((i) => i.path[0])).toEqual(["source"]);
    const future = enterRuleSchema.safeParse({ ...form, source: "Lab decision", sourceDate: "2999-01-01" });
    expect(future.error!.issues.map((i) => [i.path[0], i.message])).toEqual([["sourceDate", "The source's date cannot be in the future."]]);
    // the database refuses it too, whoever writes
    await expect(db.insert(storageRules).values({
      labId, materialClass: "steel-coupon", treatmentName: "Any treatment", version: 99, thresholdRhPercent: 30,
      method: "x", statement: "x", origin: "entered", source: "", sourceDate: "2019-05-01",
    })).rejects.toMatchObject({ cause: { constraint: "storage_rules_source_check" } });
    expect(await db.$count(storageRules, eq(storageRules.labId, labId))).toBe(before);
  });

  it("is refused to a researcher", async () => {
    const input = enterRuleSchema.parse({ ...form, source: "Lab decision" });
    await expect(enterStorageRule({ actor: researcher, input })).rejects.toMatchObject({ code: "forbidden" });
  });

  it("saves the source and its date, versions the rule and audits it without a trial", async () => {
    const input = enterRuleSchema.parse({ ...form, source: "Conservation committee decision, minute 14" });
    const first = await enterStorageRule({ actor: lead, input });
    expect(first).toMatchObject({ origin: "entered", treatmentName: "Any treatment", thresholdRhPercent: 30, source: "Conservation committee decision, minute 14", sourceDate: "2019-05-01", shareRusted: null });
    const second = await enterStorageRule({ actor: lead, input: { ...input, thresholdRhPercent: 25 } });
    expect(second.version).toBe(first.version + 1);
    const listed = await listStorageRules({ labId, userId: lead.userId });
    expect(listed.filter((r) => r.materialClass === "steel-coupon" && r.current).map((r) => r.thresholdRhPercent)).toEqual([25]);
    const trail = await db.select().from(auditEvents).where(and(eq(auditEvents.labId, labId), eq(auditEvents.entityId, second.id)));
    expect(trail.map((e) => [e.action, e.trialId])).toEqual([["create", null]]);
    expect(trail[0].summary).toContain("source: Conservation committee decision, minute 14");
  });
});

describe("the humidity each jar measured", () => {
  it("equals a direct time-weighted mean over the raw readings of the placement window", async () => {
    const { rows } = await loadHumidityResponse({ labId, trial, options: responseOptions(choice) });
    const row = rows.find((r) => Number.isFinite(r.upper))!;
    const [placement] = await db.select().from(placements).where(eq(placements.id, row.placementId));
    const [jar] = await db.select().from(chambers).where(eq(chambers.id, row.chamberId));
    const from = placement.fromAt!;
    const to = new Date(trial.startedAt!.getTime() + row.upper * 86_400_000);
    const raw = await db.select({ t: readings.takenAt, rh: readings.rhPercent }).from(readings)
      .where(and(eq(readings.chamberId, jar.id), gte(readings.takenAt, from), lte(readings.takenAt, to))).orderBy(asc(readings.takenAt));
    // Each reading holds until the next (step interpolation), the last adds no time; the demo logs every 2 h with no gaps.
    let weighted = 0;
    let span = 0;
    for (let i = 0; i + 1 < raw.length; i++) {
      const dt = raw[i + 1].t.getTime() - raw[i].t.getTime();
      weighted += raw[i].rh * dt;
      span += dt;
    }
    expect(raw.length).toBeGreaterThan(10);
    expect(row.measuredRhPercent).toBeCloseTo(weighted / span, 9);
    expect(Math.abs(row.measuredRhPercent - jar.setpointRhPercent)).toBeLessThan(5);
  });
});
