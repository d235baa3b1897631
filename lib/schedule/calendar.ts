// Calendar-day arithmetic that keeps the wall-clock time of day.
// Default zone is UTC: plain UTC day arithmetic, identical on every server whatever its TZ setting.
// With an IANA zone (the lab's), days are counted on that zone's calendar so an inspection planned
// for 09:00 stays at 09:00 local time across a daylight-saving change.

export const DAY_MS = 86_400_000;

type WallClock = { year: number; month: number; day: number; hour: number; minute: number; second: number; ms: number };

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    // Throws RangeError for an unknown zone, which is what callers should see.
    f = new Intl.DateTimeFormat("en-US", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "numeric",
      day: "numeric",
      hour: "numeric",
      minute: "numeric",
      second: "numeric",
    });
    formatters.set(timeZone, f);
  }
  return f;
}

function wallClock(date: Date, timeZone: string): WallClock {
  const parts: Record<string, number> = {};
  for (const p of formatterFor(timeZone).formatToParts(date)) {
    if (p.type !== "literal" && p.type !== "era") parts[p.type] = Number(p.value);
  }
  const t = date.getTime();
  return {
    year: parts.year,
    month: parts.month,
    day: parts.day,
    hour: parts.hour,
    minute: parts.minute,
    second: parts.second,
    ms: ((t % 1000) + 1000) % 1000,
  };
}

/** Offset of the zone from UTC at an instant, in ms (positive east of Greenwich). */
function offsetMs(instantMs: number, timeZone: string): number {
  const w = wallClock(new Date(instantMs), timeZone);
  return Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second, w.ms) - instantMs;
}

/**
 * The instant at which the zone's clock shows the given wall time (given as a UTC-epoch number of
 * the wall fields). A wall time skipped by a spring-forward change lands one offset-step later.
 */
function wallToInstant(wallAsUtcMs: number, timeZone: string): number {
  const first = wallAsUtcMs - offsetMs(wallAsUtcMs, timeZone);
  return wallAsUtcMs - offsetMs(first, timeZone);
}

function isUtc(timeZone: string | undefined): boolean {
  return timeZone === undefined || timeZone === "UTC" || timeZone === "Etc/UTC";
}

export function assertValidDate(date: Date, what: string): void {
  if (!(date instanceof Date) || Number.isNaN(date.getTime())) throw new RangeError(`${what} is not a valid date`);
}

/** `days` calendar days after `start`, same wall-clock time of day in `timeZone` (default UTC). */
export function addCalendarDays(start: Date, days: number, timeZone?: string): Date {
  if (isUtc(timeZone)) return new Date(start.getTime() + days * DAY_MS);
  const tz = timeZone as string;
  const w = wallClock(start, tz);
  return new Date(wallToInstant(Date.UTC(w.year, w.month - 1, w.day + days, w.hour, w.minute, w.second, w.ms), tz));
}

/** Midnight starting the calendar day that is `offsetDays` after the day containing `instant`. */
export function startOfDay(instant: Date, offsetDays: number, timeZone?: string): Date {
  if (isUtc(timeZone)) {
    return new Date(Date.UTC(instant.getUTCFullYear(), instant.getUTCMonth(), instant.getUTCDate() + offsetDays));
  }
  const tz = timeZone as string;
  const w = wallClock(instant, tz);
  return new Date(wallToInstant(Date.UTC(w.year, w.month - 1, w.day + offsetDays), tz));
}
