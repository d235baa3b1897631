// Trials on the real database: design → allocation → start (placements + schedule) → conclusion and
// the lock, with role refusals and tenant isolation checked through the same actions the pages use.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { getTrial } from "@/db/queries/trial-access";
import { listInspections } from "@/db/queries/inspections";
import {
  addNoteAction, allocateAction, concludeTrialAction, createTrialAction, moveSpecimenAction, startTrialAction, swapAction,
  updateProtocolAction, updateScorersAction, updateTechniciansAction, updateTrialAction,
} from "@/app/_actions/trials";
import { recordInspectionAction, rescheduleInspectionAction } from "@/app/_actions/inspections";
import { planDays } from "@/lib/schedule/plans";
import { createTestLab, type TestLab } from "../support/db";
import { addChambers, addSpecimens, addTreatments, designInput } from "./trials-fixtures";

const DAY = 86_400_000;
let a: TestLab;
let b: TestLab;
let chamberIds: string[];
let treatmentIds: string[];
let specimenIds: string[];

beforeAll(async () => {
  a = await createTestLab("Trials A");
  b = await createTestLab("Trials B");
  chamberIds = await addChambers(a, 2);
  treatmentIds = await addTreatments(a, ["Bare control", "Wax"]);
  specimenIds = (await addSpecimens(a, { "iron-meteorite": 6, "stony-iron": 4 })).map((r) => r.id);
});
afterAll(() => closeDb());

async function draft(over: Record<string, unknown> = {}) {
  const r = await createTrialAction.withIdentity(a.as("researcher"), designInput({ chamberIds, treatmentIds, technicianIds: [a.users.technician.id], ...over }));
  expect(r.ok, r.message).toBe(true);
  return (r.data as { id: string }).id;
}

/** A running trial with its own specimens (a specimen sits in one running trial at a time). */
async function running() {
  const trialId = await draft({ replicatesPerArm: 1 });
  const own = (await addSpecimens(a, { "iron-meteorite": 3, "stony-iron": 2 })).map((r) => r.id);
  expect((await allocateAction.withIdentity(a.as("researcher"), { trialId, "specimenIds[]": own, seed: "s1", blockByMaterial: "on" })).ok).toBe(true);
  const start = await startTrialAction.withIdentity(a.as("researcher"), { trialId, startAt: "" });
  expect(start.ok, start.message).toBe(true);
  return trialId;
}

