// A move's rule: refused to where the object is, before it arrived there, or in the future.
import { describe, expect, it } from "vitest";
import { checkMove, type Stay } from "@/lib/collection/stays";

const t = (s: string) => new Date(`${s}Z`);

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
