import { describe, expect, it } from "vitest";
import {
  DESICCANTS,
  desiccantBudget,
  desiccantCapacityGPerG,
  projectedExhaustionDate,
} from "@/lib/humidity/desiccant";
import { absoluteHumidityGm3 } from "@/lib/humidity/psychrometrics";

describe("desiccant references", () => {
  it("lets molecular sieve 4A hold a jar at or below 2 %RH", () => {
    // common practice, no published source (from memory: below 1–2 %RH)
    expect(DESICCANTS["molecular-sieve-4a"].lowestRhPercent).not.toBeNull();
    expect(DESICCANTS["molecular-sieve-4a"].lowestRhPercent as number).toBeLessThanOrEqual(2);
  });

  it("uses the recalled capacity figures", () => {
    // Manufacturers' isotherms and datasheets, from memory: sieve 4A ≈0.20 g/g, nearly flat with RH
    expect(desiccantCapacityGPerG("molecular-sieve-4a", 20)).toBeGreaterThanOrEqual(0.18);
    expect(desiccantCapacityGPerG("molecular-sieve-4a", 20)).toBeLessThanOrEqual(0.22);
    // Manufacturers' isotherms and datasheets, from memory: silica gel ≈0.05 at 10 %RH, 0.10–0.12 at 20 %, 0.20–0.27 at 40–50 %, 0.35 near saturation
    expect(desiccantCapacityGPerG("silica-gel", 10)).toBeCloseTo(0.05, 2);
    expect(desiccantCapacityGPerG("silica-gel", 20)).toBeGreaterThanOrEqual(0.1);
    expect(desiccantCapacityGPerG("silica-gel", 20)).toBeLessThanOrEqual(0.12);
    expect(desiccantCapacityGPerG("silica-gel", 45)).toBeGreaterThanOrEqual(0.2);
    expect(desiccantCapacityGPerG("silica-gel", 45)).toBeLessThanOrEqual(0.27);
    expect(desiccantCapacityGPerG("silica-gel", 95)).toBeCloseTo(0.35, 2);
    // Manufacturers' isotherms and datasheets, from memory: regeneration 200–315 °C (sieve), 110–150 °C (gel)
    expect(DESICCANTS["molecular-sieve-4a"].regenerationC).toEqual([200, 315]);
    expect(DESICCANTS["silica-gel"].regenerationC).toEqual([110, 150]);
    expect(desiccantCapacityGPerG("other", 30)).toBeNull();
  });
});

