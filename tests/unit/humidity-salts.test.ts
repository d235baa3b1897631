import { describe, expect, it } from "vitest";
import { SALT_IDS, SALTS, saltEquilibriumRh, saltRhCurve, type SaltId } from "@/lib/humidity/salts";
import { applyOffset, hygrometerOffset } from "@/lib/climate/hygrometer-check";
import { hazardNoteLines, hazardNotes, SDS_DEFERRAL } from "@/lib/humidity/hazards";

// Greenspan 1977 fit, values at 10/20/25/30 °C (computed from the fit). LiBr and KOH: computed
// from our own refit (R 4.2.2: lm(rh ~ poly(t, 2|3, raw = TRUE)) on Greenspan's Table 1 values,
// see lib/humidity/salts.ts), so these two rows check the coefficients as stored, not the paper.
const FIT_VALUES: Record<SaltId, [number, number, number, number]> = {
  LiBr: [7.136, 6.606, 6.373, 6.161],
  KOH: [12.342, 9.319, 8.229, 7.378],
  LiCl: [11.29, 11.31, 11.3, 11.29],
  CH3COOK: [23.39, 23.12, 22.52, 21.62],
  MgCl2: [33.48, 33.07, 32.79, 32.45],
  K2CO3: [43.15, 43.16, 43.17, 43.18],
  "Mg(NO3)2": [57.37, 54.39, 52.9, 51.41],
  NaCl: [75.68, 75.48, 75.3, 75.09],
  KCl: [86.78, 85.11, 84.35, 83.63],
  KNO3: [95.96, 94.62, 93.59, 92.31],
  K2SO4: [98.19, 97.6, 97.3, 97.01],
};

// Greenspan 1977, Table 1 at 25 °C with its uncertainty — from memory.
const TABLE_25C: Record<SaltId, [number, number]> = {
  LiBr: [6.37, 0.52],
  KOH: [8.23, 0.72],
  LiCl: [11.3, 0.27],
  CH3COOK: [22.51, 0.32],
  MgCl2: [32.78, 0.16],
  K2CO3: [43.16, 0.39],
  "Mg(NO3)2": [52.89, 0.22],
  NaCl: [75.29, 0.12],
  KCl: [84.34, 0.26],
  KNO3: [93.58, 0.55],
  K2SO4: [97.3, 0.45],
};

// Greenspan 1977 fit ranges, from memory. LiBr and KOH: the part of Greenspan's range our refit covers.
const RANGES: Record<SaltId, [number, number]> = {
  LiBr: [0, 50],
  KOH: [5, 50],
  LiCl: [0, 100],
  CH3COOK: [5, 30],
  MgCl2: [0, 100],
  K2CO3: [0, 30],
  "Mg(NO3)2": [0, 40],
  NaCl: [0, 80],
  KCl: [0, 90],
  KNO3: [0, 50],
  K2SO4: [0, 50],
};

