// Specimen input: one base schema for forms, the JSON API and CSV rows, plus the CSV reader
// (papaparse, so the browser preview and the server import read a file the same way).
import Papa from "papaparse";
import { z } from "zod";
import { toCsv, unguardText } from "@/lib/export/csv";

export const MATERIAL_CLASSES = ["iron-meteorite", "stony-iron", "chondrite", "archaeological-iron", "steel-coupon", "other"] as const;
export type MaterialClass = (typeof MATERIAL_CLASSES)[number];
export const MATERIAL_CLASS_LABELS: Record<MaterialClass, string> = {
  "iron-meteorite": "Iron meteorite",
  "stony-iron": "Stony-iron",
  chondrite: "Chondrite",
  "archaeological-iron": "Archaeological iron",
  "steel-coupon": "Steel coupon",
  other: "Other",
};

// Common preparation steps offered as checkboxes; anything else goes in the free-text part.
export const SURFACE_PREP_STEPS = ["as found", "cut", "ground", "polished", "etched", "degreased"] as const;

/** Accepts "iron-meteorite", "Iron meteorite", "iron_meteorite"… (CSV files are typed by people). */
export function parseMaterialClass(raw: unknown): unknown {
  if (typeof raw !== "string") return raw;
  const k = raw.trim().toLowerCase().replace(/[\s_]+/g, "-");
  return k;
}

const text = (max: number, label: string) => z.string().trim().max(max, `${label}: use at most ${max} characters.`).default("");
const optionalNumber = (v: unknown) => (v === "" || v === null || v === undefined ? undefined : v);

export const specimenSchema = z.object({
  label: z.string().trim().min(1, "Give the specimen a label.").max(60, "Use at most 60 characters.")
    .regex(/^[^\s].*$/, "A label cannot start with a space."),
  materialClass: z.preprocess(parseMaterialClass, z.enum(MATERIAL_CLASSES, `Choose a material class: ${MATERIAL_CLASSES.join(", ")}.`)),
  findName: text(200, "Find name"),
  face: text(200, "Face"),
  description: text(4000, "Description"),
  surfacePrep: text(300, "Surface preparation"),
  massG: z.preprocess(optionalNumber, z.coerce.number("Mass must be a number of grams.").positive("Mass must be above 0 g.").max(1_000_000, "Mass must be at most 1,000,000 g (1 t).").optional()),
  history: text(4000, "History"),
  parentPiece: text(200, "Parent piece"),
  slice: text(60, "Slice"),
  provenance: text(4000, "Provenance"),
  contaminationNotes: text(4000, "Contamination notes"),
});
export type SpecimenInput = z.infer<typeof specimenSchema>;

/** JSON PATCH: any subset; massG null clears the mass. */
export const specimenUpdateSchema = specimenSchema.partial().extend({
  massG: z.number("Mass must be a number of grams.").positive("Mass must be above 0 g.").max(1_000_000, "Mass must be at most 1,000,000 g (1 t).").nullable().optional(),
});

/** The HTML form: preparation steps come as checkboxes plus a free-text remainder. */
function fromForm(raw: unknown): unknown {
  if (typeof raw !== "object" || raw === null) return raw;
  const r = raw as Record<string, unknown>;
  if (typeof r.surfacePrep === "string") return r;
  const steps = ([] as unknown[]).concat(r["surfacePrepSteps[]"] ?? r.surfacePrepSteps ?? []).filter((s): s is string => typeof s === "string" && s !== "");
  const other = typeof r.surfacePrepOther === "string" ? r.surfacePrepOther.trim() : "";
  return { ...r, surfacePrep: [...steps, ...(other ? [other] : [])].join(", ") };
}
export const specimenFormSchema = z.preprocess(fromForm, specimenSchema);
export const specimenEditFormSchema = z.preprocess(fromForm, specimenSchema.extend({ specimenId: z.uuid() }));

/** Splits a stored preparation text back into the checkbox steps and the free-text rest. */
export function splitSurfacePrep(value: string): { steps: string[]; other: string } {
  const parts = value.split(",").map((p) => p.trim()).filter(Boolean);
  const known = new Set<string>(SURFACE_PREP_STEPS);
  return { steps: parts.filter((p) => known.has(p)), other: parts.filter((p) => !known.has(p)).join(", ") };
}

// ---- list parameters (URL search params and the JSON API share them) ----
export const SPECIMEN_SORTS = ["label", "findName", "materialClass", "massG", "createdAt"] as const;
export const pageSizeSchema = z.coerce.number().int().min(1).max(500).catch(25);
export const specimenListSchema = z.object({
  q: z.string().trim().max(100).optional().catch(undefined),
  materialClass: z.enum(MATERIAL_CLASSES).optional().catch(undefined),
  sort: z.enum(SPECIMEN_SORTS).catch("label"),
  dir: z.enum(["asc", "desc"]).catch("asc"),
  page: z.coerce.number().int().min(1).max(100_000).catch(1),
  pageSize: pageSizeSchema,
});
export type SpecimenListParams = z.infer<typeof specimenListSchema>;

