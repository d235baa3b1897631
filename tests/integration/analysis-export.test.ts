// Exports of a hand-built trial: the outcomes CSV and the Frictionless data package zip, checked
// against their own descriptor (files present, headers = schema fields, cell types, keys, checksums).
import { createHash } from "node:crypto";
import JSZip from "jszip";
import Papa from "papaparse";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { readSessionIdentity } from "@/lib/auth/session";
import { closeDb } from "@/db/client";
import { GET as getCsv } from "@/app/api/trials/[trialId]/export/outcomes.csv/route";
import { GET as getZip } from "@/app/api/trials/[trialId]/export/datapackage.zip/route";
import { validateDataPackage, type DataPackage } from "@/lib/export/datapackage";
import { profileProblems } from "../support/datapackage-profile";
import { checkTable } from "@/lib/export/table-schema";
import { OUTCOME_TABLE } from "@/lib/export/trial-tables";
import { createTestLab, type TestLab } from "../support/db";
import { buildHandTrial, type HandTrial } from "./analysis-fixtures";

vi.mock("@/lib/auth/session", () => ({ readSessionIdentity: vi.fn() }));
const session = vi.mocked(readSessionIdentity);

let lab: TestLab;
let other: TestLab;
let hand: HandTrial;

beforeAll(async () => {
  lab = await createTestLab("Export lab");
  other = await createTestLab("Other export lab");
  hand = await buildHandTrial(lab);
});
afterAll(async () => {
  await closeDb();
});
beforeEach(() => session.mockReset());

const params = (trialId: string) => ({ params: Promise.resolve({ trialId }) });
const req = (path: string) => new Request(`http://localhost/api/trials/${hand.trialId}/export/${path}`);
function parse(csv: string) {
  const { data } = Papa.parse<string[]>(csv.trimEnd(), { skipEmptyLines: false });
  return { header: data[0], rows: data.slice(1) };
}

describe("GET …/export/outcomes.csv", () => {
  it("has one row per placement with the first-rust interval in days since the start", async () => {
    session.mockResolvedValue(lab.as("observer") as never);
    const res = await getCsv(req("outcomes.csv"), params(hand.trialId));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename=".+-outcomes\.csv"/);
    const { header, rows } = parse(await res.text());
    expect(header).toEqual(OUTCOME_TABLE.columns.map((c) => c.name));
    expect(checkTable({ fields: OUTCOME_TABLE.columns }, header, rows)).toEqual([]);
    const col = (name: string) => header.indexOf(name);
    const row = (label: string) => rows.find((r) => r[col("specimen_label")] === label)!;
    const pick = (label: string) => ["interval_lower_day", "interval_upper_day", "rusted", "right_censored"].map((n) => row(label)[col(n)]);
    expect(rows).toHaveLength(4);
    expect(pick(hand.labels.rustsAt3rd)).toEqual(["7", "14", "true", "false"]);
    expect(pick(hand.labels.neverRusts)).toEqual(["28", "", "false", "true"]);
    expect(pick(hand.labels.weepsAt2nd)).toEqual(["0", "7", "true", "false"]);
    expect(pick(hand.labels.unscored)).toEqual(["", "", "false", ""]);
  });

  it("is refused to another lab (404) and to a signed-out caller (401)", async () => {
    session.mockResolvedValue(other.as("lead") as never);
    expect((await getCsv(req("outcomes.csv"), params(hand.trialId))).status).toBe(404);
    session.mockResolvedValue(null as never);
    expect((await getCsv(req("outcomes.csv"), params(hand.trialId))).status).toBe(401);
  });
});

