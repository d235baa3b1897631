// Timestamp parsing for logger files. Loggers mostly write local wall-clock time without an
// offset, so the importer needs the zone the logger was set to. Offsets come from Intl (no date
// library): a zone's offset at an instant is read from formatToParts and cached per 15 minutes,
// which is finer than any real zone's transition rule and keeps 100,000-row files fast.
// A time that cannot be read says which part failed and what was expected there, so a user can
// fix the file or the settings without guessing.
import { assertKnownZone, wallToUtcMs, zoneOffsetMs } from "@/lib/time/zone";

export type DateFormat = "auto" | "iso" | "ymd" | "dmy" | "mdy";

export interface ParsedLocalTime {
  /** Wall-clock fields interpreted as if they were UTC, in ms. */
  wallMs: number;
  /** Explicit offset written in the timestamp (minutes east of UTC), if any. */
  offsetMinutes: number | null;
}

/** A parsed time, or what is wrong with it: the failing part quoted, then what was expected. */
export type LocalTimeResult = { ok: true; value: ParsedLocalTime } | { ok: false; problem: string };

// Time of day: "13:05", "13:05:30.5", and the 12-hour forms "1:05 PM", "12:00:00 AM", "1:05 p.m.".
const TIME_PART = String.raw`(?<time>(?<hh>\d{1,2}):(?<mi>\d{2})(?::(?<ss>\d{2})(?:[.,](?<frac>\d+))?)?(?:\s*(?<ampm>[ap])\.?\s*m\.?)?)`;
const OFFSET_PART = String.raw`(?<offset>Z|[+-]\d{2}:?\d{2})`;
// Year first: ISO 8601 ("2024-03-01T12:00:00Z") or "YYYY-MM-DD HH:mm[:ss]".
const YMD = new RegExp(String.raw`^(?<date>(?<y>\d{4})-(?<a>\d{1,2})-(?<b>\d{1,2}))(?:[T ]\s*${TIME_PART})?\s*${OFFSET_PART}?$`, "i");
// Day or month first: "DD/MM/YYYY HH:mm[:ss]" (also with . or - as the date separator).
const XYY = new RegExp(String.raw`^(?<date>(?<a>\d{1,2})[/.-](?<b>\d{1,2})[/.-](?<y>\d{4}))(?:[ T]\s*${TIME_PART})?\s*${OFFSET_PART}?$`, "i");

const ORDER_NAMES: Record<"ymd" | "dmy" | "mdy", string> = { ymd: "year-month-day", dmy: "day/month/year", mdy: "month/day/year" };
const MONTHS = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"];
const EXAMPLES = "e.g. 2026-11-18 13:05, 18/11/2026 13:05 or 11/18/2026 1:05 PM";

export function parseOffsetMinutes(text: string): number | null {
  if (/^(z|utc|gmt)$/i.test(text)) return 0;
  const m = /^(?:utc|gmt)?([+-])(\d{2}):?(\d{2})$/i.exec(text);
  if (!m) return null;
  const minutes = Number(m[2]) * 60 + Number(m[3]);
  if (Number(m[3]) >= 60 || minutes > 14 * 60) return null;
  return m[1] === "-" ? -minutes : minutes;
}

type Groups = Partial<Record<"date" | "y" | "a" | "b" | "time" | "hh" | "mi" | "ss" | "frac" | "ampm" | "offset", string>>;

const fail = (problem: string): LocalTimeResult => ({ ok: false, problem });

