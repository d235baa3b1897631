// Equilibrium relative humidity over saturated salt solutions, from the polynomial fits of
// L. Greenspan, "Humidity Fixed Points of Binary Saturated Aqueous Solutions",
// J. Res. Natl. Bur. Stand. 81A(1):89–96 (1977) — the values behind ASTM E104 and OIML R 121.
// Fit form: RH% = A0 + A1·t + A2·t² + A3·t³ with t in °C.
//
// Copies of these coefficients circulate with sign errors (LiCl A1, CH3COOK A2, K2CO3 A1); the
// signs below were checked by reproducing Greenspan's tabulated values at 10/20/25/30 °C
// (tests/unit/humidity-salts.test.ts).
//
// Uncertainty: Greenspan tabulates an uncertainty for every temperature, but only the 25 °C
// values are on hand (recalled from Greenspan 1977, Table 1). We report that 25 °C value as the
// uncertainty at every temperature in the fit range. It is the right order of magnitude; at the
// ends of the range Greenspan's own figures are somewhat larger, so treat it as a lower bound there.
//
// Fit ranges are recalled, not re-read (Greenspan 1977, from memory); outside them we refuse rather
// than extrapolate, because a cubic fit can drift quickly past its data.
//
// LiBr and KOH are different: Greenspan's Table 2 coefficients for them were not on hand, so their
// coefficients are our own least-squares fits (R 4.2.2, lm, raw polynomial) to Greenspan's Table 1
// values recalled from memory, over the part of the range we recall with confidence (LiBr 0–50 °C,
// KOH 5–50 °C every 5 °C); the fits reproduce those values within 0.005 %RH. They are narrower than
// Greenspan's published ranges on purpose: replace them with the Table 2 coefficients once the
// paper has been re-read.

import { ghsStatements, type GhsStatement } from "@/lib/humidity/ghs";

export type SaltId = "LiBr" | "KOH" | "LiCl" | "CH3COOK" | "MgCl2" | "K2CO3" | "Mg(NO3)2" | "NaCl" | "KCl" | "KNO3" | "K2SO4";

export interface SaltInfo {
  id: SaltId;
  displayName: string;
  /** [A0, A1, A2, A3] of RH% = A0 + A1·t + A2·t² + A3·t³, t in °C. */
  coefficients: readonly [number, number, number, number];
  rangeC: readonly [number, number];
  /** Greenspan 1977 Table 1 uncertainty at 25 °C (%RH), used across the range (see header). */
  uncertaintyPercent: number;
  ghs: GhsStatement[];
  /** Plain-language hazard summary for the chamber form. */
  hazardText: string;
  /** True for chlorides: slurry splashed on a specimen adds the very ion that drives iron corrosion. */
  isChloride: boolean;
  /** Cautions specific to this salt (corrosive solutions), shown before the general salt cautions. */
  cautions?: string[];
  source: string;
  /** How messages name the fit ("the Greenspan 1977 fit" unless it is our refit). */
  fitLabel: string;
}

const GREENSPAN = "Greenspan 1977, J. Res. NBS 81A:89–96 (fit coefficients; 25 °C uncertainty from memory)";
const REFIT =
  "Our fit (R 4.2.2 lm, raw polynomial) to Greenspan 1977 Table 1 values recalled from memory, not Greenspan's Table 2 coefficients; 25 °C uncertainty from memory";
const GREENSPAN_LABEL = "the Greenspan 1977 fit";
const REFIT_LABEL = "our fit to Greenspan 1977 Table 1";
const NOT_CLASSIFIED = "Generally not classified as hazardous under GHS (from memory; check the SDS).";

