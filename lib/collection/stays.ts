// Where an object is and was: stays are half-open intervals [fromAt, toAt) in one location each,
// toAt null for the stay that is still open (the database refuses overlapping stays, migration 0022).
// The pure rule of a move, for the move query.

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
