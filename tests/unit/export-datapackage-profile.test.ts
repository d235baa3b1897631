// Our datapackage.json against the official Tabular Data Package profile (Frictionless Data, Data
// Package specification v1: tabular-data-package.json, JSON Schema draft-04, from the `datapackage`
// npm package), validated with ajv. Each planted mistake is one a person editing a descriptor by
// hand, or a change to our table specs, could make; the profile must catch it where it is.
import { describe, expect, it } from "vitest";
import { buildDataPackage, type DataPackage } from "@/lib/export/datapackage";
import {
  CHAMBER_TABLE, INSPECTION_TABLE, OUTCOME_TABLE, PHOTO_TABLE, PLACEMENT_TABLE, READING_TABLE, SCORE_TABLE, SPECIMEN_TABLE, TREATMENT_TABLE, TRIAL_TABLE,
} from "@/lib/export/trial-tables";
import { profileProblems } from "../support/datapackage-profile";

const SPECS = [TRIAL_TABLE, SPECIMEN_TABLE, TREATMENT_TABLE, CHAMBER_TABLE, PLACEMENT_TABLE, INSPECTION_TABLE, PHOTO_TABLE, SCORE_TABLE, READING_TABLE, OUTCOME_TABLE];

function ours(): DataPackage {
  return buildDataPackage({
    name: "rustline-profile-check", title: "Profile check", description: "Every table of a trial package.",
    created: new Date("2026-03-01T09:30:00.250Z"), keywords: ["corrosion"],
    resources: SPECS.map((spec) => ({ spec, path: `data/${spec.name}.csv`, bytes: 10, sha256: "0f".repeat(32) })),
  });
}

function planted(change: (d: Record<string, any>) => void): string[] {
  const d = JSON.parse(JSON.stringify(ours()));
  change(d);
  return profileProblems(d);
}

describe("the data package descriptor against the official profile", () => {
  it("what we build for a trial conforms", () => {
    expect(profileProblems(ours())).toEqual([]);
  });

  it("a string field with a format the spec does not define is caught (Table Schema: string formats)", () => {
    const problems = planted((d) => { d.resources[1].schema.fields[0].format = "guid"; });
    expect(problems).toContain("/resources/1/schema/fields/0/format must be equal to one of the allowed values");
  });

  it("a resource format or a media type of the wrong kind is caught (Data Resource: format, mediatype)", () => {
    expect(planted((d) => { d.resources[0].format = ["csv"]; })).toContain("/resources/0/format must be string");
    expect(planted((d) => { d.resources[0].mediatype = "csv"; })).toContain('/resources/0/mediatype must match pattern "^(.+)/(.+)$"');
  });

  it("an encoding that is not a string is caught (Data Resource: encoding)", () => {
    expect(planted((d) => { d.resources[2].encoding = 8; })).toContain("/resources/2/encoding must be string");
  });

  it("a title that is not a string is caught, on the package and on a resource", () => {
    expect(planted((d) => { d.title = { en: "Trial" }; })).toContain("/title must be string");
    expect(planted((d) => { d.resources[3].title = 42; })).toContain("/resources/3/title must be string");
  });

  it("missingValues that are not a non-empty list of strings are caught (Table Schema: missingValues)", () => {
    expect(planted((d) => { d.resources[4].schema.missingValues = ""; })).toContain("/resources/4/schema/missingValues must be array");
    expect(planted((d) => { d.resources[4].schema.missingValues = []; })).toContain("/resources/4/schema/missingValues must NOT have fewer than 1 items");
    expect(planted((d) => { d.resources[4].schema.missingValues = [null]; })).toContain("/resources/4/schema/missingValues/0 must be string");
  });

  it("a created time that is not an RFC 3339 date-time, and a bad hash, are caught", () => {
    expect(planted((d) => { d.created = "1 March 2026"; })).toContain('/created must match format "date-time"');
    expect(planted((d) => { d.resources[5].hash = "sha256:not-hex"; })).toContain('/resources/5/hash must match pattern "^([^:]+:[a-fA-F0-9]+|[a-fA-F0-9]{32}|)$"');
  });
});
