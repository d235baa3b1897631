// Display helpers for the comparison pages (days since start, percentages, p-values).

export function fmtDay(day: number | null | undefined): string {
  if (day == null || !Number.isFinite(day)) return "—";
  return day.toFixed(1);
}

export function fmtPercent(x: number | null | undefined): string {
  if (x == null || !Number.isFinite(x)) return "—";
  return `${x < 1 ? x.toFixed(2) : x.toFixed(1)}\u202f%`;
}

export function fmtStat(x: number | null | undefined, digits = 2): string {
  if (x == null || !Number.isFinite(x)) return "—";
  return x.toFixed(digits);
}

/** A p-value for a table cell, where the column already says "p": "< 0.001" or two significant figures. */
export function pCell(p: number | null | undefined): string {
  if (p == null || Number.isNaN(p)) return "—";
  return p < 0.001 ? "< 0.001" : String(Number(p.toPrecision(2)));
}