export const SALTS: Readonly<Record<SaltId, SaltInfo>> = {
  LiBr: {
    id: "LiBr",
    displayName: "Lithium bromide (LiBr)",
    // lm(rh ~ poly(t, 2, raw = TRUE)) on Greenspan Table 1, 0–50 °C by 5 °C (from memory): max residual 0.004 %RH.
    coefficients: [7.75098, -0.065773, 4.25641e-4, 0],
    rangeC: [0, 50],
    uncertaintyPercent: 0.52,
    // Classification as on common supplier SDSs, from memory: not classified corrosive as a solid.
    ghs: ghsStatements(["H302", "H315", "H317", "H319"]),
    hazardText: "Harmful if swallowed; irritates skin and eyes and may cause a skin allergy. The saturated brine corrodes steel, copper and brass.",
    isChloride: false,
    cautions: [
      "Saturated lithium bromide brine corrodes steel, copper and brass quickly: keep it in glass or plastic, away from metal fittings and the specimens, and wear gloves and eye protection.",
    ],
    source: REFIT,
    fitLabel: REFIT_LABEL,
  },
  KOH: {
    id: "KOH",
    displayName: "Potassium hydroxide (KOH)",
    // lm(rh ~ poly(t, 3, raw = TRUE)) on Greenspan Table 1, 5–50 °C by 5 °C (from memory): max residual 0.004 %RH.
    coefficients: [16.7007, -0.511057, 7.94662e-3, -4.23465e-5],
    rangeC: [5, 50],
    uncertaintyPercent: 0.72,
    ghs: ghsStatements(["H290", "H302", "H314"]),
    hazardText: "Corrosive: causes severe skin burns and eye damage, harmful if swallowed, corrodes metals (aluminium and zinc fastest).",
    isChloride: false,
    cautions: [
      "Potassium hydroxide is caustic: wear goggles (or a face shield) and alkali-resistant gloves, add the solid to water slowly (it heats strongly as it dissolves), and keep the solution off skin, aluminium and zinc.",
      "KOH takes up carbon dioxide from air and turns to carbonate, which shifts the fixed point: keep the jar closed and remake the slurry if a crust forms.",
    ],
    source: REFIT,
    fitLabel: REFIT_LABEL,
  },
  LiCl: {
    id: "LiCl",
    displayName: "Lithium chloride (LiCl)",
    coefficients: [11.2323, 8.24245e-3, -2.1489e-4, 0],
    rangeC: [0, 100],
    uncertaintyPercent: 0.27,
    ghs: ghsStatements(["H302", "H315", "H319"]),
    hazardText: "Harmful if swallowed; irritates skin and eyes.",
    isChloride: true,
    source: GREENSPAN,
    fitLabel: GREENSPAN_LABEL,
  },
  CH3COOK: {
    id: "CH3COOK",
    displayName: "Potassium acetate (CH3COOK)",
    coefficients: [22.4388, 0.156288, -6.12268e-3, 0],
    rangeC: [5, 30],
    uncertaintyPercent: 0.32,
    ghs: [],
    hazardText: NOT_CLASSIFIED,
    isChloride: false,
    source: GREENSPAN,
    fitLabel: GREENSPAN_LABEL,
  },
  MgCl2: {
    id: "MgCl2",
    displayName: "Magnesium chloride (MgCl2)",
    coefficients: [33.6686, -7.97397e-3, -1.08988e-3, 0],
    rangeC: [0, 100],
    uncertaintyPercent: 0.16,
    ghs: [],
    hazardText: NOT_CLASSIFIED,
    isChloride: true,
    source: GREENSPAN,
    fitLabel: GREENSPAN_LABEL,
  },
  K2CO3: {
    id: "K2CO3",
    displayName: "Potassium carbonate (K2CO3)",
    coefficients: [43.1315, 1.47523e-3, 0, 0],
    rangeC: [0, 30],
    uncertaintyPercent: 0.39,
    ghs: ghsStatements(["H315", "H319", "H335"]),
    hazardText: "Irritates skin, eyes and airways; the solution is alkaline.",
    isChloride: false,
    source: GREENSPAN,
    fitLabel: GREENSPAN_LABEL,
  },
  "Mg(NO3)2": {
    id: "Mg(NO3)2",
    displayName: "Magnesium nitrate (Mg(NO3)2)",
    coefficients: [60.3514, -0.298153, 0, 0],
    rangeC: [0, 40],
    uncertaintyPercent: 0.22,
    ghs: ghsStatements(["H272", "H319"]),
    hazardText: "Oxidiser (UN1474, class 5.1): keep away from combustibles; irritates eyes.",
    isChloride: false,
    source: GREENSPAN,
    fitLabel: GREENSPAN_LABEL,
  },
  NaCl: {
    id: "NaCl",
    displayName: "Sodium chloride (NaCl)",
    coefficients: [75.5164, 0.0398321, -2.65459e-3, 2.848e-5],
    rangeC: [0, 80],
    uncertaintyPercent: 0.12,
    ghs: [],
    hazardText: NOT_CLASSIFIED,
    isChloride: true,
    source: GREENSPAN,
    fitLabel: GREENSPAN_LABEL,
  },
  KCl: {
    id: "KCl",
    displayName: "Potassium chloride (KCl)",
    coefficients: [88.619, -0.19334, 8.99706e-4, 0],
    rangeC: [0, 90],
    uncertaintyPercent: 0.26,
    ghs: [],
    hazardText: NOT_CLASSIFIED,
    isChloride: true,
    source: GREENSPAN,
    fitLabel: GREENSPAN_LABEL,
  },
  KNO3: {
    id: "KNO3",
    displayName: "Potassium nitrate (KNO3)",
    coefficients: [96.3361, 0.0112371, -4.84514e-3, 0],
    rangeC: [0, 50],
    uncertaintyPercent: 0.55,
    ghs: ghsStatements(["H272"]),
    hazardText: "Oxidiser: keep away from combustibles (classification from memory; check the SDS).",
    isChloride: false,
    source: GREENSPAN,
    fitLabel: GREENSPAN_LABEL,
  },
  K2SO4: {
    id: "K2SO4",
    displayName: "Potassium sulfate (K2SO4)",
    coefficients: [98.7792, -0.0590502, 0, 0],
    rangeC: [0, 50],
    uncertaintyPercent: 0.45,
    ghs: [],
    hazardText: NOT_CLASSIFIED,
    isChloride: false,
    source: GREENSPAN,
    fitLabel: GREENSPAN_LABEL,
  },
};