describe("trial lifecycle", () => {
  it("start turns the allocation into placements from the start and the plan into inspections", async () => {
    const trialId = await draft({ planKind: "fixed", intervalDays: "3", fixedCount: "5" });
    const alloc = await allocateAction.withIdentity(a.as("researcher"), { trialId, "specimenIds[]": specimenIds, seed: "start-test", blockByMaterial: "on" });
    expect(alloc.ok, alloc.message).toBe(true);
    const startAt = new Date(Date.now() + DAY);
    startAt.setUTCHours(9, 0, 0, 0);
    const r = await startTrialAction.withIdentity(a.as("researcher"), { trialId, startAt: startAt.toISOString().slice(0, 16) });
    expect(r.ok, r.message).toBe(true);

    const t = await getTrial({ labId: a.labId, trialId });
    expect(t?.status).toBe("running");
    expect(t?.startedAt?.toISOString()).toBe(startAt.toISOString());
    const placed = await db.select().from(s.placements).where(eq(s.placements.trialId, trialId));
    // 2 chambers × 2 treatments × 2 replicates = 8 of the 10 specimens.
    expect(placed).toHaveLength(8);
    expect(placed.every((p) => p.fromAt?.getTime() === startAt.getTime() && p.toAt === null)).toBe(true);
    const insp = await db.select().from(s.inspections).where(eq(s.inspections.trialId, trialId));
    expect(insp.map((i) => i.dayNumber).sort((x, y) => x - y)).toEqual([0, 3, 6, 9, 12]);
    for (const i of insp) expect(i.plannedAt.getTime()).toBe(startAt.getTime() + i.dayNumber * DAY);
    expect(planDays({ kind: "fixed", intervalDays: 3, count: 5 })).toHaveLength(insp.length);

    // Running: the design is fixed, moves need a reason and close the old placement.
    const edit = await updateTrialAction.withIdentity(a.as("researcher"), { trialId, ...designInput({ chamberIds, treatmentIds }) });
    expect(edit).toMatchObject({ ok: false });
    expect(edit.message).toMatch(/fixed once a trial is running/);
  });

  it("moving a specimen closes one placement and opens another, with the reason", async () => {
    const trialId = await running();
    const [open] = await db.select().from(s.placements).where(eq(s.placements.trialId, trialId)).limit(1);
    const arms = await db.select().from(s.trialArms).where(eq(s.trialArms.trialId, trialId));
    const target = arms.find((x) => x.id !== open.armId)!;
    const noReason = await moveSpecimenAction.withIdentity(a.as("researcher"), { trialId, specimenId: open.specimenId, armId: target.id, reason: "" });
    expect(noReason.errors?.reason?.[0]).toMatch(/reason/i);
    const at = new Date(Date.now() + 60_000);
    const moved = await moveSpecimenAction.withIdentity(a.as("researcher"), { trialId, specimenId: open.specimenId, armId: target.id, at: at.toISOString(), reason: "Jar lid cracked" });
    expect(moved.ok, moved.message).toBe(true);
    const history = await db.select().from(s.placements).where(and(eq(s.placements.trialId, trialId), eq(s.placements.specimenId, open.specimenId)));
    expect(history).toHaveLength(2);
    expect(history.find((h) => h.id === open.id)?.toAt?.getTime()).toBe(at.getTime());
    expect(history.find((h) => h.id !== open.id)).toMatchObject({ armId: target.id, reason: "Jar lid cracked", toAt: null });
  });

  it("a concluded trial refuses every write except appended notes, and keeps its audit trail", async () => {
    const trialId = await running();
    const [insp] = await db.select().from(s.inspections).where(eq(s.inspections.trialId, trialId)).limit(1);
    const [pl] = await db.select().from(s.placements).where(eq(s.placements.trialId, trialId)).limit(1);
    expect((await concludeTrialAction.withIdentity(a.as("researcher"), { trialId })).ok).toBe(false); // lead only
    const done = await concludeTrialAction.withIdentity(a.as("lead"), { trialId, note: "Stopped at day 12 as planned." });
    expect(done.ok, done.message).toBe(true);
    const openPlacements = await db.select().from(s.placements).where(eq(s.placements.trialId, trialId));
    expect(openPlacements.every((p) => p.toAt !== null)).toBe(true);

    const auditBefore = await db.select().from(s.auditEvents).where(eq(s.auditEvents.entityId, trialId));
    const attempts = [
      updateTrialAction.withIdentity(a.as("lead"), { trialId, ...designInput({ chamberIds, treatmentIds }) }),
      allocateAction.withIdentity(a.as("lead"), { trialId, "specimenIds[]": specimenIds, seed: "x", blockByMaterial: "on" }),
      swapAction.withIdentity(a.as("lead"), { trialId, specimenA: specimenIds[0], specimenB: specimenIds[1], reason: "testing the lock" }),
      startTrialAction.withIdentity(a.as("lead"), { trialId }),
      concludeTrialAction.withIdentity(a.as("lead"), { trialId }),
      moveSpecimenAction.withIdentity(a.as("lead"), { trialId, specimenId: pl.specimenId, armId: "", reason: "testing the lock" }),
      updateScorersAction.withIdentity(a.as("lead"), { trialId, scorersIncluded: "1", "scorerIds[]": [a.users.technician.id], scoreRule: "consensus" }),
      updateTechniciansAction.withIdentity(a.as("lead"), { trialId, "technicianIds[]": [a.users.researcher.id] }),
      updateProtocolAction.withIdentity(a.as("lead"), { trialId, "photoProtocol[]": ["Changed"] }),
      recordInspectionAction.withIdentity(a.as("lead"), { inspectionId: insp.id }),
      rescheduleInspectionAction.withIdentity(a.as("lead"), { inspectionId: insp.id, plannedAt: new Date(Date.now() + DAY).toISOString(), reason: "testing the lock" }),
    ];
    for (const r of await Promise.all(attempts)) {
      expect(r.ok).toBe(false);
      expect(r.message).toMatch(/concluded .*locked\. Only notes can be added\./);
    }
    const note = await addNoteAction.withIdentity(a.as("technician"), { trialId, body: "Photos re-checked after the conclusion." });
    expect(note.ok, note.message).toBe(true);
    const notes = await db.select().from(s.trialNotes).where(eq(s.trialNotes.trialId, trialId));
    expect(notes.map((n) => n.body)).toEqual(expect.arrayContaining(["Stopped at day 12 as planned.", "Photos re-checked after the conclusion."]));
    const auditAfter = await db.select().from(s.auditEvents).where(eq(s.auditEvents.entityId, trialId));
    expect(auditAfter).toHaveLength(auditBefore.length); // refused writes left no trace, earlier events intact
    const [t] = await db.select().from(s.trials).where(eq(s.trials.id, trialId));
    expect(t.status).toBe("concluded");
  });

  it("inspections: technicians record, only design roles reschedule (with a reason that clears reminders)", async () => {
    const trialId = await running();
    const list = await listInspections({ labId: a.labId, trialId, status: "open" });
    const [first, second] = list.rows;
    const obs = await recordInspectionAction.withIdentity(a.as("observer"), { inspectionId: first.id });
    expect(obs.ok).toBe(false);
    const rec = await recordInspectionAction.withIdentity(a.as("technician"), { inspectionId: first.id, notes: "Two spots on the rind side." });
    expect(rec.ok, rec.message).toBe(true);
    const again = await recordInspectionAction.withIdentity(a.as("technician"), { inspectionId: first.id });
    expect(again.message).toMatch(/already marked done/);
    const techMove = await rescheduleInspectionAction.withIdentity(a.as("technician"), { inspectionId: second.id, plannedAt: new Date(Date.now() + 2 * DAY).toISOString(), reason: "Lab closed that day" });
    expect(techMove.ok).toBe(false);
    await db.insert(s.reminderLog).values({ inspectionId: second.id, userId: a.users.technician.id, kind: "day-before" });
    const target = new Date(Date.now() + 2 * DAY);
    const moved = await rescheduleInspectionAction.withIdentity(a.as("researcher"), { inspectionId: second.id, plannedAt: target.toISOString(), reason: "Lab closed that day" });
    expect(moved.ok, moved.message).toBe(true);
    const [row] = await db.select().from(s.inspections).where(eq(s.inspections.id, second.id));
    expect(row.rescheduleReason).toBe("Lab closed that day");
    expect(Math.abs(row.plannedAt.getTime() - target.getTime())).toBeLessThan(1000);
    expect(await db.select().from(s.reminderLog).where(eq(s.reminderLog.inspectionId, second.id))).toHaveLength(0);
    const done = await listInspections({ labId: a.labId, trialId, status: "done" });
    expect(done.rows.map((r) => r.id)).toEqual([first.id]);
  });
});

