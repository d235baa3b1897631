// The collection overview as CSV: one row per storage location, in the overview's order (most in need first).
import { toCsv } from "@/lib/export/csv";
import { NEED_LABELS, type LocationNeed } from "./rule-status";

export type OverviewCsvRow = {
  path: string; objects: number; thresholdRhPercent: number | null; ruleSource: string; needs: readonly LocationNeed[];
  inRule7d: number | null; inRule30d: number | null; inRule365d: number | null; exceedances365d: number;
  lastReadingAt: Date | null; lastRhPercent: number | null; desiccantDueAt: Date | null; keeper: string | null;
};

export const OVERVIEW_CSV_COLUMNS = [
  "location", "objects", "keep_below_rh_percent", "rule_source", "needs", "time_in_rule_7d_percent", "time_in_rule_30d_percent",
  "time_in_rule_365d_percent", "exceedances_365d", "last_reading_at", "last_rh_percent", "desiccant_due_at", "keeper",
] as const;

const pct = (f: number | null) => (f === null ? "" : (f * 100).toFixed(2));
const num = (x: number | null) => (x === null ? "" : String(x));
/** Text columns (guarded against spreadsheet formulas); the rest are numbers and ISO times. */
const TEXT = [true, false, false, true, true, false, false, false, false, false, false, false, true];

export function overviewToCsv(rows: readonly OverviewCsvRow[]): string {
  return toCsv([...OVERVIEW_CSV_COLUMNS], rows.map((r) => [
    r.path, String(r.objects), num(r.thresholdRhPercent), r.ruleSource, r.needs.map((n) => NEED_LABELS[n]).join("; "),
    pct(r.inRule7d), pct(r.inRule30d), pct(r.inRule365d), String(r.exceedances365d),
    r.lastReadingAt?.toISOString() ?? "", num(r.lastRhPercent), r.desiccantDueAt?.toISOString() ?? "", r.keeper ?? "",
  ]), TEXT);
}
