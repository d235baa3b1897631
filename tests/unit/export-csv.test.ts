// CSV writing (RFC 4180 / the Frictionless default dialect) and cell formats per Table Schema type.
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { csvCell, guardText, toCsv, unguardText } from "@/lib/export/csv";
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

// OWASP "CSV Injection": a cell starting with =, +, -, @, tab (0x09) or carriage return (0x0D) is run
// as a formula by spreadsheets; prefix such text cells with a single quote.
describe("spreadsheet formula guard", () => {
  const attacks = ["=HYPERLINK(\"http://evil.test\",\"open\")", "+cmd|' /C calc'!A0", "-2+3+cmd|' /C calc'!A0", "@SUM(1+1)*cmd|' /C calc'!A0", "\t=1+1", "\r=1+1"];

  it("writes every text cell an attacker could start with a formula character with a leading '", () => {
    const text = toCsv(["label", "notes"], attacks.map((a) => ["TV-M-001", a]));
    const parsed = Papa.parse<string[]>(text.trimEnd()).data.slice(1);
    expect(parsed.map((r) => r[1])).toEqual(attacks.map((a) => `'${a}`));
    for (const [, cell] of parsed) expect(cell).toMatch(/^'/);
  });

  it("leaves number, date and boolean columns as they are, so they still read as their type", () => {
    const text = toCsv(["label", "temp_c", "notes"], [["-north face", "-2.5", "+1 spot"]], [true, false, true]);
    expect(text.split("\r\n")[1]).toBe("'-north face,-2.5,'+1 spot");
  });

  it("guards a text cell that already starts with ' before a formula character once more, so reading back is exact", () => {
    for (const typed of ["'=1+1", "''@x", "plain", "it's", "'quoted'", ...attacks]) {
      expect(unguardText(guardText(typed))).toBe(typed);
    }
    expect(guardText("'=1+1")).toBe("''=1+1");
    expect(guardText("it's")).toBe("it's");
  });

  it("tableToCsv guards string fields only (OWASP CSV Injection; Table Schema field types)", () => {
    const spec: TableSpec = {
      name: "t", title: "T", description: "",
      columns: [
        { name: "instrument", type: "string", from: "instrument" },
        { name: "dew_point_c", type: "number", from: "dewPointC" },
        { name: "day", type: "integer", from: "day" },
      ],
    };
    const csv = tableToCsv(spec, [{ instrument: "@SUM(1)", dewPointC: -12.25, day: -1 }]);
    const [, row] = Papa.parse<string[]>(csv.trimEnd()).data;
    expect(row).toEqual(["'@SUM(1)", "-12.25", "-1"]);
    expect(checkTable({ fields: spec.columns }, ["instrument", "dew_point_c", "day"], [row])).toEqual([]);
  });
});

describe("table schema cells", () => {
  it("writes each type as Table Schema reads it; missing and non-finite values are empty", () => {
    expect(formatCell(new Date("2026-10-08T09:00:00.000Z"), { name: "t", type: "datetime" })).toBe("2026-10-08T09:00:00Z");
    // One datetime format for every export: Table Schema's default, %Y-%m-%dT%H:%M:%SZ (whole seconds).
    expect(formatCell(new Date("2026-10-08T09:00:00.250Z"), { name: "t", type: "datetime" })).toBe("2026-10-08T09:00:00Z");
    expect(formatCell(new Date("2026-10-08T09:00:59.999Z"), { name: "t", type: "datetime" })).toBe("2026-10-08T09:00:59Z");
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
    expect(cellMatches("2026-10-08T09:00:00.250Z", { name: "d", type: "datetime" })).toBe(false);
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