/** Salt ids in ascending order of equilibrium RH, for pickers. */
export const SALT_IDS: readonly SaltId[] = Object.keys(SALTS) as SaltId[];

export function isSaltId(value: string): value is SaltId {
  return Object.prototype.hasOwnProperty.call(SALTS, value);
}

export interface SaltEquilibrium {
  rhPercent: number;
  uncertaintyPercent: number | null;
  rangeC: [number, number];
}

export function saltEquilibriumRh(salt: SaltId, tempC: number): SaltEquilibrium {
  const info = SALTS[salt];
  if (!info) throw new RangeError(`Unknown salt "${String(salt)}"`);
  const [lowC, highC] = info.rangeC;
  if (!Number.isFinite(tempC) || tempC < lowC || tempC > highC) {
    throw new RangeError(
      `${info.displayName}: ${info.fitLabel} is valid from ${lowC} °C to ${highC} °C; got ${tempC} °C`,
    );
  }
  const [a0, a1, a2, a3] = info.coefficients;
  const rhPercent = a0 + tempC * (a1 + tempC * (a2 + tempC * a3));
  return { rhPercent, uncertaintyPercent: info.uncertaintyPercent, rangeC: [lowC, highC] };
}

export interface SaltRhPoint {
  tempC: number;
  rhPercent: number;
  uncertaintyPercent: number | null;
}

/** Points from the low to the high end of the fit range (both ends included) for a chart. */
export function saltRhCurve(salt: SaltId, stepC = 1): SaltRhPoint[] {
  if (!Number.isFinite(stepC) || stepC <= 0) throw new RangeError(`stepC must be a positive number; got ${stepC}`);
  const [lowC, highC] = SALTS[salt].rangeC;
  const points: SaltRhPoint[] = [];
  const count = Math.floor((highC - lowC) / stepC + 1e-9);
  // Computing t from the index (not by repeated addition) keeps 0.1 °C steps free of drift.
  for (let i = 0; i <= count; i++) {
    const tempC = Math.min(highC, lowC + i * stepC);
    points.push({ tempC, ...pick(saltEquilibriumRh(salt, tempC)) });
  }
  if (points[points.length - 1].tempC < highC) points.push({ tempC: highC, ...pick(saltEquilibriumRh(salt, highC)) });
  return points;
}

function pick(eq: SaltEquilibrium): Omit<SaltRhPoint, "tempC"> {
  return { rhPercent: eq.rhPercent, uncertaintyPercent: eq.uncertaintyPercent };
}
