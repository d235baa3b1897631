import { describe, expect, it } from "vitest";
import {
  ASTM_DISTRIBUTION,
  astmD610Grade,
  formatAstm,
  formatIso,
  ISO_RULE_TEXT,
  isoRustDegree,
} from "@/lib/scoring/grades";

describe("astmD610Grade", () => {
  // Each row: [area %, expected grade]. A value on a boundary takes the better grade; just above
  // it takes the next one down. ASTM D610 Table 1.
  const boundaries: Array<[number, number]> = [
    [0, 10], // ASTM D610 Table 1
    [0.01, 10], // ASTM D610 Table 1: 10 is ≤ 0.01 %
    [0.0101, 9], // ASTM D610 Table 1: 9 is > 0.01–0.03 %
    [0.03, 9], // ASTM D610 Table 1
    [0.031, 8], // ASTM D610 Table 1: 8 is > 0.03–0.1 %
    [0.1, 8], // ASTM D610 Table 1
    [0.101, 7], // ASTM D610 Table 1: 7 is > 0.1–0.3 %
    [0.3, 7], // ASTM D610 Table 1
    [0.301, 6], // ASTM D610 Table 1: 6 is > 0.3–1 %
    [1, 6], // ASTM D610 Table 1
    [1.01, 5], // ASTM D610 Table 1: 5 is > 1–3 %
    [3, 5], // ASTM D610 Table 1
    [3.01, 4], // ASTM D610 Table 1: 4 is > 3–10 %
    [10, 4], // ASTM D610 Table 1
    [10.01, 3], // ASTM D610 Table 1: 3 is > 10–16 %
    [16, 3], // ASTM D610 Table 1
    [16.01, 2], // ASTM D610 Table 1: 2 is > 16–33 %
    [33, 2], // ASTM D610 Table 1
    [33.01, 1], // ASTM D610 Table 1: 1 is > 33–50 %
    [50, 1], // ASTM D610 Table 1
    [50.01, 0], // ASTM D610 Table 1: 0 is > 50 %
    [100, 0], // ASTM D610 Table 1
  ];
  it.each(boundaries)("%s %% rusted → grade %s", (areaPercent, grade) => {
    expect(astmD610Grade(areaPercent)).toBe(grade);
  });

  it("treats a computed value that lands on a boundary as the boundary", () => {
    // 0.1 + 0.2 is 0.30000000000000004 in floating point; it is 0.3 % → grade 7, ASTM D610 Table 1
    expect(astmD610Grade(0.1 + 0.2)).toBe(7);
  });

  it("rejects impossible areas", () => {
    for (const bad of [Number.NaN, -0.001, 100.001, Number.POSITIVE_INFINITY]) {
      expect(() => astmD610Grade(bad)).toThrow(RangeError);
    }
  });

  it("formats grade and distribution letter the standard's way", () => {
    expect(formatAstm(6, "G")).toBe("6-G"); // ASTM D610 notation, e.g. "6-G"
    expect(formatAstm(10, "S")).toBe("10-S");
    expect(ASTM_DISTRIBUTION).toEqual({ S: "spot", G: "general", P: "pinpoint", H: "hybrid" }); // ASTM D610 distribution letters
    expect(() => formatAstm(11, "S")).toThrow(RangeError);
    expect(() => formatAstm(5.5, "P")).toThrow(RangeError);
    expect(() => formatAstm(5, "X" as "S")).toThrow(RangeError);
  });
});

describe("isoRustDegree", () => {
  it("gives each nominal area its own degree", () => {
    expect(isoRustDegree(0)).toBe(0); // ISO 4628-3: Ri 0 = 0 %
    expect(isoRustDegree(0.05)).toBe(1); // ISO 4628-3: Ri 1 = 0.05 %
    expect(isoRustDegree(0.5)).toBe(2); // ISO 4628-3: Ri 2 = 0.5 %
    expect(isoRustDegree(1)).toBe(3); // ISO 4628-3: Ri 3 = 1 %
    expect(isoRustDegree(8)).toBe(4); // ISO 4628-3: Ri 4 = 8 %
    expect(isoRustDegree(40)).toBe(5); // ISO 4628-3: Ri 5 = 40–50 %
    expect(isoRustDegree(50)).toBe(5); // ISO 4628-3: Ri 5 = 40–50 %
  });

  // Between nominal values: the smallest degree whose nominal area is ≥ the measured area.
  // This rule is Rustline's own choice (stated in ISO_RULE_TEXT), not the standard's.
  const between: Array<[number, number]> = [
    [0.0001, 1], // own rule: (0, 0.05] → Ri 1
    [0.0501, 2], // own rule: (0.05, 0.5] → Ri 2
    [0.2, 2], // own rule
    [0.5001, 3], // own rule: (0.5, 1] → Ri 3
    [1.0001, 4], // own rule: (1, 8] → Ri 4
    [5, 4], // own rule
    [8.0001, 5], // own rule: > 8 → Ri 5
    [20, 5], // own rule
    [100, 5], // own rule
  ];
  it.each(between)("%s %% rusted → Ri %s under our between-values rule", (areaPercent, degree) => {
    expect(isoRustDegree(areaPercent)).toBe(degree);
  });

  it("states the rule in words for the UI", () => {
    expect(ISO_RULE_TEXT).toContain("smallest degree whose nominal area is at least the measured area");
    expect(ISO_RULE_TEXT).toContain("Rustline's own choice");
    expect(formatIso(3)).toBe("Ri 3");
  });

  it("rejects impossible areas", () => {
    for (const bad of [Number.NaN, -1, 101]) expect(() => isoRustDegree(bad)).toThrow(RangeError);
  });
});