describe("saltEquilibriumRh", () => {
  for (const salt of SALT_IDS) {
    it(`${salt} reproduces the fit values at 10, 20, 25 and 30 °C`, () => {
      [10, 20, 25, 30].forEach((tempC, i) => {
        // Greenspan 1977 fit, ±0.05 %RH
        expect(Math.abs(saltEquilibriumRh(salt, tempC).rhPercent - FIT_VALUES[salt][i])).toBeLessThanOrEqual(0.05);
      });
    });

    it(`${salt} agrees with Greenspan's 25 °C table value and carries its uncertainty`, () => {
      const { rhPercent, uncertaintyPercent, rangeC } = saltEquilibriumRh(salt, 25);
      const [tableRh, tableU] = TABLE_25C[salt];
      // Greenspan 1977, Table 1 at 25 °C — from memory, so a wider ±0.1 %RH
      expect(Math.abs(rhPercent - tableRh)).toBeLessThanOrEqual(0.1);
      // Greenspan 1977, Table 1 uncertainty at 25 °C — from memory
      expect(uncertaintyPercent).toBe(tableU);
      expect(rangeC).toEqual(RANGES[salt]);
    });

    it(`${salt} refuses temperatures outside its fit range`, () => {
      const [low, high] = RANGES[salt];
      expect(() => saltEquilibriumRh(salt, low - 0.1)).toThrow(RangeError);
      expect(() => saltEquilibriumRh(salt, high + 0.1)).toThrow(RangeError);
      expect(() => saltEquilibriumRh(salt, high + 0.1)).toThrow(new RegExp(`${low} °C to ${high} °C`));
      expect(() => saltEquilibriumRh(salt, Number.NaN)).toThrow(RangeError);
      expect(() => saltEquilibriumRh(salt, low)).not.toThrow();
      expect(() => saltEquilibriumRh(salt, high)).not.toThrow();
    });
  }

  it("gives NaCl about 75.4 %RH at 22 °C", () => {
    // Greenspan 1977 fit: 75.5164 + 0.0398321·22 − 2.65459e-3·22² + 2.848e-5·22³ = 75.41
    expect(saltEquilibriumRh("NaCl", 22).rhPercent).toBeCloseTo(75.4, 1);
  });

  it("stays close to the coarser CRC exponential model for NaCl and MgCl2", () => {
    for (const tempC of [10, 20, 30, 40]) {
      const tK = tempC + 273.15;
      // CRC Handbook, "Constant humidity solutions": RH = A·exp(B/T), NaCl A 69.20, B 25; ±2 %RH
      expect(Math.abs(saltEquilibriumRh("NaCl", tempC).rhPercent - 69.2 * Math.exp(25 / tK))).toBeLessThan(2);
      // CRC Handbook: MgCl2 A 29.26, B 34; ±2 %RH
      expect(Math.abs(saltEquilibriumRh("MgCl2", tempC).rhPercent - 29.26 * Math.exp(34 / tK))).toBeLessThan(2);
    }
  });

  it("catalogues every salt with a display name and source", () => {
    expect(SALT_IDS).toHaveLength(11);
    expect(SALTS.NaCl.displayName).toBe("Sodium chloride (NaCl)");
    for (const id of SALT_IDS) {
      expect(SALTS[id].id).toBe(id);
      expect(SALTS[id].source).toMatch(/Greenspan 1977/);
    }
    // GHS classifications from suppliers' SDS, from memory: LiCl H302 H315 H319; Mg(NO3)2 H272 H319
    expect(SALTS.LiCl.ghs.map((s) => s.code)).toEqual(["H302", "H315", "H319"]);
    expect(SALTS["Mg(NO3)2"].ghs.map((s) => s.code)).toEqual(["H272", "H319"]);
    expect(SALTS.NaCl.ghs).toEqual([]);
  });
});

