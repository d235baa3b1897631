// A first look at a logger file before import: the delimiter, where the header is, which column
// is which and what unit and date format the file seems to use. Guesses only pre-fill the import
// form; the user confirms them.

import { detectDelimiter, eachRow, prepareText, type CsvColumnMapping } from "@/lib/climate/csv-rows";
import { zoneFromHeader, type StatedZone } from "@/lib/climate/header-zone";
import { guessDateFormat, type DateFormat } from "@/lib/climate/time-parse";

export interface CsvPreview {
  delimiter: "," | ";" | "\t";
  /** First rows after the skipped lines (header included), as raw strings. */
  rows: string[][];
  /** 1-based physical line of each row in `rows`. */
  lines: number[];
  /** Lines before the detected header (logger metadata), 0 when the header is first. */
  guessedSkipLines: number;
  /** Detected header cells, or null when no row looks like a header. */
  header: string[] | null;
  guessedMapping: Partial<CsvColumnMapping>;
  guessedTemperatureUnit: "C" | "F";
  guessedDateFormat: Exclude<DateFormat, "auto"> | null;
  /** The zone the guessed time column's header states ("Date Time, GMT+01:00"), if any. */
  statedZone: StatedZone | null;
}

const HEADER_SCAN_ROWS = 30;

const IS_DEW = /dew/i;
const IS_RH = /(^|[^a-z])rh([^a-z]|$)|relative|humid/i;
const IS_ABS = /abs/i;
const IS_TEMP = /temp|celsius|fahrenheit|°\s*[cf]|deg\s*[cf]/i;
const IS_DATE = /date|datum/i;
const IS_TIME = /time|zeit|timestamp/i;
const IS_FAHRENHEIT = /°\s*f|deg\s*f|fahrenheit|\(\s*f\s*\)|\[\s*f\s*\]/i;

function guessMapping(header: string[]): { mapping: Partial<CsvColumnMapping>; unit: "C" | "F" } {
  const mapping: Partial<CsvColumnMapping> = {};
  const find = (test: (h: string) => boolean) => header.find(test);
  const both = find((h) => IS_DATE.test(h) && IS_TIME.test(h));
  const dateOnly = find((h) => IS_DATE.test(h) && !IS_TIME.test(h));
  const timeOnly = find((h) => IS_TIME.test(h) && !IS_DATE.test(h));
  if (both) mapping.time = both;
  else if (dateOnly && timeOnly) mapping.time = [dateOnly, timeOnly];
  else if (dateOnly ?? timeOnly) mapping.time = (dateOnly ?? timeOnly) as string;

  const rh = find((h) => IS_RH.test(h) && !IS_ABS.test(h) && !IS_DEW.test(h));
  if (rh) mapping.rhPercent = rh;
  const temp = find((h) => IS_TEMP.test(h) && !IS_DEW.test(h) && h !== rh);
  if (temp) mapping.tempC = temp;
  const dew = find((h) => IS_DEW.test(h));
  if (dew) mapping.dewPointC = dew;
  const unit = (temp && IS_FAHRENHEIT.test(temp)) || (dew && IS_FAHRENHEIT.test(dew)) ? "F" : "C";
  return { mapping, unit };
}

function looksLikeHeader(cells: string[]): boolean {
  return cells.some((c) => IS_DATE.test(c) || IS_TIME.test(c)) && cells.some((c) => IS_RH.test(c) && !IS_DEW.test(c));
}

export function previewCsv(text: string, n = 10, options: { skipLines?: number; delimiter?: "auto" | "," | ";" | "\t" } = {}): CsvPreview {
  const { body, lineOffset } = prepareText(text, options.skipLines ?? 0);
  const delimiter = !options.delimiter || options.delimiter === "auto" ? detectDelimiter(body) : options.delimiter;
  const scanned: { cells: string[]; line: number }[] = [];
  eachRow(body, lineOffset, delimiter, (cells, line) => scanned.push({ cells, line }), Math.max(n, HEADER_SCAN_ROWS));

  const headerIndex = scanned.findIndex((r) => looksLikeHeader(r.cells));
  const header = headerIndex >= 0 ? scanned[headerIndex].cells.map((c) => c.replace(/^\uFEFF/, "").trim()) : null;
  const { mapping, unit } = header ? guessMapping(header) : { mapping: {}, unit: "C" as const };

  let guessedDateFormat: Exclude<DateFormat, "auto"> | null = null;
  let statedZone: StatedZone | null = null;
  if (header && mapping.time !== undefined) {
    const refs = Array.isArray(mapping.time) ? mapping.time : [mapping.time];
    const columns = refs.map((ref) => header.indexOf(String(ref)));
    // Every scanned data row: "11/18/2026" on a later row settles an order the first row leaves open.
    const samples = scanned.slice(headerIndex + 1).map((r) => columns.map((i) => r.cells[i] ?? "").join(" "));
    guessedDateFormat = guessDateFormat(samples);
    statedZone = zoneFromHeader(columns.map((i) => header[i] ?? ""));
  }
  const fromRow = Math.max(0, headerIndex);
  const shown = scanned.slice(fromRow, fromRow + n);
  return {
    delimiter,
    rows: shown.map((r) => r.cells),
    lines: shown.map((r) => r.line),
    guessedSkipLines: headerIndex >= 0 ? scanned[headerIndex].line - 1 : (options.skipLines ?? 0),
    header,
    guessedMapping: mapping,
    guessedTemperatureUnit: unit,
    guessedDateFormat,
    statedZone,
  };
}
