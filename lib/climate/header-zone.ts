// The time zone a logger file states in its time column's header ("Date Time, GMT+01:00",
// "Time (UTC-05:00)", "Timestamp (Europe/Berlin)"). The importer uses it as the default zone and
// warns when the zone a user chose gives a different offset at the file's times: otherwise every
// reading moves by the difference without anyone noticing. Zone maths go through lib/time/zone.ts
// (via zoneResolver).
import { assertKnownZone } from "@/lib/time/zone";
import { zoneResolver } from "@/lib/climate/time-parse";

export interface StatedZone {
  /** The zone in a form the importer takes: "UTC", "+01:00", "-05:30" or an IANA name. */
  zone: string;
  /** The zone as the header writes it ("GMT+01:00"). */
  label: string;
  /** The header cell it was read from. */
  header: string;
}

// "GMT+01:00", "UTC-5", "UTC +5:30", "GMT−03" (with a typographic minus).
const NAMED_OFFSET = /\b(?:GMT|UTC)\s*([+\-\u2212])\s*(\d{1,2})(?::?(\d{2}))?(?![\d:])/i;
// A bare offset in brackets or after a comma: "(+01:00)", ", -0500".
const BARE_OFFSET = /(?:^|[(\[,;])\s*([+\-\u2212])(\d{2}):?(\d{2})\s*(?:$|[)\],;])/;
// "UTC" or "GMT" on its own.
const PLAIN_UTC = /(?:^|[^A-Za-z])(UTC|GMT)(?![A-Za-z+\-\u2212\d])/i;
// An IANA name: Area/Location, possibly with a second level (America/Argentina/Salta).
const IANA = /\b([A-Z][A-Za-z_]+(?:\/[A-Za-z0-9_+\-]+){1,2})\b/g;

function offsetZone(sign: string, hh: string, mm: string | undefined): string | null {
  const hours = Number(hh);
  const minutes = mm === undefined ? 0 : Number(mm);
  if (minutes >= 60 || hours * 60 + minutes > 14 * 60) return null;
  const negative = sign !== "+" && hours * 60 + minutes > 0;
  return `${negative ? "-" : "+"}${String(hours).padStart(2, "0")}:${String(minutes).padStart(2, "0")}`;
}

function isKnownZone(name: string): boolean {
  try {
    assertKnownZone(name);
    return true;
  } catch {
    return false;
  }
}

/** The zone one header cell states, or null when it states none. */
export function zoneFromHeaderCell(cell: string): StatedZone | null {
  const header = cell.replace(/^\uFEFF/, "").trim();
  // Known IANA names first, so "Etc/GMT+1" (which is UTC−1) is not read as an offset.
  for (const m of header.matchAll(IANA)) {
    if (isKnownZone(m[1])) return { zone: m[1], label: m[1], header };
  }
  const named = NAMED_OFFSET.exec(header);
  if (named) {
    const zone = offsetZone(named[1], named[2], named[3]);
    return zone ? { zone, label: named[0].trim(), header } : null;
  }
  const bare = BARE_OFFSET.exec(header);
  if (bare) {
    const zone = offsetZone(bare[1], bare[2], bare[3]);
    return zone ? { zone, label: `${bare[1]}${bare[2]}:${bare[3]}`, header } : null;
  }
  const utc = PLAIN_UTC.exec(header);
  if (utc) return { zone: "UTC", label: utc[1], header };
  return null;
}

/** The zone stated by the time column header(s): the first cell that states one. */
export function zoneFromHeader(cells: readonly string[]): StatedZone | null {
  for (const cell of cells) {
    const stated = zoneFromHeaderCell(cell);
    if (stated) return stated;
  }
  return null;
}

export interface ZoneDisagreement {
  /** The wall-clock time (fields as UTC ms) at which the two zones differ. */
  wallMs: number;
  /** Minutes east of UTC of the stated and the chosen zone at that time. */
  statedMinutes: number;
  chosenMinutes: number;
}

/**
 * The first of the wall-clock times at which the chosen zone gives another offset than the zone the
 * file states, or null when they agree at all of them (or either zone is unknown: the import says so).
 */
export function zoneDisagreement(stated: string, chosen: string, wallTimes: Iterable<number>): ZoneDisagreement | null {
  let a: ReturnType<typeof zoneResolver>;
  let b: ReturnType<typeof zoneResolver>;
  try {
    a = zoneResolver(stated);
    b = zoneResolver(chosen);
  } catch {
    return null;
  }
  for (const wallMs of wallTimes) {
    const statedUtc = a.toUtcMs(wallMs);
    const chosenUtc = b.toUtcMs(wallMs);
    if (statedUtc !== chosenUtc) return { wallMs, statedMinutes: (wallMs - statedUtc) / 60_000, chosenMinutes: (wallMs - chosenUtc) / 60_000 };
  }
  return null;
}

/** "+01:00", "-05:30", "±00:00" for UTC. */
export function formatOffsetMinutes(minutes: number): string {
  if (minutes === 0) return "±00:00";
  const abs = Math.abs(minutes);
  return `${minutes < 0 ? "\u2212" : "+"}${String(Math.floor(abs / 60)).padStart(2, "0")}:${String(abs % 60).padStart(2, "0")}`;
}

/** The warning shown beside the import settings. */
export function zoneDisagreementMessage(stated: StatedZone, chosen: string, d: ZoneDisagreement): string {
  const at = new Date(d.wallMs).toISOString().slice(0, 16).replace("T", " ");
  const shiftMinutes = d.statedMinutes - d.chosenMinutes;
  const shift = Math.abs(shiftMinutes) % 60 === 0 ? `${Math.abs(shiftMinutes) / 60} h` : `${Math.abs(shiftMinutes)} min`;
  return `The file's header states ${stated.label} (UTC${formatOffsetMinutes(d.statedMinutes)}), but the zone chosen, ${chosen}, is UTC${formatOffsetMinutes(d.chosenMinutes)} at ${at} on the file's clock: readings would be stored ${shift} ${shiftMinutes > 0 ? "later" : "earlier"} than the header says. Choose the zone the logger was set to.`;
}