describe("lithium bromide and potassium hydroxide", () => {
  // Greenspan 1977, Table 1 (tabulated values, not the fit) at 10/20/25/30 °C — from memory.
  const TABLE_1: Record<"LiBr" | "KOH", Record<number, number>> = {
    LiBr: { 10: 7.14, 20: 6.61, 25: 6.37, 30: 6.16 },
    KOH: { 10: 12.34, 20: 9.32, 25: 8.23, 30: 7.38 },
  };

  for (const salt of ["LiBr", "KOH"] as const) {
    it(`${salt} reproduces Greenspan's Table 1 values within 0.02 %RH`, () => {
      for (const [tempC, rh] of Object.entries(TABLE_1[salt])) {
        // Greenspan 1977, Table 1 — from memory (the coefficients were fitted to these recalled values)
        expect(Math.abs(saltEquilibriumRh(salt, Number(tempC)).rhPercent - rh)).toBeLessThanOrEqual(0.02);
      }
    });
  }

  it("stays within ±2 %RH of the CRC Handbook exponential model over its range", () => {
    for (const tempC of [10, 15, 20, 25, 30]) {
      const tK = tempC + 273.15;
      // CRC Handbook of Chemistry and Physics, "Constant humidity solutions" (A. Wexler): RH = A·exp(B/T);
      // LiBr·2H2O A 0.23, B 996, 10–30 °C; KOH·2H2O A 0.014, B 1924, 5–30 °C; "generally accurate to ±2 %"
      expect(Math.abs(saltEquilibriumRh("LiBr", tempC).rhPercent - 0.23 * Math.exp(996 / tK))).toBeLessThan(2);
      expect(Math.abs(saltEquilibriumRh("KOH", tempC).rhPercent - 0.014 * Math.exp(1924 / tK))).toBeLessThan(2);
    }
  });

  it("say which range they cover when the temperature is outside it", () => {
    expect(() => saltEquilibriumRh("KOH", 4)).toThrow(/Potassium hydroxide \(KOH\): our fit to Greenspan 1977 Table 1 is valid from 5 °C to 50 °C; got 4 °C/);
    expect(() => saltEquilibriumRh("LiBr", 60)).toThrow(/0 °C to 50 °C/);
  });

  it("name their source as our refit, not Greenspan's own coefficients", () => {
    expect(SALTS.LiBr.source).toMatch(/not Greenspan's Table 2 coefficients/);
    expect(SALTS.KOH.source).toMatch(/not Greenspan's Table 2 coefficients/);
  });
});

describe("saltRhCurve", () => {
  it("covers the whole fit range, ends included", () => {
    const curve = saltRhCurve("CH3COOK", 2);
    expect(curve[0].tempC).toBe(5);
    expect(curve[curve.length - 1].tempC).toBe(30);
    expect(curve).toHaveLength(14); // 5, 7, …, 29, then 30
    for (const p of curve) expect(p.rhPercent).toBeCloseTo(saltEquilibriumRh("CH3COOK", p.tempC).rhPercent, 12);
  });

  it("rejects a non-positive step", () => {
    expect(() => saltRhCurve("NaCl", 0)).toThrow(RangeError);
  });
});

describe("hygrometerOffset", () => {
  it("is the reading minus the salt's equilibrium RH, with the reference uncertainty", () => {
    const check = hygrometerOffset({ readingRhPercent: 77.3, salt: "NaCl", tempC: 25 });
    // Greenspan 1977 fit: NaCl at 25 °C = 75.30 %RH
    expect(check.offsetPercent).toBeCloseTo(2.0, 1);
    expect(check.referenceUncertaintyPercent).toBe(0.12); // Greenspan 1977 Table 1 — from memory
    expect(applyOffset(60, check)).toBeCloseTo(58.0, 1);
    expect(applyOffset(1, check)).toBe(0);
  });

  it("refuses a check outside the salt's fit range", () => {
    expect(() => hygrometerOffset({ readingRhPercent: 43, salt: "K2CO3", tempC: 35 })).toThrow(RangeError);
  });
});

describe("hazardNotes", () => {
  it("lists a salt's GHS statements with their standard wording and ends with the SDS deferral", () => {
    const notes = hazardNotes({ kind: "saturated-salt", salt: "K2CO3" });
    // GHS classifications from suppliers' SDS, from memory: K2CO3 H315 H319 H335; texts are the standard GHS statements
    expect(notes.ghs).toEqual([
      { code: "H315", text: "Causes skin irritation" },
      { code: "H319", text: "Causes serious eye irritation" },
      { code: "H335", text: "May cause respiratory irritation" },
    ]);
    expect(notes.cautions.join(" ")).toMatch(/corrosive vapour/);
    expect(notes.deferral).toBe("Follow the supplier's safety data sheet (SDS) and local rules.");
    expect(hazardNoteLines(notes).at(-1)).toBe(SDS_DEFERRAL);
  });

  it("warns about chloride contamination for chloride salts only", () => {
    expect(hazardNotes({ kind: "saturated-salt", salt: "NaCl" }).cautions.join(" ")).toMatch(/chloride salt/);
    expect(hazardNotes({ kind: "saturated-salt", salt: "K2SO4" }).cautions.join(" ")).not.toMatch(/chloride salt/);
  });

  it("gives the practice cautions for vacuum, inert gas, desiccant and water chambers", () => {
    expect(hazardNotes({ kind: "vacuum" }).cautions.join(" ")).toMatch(/implode/);
    expect(hazardNotes({ kind: "inert-gas" }).cautions.join(" ")).toMatch(/asphyxiation/);
    const sieve = hazardNotes({ kind: "desiccant", desiccant: "molecular-sieve-4a" }).cautions.join(" ");
    expect(sieve).toMatch(/warms strongly/);
    expect(sieve).toMatch(/hot enough to burn/);
    // suppliers' SDS, from memory: cobalt chloride indicating gel H350i H360F H341 H334 H317
    // EU CLP Annex VI harmonised classification of cobalt(II) chloride, from memory: H350i H360F H341 H334 H317 H302 H410
    const cobalt = hazardNotes({ kind: "desiccant", desiccant: "silica-gel", indicator: "cobalt-chloride" });
    expect(cobalt.ghs.map((s) => s.code)).toEqual(["H350i", "H360F", "H341", "H334", "H317", "H302", "H410"]);
    expect(cobalt.cautions.join(" ")).toMatch(/cobalt-free/);
    // trade practice: pure water approaches 100 %RH, real jars ~90–100 %
    expect(hazardNotes({ kind: "water" }).cautions.join(" ")).toMatch(/approaches 100 %RH.*~90–100 %/);
    for (const kind of ["open-shelf", "other"] as const) expect(hazardNotes({ kind }).deferral).toBe(SDS_DEFERRAL);
  });
});
