import { describe, expect, it } from "vitest";
import { chlorideStateOf, daysBetween, latestToday, massChanges, massToTenthMg, tenthMgToGramsText } from "@/lib/specimens/history";
import { historyEntrySchema } from "@/lib/validation/specimen-history";
import { z } from "zod";

const SPECIMEN = "7a0c2f0e-3c1b-4f57-9b5e-2d8c1f0a9b11";

describe("masses to 0.1 mg", () => {
  it("reads grams with up to 4 decimals and milligrams with up to 1, exactly", () => {
    expect(massToTenthMg("12.3456", "g")).toBe(123456);
    expect(massToTenthMg("12345.6", "mg")).toBe(123456);
    expect(massToTenthMg("12.34560", "g")).toBe(123456); // trailing zeros are not extra precision
    expect(massToTenthMg("12.34567", "g")).toBeNull();
    expect(massToTenthMg("12345.67", "mg")).toBeNull();
    expect(massToTenthMg("-1", "g")).toBeNull();
    expect(massToTenthMg("1e3", "g")).toBeNull();
    expect(tenthMgToGramsText(123456)).toBe("12.3456");
    expect(tenthMgToGramsText(5)).toBe("0.0005");
  });
});

describe("mass change over time", () => {
  // Raw data invented for the test; every expected value is recomputed below by hand from it.
  const raw = [
    { measuredOn: "2026-03-01", massG: "12.3420" },
    { measuredOn: "2026-01-01", massG: "12.3456" },
    { measuredOn: "2026-01-31", massG: "12.3501" },
  ];

  it("orders by date and gives g, % and per-day changes against a direct computation", () => {
    const rows = massChanges(raw);
    expect(rows.map((r) => r.measuredOn)).toEqual(["2026-01-01", "2026-01-31", "2026-03-01"]);
    expect(rows[0].sincePrevious).toBeNull();
    // Calendar: January has 31 days, so 1 Jan → 31 Jan is 30 days and 1 Jan → 1 Mar 2026 is 31 + 28 = 59.
    expect(rows[1].sincePrevious!.days).toBe(30);
    expect(rows[2].sinceFirst!.days).toBe(59);
    expect(rows[2].sincePrevious!.days).toBe(29);
    // Direct computation in tenths of a milligram: 123501 − 123456 = 45 → 0.0045 g.
    expect(rows[1].sincePrevious!.changeG).toBe(0.0045);
    expect(rows[1].sincePrevious!.changePercent).toBeCloseTo((45 / 123456) * 100, 12);
    expect(rows[1].sincePrevious!.gPerDay).toBeCloseTo(0.0045 / 30, 15);
    expect(rows[1].sincePrevious!.percentPerDay).toBeCloseTo((45 / 123456) * 100 / 30, 14);
    // 123420 − 123456 = −36 → −0.0036 g over 59 days; −81 tenths (−0.0081 g) since the weighing before.
    expect(rows[2].sinceFirst!.changeG).toBe(-0.0036);
    expect(rows[2].sinceFirst!.changePercent).toBeCloseTo((-36 / 123456) * 100, 12);
    expect(rows[2].sinceFirst!.percentPerDay).toBeCloseTo((-36 / 123456) * 100 / 59, 14);
    expect(rows[2].sincePrevious!.changeG).toBe(-0.0081);
    expect(rows[2].sincePrevious!.changePercent).toBeCloseTo((-81 / 123501) * 100, 12);
  });

  it("gives no per-day rate for two weighings on one day", () => {
    const [, second] = massChanges([{ measuredOn: "2026-02-02", massG: "1.0000" }, { measuredOn: "2026-02-02", massG: "1.0002" }]);
    expect(second.sincePrevious).toMatchObject({ days: 0, changeG: 0.0002, gPerDay: null, percentPerDay: null });
  });

  it("counts days across a leap day", () => {
    // 2028 is a leap year (divisible by 4, not by 100): 28 Feb → 1 Mar is 2 days.
    expect(daysBetween("2028-02-28", "2028-03-01")).toBe(2);
  });
});

describe("chloride state", () => {
  it("is the latest test's result, or untested", () => {
    expect(chlorideStateOf([])).toBe("untested");
    expect(chlorideStateOf([{ testedOn: "2026-01-05", result: "present" }, { testedOn: "2026-02-01", result: "absent" }])).toBe("absent");
    expect(chlorideStateOf([{ testedOn: "2026-03-01", result: "present" }, { testedOn: "2026-02-01", result: "absent" }])).toBe("present");
  });
});

describe("history input", () => {
  const errorsOf = (input: Record<string, unknown>) => {
    const r = historyEntrySchema.safeParse(input);
    return r.success ? {} : (z.flattenError(r.error).fieldErrors as Record<string, string[]>);
  };
  const tomorrowEverywhere = new Date(Date.parse(`${latestToday()}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);

  it("accepts a weighing in g or mg", () => {
    expect(historyEntrySchema.parse({ kind: "mass", specimenId: SPECIMEN, measuredOn: "2026-01-02", mass: "12.3456", unit: "g" })).toMatchObject({ mass: "12.3456" });
    expect(errorsOf({ kind: "mass", specimenId: SPECIMEN, measuredOn: "2026-01-02", mass: "12345.6", unit: "mg" })).toEqual({});
  });
  it("names the field for a wrong unit, a negative mass, too many decimals and a future date", () => {
    expect(errorsOf({ kind: "mass", specimenId: SPECIMEN, measuredOn: "2026-01-02", mass: "12.3", unit: "kg" }).unit?.[0]).toMatch(/g or mg/);
    expect(errorsOf({ kind: "mass", specimenId: SPECIMEN, measuredOn: "2026-01-02", mass: "12.3 oz", unit: "g" }).mass?.[0]).toMatch(/number only/);
    expect(errorsOf({ kind: "mass", specimenId: SPECIMEN, measuredOn: "2026-01-02", mass: "-2", unit: "g" }).mass?.[0]).toMatch(/number only/);
    expect(errorsOf({ kind: "mass", specimenId: SPECIMEN, measuredOn: "2026-01-02", mass: "0", unit: "g" }).mass?.[0]).toMatch(/above 0/);
    expect(errorsOf({ kind: "mass", specimenId: SPECIMEN, measuredOn: "2026-01-02", mass: "1.23456", unit: "g" }).mass?.[0]).toMatch(/0\.1 mg/);
    expect(errorsOf({ kind: "mass", specimenId: SPECIMEN, measuredOn: tomorrowEverywhere, mass: "1", unit: "g" }).measuredOn?.[0]).toMatch(/future/);
    expect(errorsOf({ kind: "mass", specimenId: SPECIMEN, measuredOn: "2026-02-30", mass: "1", unit: "g" }).measuredOn?.[0]).toMatch(/not a real date/);
  });
  it("refuses an unknown chloride or akaganeite method at the method field", () => {
    expect(errorsOf({ kind: "chloride", specimenId: SPECIMEN, testedOn: "2026-01-02", method: "tasting", result: "present" }).method?.[0]).toMatch(/Choose a method/);
    expect(errorsOf({ kind: "akaganeite", specimenId: SPECIMEN, checkedOn: "2026-01-02", method: "guess", seen: "yes" }).method?.[0]).toMatch(/Choose a method/);
    expect(errorsOf({ kind: "chloride", specimenId: SPECIMEN, testedOn: "2026-01-02", method: "chloride-strip", result: "maybe" }).result?.[0]).toMatch(/present, absent/);
  });
});