// ---- CSV ----
export const CSV_COLUMNS = [
  "label", "material_class", "find_name", "face", "description", "surface_prep", "mass_g", "history", "parent_piece", "slice", "provenance", "contamination_notes",
] as const;
const CSV_TO_FIELD: Record<(typeof CSV_COLUMNS)[number], keyof SpecimenInput> = {
  label: "label", material_class: "materialClass", find_name: "findName", face: "face", description: "description",
  surface_prep: "surfacePrep", mass_g: "massG", history: "history", parent_piece: "parentPiece", slice: "slice", provenance: "provenance",
  contamination_notes: "contaminationNotes",
};
export const MAX_IMPORT_ROWS = 5000;
// Under the 2 MB server-action body limit (next.config.ts) with room for the form around it.
export const MAX_IMPORT_BYTES = 1_500_000;

export type CsvRowError = { line: number; field?: string; message: string };
export type CsvParseResult = { rows: { line: number; value: SpecimenInput }[]; errors: CsvRowError[]; total: number };


/**
 * Read a specimen CSV. Line numbers are those a text editor shows (the header is line 1), also when
 * quoted cells span lines or blank lines sit between rows. Labels repeated inside the file are errors.
 */
export function parseSpecimenCsv(input: string): CsvParseResult {
  const errors: CsvRowError[] = [];
  const rows: CsvParseResult["rows"] = [];
  if (input.length > MAX_IMPORT_BYTES) return { rows, errors: [{ line: 0, message: `The file is larger than ${MAX_IMPORT_BYTES / 1_000_000} MB; split it.` }], total: 0 };
  const textIn = input.replace(/^\uFEFF/, "");
  let header: string[] | null = null;
  let prevCursor = 0;
  let total = 0;
  const firstLineOf = new Map<string, number>();
  // Newlines are counted incrementally from the previous row, so this stays linear in the file size.
  let countedTo = 0;
  let countedLines = 0;
  const lineAt = (pos: number) => {
    for (let i = countedTo; i < pos; i++) if (textIn.charCodeAt(i) === 10) countedLines++;
    countedTo = pos;
    return countedLines + 1;
  };
  Papa.parse<string[]>(textIn, {
    step: (res) => {
      const start = prevCursor;
      prevCursor = res.meta.cursor;
      const cells = res.data;
      if (cells.length === 1 && cells[0].trim() === "") return; // blank line
      const line = lineAt(start);
      if (!header) {
        header = cells.map((h) => h.trim().toLowerCase().replace(/[\s-]+/g, "_"));
        const missing = ["label", "material_class"].filter((c) => !header!.includes(c));
        const unknown = header.filter((h) => h && !(CSV_COLUMNS as readonly string[]).includes(h));
        if (missing.length) errors.push({ line, message: `The header needs the column(s) ${missing.join(", ")}. Expected: ${CSV_COLUMNS.join(", ")}.` });
        if (unknown.length) errors.push({ line, message: `Unknown column(s) ${unknown.join(", ")}. Expected: ${CSV_COLUMNS.join(", ")}.` });
        return;
      }
      total++;
      if (total > MAX_IMPORT_ROWS) {
        if (total === MAX_IMPORT_ROWS + 1) errors.push({ line, message: `More than ${MAX_IMPORT_ROWS} rows; split the file.` });
        return;
      }
      if (cells.length !== header.length) {
        errors.push({ line, message: `Expected ${header.length} cells, found ${cells.length}.` });
        return;
      }
      const obj: Record<string, unknown> = {};
      header.forEach((h, i) => {
        const field = CSV_TO_FIELD[h as keyof typeof CSV_TO_FIELD];
        if (field) obj[field] = unguardText(cells[i]); // our exports guard text cells (lib/export/csv.ts)
      });
      const parsed = specimenSchema.safeParse(obj);
      if (!parsed.success) {
        for (const issue of parsed.error.issues) {
          const field = String(issue.path[0] ?? "");
          const column = Object.entries(CSV_TO_FIELD).find(([, f]) => f === field)?.[0];
          errors.push({ line, field: column, message: issue.message });
        }
        return;
      }
      const key = parsed.data.label.toLowerCase();
      const seen = firstLineOf.get(key);
      if (seen !== undefined) {
        errors.push({ line, field: "label", message: `Label "${parsed.data.label}" is repeated (first on line ${seen}).` });
        return;
      }
      firstLineOf.set(key, line);
      rows.push({ line, value: parsed.data });
    },
  });
  if (!header) errors.push({ line: 1, message: "The file is empty. The first line must name the columns." });
  else if (total === 0 && errors.length === 0) errors.push({ line: 2, message: "The file has a header but no specimen rows." });
  return { rows, errors, total };
}

export function specimensToCsv(rows: readonly SpecimenInput[]): string {
  return toCsv(
    CSV_COLUMNS,
    rows.map((r) => CSV_COLUMNS.map((c) => String(r[CSV_TO_FIELD[c]] ?? ""))),
    CSV_COLUMNS.map((c) => c !== "mass_g"),
  );
}

export const importSchema = z.object({ csv: z.string().min(1, "Choose a CSV file first.").max(MAX_IMPORT_BYTES, "The file is larger than 1.5 MB; split it.") });
