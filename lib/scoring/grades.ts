// Standard rust grades from a rusted-area percentage.
// ASTM D610 / SSPC-VIS 2 Table 1 and ISO 4628-3 nominal areas (ASTM D610-08, Table 1; ISO 4628-3:2016).

/**
 * Upper bound (inclusive) of rusted area, in percent, for each ASTM D610 grade from 10 down to 1;
 * anything above the last bound is grade 0. ASTM D610 / SSPC-VIS 2, Table 1.
 */
export const ASTM_D610_UPPER_PERCENT: ReadonlyArray<{ grade: number; maxPercent: number }> = [
  { grade: 10, maxPercent: 0.01 },
  { grade: 9, maxPercent: 0.03 },
  { grade: 8, maxPercent: 0.1 },
  { grade: 7, maxPercent: 0.3 },
  { grade: 6, maxPercent: 1 },
  { grade: 5, maxPercent: 3 },
  { grade: 4, maxPercent: 10 },
  { grade: 3, maxPercent: 16 },
  { grade: 2, maxPercent: 33 },
  { grade: 1, maxPercent: 50 },
];

// An area computed as, say, 0.1 can arrive as 0.10000000000000002 after floating-point sums; a
// value that close to a boundary is on the boundary and takes the better grade, as the table says.
// 1e-9 percentage points is far below any measurable area.
const BOUNDARY_TOLERANCE_PERCENT = 1e-9;

function assertPercent(areaPercent: number): void {
  if (Number.isNaN(areaPercent) || areaPercent < 0 || areaPercent > 100) {
    throw new RangeError(`rusted area must be between 0 and 100 %, got ${areaPercent}`);
  }
}

/** ASTM D610 rust grade, 10 (best) … 0 (worst); a value on a boundary takes the better grade. */
export function astmD610Grade(areaPercent: number): number {
  assertPercent(areaPercent);
  for (const { grade, maxPercent } of ASTM_D610_UPPER_PERCENT) {
    if (areaPercent <= maxPercent + BOUNDARY_TOLERANCE_PERCENT) return grade;
  }
  return 0;
}

/** ASTM D610 distribution letters. */
export const ASTM_DISTRIBUTION = { S: "spot", G: "general", P: "pinpoint", H: "hybrid" } as const;
export type AstmDistributionLetter = keyof typeof ASTM_DISTRIBUTION;

/** "6-G": grade then distribution letter, the way the standard writes a rating. */
export function formatAstm(grade: number, letter: AstmDistributionLetter): string {
  if (!Number.isInteger(grade) || grade < 0 || grade > 10) {
    throw new RangeError(`ASTM D610 grade must be an integer 0–10, got ${grade}`);
  }
  if (!(letter in ASTM_DISTRIBUTION)) {
    throw new RangeError(`distribution must be one of S, G, P, H, got ${String(letter)}`);
  }
  return `${grade}-${letter}`;
}

export type IsoRustDegree = 0 | 1 | 2 | 3 | 4 | 5;

/** ISO 4628-3 nominal rusted area per degree, percent (Ri 5 is nominally 40–50 %). */
export const ISO_4628_3_NOMINAL_PERCENT: Readonly<Record<IsoRustDegree, string>> = {
  0: "0",
  1: "0.05",
  2: "0.5",
  3: "1",
  4: "8",
  5: "40–50",
};

// Upper bound (inclusive) per degree under our between-values rule; Ri 0 is exactly 0 and Ri 5 takes the rest.
const ISO_UPPER_PERCENT: ReadonlyArray<{ degree: IsoRustDegree; maxPercent: number }> = [
  { degree: 1, maxPercent: 0.05 },
  { degree: 2, maxPercent: 0.5 },
  { degree: 3, maxPercent: 1 },
  { degree: 4, maxPercent: 8 },
];

/** The rule for areas between the standard's nominal values; shown in the UI next to the grade. */
export const ISO_RULE_TEXT =
  "ISO 4628-3 gives one nominal rusted area per degree (Ri 0 = 0 %, Ri 1 = 0.05 %, Ri 2 = 0.5 %, " +
  "Ri 3 = 1 %, Ri 4 = 8 %, Ri 5 = 40–50 %). Between those values Rustline assigns the smallest degree " +
  "whose nominal area is at least the measured area: 0 % → Ri 0; above 0 to 0.05 % → Ri 1; " +
  "above 0.05 to 0.5 % → Ri 2; above 0.5 to 1 % → Ri 3; above 1 to 8 % → Ri 4; above 8 % → Ri 5. " +
  "This between-values rule is Rustline's own choice, not part of the standard.";

/** ISO 4628-3 degree of rusting under the rule in ISO_RULE_TEXT. */
export function isoRustDegree(areaPercent: number): IsoRustDegree {
  assertPercent(areaPercent);
  // Ri 0 means no rust at all, so only an exact zero gets it (no tolerance here).
  if (areaPercent === 0) return 0;
  for (const { degree, maxPercent } of ISO_UPPER_PERCENT) {
    if (areaPercent <= maxPercent + BOUNDARY_TOLERANCE_PERCENT) return degree;
  }
  return 5;
}

/** "Ri 3": the way ISO 4628-3 writes a degree. */
export function formatIso(degree: IsoRustDegree): string {
  return `Ri ${degree}`;
}
