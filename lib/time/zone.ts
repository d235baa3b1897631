// Time-zone arithmetic on Intl (the runtime's IANA database, no date library): the wall clock of a zone
// at an instant, the zone's offset, and the instant a wall-clock time stands for. Shared by the inspection
// calendar (lib/schedule/calendar.ts) and the logger-file importer (lib/climate/time-parse.ts).

export type WallClock = { year: number; month: number; day: number; hour: number; minute: number; second: number; ms: number };

const formatters = new Map<string, Intl.DateTimeFormat>();

/** A cached formatter for the zone; throws RangeError for an unknown zone. */
function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", {
      timeZone, hourCycle: "h23", year: "numeric", month: "numeric", day: "numeric", hour: "numeric", minute: "numeric", second: "numeric",
    });
    formatters.set(timeZone, f);
  }
  return f;
}

/** Throws RangeError unless the runtime knows the IANA zone. */
export function assertKnownZone(timeZone: string): void {
  formatterFor(timeZone);
}

/** The zone's wall-clock fields at an instant. */
export function wallClock(instantMs: number, timeZone: string): WallClock {
  const parts: Record<string, number> = {};
  for (const p of formatterFor(timeZone).formatToParts(new Date(instantMs))) {
    if (p.type !== "literal" && p.type !== "era") parts[p.type] = Number(p.value);
  }
  return { year: parts.year, month: parts.month, day: parts.day, hour: parts.hour, minute: parts.minute, second: parts.second, ms: ((instantMs % 1000) + 1000) % 1000 };
}

/** Offset of the zone from UTC at an instant, in ms (positive east of Greenwich). */
export function zoneOffsetMs(instantMs: number, timeZone: string): number {
  const w = wallClock(instantMs, timeZone);
  return Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second, w.ms) - instantMs;
}

const DAY_MS = 86_400_000;

/**
 * The instant at which a zone's clock shows a wall time (its fields given as a UTC-epoch number), with
 * `offsetAt` the zone's offset at an instant. The offsets a day before and a day after bracket any
 * change near the wall time; each gives a candidate, kept if the zone's clock shows the wall time
 * then. A time in the autumn's repeated hour fits both and resolves to the later (standard-time)
 * instant; a time in the spring gap, which never existed, fits neither and is read with the offset
 * before the change, i.e. moved forward by the gap.
 */
export function wallToUtcMs(wallMs: number, offsetAt: (utcMs: number) => number): number {
  const before = wallMs - offsetAt(wallMs - DAY_MS);
  const after = wallMs - offsetAt(wallMs + DAY_MS);
  const fits = (utcMs: number) => utcMs + offsetAt(utcMs) === wallMs;
  const fitsBefore = fits(before);
  const fitsAfter = fits(after);
  if (fitsBefore && fitsAfter) return Math.max(before, after);
  if (fitsAfter) return after;
  return before;
}
