// Correcting and deleting a wrong specimen-history entry on the real database: the row and its audit
// event change together, a delete needs a reason (kept in the trail), bad input is refused at the
// field with nothing changed, another lab's entry is not found, and a blind scorer cannot touch an
// entry hidden from them.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { addSpecimenHistoryAction, deleteSpecimenHistoryAction, updateSpecimenHistoryAction } from "@/app/_actions/specimen-history";
import { createTestLab, TEST_PASSWORD, type TestLab } from "../support/db";
import { signedInClient } from "../support/http";
import { addChambers, addSpecimens, addTreatments } from "./trials-fixtures";

let a: TestLab;
let b: TestLab;
let specimenId: string;

const add = async (input: Record<string, string>, lab = a, id = specimenId) => {
  const r = await addSpecimenHistoryAction.withIdentity(lab.as("researcher"), { specimenId: id, ...input });
  expect(r.ok, r.message).toBe(true);
  return (r.data as { id: string }).id;
};
const auditOf = (entityId: string) => db.select().from(s.auditEvents).where(eq(s.auditEvents.entityId, entityId));

beforeAll(async () => {
  a = await createTestLab("History edit A");
  b = await createTestLab("History edit B");
  [{ id: specimenId }] = await addSpecimens(a, { "iron-meteorite": 1 });
});
afterAll(() => closeDb());

