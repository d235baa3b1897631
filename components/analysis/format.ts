// Display helpers for the comparison pages (days since start, percentages, p-values).

export function fmtDay(day: number | null | undefined): string {
  if (day == null || !Number.isFinite(day)) return "—";
  return day.toFixed(1);
}

/** A table column's day, in whole days since the start ("day 7"); the exact day goes in its title. */
export function dayHeader(day: number): string {
  return `day ${Math.round(day)}`;
}

/** The interval notation "(7.0, 14.0]" of a first event, and what it means in plain words (for a title). */
export function intervalText(lower: number, upper: number, event: "rust" | "weeping" = "rust"): { text: string; title: string } {
  const clean = event === "rust" ? "last clean look" : "last look without weeping";
  return {
    text: `(${fmtDay(lower)}, ${fmtDay(upper)}]`,
    title: `${event === "rust" ? "Rust" : "Weeping"} first seen between day ${fmtDay(lower)} (${clean}) and day ${fmtDay(upper)}`,
  };
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