function daysIn(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

function build(g: Groups, order: "ymd" | "dmy" | "mdy"): LocalTimeResult {
  const year = Number(g.y);
  const [a, b] = [Number(g.a), Number(g.b)];
  const month = order === "dmy" ? b : a;
  const day = order === "dmy" ? a : b;
  const date = g.date as string;
  const readAs = order === "ymd" ? "" : ` read as ${ORDER_NAMES[order]}`;
  if (month < 1 || month > 12) {
    // The other number would make a month: the file probably uses the other slash order.
    const other = order === "dmy" ? a : b;
    const hint = order !== "ymd" && other >= 1 && other <= 12 ? ` (is the date order ${ORDER_NAMES[order === "dmy" ? "mdy" : "dmy"]}?)` : "";
    return fail(`"${date}" — month ${month}${readAs}; expected 1–12${hint}`);
  }
  if (day < 1 || day > daysIn(year, month)) {
    return fail(`"${date}" — day ${day}${readAs}; ${MONTHS[month - 1]} ${year} has ${daysIn(year, month)} days`);
  }

  let hour = 0;
  let minute = 0;
  let second = 0;
  let ms = 0;
  if (g.time !== undefined) {
    const time = g.time;
    hour = Number(g.hh);
    minute = Number(g.mi);
    second = g.ss === undefined ? 0 : Number(g.ss);
    ms = g.frac === undefined ? 0 : Math.round(Number(`0.${g.frac}`) * 1000);
    if (g.ampm !== undefined) {
      const pm = g.ampm.toLowerCase() === "p";
      if (hour < 1 || hour > 12) return fail(`"${time}" — hour ${hour} with ${pm ? "PM" : "AM"}; expected 1–12 before AM/PM`);
      // 12 AM is midnight (00), 12 PM is noon (12).
      hour = (hour % 12) + (pm ? 12 : 0);
    } else if (hour > 23) {
      return fail(`"${time}" — hour ${hour}; expected 0–23 (or 1–12 followed by AM/PM)`);
    }
    if (minute > 59) return fail(`"${time}" — minute ${minute}; expected 00–59`);
    if (second > 60) return fail(`"${time}" — second ${second}; expected 00–59`);
  }
  const wallMs = Date.UTC(year, month - 1, day, hour, minute, second, ms);
  let offsetMinutes: number | null = null;
  if (g.offset !== undefined) {
    offsetMinutes = parseOffsetMinutes(g.offset);
    if (offsetMinutes === null) return fail(`"${g.offset}" — offset out of range; expected −14:00 to +14:00`);
  }
  return { ok: true, value: { wallMs, offsetMinutes } };
}

/** Guess the date format from sample timestamps; a number above 12 in front decides day/month order, else day-first wins (logger default outside the US). */
export function guessDateFormat(samples: string | readonly string[]): Exclude<DateFormat, "auto"> | null {
  const list = (typeof samples === "string" ? [samples] : samples).map((s) => s.trim()).filter((s) => s !== "");
  let slash = false;
  let secondAbove12 = false;
  for (const s of list) {
    if (YMD.test(s)) return s.includes("T") ? "iso" : "ymd";
    const m = XYY.exec(s);
    if (!m) continue;
    slash = true;
    if (Number(m.groups?.a) > 12) return "dmy";
    if (Number(m.groups?.b) > 12) secondAbove12 = true;
  }
  if (!slash) return null;
  return secondAbove12 ? "mdy" : "dmy";
}

/** Reads a timestamp cell, or says which part of it is wrong and what was expected. */
export function readLocalTime(text: string, format: DateFormat): LocalTimeResult {
  const s = text.trim();
  if (s === "") return fail("empty; expected a date and time");
  const ymd = YMD.exec(s);
  const xyy = ymd ? null : XYY.exec(s);
  if (format === "auto") {
    if (ymd) return build(ymd.groups as Groups, "ymd");
    if (xyy) return build(xyy.groups as Groups, "dmy");
  } else if (format === "iso" || format === "ymd") {
    if (ymd) return build(ymd.groups as Groups, "ymd");
    if (xyy) return fail(`"${xyy.groups?.date}" has the year last, but the date order is set to ${ORDER_NAMES.ymd}`);
  } else {
    if (xyy) return build(xyy.groups as Groups, format);
    if (ymd) return fail(`"${ymd.groups?.date}" has the year first, but the date order is set to ${ORDER_NAMES[format]}`);
  }
  return fail(`"${s}" is not a recognised date and time; expected ${EXAMPLES}`);
}

export function parseLocalTime(text: string, format: DateFormat): ParsedLocalTime | null {
  const result = readLocalTime(text, format);
  return result.ok ? result.value : null;
}

/** Converts wall-clock times in one zone (IANA name or fixed offset) to instants. */
export interface ZoneResolver {
  toUtcMs(wallMs: number): number;
}

const CACHE_STEP_MS = 15 * 60_000;

export function zoneResolver(timeZone: string): ZoneResolver {
  const fixed = parseOffsetMinutes(timeZone.trim());
  if (fixed !== null) return { toUtcMs: (wallMs) => wallMs - fixed * 60_000 };

  try {
    assertKnownZone(timeZone);
  } catch {
    throw new RangeError(`Unknown time zone "${timeZone}": use an IANA name such as "Europe/Berlin" or an offset such as "+02:00"`);
  }
  const cache = new Map<number, number>();
  // Offset (ms) of the zone at a UTC instant; exact on the cache grid, which is fine because zone
  // transitions fall on whole quarter hours.
  const offsetAt = (utcMs: number): number => {
    const key = Math.floor(utcMs / CACHE_STEP_MS);
    let offset = cache.get(key);
    if (offset === undefined) {
      offset = zoneOffsetMs(key * CACHE_STEP_MS, timeZone);
      cache.set(key, offset);
    }
    return offset;
  };
  return { toUtcMs: (wallMs) => wallToUtcMs(wallMs, offsetAt) };
}
