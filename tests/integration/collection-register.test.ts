// The object register's CSV (the specimen import and export with register columns and a place):
// all or nothing with every problem by line, first places opened in the same transaction, the export
// reads back; and an object in a trial the viewer scores blind has no visible place.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createLocationAction, moveObjectAction } from "@/app/_actions/collection";
import { createSpecimenAction, importSpecimensAction } from "@/app/_actions/specimens";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { currentPlaces, listObjectStays } from "@/db/queries/object-locations";
import { exportSpecimens } from "@/db/queries/specimens";
import { parseSpecimenCsv, specimensToCsv } from "@/lib/validation/specimens";
import { createTestLab, type TestLab } from "../support/db";

let a: TestLab;
const ids: Record<string, string> = {};
const place = (name: string, locationKind: string, parentId = "") => ({ name, locationKind, parentId, kind: "open-shelf", nominalTempC: "18", setpointRhPercent: "45" });
const count = async (table: typeof s.specimens | typeof s.objectLocations) => (await db.select().from(table).where(eq(table.labId, a.labId))).length;

beforeAll(async () => {
  a = await createTestLab("Register");
  for (const [key, input] of [["store", () => place("Store 1", "room")], ["cabA", () => place("Cabinet A", "cabinet", ids.store)],
    ["d1a", () => place("Drawer 1", "drawer", ids.cabA)], ["cabB", () => place("Cabinet B", "cabinet", ids.store)], ["d1b", () => place("Drawer 1", "drawer", ids.cabB)]] as const) {
    const r = await createLocationAction.withIdentity(a.as("lead"), input());
    expect(r.ok, r.message).toBe(true);
    ids[key] = (r.data as { id: string }).id;
  }
  await db.insert(s.specimens).values({ labId: a.labId, label: "OLD-1", materialClass: "other", accessionNumber: "TAR.1990.4" });
});
afterAll(() => closeDb());

describe("register CSV import", () => {
  it("imports nothing when a row is wrong, naming each line and column", async () => {
    const csv = [
      "label,material_class,accession_number,chloride_state,treatments_applied,location", // 1
      "R-1,archaeological iron,TAR.2001.1,present,tannic acid 1998,Store 1 / Cabinet A", // 2 ok
      "R-2,archaeological iron,tar.1990.4,unknown,,Cabinet A", //                           3 accession used in the lab
      "R-3,archaeological iron,TAR.2001.1,,,", //                                            4 accession repeated in the file
      "R-4,iron meteorite,,weeping,,", //                                                    5 unknown chloride state
      "R-5,iron meteorite,,,,Drawer 1", //                                                   6 two drawers named so
      "R-6,iron meteorite,,,,Attic", //                                                      7 no such place
    ].join("\n");
    const before = [await count(s.specimens), await count(s.objectLocations)];
    const r = await importSpecimensAction.withIdentity(a.as("researcher"), { csv });
    expect(r.ok).toBe(false);
    const errors = (r.data as { errors: { line: number; field?: string; message: string }[] }).errors;
    expect(errors.map((e) => [e.line, e.field])).toEqual([[3, "accession_number"], [4, "accession_number"], [5, "chloride_state"], [6, "location"], [7, "location"]]);
    expect(errors[0].message).toBe('Accession number "tar.1990.4" is already used in this lab.');
    expect(errors[3].message).toBe('"Drawer 1" names 2 locations; write the path, e.g. "Store 1 / Cabinet A / Drawer 1".');
    expect([await count(s.specimens), await count(s.objectLocations)]).toEqual(before);
  });

  it("imports a valid file with each object's first place and audit events, in one transaction", async () => {
    const csv = "label,material_class,accession_number,chloride_state,storage_notes,location\n"
      + "R-1,archaeological iron,TAR.2001.1,present,keep below 30 %RH,Store 1 / Cabinet A / Drawer 1\n"
      + "R-2,iron meteorite,TAR.2001.2,not detected,,cabinet b\n"
      + "R-3,iron meteorite,,,,\n";
    const r = await importSpecimensAction.withIdentity(a.as("researcher"), { csv });
    expect(r).toMatchObject({ ok: true, message: "Imported 3 specimens." });
    const rows = await db.select().from(s.specimens).where(and(eq(s.specimens.labId, a.labId)));
    const byLabel = Object.fromEntries(rows.map((x) => [x.label, x]));
    expect([byLabel["R-1"].chlorideState, byLabel["R-2"].chlorideState, byLabel["R-3"].chlorideState]).toEqual(["present", "not-detected", "unknown"]);
    const { places } = await currentPlaces({ labId: a.labId, userId: a.users.observer.id });
    expect([places.get(byLabel["R-1"].id)?.locationId, places.get(byLabel["R-2"].id)?.locationId, places.get(byLabel["R-3"].id)]).toEqual([ids.d1a, ids.cabB, undefined]);
    const audits = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, a.labId), eq(s.auditEvents.entity, "object-location")));
    expect(audits).toHaveLength(2);
  });

  it("keeps accession numbers unique in the lab on the form too, case-insensitively, at the field", async () => {
    const r = await createSpecimenAction.withIdentity(a.as("researcher"), { label: "NEW-9", materialClass: "other", accessionNumber: "tar.2001.2" });
    expect(r).toMatchObject({ ok: false, errors: { accessionNumber: ["This accession number is already used in this lab."] } });
    const ok = await createSpecimenAction.withIdentity(a.as("researcher"), { label: "NEW-9", materialClass: "other", accessionNumber: "", chlorideState: "present" });
    expect(ok.ok, ok.message).toBe(true);
    // The database holds the same rule, so two writers racing past the app's check cannot both win.
    const race = db.insert(s.specimens).values({ labId: a.labId, label: "NEW-10", materialClass: "other", findName: "Race", accessionNumber: "TAR.2001.2".toLowerCase() });
    await expect(race).rejects.toMatchObject({ cause: { code: "23505", constraint: "specimens_lab_accession_idx" } });
  });

  it("exports the register with each place as a path, and the file reads back", async () => {
    const rows = await exportSpecimens({ labId: a.labId, userId: a.users.observer.id });
    const csv = specimensToCsv(rows);
    expect(csv.split("\r\n")[0] ?? csv.split("\n")[0]).toMatch(/accession_number,treatments_applied,chloride_state,storage_notes,location/);
    const back = parseSpecimenCsv(csv);
    expect(back.errors).toEqual([]);
    const r1 = back.rows.find((x) => x.value.label === "R-1")!;
    expect(r1).toMatchObject({ location: "Store 1 / Cabinet A / Drawer 1", value: { accessionNumber: "TAR.2001.1", chlorideState: "present", storageNotes: "keep below 30 %RH" } });
  });
});

