// Property-based fuzzing (fast-check) of the logger CSV importer: any text, however hostile, yields
// rows or line-numbered errors — never an exception, never a reading outside the validated ranges.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { importCsv } from "@/lib/climate/csv-import";

const hostile = fc.oneof(
  fc.string({ maxLength: 40 }),
  fc.constantFrom("NaN", "Infinity", "-1e309", "1e309", "0x1F", "\u0000", "\u202e", "'; drop table readings; --", "<script>alert(1)</script>", "2026-02-30 12:00", "99,9,9", "\"unterminated", ""),
  fc.double().map(String),
);
const line = fc.tuple(fc.array(hostile, { minLength: 0, maxLength: 6 }), fc.constantFrom(",", ";", "\t")).map(([cells, d]) => cells.join(d));
const file = fc.tuple(fc.constantFrom("time,rh,temp", "timestamp;humidity;temperature", ""), fc.array(line, { maxLength: 30 }), fc.constantFrom("\n", "\r\n")).map(([h, rows, nl]) => [h, ...rows].join(nl));

describe("logger CSV importer under hostile input", () => {
  it("never throws and only returns readings inside the validated ranges", () => {
    fc.assert(
      fc.property(file, fc.constantFrom<"C" | "F">("C", "F"), (text, unit) => {
        const r = importCsv(text, { mapping: { time: 0, rhPercent: 1, tempC: 2 }, hasHeader: true, temperatureUnit: unit });
        for (const row of r.rows) {
          expect(Number.isFinite(row.takenAt.getTime())).toBe(true);
          expect(row.rhPercent).toBeGreaterThanOrEqual(0);
          expect(row.rhPercent).toBeLessThanOrEqual(100);
          if (row.tempC != null) expect(Number.isFinite(row.tempC)).toBe(true);
        }
        for (const e of r.errors) {
          expect(e.line).toBeGreaterThanOrEqual(1);
          expect(e.message.length).toBeGreaterThan(0);
        }
      }),
      { numRuns: 300 },
    );
  });
});
