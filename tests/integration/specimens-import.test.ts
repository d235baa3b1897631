// Specimen CSV import on the real database: all or nothing, every problem with the line a text
// editor shows, duplicates inside the file and against the lab reported; export reads back the same.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { createSpecimenAction, importSpecimensAction, updateSpecimenAction } from "@/app/_actions/specimens";
import { exportSpecimens, listSpecimens } from "@/db/queries/specimens";
import { parseSpecimenCsv, specimensToCsv } from "@/lib/validation/specimens";
import { createTestLab, type TestLab } from "../support/db";

let a: TestLab;
let b: TestLab;

beforeAll(async () => {
  a = await createTestLab("Import A");
  b = await createTestLab("Import B");
  await db.insert(s.specimens).values({ labId: a.labId, label: "OLD-1", materialClass: "steel-coupon" });
  await db.insert(s.specimens).values({ labId: b.labId, label: "NEW-3", materialClass: "steel-coupon" });
});
afterAll(() => closeDb());

const count = async (labId: string) => (await db.select().from(s.specimens).where(eq(s.specimens.labId, labId))).length;

describe("specimen CSV import", () => {
  it("imports nothing when any row is wrong and reports each problem by line", async () => {
    const csv = [
      "label,material_class,find_name,mass_g,description", // 1
      "NEW-1,iron meteorite,Corvenlow Tarn,12.5,fine", //        2 ok
      "NEW-2,meteorite,Corvenlow Tarn,3,x", //                  3 unknown class
      "", //                                                   4 blank, skipped
      "NEW-3,stony-iron,Esker Holloway,-4,x", //              5 negative mass
      'NEW-4,chondrite,Velloby Rigg,8,"two', //               6 quoted cell over two lines
      'lines"', //                                             7
      "new-1,steel coupon,,1,repeated label (any case)", //    8 repeats line 2
      "OLD-1,steel coupon,,1,already in the lab", //           9 exists in lab A
      "NEW-5,other,,,", //                                    10 ok (mass optional)
    ].join("\r\n");
    const before = await count(a.labId);
    const r = await importSpecimensAction.withIdentity(a.as("researcher"), { csv });
    expect(r.ok).toBe(false);
    expect(r.message).toMatch(/^Nothing was imported: 4 problems/);
    const errors = (r.data as { errors: { line: number; field?: string; message: string }[] }).errors;
    expect(errors.map((e) => [e.line, e.field])).toEqual([[3, "material_class"], [5, "mass_g"], [8, "label"], [9, "label"]]);
    expect(errors[2].message).toBe('Label "new-1" is repeated (first on line 2).');
    expect(errors[3].message).toBe('Label "OLD-1" already exists in this lab.');
    expect(await count(a.labId)).toBe(before);
    // NEW-3 exists only in lab B: another lab's labels are not this lab's business.
    expect(errors.some((e) => e.message.includes("NEW-3") && /exists/.test(e.message))).toBe(false);
  });

  it("imports every row of a valid file in one go, with an audit event per specimen", async () => {
    const csv = "label,material_class,find_name,face,surface_prep,mass_g,contamination_notes\n"
      + "IMP-1,Iron meteorite,Marrowby Sands,cut face,\"cut, polished\",21.4,\n"
      + "IMP-2,archaeological_iron,Fennick Lowe,,as found,,soil salts; earlier rusting\n";
    const r = await importSpecimensAction.withIdentity(a.as("researcher"), { csv });
    expect(r).toMatchObject({ ok: true, message: "Imported 2 specimens." });
    const { rows } = await listSpecimens({ labId: a.labId, q: "IMP-", sort: "label", dir: "asc", page: 1, pageSize: 25 });
    expect(rows.map((x) => [x.label, x.materialClass, x.surfacePrep, x.massG, x.contaminationNotes])).toEqual([
      ["IMP-1", "iron-meteorite", "cut, polished", 21.4, ""],
      ["IMP-2", "archaeological-iron", "as found", null, "soil salts; earlier rusting"],
    ]);
    const audit = await db.select().from(s.auditEvents).where(eq(s.auditEvents.labId, a.labId));
    expect(audit.filter((e) => e.entity === "specimen" && rows.some((x) => x.id === e.entityId))).toHaveLength(2);
  });

  it("only lead and researcher may import", async () => {
    for (const role of ["technician", "observer"] as const) {
      const r = await importSpecimensAction.withIdentity(a.as(role), { csv: "label,material_class\nZ-1,other\n" });
      expect(r).toMatchObject({ ok: false, message: `Your role (${role}) does not allow this.` });
    }
  });

  it("the export reads back to the same specimens, with spreadsheet formulas defused", async () => {
    await createSpecimenAction.withIdentity(a.as("researcher"), { label: "=HYPERLINK(1)", materialClass: "other", description: "quote \" and, comma\nnew line", massG: "2.5" });
    const rows = await exportSpecimens({ labId: a.labId, userId: a.users.researcher.id });
    const csv = specimensToCsv(rows.map((r) => ({ ...r, massG: r.massG ?? undefined })));
    expect(csv).toContain("'=HYPERLINK(1)");
    const back = parseSpecimenCsv(csv);
    expect(back.errors).toEqual([]);
    expect(back.rows.map((r) => r.value.label)).toEqual(rows.map((r) => r.label));
    const weird = back.rows.find((r) => r.value.label === "=HYPERLINK(1)")!;
    expect(weird.value).toMatchObject({ description: "quote \" and, comma\nnew line", massG: 2.5, materialClass: "other" });
  });

  it("parent piece, slice and provenance go in and come back out; a too long slice stops the whole file at its line", async () => {
    const header = "label,material_class,parent_piece,slice,provenance,mass_g";
    const bad = [header, "PP-1,iron meteorite,Corvenlow Tarn main mass,S1,\"Tarrow collection, 1971\",4.2", `PP-2,iron meteorite,Corvenlow Tarn main mass,${"x".repeat(61)},,3`].join("\n");
    const r1 = await importSpecimensAction.withIdentity(a.as("researcher"), { csv: bad });
    expect(r1.ok).toBe(false);
    expect((r1.data as { errors: { line: number; field?: string }[] }).errors.map((e) => [e.line, e.field])).toEqual([[3, "slice"]]);
    expect((await listSpecimens({ labId: a.labId, q: "PP-", sort: "label", dir: "asc", page: 1, pageSize: 25 })).total).toBe(0);

    const good = [header, "PP-1,iron meteorite,Corvenlow Tarn main mass,S1,\"Tarrow collection, 1971\",4.2", "PP-2,iron meteorite,Corvenlow Tarn main mass,S2,=from a dealer,3"].join("\n");
    const r2 = await importSpecimensAction.withIdentity(a.as("researcher"), { csv: good });
    expect(r2, r2.message).toMatchObject({ ok: true });
    const stored = await exportSpecimens({ labId: a.labId, userId: a.users.researcher.id, q: "PP-" });
    expect(stored.map((x) => [x.label, x.parentPiece, x.slice, x.provenance])).toEqual([
      ["PP-1", "Corvenlow Tarn main mass", "S1", "Tarrow collection, 1971"],
      ["PP-2", "Corvenlow Tarn main mass", "S2", "=from a dealer"],
    ]);
    const csv = specimensToCsv(stored.map((x) => ({ ...x, massG: x.massG ?? undefined })));
    expect(csv.split("\r\n")[1]).toContain(",Corvenlow Tarn main mass,S1,\"Tarrow collection, 1971\",");
    expect(csv).toContain(",'=from a dealer,"); // guarded on the way out, unguarded on the way in
    const back = parseSpecimenCsv(csv);
    expect(back.errors).toEqual([]);
    expect(back.rows.map((x) => [x.value.label, x.value.parentPiece, x.value.slice, x.value.provenance])).toEqual(stored.map((x) => [x.label, x.parentPiece, x.slice, x.provenance]));
  });

  it("labels are unique per lab, case-insensitively, on create and edit", async () => {
    const dup = await createSpecimenAction.withIdentity(a.as("researcher"), { label: "imp-1", materialClass: "other" });
    expect(dup).toMatchObject({ ok: false, errors: { label: ["This label is already used in this lab."] } });
    const [imp2] = await db.select().from(s.specimens).where(and(eq(s.specimens.labId, a.labId), eq(s.specimens.label, "IMP-2")));
    const rename = await updateSpecimenAction.withIdentity(a.as("researcher"), { specimenId: imp2.id, label: "IMP-1", materialClass: "archaeological-iron" });
    expect(rename.ok).toBe(false);
    const edit = await updateSpecimenAction.withIdentity(a.as("researcher"), { specimenId: imp2.id, label: "IMP-2", materialClass: "archaeological-iron", "surfacePrepSteps[]": ["as found", "degreased"], surfacePrepOther: "soft brush", massG: "" });
    expect(edit.ok, edit.message).toBe(true);
    const [after] = await db.select().from(s.specimens).where(eq(s.specimens.id, imp2.id));
    expect(after.surfacePrep).toBe("as found, degreased, soft brush");
    expect(after.massG).toBeNull(); // emptied in the form
    // Another lab may use the same label.
    expect((await createSpecimenAction.withIdentity(b.as("researcher"), { label: "IMP-1", materialClass: "other" })).ok).toBe(true);
    // Lab B cannot edit lab A's specimen.
    const cross = await updateSpecimenAction.withIdentity(b.as("lead"), { specimenId: imp2.id, label: "HIJACK", materialClass: "other" });
    expect(cross).toMatchObject({ ok: false, message: "No such specimen in this lab." });
  });
});
