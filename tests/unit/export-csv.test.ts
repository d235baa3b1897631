// CSV writing (RFC 4180 / the Frictionless default dialect) and cell formats per Table Schema type.
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { csvCell, toCsv } from "@/lib/export/csv";
import { cellMatches, checkTable, formatCell, tableToCsv, type TableSpec } from "@/lib/export/table-schema";

describe("csv", () => {
  it("quotes only cells that need it and doubles quotes inside (RFC 4180, section 2)", () => {
    expect(csvCell("plain")).toBe("plain");
    expect(csvCell("a,b")).toBe('"a,b"');
    expect(csvCell('say "rust"')).toBe('"say ""rust"""');
    expect(csvCell("two\nlines")).toBe('"two\nlines"');
    expect(csvCell(" padded")).toBe('" padded"');
  });

  it("ends every record with CRLF and round-trips through a CSV parser", () => {
    const rows = [["TV-M-001", "Slice, etched", 'the "rind" side'], ["TV-S-003", "", "line one\r\nline two"]];
    const text = toCsv(["label", "face", "notes"], rows);
    expect(text.endsWith("\r\n")).toBe(true);
    expect(text.split("\r\n")[0]).toBe("label,face,notes");
    const parsed = Papa.parse<string[]>(text.trimEnd()).data;
    expect(parsed).toEqual([["label", "face", "notes"], ...rows]);
  });
});

describe("table schema cells", () => {
  it("writes each type as Table Schema reads it; missing and non-finite values are empty", () => {
    expect(formatCell(new Date("2026-10-08T09:00:00.000Z"), { name: "t", type: "datetime" })).toBe("2026-10-08T09:00:00Z");
    expect(formatCell(new Date("2026-10-08T09:00:00.250Z"), { name: "t", type: "datetime" })).toBe("2026-10-08T09:00:00.250Z");
    expect(formatCell(true, { name: "b", type: "boolean" })).toBe("true");
    expect(formatCell(0.125, { name: "n", type: "number" })).toBe("0.125");
    expect(formatCell(Infinity, { name: "n", type: "number" })).toBe("");
    expect(formatCell(null, { name: "n", type: "integer" })).toBe("");
    expect(formatCell({ kind: "custom", days: [0, 7] }, { name: "o", type: "object" })).toBe('{"kind":"custom","days":[0,7]}');
  });

  it("recognises valid and invalid cells per type", () => {
    expect(cellMatches("12", { name: "i", type: "integer" })).toBe(true);
    expect(cellMatches("1.5", { name: "i", type: "integer" })).toBe(false);
    expect(cellMatches("-1.5e3", { name: "n", type: "number" })).toBe(true);
    expect(cellMatches("1,5", { name: "n", type: "number" })).toBe(false);
    expect(cellMatches("2026-10-08T09:00:00Z", { name: "d", type: "datetime" })).toBe(true);
    expect(cellMatches("2026-10-08 09:00", { name: "d", type: "datetime" })).toBe(false);
    expect(cellMatches("maybe", { name: "b", type: "boolean" })).toBe(false);
    expect(cellMatches("", { name: "x", type: "integer" })).toBe(true);
    expect(cellMatches("", { name: "x", type: "string", constraints: { required: true } })).toBe(false);
    expect(cellMatches("7d1a5c1e-4b0e-4a8e-9a51-0d6f2f1c9b3a", { name: "id", type: "string", format: "uuid" })).toBe(true);
    expect(cellMatches("TV-M-001", { name: "id", type: "string", format: "uuid" })).toBe(false);
  });

  it("writes a table whose header is its schema, and checkTable finds header and cell problems", () => {
    const spec: TableSpec = {
      name: "t", title: "T", description: "",
      columns: [
        { name: "label", type: "string", from: "label" },
        { name: "mass_g", type: "number", from: "massG" },
        { name: "seen_at", type: "datetime", from: "seenAt" },
      ],
    };
    const csv = tableToCsv(spec, [{ label: "A, cut", massG: 12.5, seenAt: new Date("2026-01-01T00:00:00Z") }, { label: "B", massG: null, seenAt: null }]);
    const [header, ...rows] = Papa.parse<string[]>(csv.trimEnd()).data;
    const schema = { fields: spec.columns };
    expect(header).toEqual(["label", "mass_g", "seen_at"]);
    expect(checkTable(schema, header, rows)).toEqual([]);
    expect(checkTable(schema, ["label", "mass"], [])).toHaveLength(1);
    expect(checkTable(schema, header, [["C", "heavy", ""]])).toEqual(['row 2, mass_g: "heavy" is not a valid number']);
    expect(checkTable(schema, header, [["C", "1"]])).toEqual(["row 2: 2 cells, schema has 3 fields"]);
  });
});