describe("roles", () => {
  it("observers and technicians cannot design, allocate, start, swap or move; researchers cannot conclude or assign scorers", async () => {
    const trialId = await draft();
    const design = designInput({ chamberIds, treatmentIds });
    for (const role of ["observer", "technician"] as const) {
      const who = a.as(role);
      const results = await Promise.all([
        createTrialAction.withIdentity(who, design),
        updateTrialAction.withIdentity(who, { trialId, ...design }),
        allocateAction.withIdentity(who, { trialId, "specimenIds[]": specimenIds, seed: "x", blockByMaterial: "on" }),
        swapAction.withIdentity(who, { trialId, specimenA: specimenIds[0], specimenB: specimenIds[1], reason: "not allowed" }),
        startTrialAction.withIdentity(who, { trialId }),
        moveSpecimenAction.withIdentity(who, { trialId, specimenId: specimenIds[0], armId: "", reason: "not allowed" }),
        updateTechniciansAction.withIdentity(who, { trialId, "technicianIds[]": [] }),
        updateProtocolAction.withIdentity(who, { trialId, "photoProtocol[]": ["x"] }),
        concludeTrialAction.withIdentity(who, { trialId }),
        updateScorersAction.withIdentity(who, { trialId, scorersIncluded: "1", "scorerIds[]": [], scoreRule: "consensus" }),
      ]);
      for (const r of results) expect({ role, ok: r.ok, message: r.message }).toEqual({ role, ok: false, message: `Your role (${role}) does not allow this.` });
    }
    expect((await addNoteAction.withIdentity(a.as("observer"), { trialId, body: "hello" })).ok).toBe(false);
    expect((await addNoteAction.withIdentity(a.as("technician"), { trialId, body: "hello" })).ok).toBe(true);

    const researcherScorers = await updateScorersAction.withIdentity(a.as("researcher"), { trialId, scorersIncluded: "1", "scorerIds[]": [a.users.technician.id], scoreRule: "consensus" });
    expect(researcherScorers.ok).toBe(false);
    // A researcher's design form cannot smuggle scorers in either.
    const smuggled = await createTrialAction.withIdentity(a.as("researcher"), { ...design, scorersIncluded: "1", "scorerIds[]": [a.users.technician.id], scoreRule: "consensus" });
    expect(smuggled.ok).toBe(false);
    expect(smuggled.message).toMatch(/Only a lab lead assigns scorers/);
    const lead = await updateScorersAction.withIdentity(a.as("lead"), { trialId, scorersIncluded: "1", "scorerIds[]": [a.users.technician.id, a.users.researcher.id], "blindScorerIds[]": [a.users.researcher.id], scoreRule: "primary-scorer", primaryScorerId: a.users.technician.id });
    expect(lead.ok, lead.message).toBe(true);
    const members = await db.select().from(s.trialMembers).where(and(eq(s.trialMembers.trialId, trialId), eq(s.trialMembers.role, "scorer")));
    expect(members.map((m) => [m.userId, m.blind]).sort()).toEqual([[a.users.researcher.id, true], [a.users.technician.id, false]].sort());
    // A lead's design form sets scorers, blind flags and the primary scorer in one go.
    const byLead = await createTrialAction.withIdentity(a.as("lead"), { ...design, scorersIncluded: "1", "scorerIds[]": [a.users.technician.id, a.users.lead.id], "blindScorerIds[]": [a.users.lead.id], scoreRule: "primary-scorer", primaryScorerId: a.users.technician.id });
    expect(byLead.ok, byLead.message).toBe(true);
    const leadTrial = (byLead.data as { id: string }).id;
    const [lt] = await db.select().from(s.trials).where(eq(s.trials.id, leadTrial));
    expect(lt).toMatchObject({ scoreRule: "primary-scorer", primaryScorerId: a.users.technician.id });
    const leadScorers = await db.select().from(s.trialMembers).where(and(eq(s.trialMembers.trialId, leadTrial), eq(s.trialMembers.role, "scorer")));
    expect(leadScorers.map((m) => [m.userId, m.blind]).sort()).toEqual([[a.users.lead.id, true], [a.users.technician.id, false]].sort());
    const noPrimary = await createTrialAction.withIdentity(a.as("lead"), { ...design, scorersIncluded: "1", "scorerIds[]": [a.users.technician.id], scoreRule: "primary-scorer", primaryScorerId: "" });
    expect(noPrimary.errors?.primaryScorerId).toEqual(["Choose the primary scorer, or use consensus."]);
    // Observers cannot be given trial work.
    const observerTech = await updateTechniciansAction.withIdentity(a.as("researcher"), { trialId, "technicianIds[]": [a.users.observer.id] });
    expect(observerTech.ok).toBe(false);
  });
});

