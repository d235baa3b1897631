// Import of hygrometer/logger CSV exports into chamber readings. Logger files vary by maker:
// metadata lines before the header, ";" with decimal commas, °F, local time without offset, day-
// first dates. The options cover those; previewCsv guesses them so the form starts pre-filled.
// papaparse does the splitting (quotes, embedded delimiters); everything else is ours.

import { detectDelimiter, eachRow, parseLoggerNumber, prepareText, type ColumnRef, type CsvColumnMapping } from "@/lib/climate/csv-rows";
import { zoneFromHeader, type StatedZone, type ZoneDisagreement } from "@/lib/climate/header-zone";
import { readLocalTime, zoneResolver, type DateFormat, type ZoneResolver } from "@/lib/climate/time-parse";

export type CsvDelimiter = "auto" | "," | ";" | "\t";

export interface CsvImportOptions {
  mapping: CsvColumnMapping;
  delimiter?: CsvDelimiter;
  /** Physical lines to skip before the header (logger metadata). */
  skipLines?: number;
  /** Whether the first row after the skipped lines is a header. Default true. */
  hasHeader?: boolean;
  /**
   * Zone for timestamps without an offset: IANA name ("Europe/Berlin") or offset ("+02:00"). Default: the
   * zone the time column's header states ("Date Time, GMT+01:00"), else UTC.
   */
  timeZone?: string;
  /** Unit of the temperature and dew point columns. Default "C". */
  temperatureUnit?: "C" | "F";
  dateFormat?: DateFormat;
}

export interface ImportedReading {
  takenAt: Date;
  rhPercent: number;
  tempC: number | null;
  dewPointC?: number | null;
}

export interface CsvImportError {
  /** 1-based physical line of the file. */
  line: number;
  message: string;
}

export interface CsvImportResult {
  /** Valid readings sorted by time. */
  rows: ImportedReading[];
  errors: CsvImportError[];
  duplicatesSkipped: number;
  /** The zone the time column's header states, if any. */
  statedZone: StatedZone | null;
  /** The first row at which the zone used gives another offset than the stated one (a warning, not an error). */
  zoneDisagreement: (ZoneDisagreement & { line: number }) | null;
}

export const TEMP_LIMITS_C: readonly [number, number] = [-60, 90];

interface ResolvedColumns {
  time: number[];
  /** How errors name the time column(s): 'column "Date Time"' or 'column 1'. */
  timeLabel: string;
  /** Header cells of the time column(s), empty without a header. */
  timeHeaders: string[];
  rh: number;
  temp: number | null;
  dew: number | null;
}

function resolveColumn(ref: ColumnRef, header: string[] | null, label: string): number {
  if (typeof ref === "number") {
    if (!Number.isInteger(ref) || ref < 0) throw new RangeError(`${label}: column index must be a whole number ≥ 0`);
    return ref;
  }
  if (!header) throw new RangeError(`${label}: column "${ref}" is a name, but the file has no header row`);
  const wanted = ref.trim().toLowerCase();
  const index = header.findIndex((h) => h.trim().toLowerCase() === wanted);
  if (index < 0) throw new RangeError(`${label}: column "${ref}" is not in the header`);
  return index;
}

function resolveColumns(mapping: CsvColumnMapping, header: string[] | null): ResolvedColumns {
  const timeRefs: readonly ColumnRef[] = Array.isArray(mapping.time) ? mapping.time : [mapping.time as ColumnRef];
  const time = timeRefs.map((ref) => resolveColumn(ref, header, "Time"));
  const names = time.map((i) => (header?.[i]?.trim() ? `"${header[i].trim()}"` : `${i + 1}`));
  return {
    time,
    timeLabel: names.length === 1 ? `column ${names[0]}` : `columns ${names.join(" and ")}`,
    timeHeaders: header ? time.map((i) => header[i] ?? "") : [],
    rh: resolveColumn(mapping.rhPercent, header, "RH"),
    temp: mapping.tempC == null ? null : resolveColumn(mapping.tempC, header, "Temperature"),
    dew: mapping.dewPointC == null ? null : resolveColumn(mapping.dewPointC, header, "Dew point"),
  };
}