describe("GET …/export/datapackage.zip", () => {
  let zip: JSZip;
  let descriptor: DataPackage;
  const tables = new Map<string, { header: string[]; rows: string[][]; bytes: Uint8Array }>();

  beforeAll(async () => {
    session.mockResolvedValue(lab.as("researcher") as never);
    const res = await getZip(req("datapackage.zip"), params(hand.trialId));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/zip");
    zip = await JSZip.loadAsync(await res.arrayBuffer());
    descriptor = JSON.parse(await zip.file("datapackage.json")!.async("string"));
    for (const r of descriptor.resources) {
      const file = zip.file(r.path);
      if (!file) continue;
      const bytes = await file.async("uint8array");
      tables.set(r.name, { ...parse(Buffer.from(bytes).toString("utf8")), bytes });
    }
  });

  it("datapackage.json validates as a tabular data package", () => {
    expect(validateDataPackage(descriptor)).toEqual([]);
    expect(profileProblems(descriptor)).toEqual([]); // Frictionless Data, Tabular Data Package profile v1
    expect(descriptor.profile).toBe("tabular-data-package");
    expect(descriptor.resources.map((r) => r.name)).toEqual([
      "trial", "specimens", "treatments", "chambers", "placements", "inspections", "photos", "scores", "readings", "outcomes", "exposure",
      "chloride_tests", "akaganeite_checks", "prior_treatments", "mass_measurements", "storage_rules",
    ]);
    expect(zip.file("README.md")).not.toBeNull();
  });

  it("every listed file exists, its header is the schema's fields and every cell has the field's type", () => {
    for (const r of descriptor.resources) {
      expect(zip.file(r.path), r.path).not.toBeNull();
      expect([r.format, r.mediatype, r.encoding]).toEqual(["csv", "text/csv", "utf-8"]);
      const t = tables.get(r.name)!;
      expect(t.header, r.name).toEqual(r.schema.fields.map((f) => f.name));
      expect(checkTable(r.schema, t.header, t.rows), r.name).toEqual([]);
    }
  });

  it("byte sizes and SHA-256 checksums match the files", () => {
    for (const r of descriptor.resources) {
      const { bytes } = tables.get(r.name)!;
      expect(r.bytes).toBe(bytes.length);
      expect(r.hash).toBe(`sha256:${createHash("sha256").update(bytes).digest("hex")}`);
    }
  });

  it("primary keys are unique and every foreign key points at a row in the package", () => {
    const column = (name: string, field: string) => {
      const t = tables.get(name)!;
      return t.rows.map((row) => row[t.header.indexOf(field)]);
    };
    for (const r of descriptor.resources) {
      const pk = r.schema.primaryKey as string;
      const keys = column(r.name, pk);
      expect(new Set(keys).size, `${r.name}.${pk}`).toBe(keys.length);
      for (const fk of r.schema.foreignKeys ?? []) {
        const targets = new Set(column(fk.reference.resource, fk.reference.fields as string));
        const dangling = column(r.name, fk.fields as string).filter((v) => v !== "" && !targets.has(v));
        expect(dangling, `${r.name}.${String(fk.fields)} → ${fk.reference.resource}`).toEqual([]);
      }
    }
  });

  it("holds the trial's rows: readings only while it ran, every score, and the photo manifest with its checksum", () => {
    expect(tables.get("specimens")!.rows).toHaveLength(4);
    expect(tables.get("inspections")!.rows).toHaveLength(5);
    expect(tables.get("scores")!.rows).toHaveLength(14);
    expect(tables.get("readings")!.rows).toHaveLength(2); // the reading from before the start is left out
    const photos = tables.get("photos")!;
    expect(photos.rows).toHaveLength(1);
    expect(photos.rows[0][photos.header.indexOf("sha256")]).toBe("ab".repeat(32));
    expect(photos.rows[0][photos.header.indexOf("filename")]).toBe("face, day 14.jpg");
  });

  it("is refused to another lab (404) and to a signed-out caller (401)", async () => {
    session.mockResolvedValue(other.as("researcher") as never);
    expect((await getZip(req("datapackage.zip"), params(hand.trialId))).status).toBe(404);
    session.mockResolvedValue(null as never);
    expect((await getZip(req("datapackage.zip"), params(hand.trialId))).status).toBe(401);
  });
});