describe("tenant isolation", () => {
  it("another lab's trial, inspection and chambers are not found from lab B", async () => {
    const trialId = await running();
    const [insp] = await db.select().from(s.inspections).where(eq(s.inspections.trialId, trialId)).limit(1);
    await expect(getTrial({ labId: b.labId, trialId })).rejects.toMatchObject({ code: "not-found" });
    const results = await Promise.all([
      updateTechniciansAction.withIdentity(b.as("lead"), { trialId, "technicianIds[]": [] }),
      addNoteAction.withIdentity(b.as("lead"), { trialId, body: "from another lab" }),
      concludeTrialAction.withIdentity(b.as("lead"), { trialId }),
      recordInspectionAction.withIdentity(b.as("lead"), { inspectionId: insp.id }),
      rescheduleInspectionAction.withIdentity(b.as("lead"), { inspectionId: insp.id, plannedAt: new Date().toISOString(), reason: "from another lab" }),
    ]);
    for (const r of results) expect(r).toMatchObject({ ok: false, message: expect.stringMatching(/^No such (trial|inspection) in this lab\.$/) });
    expect((await listInspections({ labId: b.labId, trialId })).rows).toHaveLength(0);
    // Lab B cannot build a trial from lab A's chambers and treatments either.
    const crossDesign = await createTrialAction.withIdentity(b.as("lead"), designInput({ chamberIds, treatmentIds }));
    expect(crossDesign.ok).toBe(false);
    expect(crossDesign.errors?.chamberIds).toBeDefined();
  });
});