export function importCsv(text: string, options: CsvImportOptions): CsvImportResult {
  const skipLines = options.skipLines ?? 0;
  if (!Number.isInteger(skipLines) || skipLines < 0) throw new RangeError("skipLines must be a whole number ≥ 0");
  const { body, lineOffset } = prepareText(text, skipLines);
  const delimiter = !options.delimiter || options.delimiter === "auto" ? detectDelimiter(body) : options.delimiter;
  // A zone given in the options is checked before any row is read; without one, the header decides.
  let zone: ZoneResolver | null = options.timeZone ? zoneResolver(options.timeZone) : null;
  let statedZone: StatedZone | null = null;
  let stated: ZoneResolver | null = null;
  let zoneDisagreement: CsvImportResult["zoneDisagreement"] = null;
  const dateFormat = options.dateFormat ?? "auto";
  const fahrenheit = options.temperatureUnit === "F";
  const toC = (value: number) => (fahrenheit ? ((value - 32) * 5) / 9 : value);
  const wantDew = options.mapping.dewPointC != null;

  const rows: ImportedReading[] = [];
  const errors: CsvImportError[] = [];
  const seen = new Set<number>();
  let duplicatesSkipped = 0;
  let sorted = true;
  let lastMs = -Infinity;
  let columns: ResolvedColumns | null = options.hasHeader === false ? resolveColumns(options.mapping, null) : null;
  if (columns) zone ??= zoneResolver("UTC");
  let needed = columns ? Math.max(...columns.time, columns.rh, columns.temp ?? 0, columns.dew ?? 0) + 1 : 0;
  let failed = false;

  eachRow(body, lineOffset, delimiter, (cells, line, parseError) => {
    if (failed) return;
    if (!columns) {
      try {
        columns = resolveColumns(options.mapping, cells.map((c) => c.replace(/^\uFEFF/, "")));
      } catch (error) {
        errors.push({ line, message: (error as Error).message });
        failed = true;
        return;
      }
      needed = Math.max(...columns.time, columns.rh, columns.temp ?? 0, columns.dew ?? 0) + 1;
      statedZone = zoneFromHeader(columns.timeHeaders);
      zone ??= zoneResolver(statedZone?.zone ?? "UTC");
      if (statedZone && options.timeZone) stated = zoneResolver(statedZone.zone);
      return;
    }
    if (parseError) {
      errors.push({ line, message: `Unreadable row: ${parseError}` });
      return;
    }
    if (cells.length < needed) {
      errors.push({ line, message: `Expected at least ${needed} columns, found ${cells.length}` });
      return;
    }
    const problems: string[] = [];
    const timeText = columns.time.length === 1 ? cells[columns.time[0]] : columns.time.map((i) => cells[i].trim()).join(" ");
    const local = readLocalTime(timeText, dateFormat);
    let takenMs = Number.NaN;
    if (!local.ok) problems.push(`${columns.timeLabel}: ${local.problem}`);
    else if (local.value.offsetMinutes !== null) takenMs = local.value.wallMs - local.value.offsetMinutes * 60_000;
    else {
      takenMs = (zone as ZoneResolver).toUtcMs(local.value.wallMs);
      if (stated && !zoneDisagreement) {
        const statedMs = stated.toUtcMs(local.value.wallMs);
        if (statedMs !== takenMs) {
          zoneDisagreement = { line, wallMs: local.value.wallMs, statedMinutes: (local.value.wallMs - statedMs) / 60_000, chosenMinutes: (local.value.wallMs - takenMs) / 60_000 };
        }
      }
    }

    const rh = parseLoggerNumber(cells[columns.rh]);
    if (rh === null) problems.push("RH is empty");
    else if (Number.isNaN(rh)) problems.push(`RH "${cells[columns.rh].trim()}" is not a number`);
    else if (rh < 0 || rh > 100) problems.push(`RH ${rh} % is outside 0–100 %`);

    let tempC: number | null = null;
    if (columns.temp !== null) {
      const raw = parseLoggerNumber(cells[columns.temp]);
      if (raw !== null && Number.isNaN(raw)) problems.push(`temperature "${cells[columns.temp].trim()}" is not a number`);
      else if (raw !== null) {
        tempC = toC(raw);
        if (tempC < TEMP_LIMITS_C[0] || tempC > TEMP_LIMITS_C[1]) problems.push(`temperature ${round1(tempC)} °C is outside −60…90 °C`);
      }
    }
    let dewPointC: number | null = null;
    if (columns.dew !== null) {
      const raw = parseLoggerNumber(cells[columns.dew]);
      if (raw !== null && Number.isNaN(raw)) problems.push(`dew point "${cells[columns.dew].trim()}" is not a number`);
      else if (raw !== null) {
        dewPointC = toC(raw);
        if (dewPointC < -90 || dewPointC > TEMP_LIMITS_C[1]) problems.push(`dew point ${round1(dewPointC)} °C is outside −90…90 °C`);
      }
    }
    if (problems.length > 0) {
      errors.push({ line, message: capitalise(problems.join("; ")) });
      return;
    }
    if (seen.has(takenMs)) {
      duplicatesSkipped++;
      return;
    }
    seen.add(takenMs);
    if (takenMs < lastMs) sorted = false;
    lastMs = takenMs;
    const reading: ImportedReading = { takenAt: new Date(takenMs), rhPercent: rh as number, tempC };
    if (wantDew) reading.dewPointC = dewPointC;
    rows.push(reading);
  });

  if (!columns && !failed && options.hasHeader !== false) {
    errors.push({ line: lineOffset + 1, message: "The file has no header row after the skipped lines" });
  }
  if (!sorted) rows.sort((a, b) => a.takenAt.getTime() - b.takenAt.getTime());
  return { rows, errors, duplicatesSkipped, statedZone, zoneDisagreement };
}

function round1(value: number): number {
  return Math.round(value * 10) / 10;
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

