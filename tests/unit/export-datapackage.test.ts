// The datapackage.json validator against the Data Package / Tabular Data Package / Table Schema specs
// (specs.frictionlessdata.io, v1): good descriptors pass, each broken rule is reported where it is.
import { describe, expect, it } from "vitest";
import { buildDataPackage, toPackageName, validateDataPackage } from "@/lib/export/datapackage";
import { SCORE_TABLE, SPECIMEN_TABLE, INSPECTION_TABLE, PHOTO_TABLE } from "@/lib/export/trial-tables";

interface TestResource extends Record<string, unknown> {
  name: string; path: string; profile: string; format: string; mediatype: string; bytes?: number; hash?: string;
  schema: {
    fields: { name: string; type: string; format?: string }[];
    primaryKey: string | string[];
    foreignKeys?: { fields: string; reference: { resource: string; fields: string } }[];
  };
}

function good(): { profile: string; name: string; resources: TestResource[] } {
  return {
    profile: "tabular-data-package",
    name: "rustline-demo",
    resources: [
      {
        name: "specimens", path: "data/specimens.csv", profile: "tabular-data-resource", format: "csv", mediatype: "text/csv",
        schema: { fields: [{ name: "id", type: "string", format: "uuid" }, { name: "mass_g", type: "number" }], primaryKey: "id" },
      },
      {
        name: "scores", path: "data/scores.csv", profile: "tabular-data-resource", format: "csv", mediatype: "text/csv",
        bytes: 120, hash: "sha256:0a1b",
        schema: {
          fields: [{ name: "id", type: "string" }, { name: "specimen_id", type: "string" }, { name: "area_percent", type: "number" }],
          primaryKey: ["id"],
          foreignKeys: [{ fields: "specimen_id", reference: { resource: "specimens", fields: "id" } }],
        },
      },
    ],
  };
}
type Descriptor = ReturnType<typeof good> & Record<string, unknown>;
function broken(change: (d: Descriptor) => void) {
  const d = good() as Descriptor;
  change(d);
  return validateDataPackage(d);
}
const where = (problems: { at: string }[]) => problems.map((p) => p.at);

