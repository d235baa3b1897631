// An audit event's before/after records as lines a person reads: "Setpoint RH (%): 75 → 76".
// Only what changed is listed (for a new record, what was set; for a deleted one, what it held);
// bookkeeping fields (ids, created/updated times) stay in the raw record shown beside it.
import { formatDateTime } from "@/lib/format";

export interface AuditChange {
  /** The field's path in the record, e.g. "options.mapping.time". */
  field: string;
  /** Plain label: "Options › mapping › time", "Setpoint RH (%)". */
  label: string;
  /** Displayed values; null where the record had no such field (created or deleted). */
  before: string | null;
  after: string | null;
}

const SKIPPED = new Set(["id", "labId", "createdAt", "updatedAt"]);
const MAX_DEPTH = 2;
const MAX_LIST = 8;
const MAX_TEXT = 160;

// Words that are abbreviations or units when they end a field name (the product's naming rule: units in names).
const WORDS: Record<string, string> = { rh: "RH", id: "ID", ids: "IDs", url: "URL", csv: "CSV", sha256: "SHA-256", gps: "GPS", exif: "EXIF" };
const UNIT_SUFFIX: Record<string, string> = { c: "(°C)", percent: "(%)", g: "(g)", l: "(L)", bytes: "(bytes)", ms: "(ms)" };

/** "setpointRhPercent" → "Setpoint RH (%)", "nominalTempC" → "Nominal temp (°C)", "archivedAt" → "Archived at". */
export function fieldLabel(key: string): string {
  const words = key
    .replace(/[_-]+/g, " ")
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .replace(/([A-Z]+)([A-Z][a-z])/g, "$1 $2")
    .trim()
    .split(/\s+/)
    .map((w) => w.toLowerCase());
  if (words.length === 0 || words[0] === "") return key;
  const last = words[words.length - 1];
  const unit = words.length > 1 ? UNIT_SUFFIX[last] : undefined;
  const body = (unit ? words.slice(0, -1) : words).map((w) => WORDS[w] ?? w);
  const text = [...body, ...(unit ? [unit] : [])].join(" ");
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** "Temp (°C)" → "temp (°C)" inside a path; abbreviations ("RH (%)") stay as they are. */
function lowerFirst(label: string): string {
  return /^[A-Z0-9-]{2,}\b/.test(label) ? label : label.charAt(0).toLowerCase() + label.slice(1);
}

const ISO_DATETIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(?::\d{2}(?:\.\d+)?)?(?:Z|[+-]\d{2}:?\d{2})$/;

/** One value as text: dates as elsewhere in the product (UTC with the zone named), yes/no, lists joined. */
export function formatAuditValue(value: unknown): string {
  if (value === null || value === undefined) return "—";
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "—";
  if (typeof value === "string") {
    if (ISO_DATETIME.test(value) && !Number.isNaN(Date.parse(value))) return formatDateTime(value);
    if (value === "") return "(empty)";
    return value.length > MAX_TEXT ? `${value.slice(0, MAX_TEXT - 1)}…` : value;
  }
  if (Array.isArray(value)) {
    if (value.length === 0) return "none";
    if (value.every((v) => v === null || typeof v !== "object")) {
      const shown = value.slice(0, MAX_LIST).map(formatAuditValue).join(", ");
      return value.length > MAX_LIST ? `${shown}, … (${value.length} in all)` : shown;
    }
    return `${value.length} ${value.length === 1 ? "entry" : "entries"}`;
  }
  const keys = Object.keys(value as object);
  return `${keys.length} ${keys.length === 1 ? "field" : "fields"}`;
}

const isRecord = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === "object" && !Array.isArray(v);
const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);

function walk(before: unknown, after: unknown, path: string[], labels: string[], out: AuditChange[], beforeExists: boolean, afterExists: boolean) {
  const depth = path.length;
  if (depth < MAX_DEPTH + 1 && (isRecord(before) || isRecord(after)) && (before == null || isRecord(before)) && (after == null || isRecord(after))) {
    const b = (before ?? {}) as Record<string, unknown>;
    const a = (after ?? {}) as Record<string, unknown>;
    for (const key of [...new Set([...Object.keys(b), ...Object.keys(a)])]) {
      if (depth === 0 && SKIPPED.has(key)) continue;
      const inB = beforeExists && before != null && key in b;
      const inA = afterExists && after != null && key in a;
      walk(b[key], a[key], [...path, key], [...labels, depth === 0 ? fieldLabel(key) : lowerFirst(fieldLabel(key))], out, inB, inA);
    }
    return;
  }
  if (beforeExists && afterExists && same(before, after)) return;
  // A new record's empty fields were not set; a deleted record's empty fields held nothing.
  if (!beforeExists && (after === null || after === undefined)) return;
  if (!afterExists && (before === null || before === undefined)) return;
  out.push({ field: path.join("."), label: labels.join(" › "), before: beforeExists ? formatAuditValue(before) : null, after: afterExists ? formatAuditValue(after) : null });
}

/**
 * The changed fields between two audit records (either may be null: created or deleted). Nested
 * records are followed two levels down; deeper structures and lists of records count their entries.
 * Records that are not objects (a list of swapped placements) give one line for the whole record.
 */
export function auditChanges(before: unknown, after: unknown): AuditChange[] {
  const out: AuditChange[] = [];
  if (before == null && after == null) return out;
  if ((before == null || isRecord(before)) && (after == null || isRecord(after))) {
    walk(before, after, [], [], out, before != null, after != null);
    return out;
  }
  if (!same(before, after)) out.push({ field: "", label: "Record", before: before == null ? null : formatAuditValue(before), after: after == null ? null : formatAuditValue(after) });
  return out;
}