describe("desiccantBudget", () => {
  it("shows that the air in a 1 L jar at 25 °C and 75 %RH holds only about 17 mg of water", () => {
    // trade practice, checked by the ideal-gas law: a sealed 1 L jar at 25 °C and 75 %RH holds ~17 mg of vapour
    const mg = absoluteHumidityGm3(25, 75) * 1e-3 * 1000;
    expect(Math.abs(mg - 17)).toBeLessThan(1);
    const budget = desiccantBudget({
      kind: "silica-gel",
      massG: 50,
      jarVolumeL: 1,
      tempC: 25,
      insideRhPercent: 75,
      outsideRhPercent: 75,
      airExchangePerDay: 1,
    });
    expect(budget.assumptions.join(" ")).toMatch(/17\.\d mg of vapour/);
  });

  it("counts leak water as exchange rate × volume × humidity difference, plus the extra load", () => {
    const input = {
      kind: "molecular-sieve-4a" as const,
      massG: 100,
      jarVolumeL: 2,
      tempC: 25,
      insideRhPercent: 2,
      outsideRhPercent: 60,
      airExchangePerDay: 0.5,
      extraLoadGPerDay: 0.01,
    };
    const budget = desiccantBudget(input);
    const leak = 0.5 * 0.002 * (absoluteHumidityGm3(25, 60) - absoluteHumidityGm3(25, 2));
    expect(budget.waterInGPerDay).toBeCloseTo(leak + 0.01, 12);
    // By hand: 0.5 × 0.002 m³ × (13.82 − 0.46) g/m³ ≈ 0.0134 g/day, + 0.01
    expect(budget.waterInGPerDay).toBeCloseTo(0.0234, 3);
    expect(budget.capacityG).toBeCloseTo(100 * (desiccantCapacityGPerG("molecular-sieve-4a", 2) as number), 12);
    expect(budget.daysUntilSpent).toBeCloseTo((budget.capacityG as number) / budget.waterInGPerDay, 9);
    expect(budget.assumptions.length).toBeGreaterThanOrEqual(3);

    const chargedAt = new Date("2025-01-01T00:00:00Z");
    const spent = projectedExhaustionDate(chargedAt, budget) as Date;
    expect((spent.getTime() - chargedAt.getTime()) / 86_400_000).toBeCloseTo(budget.daysUntilSpent as number, 6);
  });

  it("warns when the target is drier than the desiccant can hold", () => {
    const budget = desiccantBudget({
      kind: "magnesium-sulfate",
      massG: 200,
      jarVolumeL: 1,
      tempC: 20,
      insideRhPercent: 5,
      outsideRhPercent: 50,
      airExchangePerDay: 1,
    });
    expect(budget.assumptions.join(" ")).toMatch(/cannot hold a jar much below 10 %RH/);
  });

  it("says silica gel still dries a jar below 10 %RH but holds little water there", () => {
    const budget = desiccantBudget({ kind: "silica-gel", massG: 200, jarVolumeL: 1, tempC: 20, insideRhPercent: 5, outsideRhPercent: 50, airExchangePerDay: 1 });
    const said = budget.assumptions.join(" ");
    // Manufacturers' isotherms, from memory: regular-density gel reaches a few %RH; ≈0.05 g/g at 10 %RH
    expect(said).not.toMatch(/cannot hold/);
    expect(said).toMatch(/still dries a jar below 20 %RH, but its capacity there is small/);
    expect(DESICCANTS["silica-gel"].lowestRhPercent).toBeNull();
    expect(DESICCANTS["silica-gel"].cautions.join(" ")).toMatch(/can dry a jar below 10 %RH, but its capacity there is small/);
    // At mid RH there is no low-capacity note.
    const at40 = desiccantBudget({ kind: "silica-gel", massG: 200, jarVolumeL: 1, tempC: 20, insideRhPercent: 40, outsideRhPercent: 50, airExchangePerDay: 1 });
    expect(at40.assumptions.join(" ")).not.toMatch(/capacity there is small/);
  });

  it("gives calcium chloride the stoichiometric capacity to its dihydrate", () => {
    // molar masses (IUPAC 2021 standard atomic weights): CaCl2 110.98, H2O 18.015 → 2 × 18.015 / 110.98 = 0.325 g/g
    expect(desiccantCapacityGPerG("calcium-chloride", 20)).toBeCloseTo((2 * 18.015) / 110.98, 2);
  });

  it("counts a conditioned gel buffer as spent when the jar would drift out of its band", () => {
    const input = { kind: "silica-gel-conditioned" as const, massG: 500, jarVolumeL: 10, tempC: 20, insideRhPercent: 45, outsideRhPercent: 60, airExchangePerDay: 1, toleranceRhPercent: 5 };
    const budget = desiccantBudget(input);
    // Recalled isotherm (manufacturers' isotherms, from memory): 0.235 g/g at 45 %RH, 0.26 at 50 %RH → 0.025 g/g over +5 %RH
    expect(desiccantCapacityGPerG("silica-gel-conditioned", 50)! - desiccantCapacityGPerG("silica-gel-conditioned", 45)!).toBeCloseTo(0.025, 6);
    expect(budget.capacityG).toBeCloseTo(500 * 0.025, 6);
    // Ideal-gas vapour density (same formula as the other budgets): water in = 1 × 0.010 m³ × Δρ
    const inGPerDay = 0.01 * (absoluteHumidityGm3(20, 60) - absoluteHumidityGm3(20, 45));
    expect(budget.waterInGPerDay).toBeCloseTo(inGPerDay, 9);
    expect(budget.daysUntilSpent).toBeCloseTo(12.5 / inGPerDay, 6);
    expect(budget.assumptions.join(" ")).toMatch(/take up about 0\.025 g water per g before the jar drifts 5 %RH above its target/);

    // A drier room drains the buffer: spent by the fall across the lower half band (0.21 → 0.235 g/g, 40 → 45 %RH).
    const drier = desiccantBudget({ ...input, outsideRhPercent: 30 });
    expect(drier.waterInGPerDay).toBeLessThan(0);
    expect(drier.capacityG).toBeCloseTo(500 * 0.025, 6);
    expect(drier.daysUntilSpent).toBeCloseTo(12.5 / -drier.waterInGPerDay, 6);
    expect(drier.assumptions.join(" ")).toMatch(/give up about/);

    // Without a tolerance there is no band to drift out of.
    const noBand = desiccantBudget({ ...input, toleranceRhPercent: undefined });
    expect(noBand.daysUntilSpent).toBeNull();
    expect(noBand.assumptions.join(" ")).toMatch(/Enter the tolerance/);
  });

  it("gives no life estimate without capacity data or without net inflow", () => {
    const other = desiccantBudget({
      kind: "other",
      massG: 100,
      jarVolumeL: 1,
      tempC: 20,
      insideRhPercent: 10,
      outsideRhPercent: 50,
      airExchangePerDay: 1,
    });
    expect(other.capacityG).toBeNull();
    expect(other.daysUntilSpent).toBeNull();
    expect(projectedExhaustionDate(new Date(), other)).toBeNull();

    const withCapacity = desiccantBudget({ kind: "other", massG: 100, jarVolumeL: 1, tempC: 20, insideRhPercent: 10, outsideRhPercent: 50, airExchangePerDay: 1, capacityGPerG: 0.1 });
    expect(withCapacity.capacityG).toBeCloseTo(10, 12);

    const drierOutside = desiccantBudget({ kind: "silica-gel", massG: 100, jarVolumeL: 1, tempC: 20, insideRhPercent: 40, outsideRhPercent: 30, airExchangePerDay: 1 });
    expect(drierOutside.waterInGPerDay).toBeLessThan(0);
    expect(drierOutside.daysUntilSpent).toBeNull();
  });

  it("rejects negative masses and volumes", () => {
    expect(() =>
      desiccantBudget({ kind: "silica-gel", massG: -1, jarVolumeL: 1, tempC: 20, insideRhPercent: 40, outsideRhPercent: 50, airExchangePerDay: 1 }),
    ).toThrow(RangeError);
  });
});