describe("correcting specimen history", () => {
  it("corrects a weighing in place, with before and after in one audit event", async () => {
    const id = await add({ kind: "mass", measuredOn: "2026-01-02", mass: "12.3465", unit: "g" });
    const r = await updateSpecimenHistoryAction.withIdentity(a.as("researcher"), { specimenId, entryId: id, kind: "mass", measuredOn: "2026-01-03", mass: "12345.6", unit: "mg", notes: "digits swapped" });
    expect(r, r.message).toMatchObject({ ok: true });
    const [row] = await db.select().from(s.massMeasurements).where(eq(s.massMeasurements.id, id));
    expect(row).toMatchObject({ measuredOn: "2026-01-03", massG: "12.3456", notes: "digits swapped" }); // 12345.6 mg = 12.3456 g
    const update = (await auditOf(id)).find((e) => e.action === "update")!;
    expect(update.before).toMatchObject({ massG: "12.3465", measuredOn: "2026-01-02" });
    expect(update.after).toMatchObject({ massG: "12.3456", measuredOn: "2026-01-03" });
  });

  it("refuses bad input at the field and changes nothing", async () => {
    const id = await add({ kind: "chloride", testedOn: "2026-01-02", method: "chloride-strip", result: "absent" });
    const r = await updateSpecimenHistoryAction.withIdentity(a.as("researcher"), { specimenId, entryId: id, kind: "chloride", testedOn: "2999-01-01", method: "chloride-strip", result: "maybe" });
    expect(r).toMatchObject({ ok: false, code: "invalid" });
    expect(Object.keys(r.errors ?? {}).sort()).toEqual(["result", "testedOn"]);
    const [row] = await db.select().from(s.chlorideTests).where(eq(s.chlorideTests.id, id));
    expect(row).toMatchObject({ testedOn: "2026-01-02", result: "absent" });
    expect((await auditOf(id)).map((e) => e.action)).toEqual(["create"]);
  });

  it("deletes only with a reason, and the trail keeps the row and the reason", async () => {
    const id = await add({ kind: "treatment", treatedOn: "2025-05-01", treatment: "entered on the wrong specimen" });
    const noReason = await deleteSpecimenHistoryAction.withIdentity(a.as("researcher"), { specimenId, entryId: id, kind: "treatment", reason: " " });
    expect(noReason).toMatchObject({ ok: false, code: "invalid", errors: { reason: ["Say why this entry is deleted (at least 3 characters)."] } });
    expect(await db.select().from(s.priorTreatments).where(eq(s.priorTreatments.id, id))).toHaveLength(1);
    const r = await deleteSpecimenHistoryAction.withIdentity(a.as("researcher"), { specimenId, entryId: id, kind: "treatment", reason: "belongs to the next slice" });
    expect(r, r.message).toMatchObject({ ok: true });
    expect(await db.select().from(s.priorTreatments).where(eq(s.priorTreatments.id, id))).toHaveLength(0);
    const del = (await auditOf(id)).find((e) => e.action === "delete")!;
    expect(del.summary).toMatch(/deleted: belongs to the next slice$/);
    expect(del.before).toMatchObject({ treatment: "entered on the wrong specimen" });
  });

  it("does not find another lab's entry, nor an entry under the wrong kind; observers change nothing, technicians only bench measurements", async () => {
    const [{ id: otherSpecimen }] = await addSpecimens(b, { "iron-meteorite": 1 });
    const theirs = await add({ kind: "akaganeite", checkedOn: "2026-01-02", method: "visual", seen: "no" }, b, otherSpecimen);
    const cross = await deleteSpecimenHistoryAction.withIdentity(a.as("lead"), { specimenId: otherSpecimen, entryId: theirs, kind: "akaganeite", reason: "not ours" });
    expect(cross).toMatchObject({ ok: false, code: "not-found" });
    const wrongKind = await deleteSpecimenHistoryAction.withIdentity(b.as("lead"), { specimenId: otherSpecimen, entryId: theirs, kind: "chloride", reason: "wrong kind" });
    expect(wrongKind).toMatchObject({ ok: false, code: "not-found" });
    expect(await db.select().from(s.akaganeiteChecks).where(eq(s.akaganeiteChecks.id, theirs))).toHaveLength(1);
    const observer = await deleteSpecimenHistoryAction.withIdentity(b.as("observer"), { specimenId: otherSpecimen, entryId: theirs, kind: "akaganeite", reason: "try" });
    expect(observer).toMatchObject({ ok: false, code: "forbidden" });
    // An earlier treatment is the specimen's record (specimens.write); a technician may not change it.
    const treated = await add({ kind: "treatment", treatedOn: "2025-11-02", treatment: "Tannic acid" }, b, otherSpecimen);
    const treatment = await deleteSpecimenHistoryAction.withIdentity(b.as("technician"), { specimenId: otherSpecimen, entryId: treated, kind: "treatment", reason: "try" });
    expect(treatment).toMatchObject({ ok: false, code: "forbidden" });
    expect(await db.select().from(s.priorTreatments).where(eq(s.priorTreatments.id, treated))).toHaveLength(1);
    // The check is a bench measurement: the technician who made it may correct it.
    const fixed = await updateSpecimenHistoryAction.withIdentity(b.as("technician"), { specimenId: otherSpecimen, entryId: theirs, kind: "akaganeite", checkedOn: "2026-01-03", method: "visual", seen: "yes" });
    expect(fixed.ok, fixed.message).toBe(true);
    expect((await db.select().from(s.akaganeiteChecks).where(eq(s.akaganeiteChecks.id, theirs)))[0].seen).toBe(true);
  });

  it("a blind scorer cannot correct or delete an entry dated inside the trial they score blind", async () => {
    const [spec] = await addSpecimens(a, { "archaeological-iron": 1 });
    const [chamberId] = await addChambers(a, 1);
    const [treatmentId] = await addTreatments(a, ["wax coating"]);
    const [trial] = await db.insert(s.trials).values({ labId: a.labId, title: "Blind edit", question: "Does wax delay rust?", status: "running", schedulePlan: { kind: "custom", days: [0, 7] } }).returning();
    await db.insert(s.trialMembers).values({ labId: a.labId, trialId: trial.id, userId: a.users.lead.id, role: "scorer", blind: true });
    await db.insert(s.placements).values({ labId: a.labId, trialId: trial.id, specimenId: spec.id, chamberId, treatmentId, fromAt: new Date("2026-02-01T09:00:00Z") });
    const before = await add({ kind: "mass", measuredOn: "2026-01-20", mass: "4.1000", unit: "g" }, a, spec.id);
    const during = await add({ kind: "mass", measuredOn: "2026-02-15", mass: "4.1350", unit: "g" }, a, spec.id);
    const asLead = (entryId: string, mass: string) => updateSpecimenHistoryAction.withIdentity(a.as("lead"), { specimenId: spec.id, entryId, kind: "mass", measuredOn: "2026-01-20", mass, unit: "g" });
    expect(await asLead(during, "4.1351")).toMatchObject({ ok: false, code: "not-found" });
    expect(await deleteSpecimenHistoryAction.withIdentity(a.as("lead"), { specimenId: spec.id, entryId: during, kind: "mass", reason: "peek" })).toMatchObject({ ok: false, code: "not-found" });
    expect((await asLead(before, "4.1001")).ok).toBe(true); // history before the trial stays theirs to correct
    const rows = await db.select().from(s.massMeasurements).where(and(eq(s.massMeasurements.specimenId, spec.id)));
    expect(rows.map((r) => r.massG).sort()).toEqual(["4.1001", "4.1350"]);
    // Someone not blind moves the in-trial weighing to before the trial: the event holds the old row,
    // so it stays with the trial (hidden from its blind scorers in the audit trail).
    const moved = await updateSpecimenHistoryAction.withIdentity(a.as("researcher"), { specimenId: spec.id, entryId: during, kind: "mass", measuredOn: "2026-01-25", mass: "4.1350", unit: "g" });
    expect(moved.ok, moved.message).toBe(true);
    expect((await auditOf(during)).find((e) => e.action === "update")!.trialId).toBe(trial.id);

    // The specimen page over HTTP: the correction form for an entry the viewer sees, none for one hidden from them.
    const page = async (role: "researcher" | "lead" | "observer", entryId: string) =>
      (await (await signedInClient(a.users[role].email, TEST_PASSWORD)).fetch(`/specimens/${spec.id}?entry=mass:${entryId}`)).text();
    const researcherView = await page("researcher", before);
    expect(researcherView).toContain("Correct the entry");
    expect(researcherView).toContain("4.1001");
    expect(researcherView).toContain("Why delete this entry?");
    const secondWeighing = await add({ kind: "mass", measuredOn: "2026-02-20", mass: "4.2222", unit: "g" }, a, spec.id);
    const blindView = await page("lead", secondWeighing); // the lead scores this trial blind
    expect(blindView).not.toContain("Correct the entry");
    expect(blindView).not.toContain("4.2222");
    expect(await page("observer", before)).not.toContain("Correct or delete");
  });
});