describe("blinding", () => {
  it("hides the place and stays of an object in a trial the viewer scores blind, until the trial is concluded", async () => {
    const [obj] = await db.select().from(s.specimens).where(and(eq(s.specimens.labId, a.labId), eq(s.specimens.label, "R-1")));
    const [jar] = await db.insert(s.chambers).values({ labId: a.labId, name: "Arm jar 33", kind: "saturated-salt", saltId: "MgCl2", nominalTempC: 20, setpointRhPercent: 33, toleranceRhPercent: 2 }).returning();
    const [tr] = await db.insert(s.treatments).values({ labId: a.labId, name: "Wax coat", kind: "coating" }).returning();
    const [trial] = await db.insert(s.trials).values({ labId: a.labId, title: "Blind shelf trial", question: "?", status: "running", schedulePlan: { kind: "custom", days: [0] } as never }).returning();
    await db.insert(s.trialMembers).values({ trialId: trial.id, userId: a.users.technician.id, labId: a.labId, role: "scorer", blind: true });
    await db.insert(s.placements).values({ labId: a.labId, trialId: trial.id, specimenId: obj.id, chamberId: jar.id, treatmentId: tr.id, fromAt: new Date("2025-02-01T00:00:00Z") });
    const blindView = await currentPlaces({ labId: a.labId, userId: a.users.technician.id });
    expect(blindView.hidden.has(obj.id)).toBe(true);
    expect(blindView.places.has(obj.id)).toBe(false);
    expect(await listObjectStays({ labId: a.labId, userId: a.users.technician.id, specimenId: obj.id })).toEqual({ hidden: true, stays: [] });
    const exported = await exportSpecimens({ labId: a.labId, userId: a.users.technician.id });
    expect(exported.find((x) => x.id === obj.id)?.location).toBeNull();
    // Others see it; after the conclusion the scorer does too.
    expect((await currentPlaces({ labId: a.labId, userId: a.users.lead.id })).places.get(obj.id)?.locationId).toBe(ids.d1a);
    expect((await currentPlaces({ labId: a.labId, userId: a.users.lead.id })).inTrial.get(obj.id)).toBe("Blind shelf trial");
    // While the trial runs the object moves through the trial, not through the store.
    const during = await moveObjectAction.withIdentity(a.as("lead"), { specimenId: obj.id, locationId: ids.store, at: "2025-03-01T09:00", timeZone: "UTC" });
    expect(during).toMatchObject({ ok: false, errors: { specimenId: ["This object is in a running trial."] } });
    await db.update(s.trials).set({ status: "concluded" }).where(eq(s.trials.id, trial.id));
    expect((await currentPlaces({ labId: a.labId, userId: a.users.technician.id })).places.get(obj.id)?.locationId).toBe(ids.d1a);
    // The imported first place began at the import; a move must come after it (a minute from now is allowed).
    const early = await moveObjectAction.withIdentity(a.as("technician"), { specimenId: obj.id, locationId: ids.store, at: "2025-03-01T09:00", timeZone: "Europe/London" });
    expect(early).toMatchObject({ ok: false, errors: { at: [expect.stringMatching(/after the object arrived/)] } });
    const soon = new Date(Date.now() + 60_000).toISOString().slice(0, 16);
    const r = await moveObjectAction.withIdentity(a.as("technician"), { specimenId: obj.id, locationId: ids.store, at: soon, timeZone: "UTC" });
    expect(r.ok, r.message).toBe(true);
  });
});
