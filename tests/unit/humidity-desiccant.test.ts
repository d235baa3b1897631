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
      kind: "silica-gel",
      massG: 200,
      jarVolumeL: 1,
      tempC: 20,
      insideRhPercent: 5,
      outsideRhPercent: 50,
      airExchangePerDay: 1,
    });
    expect(budget.assumptions.join(" ")).toMatch(/cannot hold a jar much below 10 %RH/);
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
