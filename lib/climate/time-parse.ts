// Timestamp parsing for logger files. Loggers mostly write local wall-clock time without an
// offset, so the importer needs the zone the logger was set to. Offsets come from Intl (no date
// library): a zone's offset at an instant is read from formatToParts and cached per 15 minutes,
// which is finer than any real zone's transition rule and keeps 100,000-row files fast.
import { assertKnownZone, wallToUtcMs, zoneOffsetMs } from "@/lib/time/zone";

export type DateFormat = "auto" | "iso" | "ymd" | "dmy" | "mdy";

export interface ParsedLocalTime {
  /** Wall-clock fields interpreted as if they were UTC, in ms. */
  wallMs: number;
  /** Explicit offset written in the timestamp (minutes east of UTC), if any. */
  offsetMinutes: number | null;
}

// Year first: ISO 8601 ("2024-03-01T12:00:00Z") or "YYYY-MM-DD HH:mm[:ss]".
const YMD = /^(\d{4})-(\d{1,2})-(\d{1,2})(?:[T ](\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?)?\s*(Z|[+-]\d{2}:?\d{2})?$/i;
// Day or month first: "DD/MM/YYYY HH:mm[:ss]" (also with . or - as the date separator).
const XYY = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4})(?:[ T](\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?)?\s*(Z|[+-]\d{2}:?\d{2})?$/i;

export function parseOffsetMinutes(text: string): number | null {
  if (/^(z|utc|gmt)$/i.test(text)) return 0;
  const m = /^(?:utc|gmt)?([+-])(\d{2}):?(\d{2})$/i.exec(text);
  if (!m) return null;
  const minutes = Number(m[2]) * 60 + Number(m[3]);
  if (Number(m[3]) >= 60 || minutes > 14 * 60) return null;
  return m[1] === "-" ? -minutes : minutes;
}

function build(
  year: number,
  month: number,
  day: number,
  hh: string | undefined,
  mm: string | undefined,
  ss: string | undefined,
  frac: string | undefined,
  offset: string | undefined,
): ParsedLocalTime | null {
  const hour = hh === undefined ? 0 : Number(hh);
  const minute = mm === undefined ? 0 : Number(mm);
  const second = ss === undefined ? 0 : Number(ss);
  const ms = frac === undefined ? 0 : Math.round(Number(`0.${frac}`) * 1000);
  if (month < 1 || month > 12 || day < 1 || hour > 23 || minute > 59 || second > 60) return null;
  const wallMs = Date.UTC(year, month - 1, day, hour, minute, second, ms);
  // Date.UTC rolls 31 April into 1 May; a real logger never writes that, so call it an error.
  if (new Date(wallMs).getUTCDate() !== day) return null;
  let offsetMinutes: number | null = null;
  if (offset !== undefined) {
    offsetMinutes = parseOffsetMinutes(offset);
    if (offsetMinutes === null) return null;
  }
  return { wallMs, offsetMinutes };
}

/** Guess the date format from a sample timestamp; day-first wins for slash dates (logger default outside the US). */
export function guessDateFormat(sample: string): Exclude<DateFormat, "auto"> | null {
  const s = sample.trim();
  if (YMD.test(s)) return s.includes("T") ? "iso" : "ymd";
  if (XYY.test(s)) return "dmy";
  return null;
}

export function parseLocalTime(text: string, format: DateFormat): ParsedLocalTime | null {
  const s = text.trim();
  if (format === "auto" || format === "iso" || format === "ymd") {
    const m = YMD.exec(s);
    if (m) return build(Number(m[1]), Number(m[2]), Number(m[3]), m[4], m[5], m[6], m[7], m[8]);
    if (format !== "auto") return null;
  }
  const m = XYY.exec(s);
  if (!m) return null;
  const [a, b] = [Number(m[1]), Number(m[2])];
  return format === "mdy"
    ? build(Number(m[3]), a, b, m[4], m[5], m[6], m[7], m[8])
    : build(Number(m[3]), b, a, m[4], m[5], m[6], m[7], m[8]);
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
