// Calendar-day arithmetic that keeps the wall-clock time of day.
// Default zone is UTC: plain UTC day arithmetic, identical on every server whatever its TZ setting.
// With an IANA zone (the lab's), days are counted on that zone's calendar so an inspection planned
// for 09:00 stays at 09:00 local time across a daylight-saving change.

import { wallClock, wallToUtcMs, zoneOffsetMs } from "@/lib/time/zone";

export const DAY_MS = 86_400_000;

/** The instant at which the zone's clock shows the given wall time (fields as a UTC-epoch number). */
function wallToInstant(wallAsUtcMs: number, timeZone: string): number {
  return wallToUtcMs(wallAsUtcMs, (t) => zoneOffsetMs(t, timeZone));
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
  const w = wallClock(start.getTime(), tz);
  return new Date(wallToInstant(Date.UTC(w.year, w.month - 1, w.day + days, w.hour, w.minute, w.second, w.ms), tz));
}

/** Midnight starting the calendar day that is `offsetDays` after the day containing `instant`. */
export function startOfDay(instant: Date, offsetDays: number, timeZone?: string): Date {
  if (isUtc(timeZone)) {
    return new Date(Date.UTC(instant.getUTCFullYear(), instant.getUTCMonth(), instant.getUTCDate() + offsetDays));
  }
  const tz = timeZone as string;
  const w = wallClock(instant.getTime(), tz);
  return new Date(wallToInstant(Date.UTC(w.year, w.month - 1, w.day + offsetDays), tz));
}
