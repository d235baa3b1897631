// Where an object is and was: stays are half-open intervals [fromAt, toAt) in one location each,
// toAt null for the stay that is still open. Pure rules for the move query and for time-in-place sums.

export type Stay = { locationId: string; fromAt: Date; toAt: Date | null };

export type MoveCheck = { ok: true } | { ok: false; field: "at" | "locationId"; message: string };

/** A move at `at` to `locationId` after the object's open stay (if any). */
export function checkMove(open: Stay | null, locationId: string, at: Date, now: Date = new Date()): MoveCheck {
  if (at.getTime() > now.getTime() + 5 * 60_000) return { ok: false, field: "at", message: "That time is in the future." };
  if (!open) return { ok: true };
  if (open.locationId === locationId) return { ok: false, field: "locationId", message: "The object is already there." };
  if (at.getTime() <= open.fromAt.getTime()) {
    return { ok: false, field: "at", message: `The move must be after the object arrived where it is now (${open.fromAt.toISOString().slice(0, 16).replace("T", " ")} UTC).` };
  }
  return { ok: true };
}

/** The location an object was in at instant t, or null. */
export function locationAt(stays: readonly Stay[], t: Date): string | null {
  const ms = t.getTime();
  const hit = stays.find((s) => s.fromAt.getTime() <= ms && (s.toAt === null || ms < s.toAt.getTime()));
  return hit?.locationId ?? null;
}

/** Two stays of one object that overlap in time (what the database's exclusion constraint refuses). */
export function overlaps(a: Stay, b: Stay): boolean {
  const aEnd = a.toAt?.getTime() ?? Infinity;
  const bEnd = b.toAt?.getTime() ?? Infinity;
  return a.fromAt.getTime() < bEnd && b.fromAt.getTime() < aEnd;
}

/** Milliseconds spent in each location within [from, to): open stays count up to `to`. */
export function msByLocation(stays: readonly Stay[], from: Date, to: Date): Map<string, number> {
  const out = new Map<string, number>();
  const lo = from.getTime();
  const hi = to.getTime();
  for (const s of stays) {
    const start = Math.max(lo, s.fromAt.getTime());
    const end = Math.min(hi, s.toAt?.getTime() ?? Infinity);
    if (end > start) out.set(s.locationId, (out.get(s.locationId) ?? 0) + (end - start));
  }
  return out;
}
