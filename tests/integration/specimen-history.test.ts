// Specimen history on the real database: entries saved through the action with an audit event each,
// mass change read back against a direct computation, bad input refused at the field with nothing
// saved, another lab's specimen not found, and entries dated inside a blind trial hidden from its
// blind scorer on the page query and in the audit trail.
import { and, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { addSpecimenHistoryAction } from "@/app/_actions/specimen-history";
import { loadHistoryFactors, loadSpecimenHistory } from "@/db/queries/specimen-history";
import { blindTrialIds } from "@/db/queries/trial-access";
import { auditEventForViewer } from "@/lib/trials/access";
import { latestToday } from "@/lib/specimens/history";
import { AKAGANEITE_METHODS, CHLORIDE_METHODS, CHLORIDE_RESULTS } from "@/lib/validation/specimen-history";
import { createTestLab, type TestLab } from "../support/db";
import { addChambers, addSpecimens, addTreatments } from "./trials-fixtures";

let a: TestLab;
let b: TestLab;
let specimenId: string;
let otherLabSpecimenId: string;

const none = new Set<string>();
const rowsOf = async (id: string) => Promise.all([
  db.select().from(s.massMeasurements).where(eq(s.massMeasurements.specimenId, id)),
  db.select().from(s.chlorideTests).where(eq(s.chlorideTests.specimenId, id)),
  db.select().from(s.akaganeiteChecks).where(eq(s.akaganeiteChecks.specimenId, id)),
  db.select().from(s.priorTreatments).where(eq(s.priorTreatments.specimenId, id)),
]).then((all) => all.reduce((n, r) => n + r.length, 0));
const auditCount = async (labId: string) => (await db.select().from(s.auditEvents).where(eq(s.auditEvents.labId, labId))).length;

beforeAll(async () => {
  a = await createTestLab("History A");
  b = await createTestLab("History B");
  [{ id: specimenId }] = await addSpecimens(a, { "iron-meteorite": 1 });
  [{ id: otherLabSpecimenId }] = await addSpecimens(b, { "iron-meteorite": 1 });
});
afterAll(() => closeDb());

describe("specimen history", () => {
  it("saves weighings in g and mg and reads back the mass change of a direct computation", async () => {
    const add = (input: Record<string, string>) => addSpecimenHistoryAction.withIdentity(a.as("researcher"), { specimenId, ...input });
    expect(await add({ kind: "mass", measuredOn: "2026-01-01", mass: "12.3456", unit: "g" })).toMatchObject({ ok: true });
    expect(await add({ kind: "mass", measuredOn: "2026-01-31", mass: "12350.1", unit: "mg", notes: "after wash" })).toMatchObject({ ok: true });
    expect(await add({ kind: "chloride", testedOn: "2026-01-10", method: "silver-nitrate-spot", result: "present" })).toMatchObject({ ok: true });
    expect(await add({ kind: "akaganeite", checkedOn: "2026-01-10", method: "microscope", seen: "yes" })).toMatchObject({ ok: true });
    expect(await add({ kind: "treatment", treatedOn: "2026-01-12", treatment: "alkaline sulphite wash, 3 weeks" })).toMatchObject({ ok: true });

    const h = await loadSpecimenHistory({ labId: a.labId, specimenId, blindTrialIds: none });
    expect(h.weighings.map((w) => w.massG)).toEqual(["12.3456", "12.3501"]); // numeric(12,4) keeps 0.1 mg exactly
    // Direct: (12.3501 − 12.3456) g = 0.0045 g over 30 days (1 → 31 January); 0.0045 / 12.3456 × 100 %.
    expect(h.weighings[1].sinceFirst).toMatchObject({ days: 30, changeG: 0.0045 });
    expect(h.weighings[1].sinceFirst!.changePercent).toBeCloseTo(0.0045 / 12.3456 * 100, 10);
    expect(h.weighings[1].sinceFirst!.gPerDay).toBeCloseTo(0.0045 / 30, 12);
    expect(h).toMatchObject({ chlorideState: "present", akaganeiteSeen: true, hidden: 0 });
    expect(h.priorTreatments[0].treatment).toBe("alkaline sulphite wash, 3 weeks");
    const audits = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, a.labId), inArray(s.auditEvents.entity, ["mass_measurement", "chloride_test", "akaganeite_check", "prior_treatment"])));
    expect(audits).toHaveLength(5);

    const factors = await loadHistoryFactors({ labId: a.labId, specimenIds: [specimenId] });
    expect(factors.get(specimenId)).toEqual({ chlorideState: "present", akaganeiteSeen: true, initialMassG: 12.3456 });
    expect((await loadHistoryFactors({ labId: a.labId, specimenIds: [specimenId], before: "2026-01-05" })).get(specimenId))
      .toEqual({ chlorideState: "untested", akaganeiteSeen: null, initialMassG: 12.3456 });
  });

  it("refuses a wrong unit, a negative mass, a future date and an unknown method at the field, saving nothing", async () => {
    const tomorrowEverywhere = new Date(Date.parse(`${latestToday()}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
    const before = [await rowsOf(specimenId), await auditCount(a.labId)];
    const cases: [Record<string, string>, string, RegExp][] = [
      [{ kind: "mass", measuredOn: "2026-01-02", mass: "12.3", unit: "oz" }, "unit", /g or mg/],
      [{ kind: "mass", measuredOn: "2026-01-02", mass: "-12.3", unit: "g" }, "mass", /number only/],
      [{ kind: "mass", measuredOn: "2026-01-02", mass: "12.34567", unit: "g" }, "mass", /0\.1 mg/],
      [{ kind: "mass", measuredOn: tomorrowEverywhere, mass: "12.3", unit: "g" }, "measuredOn", /future/],
      [{ kind: "chloride", testedOn: "2026-01-02", method: "smell", result: "present" }, "method", /Choose a method/],
      [{ kind: "akaganeite", checkedOn: tomorrowEverywhere, method: "raman", seen: "no" }, "checkedOn", /future/],
    ];
    for (const [input, field, message] of cases) {
      const r = await addSpecimenHistoryAction.withIdentity(a.as("researcher"), { specimenId, ...input });
      expect(r.ok, JSON.stringify(input)).toBe(false);
      expect(r.code).toBe("invalid");
      expect(r.errors?.[field]?.join(" "), JSON.stringify(input)).toMatch(message);
      expect(r.values?.[field]).toBe(input[field]); // what was typed comes back to the form
    }
    expect([await rowsOf(specimenId), await auditCount(a.labId)]).toEqual(before);
  });

  it("stores every method and result the form offers (the database checks the same lists)", async () => {
    const [spec] = await addSpecimens(a, { "stony-iron": 1 });
    for (const [i, method] of CHLORIDE_METHODS.entries()) {
      const r = await addSpecimenHistoryAction.withIdentity(a.as("lead"), { specimenId: spec.id, kind: "chloride", testedOn: "2026-01-02", method, result: CHLORIDE_RESULTS[i % CHLORIDE_RESULTS.length] });
      expect(r.ok, `${method}: ${r.message}`).toBe(true);
    }
    for (const method of AKAGANEITE_METHODS) {
      const r = await addSpecimenHistoryAction.withIdentity(a.as("lead"), { specimenId: spec.id, kind: "akaganeite", checkedOn: "2026-01-02", method, seen: "no" });
      expect(r.ok, `${method}: ${r.message}`).toBe(true);
    }
    expect(await rowsOf(spec.id)).toBe(CHLORIDE_METHODS.length + AKAGANEITE_METHODS.length);
  });

  it("does not write to another lab's specimen; a technician records bench measurements but not an earlier treatment; an observer nothing", async () => {
    const r = await addSpecimenHistoryAction.withIdentity(a.as("researcher"), { specimenId: otherLabSpecimenId, kind: "mass", measuredOn: "2026-01-02", mass: "1", unit: "g" });
    expect(r).toMatchObject({ ok: false, code: "not-found" });
    expect(await rowsOf(otherLabSpecimenId)).toBe(0);
    const before = await rowsOf(specimenId);
    const observer = await addSpecimenHistoryAction.withIdentity(a.as("observer"), { specimenId, kind: "mass", measuredOn: "2026-01-02", mass: "1", unit: "g" });
    expect(observer).toMatchObject({ ok: false, code: "forbidden" });
    const treatment = await addSpecimenHistoryAction.withIdentity(a.as("technician"), { specimenId, kind: "treatment", treatedOn: "2026-01-02", treatment: "Tannic acid" });
    expect(treatment).toMatchObject({ ok: false, code: "forbidden" });
    expect(await rowsOf(specimenId)).toBe(before);
    const weighing = await addSpecimenHistoryAction.withIdentity(a.as("technician"), { specimenId, kind: "mass", measuredOn: "2026-01-02", mass: "1.2345", unit: "g" });
    expect(weighing.ok, weighing.message).toBe(true);
    const test = await addSpecimenHistoryAction.withIdentity(a.as("technician"), { specimenId, kind: "chloride", testedOn: "2026-01-02", method: CHLORIDE_METHODS[0], result: CHLORIDE_RESULTS[0] });
    expect(test.ok, test.message).toBe(true);
    expect(await rowsOf(specimenId)).toBe(before + 2);
  });

  it("hides entries dated from the specimen's entry into a trial from that trial's blind scorer, page and audit trail alike", async () => {
    const [spec] = await addSpecimens(a, { "archaeological-iron": 1 });
    const [chamberId] = await addChambers(a, 1);
    const [treatmentId] = await addTreatments(a, ["wax coating"]);
    const [trial] = await db.insert(s.trials).values({ labId: a.labId, title: "Blind wax", question: "Does wax delay rust?", status: "running", schedulePlan: { kind: "custom", days: [0, 7] } }).returning();
    await db.insert(s.trialMembers).values({ labId: a.labId, trialId: trial.id, userId: a.users.technician.id, role: "scorer", blind: true });
    await db.insert(s.placements).values({ labId: a.labId, trialId: trial.id, specimenId: spec.id, chamberId, treatmentId, fromAt: new Date("2026-02-01T09:00:00Z") });
    const add = (input: Record<string, string>) => addSpecimenHistoryAction.withIdentity(a.as("researcher"), { specimenId: spec.id, ...input });
    await add({ kind: "treatment", treatedOn: "2025-06-01", treatment: "tannic acid, 2 coats" }); // before the trial: history
    await add({ kind: "mass", measuredOn: "2026-01-20", mass: "4.1000", unit: "g" });
    await add({ kind: "mass", measuredOn: "2026-02-15", mass: "4.1350", unit: "g" }); // during the trial: could show the coating

    const blind = await blindTrialIds({ labId: a.labId, userId: a.users.technician.id });
    expect(blind.has(trial.id)).toBe(true);
    const seenBlind = await loadSpecimenHistory({ labId: a.labId, specimenId: spec.id, blindTrialIds: blind });
    expect(seenBlind.weighings.map((w) => w.measuredOn)).toEqual(["2026-01-20"]);
    expect(seenBlind.priorTreatments.map((t) => t.treatment)).toEqual(["tannic acid, 2 coats"]);
    expect(seenBlind.hidden).toBe(1);
    expect(JSON.stringify(seenBlind)).not.toContain("4.135");
    const open = await loadSpecimenHistory({ labId: a.labId, specimenId: spec.id, blindTrialIds: await blindTrialIds({ labId: a.labId, userId: a.users.researcher.id }) });
    expect(open.weighings.map((w) => w.massG)).toEqual(["4.1000", "4.1350"]);

    const events = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, a.labId), eq(s.auditEvents.entity, "mass_measurement")));
    const during = events.find((e) => (e.summary ?? "").includes("4.1350"))!;
    const before = events.find((e) => (e.summary ?? "").includes("4.1000"))!;
    expect(during.trialId).toBe(trial.id);
    expect(before.trialId).toBeNull();
    expect(auditEventForViewer(during, { userId: a.users.technician.id, blindTrialIds: blind })).toMatchObject({ hidden: true, after: null });
    expect(auditEventForViewer(before, { userId: a.users.technician.id, blindTrialIds: blind }).hidden).toBe(false);
  });
});
