// CSV as RFC 4180 and the Frictionless default dialect describe it: comma, double quotes doubled
// inside quoted cells, CRLF between records, UTF-8, a header row. Every CSV the product writes goes
// through toCsv, so one rule guards text cells against spreadsheet formulas.

const NEEDS_QUOTES = /[",\r\n]|^\s|\s$/;

// A spreadsheet runs a cell that starts with one of these as a formula (OWASP "CSV Injection").
// Text cells that would start so get a leading apostrophe; so do text cells that already start with
// apostrophes before such a character, so that removing one apostrophe on import is always exact.
const GUARDED_START = /^'*[=+\-@\t\r]/;

/** A text cell as written: with a leading "'" when a spreadsheet would otherwise read a formula. */
export function guardText(text: string): string {
  return GUARDED_START.test(text) ? `'${text}` : text;
}

/** The inverse of guardText, for reading our own exports back. */
export function unguardText(text: string): string {
  return text.startsWith("'") && GUARDED_START.test(text.slice(1)) ? text.slice(1) : text;
}

export function csvCell(text: string): string {
  return NEEDS_QUOTES.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * Header and rows as CSV. `textColumns[i]` false marks column i as non-text (numbers, dates,
 * booleans): written as is. Every other cell, and every header, is text and is guarded.
 */
export function toCsv(
  header: readonly string[],
  rows: readonly (readonly string[])[],
  textColumns: readonly boolean[] = [],
): string {
  const line = (cells: readonly string[], isHeader: boolean) =>
    cells.map((c, i) => csvCell(isHeader || textColumns[i] !== false ? guardText(c) : c)).join(",");
  const lines = [line(header, true), ...rows.map((cells) => line(cells, false))];
  return `${lines.join("\r\n")}\r\n`;
}
