// Table Schema (Frictionless): field types, how our values are written into CSV cells, and a check
// that a CSV's header and cells agree with a schema.
import { toCsv } from "./csv";
import { isUuid } from "@/lib/ids";

/** The field types the Table Schema specification allows. */
export const FIELD_TYPES = [
  "string", "number", "integer", "boolean", "object", "array", "date", "time", "datetime",
  "year", "yearmonth", "duration", "geopoint", "geojson", "any",
] as const;
export type FieldType = (typeof FIELD_TYPES)[number];

export interface Field {
  name: string;
  type: FieldType;
  format?: string;
  title?: string;
  description?: string;
  constraints?: { required?: boolean; unique?: boolean; minimum?: number; maximum?: number; enum?: string[] };
}

export interface ForeignKey {
  fields: string | string[];
  reference: { resource: string; fields: string | string[] };
}

export interface TableSchema {
  fields: Field[];
  primaryKey?: string | string[];
  foreignKeys?: ForeignKey[];
  missingValues?: string[];
}

/** A field of an export table and the property of the source row it is read from. */
export interface ColumnSpec extends Field {
  from: string;
}

export interface TableSpec {
  name: string;
  title: string;
  description: string;
  columns: ColumnSpec[];
  primaryKey?: string | string[];
  foreignKeys?: ForeignKey[];
}

export function schemaOf(spec: TableSpec): TableSchema {
  return {
    fields: spec.columns.map(({ from: _from, ...field }) => field),
    ...(spec.primaryKey ? { primaryKey: spec.primaryKey } : {}),
    ...(spec.foreignKeys ? { foreignKeys: spec.foreignKeys } : {}),
    missingValues: [""],
  };
}

/**
 * The one datetime format of every export: UTC, whole seconds, "Z" (Table Schema's default datetime
 * format, %Y-%m-%dT%H:%M:%SZ, which readers such as the Frictionless libraries require). Milliseconds
 * are dropped, not rounded, so a time never moves past the second it happened in.
 */
export function formatDateTime(d: Date): string {
  return `${d.toISOString().slice(0, 19)}Z`;
}

/** One value as the cell text its field type expects; null/undefined/non-finite become "" (missing). */
export function formatCell(value: unknown, field: Field): string {
  if (value === null || value === undefined) return "";
  switch (field.type) {
    case "datetime":
      if (value instanceof Date) return Number.isNaN(value.getTime()) ? "" : formatDateTime(value);
      return String(value);
    case "date":
      return value instanceof Date ? value.toISOString().slice(0, 10) : String(value);
    case "number":
    case "integer":
      return typeof value === "number" && !Number.isFinite(value) ? "" : String(value);
    case "boolean":
      return value ? "true" : "false";
    case "object":
    case "array":
      return JSON.stringify(value);
    default:
      return value instanceof Date ? formatDateTime(value) : String(value);
  }
}

/** Only string fields are text: numbers, dates and booleans are written as they are. */
export const isTextField = (field: Field) => field.type === "string" || field.type === "any";

export function tableToCsv(spec: TableSpec, rows: readonly object[]): string {
  return toCsv(
    spec.columns.map((c) => c.name),
    rows.map((row) => spec.columns.map((c) => formatCell((row as Record<string, unknown>)[c.from], c))),
    spec.columns.map(isTextField),
  );
}

const PATTERNS: Partial<Record<FieldType, RegExp>> = {
  integer: /^[+-]?\d+$/,
  number: /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$|^(NaN|INF|-INF)$/,
  boolean: /^(true|false|True|False|TRUE|FALSE|1|0)$/,
  date: /^\d{4}-\d{2}-\d{2}$/,
  time: /^\d{2}:\d{2}:\d{2}(\.\d+)?$/,
  datetime: /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}Z$/,
  year: /^\d{4}$/,
  yearmonth: /^\d{4}-\d{2}$/,
};

/** Whether a cell's text can be read as its field's type (missing values always can). */
export function cellMatches(text: string, field: Field, missingValues: readonly string[] = [""]): boolean {
  if (missingValues.includes(text)) return !field.constraints?.required;
  if (field.type === "string" && field.format === "uuid") return isUuid(text);
  if (field.type === "object" || field.type === "array") {
    try {
      const v = JSON.parse(text);
      return field.type === "array" ? Array.isArray(v) : typeof v === "object" && v !== null && !Array.isArray(v);
    } catch {
      return false;
    }
  }
  const pattern = PATTERNS[field.type];
  return pattern ? pattern.test(text) : true;
}

/** Problems of a parsed CSV against its schema: header mismatch, wrong cell types, bad widths. */
export function checkTable(schema: TableSchema, header: readonly string[], rows: readonly (readonly string[])[]): string[] {
  const problems: string[] = [];
  const names = schema.fields.map((f) => f.name);
  if (header.join(",") !== names.join(",")) problems.push(`header [${header.join(", ")}] is not the schema's [${names.join(", ")}]`);
  rows.forEach((row, r) => {
    if (row.length !== names.length) {
      problems.push(`row ${r + 2}: ${row.length} cells, schema has ${names.length} fields`);
      return;
    }
    schema.fields.forEach((f, c) => {
      if (!cellMatches(row[c], f, schema.missingValues)) problems.push(`row ${r + 2}, ${f.name}: "${row[c]}" is not a valid ${f.type}`);
    });
  });
  return problems;
}
