// Stays: where an object was at an instant and how long it spent in each place, checked against a
// direct recomputation (stepping through the window minute by minute and asking where the object was).
import { describe, expect, it } from "vitest";
import { checkMove, locationAt, msByLocation, overlaps, type Stay } from "@/lib/collection/stays";

const t = (s: string) => new Date(`${s}Z`);
const stays: Stay[] = [
  { locationId: "store", fromAt: t("2025-01-01T00:00:00"), toAt: t("2025-01-03T06:00:00") },
  { locationId: "box14", fromAt: t("2025-01-03T06:00:00"), toAt: t("2025-01-05T12:30:00") },
  { locationId: "store", fromAt: t("2025-01-05T12:30:00"), toAt: t("2025-01-06T00:00:00") },
  { locationId: "cabB", fromAt: t("2025-01-07T00:00:00"), toAt: null }, // a day unrecorded before it
];

function byMinute(from: Date, to: Date) {
  const out = new Map<string, number>();
  for (let ms = from.getTime(); ms < to.getTime(); ms += 60_000) {
    const loc = locationAt(stays, new Date(ms));
    if (loc) out.set(loc, (out.get(loc) ?? 0) + 60_000);
  }
  return out;
}

describe("msByLocation", () => {
  it("equals a minute-by-minute recomputation over windows that cut stays and gaps", () => {
    for (const [a, b] of [["2025-01-01T00:00:00", "2025-01-09T00:00:00"], ["2025-01-02T13:17:00", "2025-01-05T12:31:00"], ["2025-01-06T00:00:00", "2025-01-07T00:00:00"]]) {
      expect(Object.fromEntries(msByLocation(stays, t(a), t(b)))).toEqual(Object.fromEntries(byMinute(t(a), t(b))));
    }
  });
  it("gives the hand-worked hours for the whole record", () => {
    const h = Object.fromEntries([...msByLocation(stays, t("2025-01-01T00:00:00"), t("2025-01-08T00:00:00"))].map(([k, v]) => [k, v / 3_600_000]));
    // store 54 h + 11.5 h, box14 54.5 h, cabB 24 h (worked by hand).
    expect(h).toEqual({ store: 65.5, box14: 54.5, cabB: 24 });
  });
});

describe("locationAt and overlaps", () => {
  it("uses half-open stays: the move instant belongs to the new place", () => {
    expect(locationAt(stays, t("2025-01-03T06:00:00"))).toBe("box14");
    expect(locationAt(stays, t("2025-01-06T12:00:00"))).toBeNull();
  });
  it("sees overlap only when the intervals share time", () => {
    expect(overlaps(stays[0], stays[1])).toBe(false);
    expect(overlaps(stays[3], { locationId: "x", fromAt: t("2030-01-01T00:00:00"), toAt: null })).toBe(true);
  });
});

describe("checkMove", () => {
  const open: Stay = { locationId: "cabB", fromAt: t("2025-01-07T00:00:00"), toAt: null };
  const now = t("2025-02-01T00:00:00");
  it("refuses a move to where the object is, before its arrival, or in the future, naming the field", () => {
    expect(checkMove(open, "cabB", t("2025-01-08T00:00:00"), now)).toMatchObject({ ok: false, field: "locationId" });
    expect(checkMove(open, "store", t("2025-01-07T00:00:00"), now)).toMatchObject({ ok: false, field: "at" });
    expect(checkMove(open, "store", t("2025-03-01T00:00:00"), now)).toMatchObject({ ok: false, field: "at", message: "That time is in the future." });
  });
  it("allows a later move and a first placement", () => {
    expect(checkMove(open, "store", t("2025-01-08T00:00:00"), now)).toEqual({ ok: true });
    expect(checkMove(null, "store", t("2025-01-08T00:00:00"), now)).toEqual({ ok: true });
  });
});
