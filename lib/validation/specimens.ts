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

// How far a find's chlorides are known and dealt with (register field; common conservation usage).
export const CHLORIDE_STATES = ["unknown", "not-detected", "present", "active", "desalinated"] as const;
export type ChlorideState = (typeof CHLORIDE_STATES)[number];
export const CHLORIDE_STATE_LABELS: Record<ChlorideState, string> = {
  unknown: "Unknown",
  "not-detected": "Not detected",
  present: "Present, stable",
  active: "Active (weeping, akaganeite)",
  desalinated: "Desalinated",
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
  // Object register: the museum's accession number (unique in the lab when given), conservation
  // treatments already applied, chloride state and storage notes.
  accessionNumber: z.preprocess((v) => (typeof v === "string" && v.trim() === "" ? undefined : v),
    z.string().trim().max(60, "Accession number: use at most 60 characters.").optional()),
  treatmentsApplied: text(2000, "Treatments applied"),
  chlorideState: z.preprocess((v) => (v === "" || v === undefined ? "unknown" : parseMaterialClass(v)),
    z.enum(CHLORIDE_STATES, `Choose a chloride state: ${CHLORIDE_STATES.join(", ")}.`)),
  storageNotes: text(4000, "Storage notes"),
});
export type SpecimenInput = z.infer<typeof specimenSchema>;

/** JSON PATCH: any subset; massG or accessionNumber null clears it. */
export const specimenUpdateSchema = specimenSchema.partial().extend({
  accessionNumber: z.string().trim().min(1, "Accession number: leave it out or send null to clear it.").max(60, "Accession number: use at most 60 characters.").nullable().optional(),
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
const FIELD_COLUMNS = ["label", "material_class", "find_name", "face", "description", "surface_prep", "mass_g", "history", "parent_piece", "slice", "provenance", "contamination_notes",
  "accession_number", "treatments_applied", "chloride_state", "storage_notes"] as const;
/** `location` names a storage location (its name, or its path "Room / Cabinet / Drawer"): the object's place from the import on. */
export const CSV_COLUMNS = [...FIELD_COLUMNS, "location"] as const;
const CSV_TO_FIELD: Record<(typeof FIELD_COLUMNS)[number], keyof SpecimenInput> = {
  label: "label", material_class: "materialClass", find_name: "findName", face: "face", description: "description",
  surface_prep: "surfacePrep", mass_g: "massG", history: "history", parent_piece: "parentPiece", slice: "slice", provenance: "provenance",
  contamination_notes: "contaminationNotes",
  accession_number: "accessionNumber", treatments_applied: "treatmentsApplied", chloride_state: "chlorideState", storage_notes: "storageNotes",
};
export const MAX_IMPORT_ROWS = 5000;
// Under the 2 MB server-action body limit (next.config.ts) with room for the form around it.
export const MAX_IMPORT_BYTES = 1_500_000;

export type CsvRowError = { line: number; field?: string; message: string };
export type CsvParseResult = { rows: { line: number; value: SpecimenInput; location: string | null }[]; errors: CsvRowError[]; total: number };


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
  const firstAccessionLine = new Map<string, number>();
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
      let location: string | null = null;
      header.forEach((h, i) => {
        if (h === "location") location = unguardText(cells[i]).trim() || null;
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
      const accession = parsed.data.accessionNumber?.toLowerCase();
      const seenAccession = accession === undefined ? undefined : firstAccessionLine.get(accession);
      if (seenAccession !== undefined) {
        errors.push({ line, field: "accession_number", message: `Accession number "${parsed.data.accessionNumber}" is repeated (first on line ${seenAccession}).` });
        return;
      }
      firstLineOf.set(key, line);
      if (accession !== undefined) firstAccessionLine.set(accession, line);
      rows.push({ line, value: parsed.data, location });
    },
  });
  if (!header) errors.push({ line: 1, message: "The file is empty. The first line must name the columns." });
  else if (total === 0 && errors.length === 0) errors.push({ line: 2, message: "The file has a header but no specimen rows." });
  return { rows, errors, total };
}

/** The register as CSV; `location` is the object's current place as a path (blank when unknown or hidden). */
export type RegisterCsvRow = Omit<SpecimenInput, "massG" | "accessionNumber"> & { massG?: number | null; accessionNumber?: string | null; location?: string | null };
export function specimensToCsv(rows: readonly RegisterCsvRow[]): string {
  return toCsv(
    CSV_COLUMNS,
    rows.map((r) => CSV_COLUMNS.map((c) => (c === "location" ? (r.location ?? "") : String(r[CSV_TO_FIELD[c]] ?? "")))),
    CSV_COLUMNS.map((c) => c !== "mass_g"),
  );
}

export const importSchema = z.object({ csv: z.string().min(1, "Choose a CSV file first.").max(MAX_IMPORT_BYTES, "The file is larger than 1.5 MB; split it.") });
