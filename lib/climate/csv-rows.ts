// Row splitting shared by the CSV importer and the preview: papaparse does the quoting rules,
// this keeps track of physical line numbers so errors point at the line a user can open.

import Papa from "papaparse";

/** A header name (matched case-insensitively) or a 0-based column index. */
export type ColumnRef = string | number;

export interface CsvColumnMapping {
  /** One column, or a [date, time] pair for loggers that split them. */
  time: ColumnRef | readonly [ColumnRef, ColumnRef];
  rhPercent: ColumnRef;
  tempC?: ColumnRef | null;
  dewPointC?: ColumnRef | null;
}

const UNIT_SUFFIX = /\s*(%\s*rh|%|°\s*[cf]|deg\s*[cf])$/i;

/** Number from a logger cell: accepts "21,5" (decimal comma) and a trailing unit ("45 %", "21 °C"). */
export function parseLoggerNumber(raw: string): number | null {
  let s = raw.trim();
  if (s === "") return null;
  s = s.replace(UNIT_SUFFIX, "");
  if (s.includes(",") && !s.includes(".")) s = s.replace(",", ".");
  if (!/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(s)) return Number.NaN;
  return Number(s);
}

/** Normalises line ends so papaparse sees one kind and physical line numbers stay countable. */
export function prepareText(text: string, skipLines: number): { body: string; lineOffset: number } {
  let normalized = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  normalized = normalized.replace(/\r\n?/g, "\n");
  let pos = 0;
  let skipped = 0;
  while (skipped < skipLines && pos < normalized.length) {
    const next = normalized.indexOf("\n", pos);
    if (next < 0) {
      pos = normalized.length;
    } else {
      pos = next + 1;
    }
    skipped++;
  }
  return { body: normalized.slice(pos), lineOffset: skipped };
}

export function detectDelimiter(body: string): "," | ";" | "\t" {
  const guess = Papa.parse<string[]>(body.slice(0, 20_000), {
    delimitersToGuess: [",", ";", "\t"],
    preview: 20,
    skipEmptyLines: "greedy",
  }).meta.delimiter;
  return guess === ";" || guess === "\t" ? guess : ",";
}

export type RowVisitor = (cells: string[], line: number, parseError: string | null) => void;

/** Streams rows with the 1-based physical line on which each row starts. */
export function eachRow(body: string, lineOffset: number, delimiter: string, visit: RowVisitor, preview = 0): void {
  let countedTo = 0;
  let line = lineOffset + 1;
  let previousStart = lineOffset;
  Papa.parse<string[]>(body, {
    delimiter,
    newline: "\n",
    skipEmptyLines: "greedy",
    preview,
    step: (result) => {
      // Find the row's last line from where papaparse stopped (stepping back over the line end),
      // then subtract newlines inside quoted cells to get the line the row starts on. Counting
      // from the end rather than the start keeps lines right after rows papaparse dropped (";;;").
      let end = result.meta.cursor;
      while (end > countedTo && isBlank(body.charCodeAt(end - 1))) end--;
      for (let i = countedTo; i < end; i++) if (body.charCodeAt(i) === 10) line++;
      countedTo = end;
      let embedded = 0;
      for (const cell of result.data) {
        for (let at = cell.indexOf("\n"); at >= 0; at = cell.indexOf("\n", at + 1)) embedded++;
      }
      const parseError = result.errors.length > 0 ? result.errors[0].message : null;
      // An unterminated quote swallows the line ends after it; a row never starts before the one after the previous row.
      const start = Math.max(previousStart + 1, line - embedded);
      previousStart = start;
      visit(result.data, start, parseError);
    },
  });
}

function isBlank(code: number): boolean {
  return code === 10 || code === 32 || code === 9;
}