describe("validateDataPackage", () => {
  it("accepts a well-formed tabular data package", () => {
    expect(validateDataPackage(good())).toEqual([]);
  });

  it("accepts what buildDataPackage makes from our table specs", () => {
    const d = buildDataPackage({
      name: "x", created: new Date("2026-01-01T00:00:00Z"),
      resources: [SPECIMEN_TABLE, INSPECTION_TABLE, PHOTO_TABLE, SCORE_TABLE].map((spec) => ({ spec, path: `data/${spec.name}.csv`, bytes: 1, sha256: "ff" })),
    });
    // Its own foreign keys point at trial (inspections.trial_id), which this subset leaves out.
    expect(validateDataPackage(d).map((p) => p.message)).toEqual(['no resource named "trial"']);
    expect(d.resources[0]).toMatchObject({ format: "csv", mediatype: "text/csv", profile: "tabular-data-resource", hash: "sha256:ff" });
    expect(d.resources[0].schema.fields.map((f) => f.name)).toEqual(SPECIMEN_TABLE.columns.map((c) => c.name));
  });

  it("rejects a descriptor that is not an object", () => {
    expect(where(validateDataPackage(null))).toEqual([""]);
    expect(where(validateDataPackage([]))).toEqual([""]);
  });

  it("requires a lower-case package name", () => {
    expect(where(broken((d) => { delete (d as Partial<Descriptor>).name; }))).toEqual(["name"]);
    expect(where(broken((d) => { d.name = "Rustline Demo"; }))).toEqual(["name"]);
  });

  it("requires a non-empty resources array", () => {
    expect(where(broken((d) => { d.resources = []; }))).toEqual(["resources"]);
    expect(where(broken((d) => { (d as Record<string, unknown>).resources = "data.csv"; }))).toEqual(["resources"]);
  });

  it("requires each resource's name, unique, and exactly one of path or data", () => {
    expect(where(broken((d) => { (d.resources[0] as Record<string, unknown>).name = undefined; }))).toContain("resources[0].name");
    expect(where(broken((d) => { d.resources[1].name = "specimens"; }))).toContain("resources[1].name");
    expect(where(broken((d) => { delete (d.resources[0] as Record<string, unknown>).path; }))).toEqual(["resources[0]"]);
    expect(where(broken((d) => { (d.resources[0] as Record<string, unknown>).data = [[1]]; }))).toEqual(["resources[0]"]);
  });

  it("refuses absolute paths and paths that climb out of the package", () => {
    expect(where(broken((d) => { d.resources[0].path = "/etc/passwd"; }))).toEqual(["resources[0].path"]);
    expect(where(broken((d) => { d.resources[0].path = "data/../../x.csv"; }))).toEqual(["resources[0].path"]);
    expect(where(broken((d) => { d.resources[0].path = "data\\x.csv"; }))).toEqual(["resources[0].path"]);
    expect(broken((d) => { d.resources[0].path = "https://example.org/specimens.csv"; })).toEqual([]);
  });

  it("requires schema fields with a name and a Table Schema type", () => {
    expect(where(broken((d) => { d.resources[0].schema.fields[1].type = "float"; }))).toEqual(["resources[0].schema.fields[1].type"]);
    expect(where(broken((d) => { delete (d.resources[0].schema.fields[1] as Record<string, unknown>).type; }))).toEqual(["resources[0].schema.fields[1].type"]);
    expect(where(broken((d) => { d.resources[0].schema.fields[1].name = ""; }))).toEqual(["resources[0].schema.fields[1].name"]);
    expect(where(broken((d) => { d.resources[0].schema.fields[1].name = "id"; }))).toEqual(["resources[0].schema.fields[1].name"]);
    expect(where(broken((d) => { d.resources[0].schema.fields = []; }))).toContain("resources[0].schema.fields");
  });

  it("in a tabular data package, every resource needs a schema and the tabular profile", () => {
    expect(where(broken((d) => { delete (d.resources[0] as Record<string, unknown>).schema; }))).toContain("resources[0].schema");
    expect(where(broken((d) => { d.resources[0].profile = "data-resource"; }))).toEqual(["resources[0].profile"]);
    // Without the tabular profile a schema-less resource is allowed.
    expect(broken((d) => { delete (d as Record<string, unknown>).profile; delete (d.resources[0] as Record<string, unknown>).schema; d.resources[1].schema.foreignKeys = []; })).toEqual([]);
  });

  it("checks primary and foreign keys against the fields they name", () => {
    expect(where(broken((d) => { d.resources[0].schema.primaryKey = "label"; }))).toEqual(["resources[0].schema.primaryKey"]);
    expect(where(broken((d) => { d.resources[1].schema.foreignKeys![0].fields = "specimen"; }))).toEqual(["resources[1].schema.foreignKeys[0].fields"]);
    expect(where(broken((d) => { d.resources[1].schema.foreignKeys![0].reference.resource = "samples"; }))).toEqual(["resources[1].schema.foreignKeys[0].reference.resource"]);
    expect(where(broken((d) => { d.resources[1].schema.foreignKeys![0].reference.fields = "uuid"; }))).toEqual(["resources[1].schema.foreignKeys[0].reference.fields"]);
    // An empty reference.resource means the resource itself.
    expect(broken((d) => { d.resources[1].schema.foreignKeys![0] = { fields: "specimen_id", reference: { resource: "", fields: "id" } }; })).toEqual([]);
  });

  it("checks byte counts, hashes and media types when given", () => {
    expect(where(broken((d) => { d.resources[1].bytes = -1; }))).toEqual(["resources[1].bytes"]);
    expect(where(broken((d) => { d.resources[1].hash = "sha256:not-hex"; }))).toEqual(["resources[1].hash"]);
    expect(where(broken((d) => { d.resources[1].mediatype = "csv"; }))).toEqual(["resources[1].mediatype"]);
  });
});

describe("toPackageName", () => {
  it("turns a trial title into a valid package name", () => {
    expect(toPackageName("Storage humidity × surface treatment, 2026 slices")).toBe("storage-humidity-surface-treatment-2026-slices");
    expect(toPackageName("Café Ölfeld")).toBe("cafe-olfeld");
    expect(toPackageName("×××")).toBe("rustline-trial");
  });
});
