// Desiccant references and a simple water budget for a desiccated jar.
//
// The capacity curves, lowest attainable RH and regeneration temperatures below are recalled
// values (recalled from manufacturers' published isotherms), not re-read from a datasheet: good enough to size a charge with a
// wide margin, not to promise a date. Suppliers' isotherms differ by grade and by batch.

import { absoluteHumidityGm3 } from "@/lib/humidity/psychrometrics";

export type DesiccantKind = "molecular-sieve-4a" | "silica-gel" | "magnesium-sulfate" | "other";

export interface DesiccantInfo {
  kind: DesiccantKind;
  displayName: string;
  /**
   * Usable capacity (g water per g dry desiccant) against the RH the desiccant is holding, as
   * [rhPercent, gPerG] points for linear interpolation; null where we have no data.
   */
  capacityCurve: readonly (readonly [number, number])[] | null;
  /** Lowest RH the desiccant can hold in a sealed jar (%), null if unknown. */
  lowestRhPercent: number | null;
  regenerationC: readonly [number, number] | null;
  cautions: string[];
  source: string;
}

const MEM = "manufacturers' published isotherms, from memory (no datasheet at hand)";

export const DESICCANTS: Readonly<Record<DesiccantKind, DesiccantInfo>> = {
  "molecular-sieve-4a": {
    kind: "molecular-sieve-4a",
    displayName: "Molecular sieve 4A",
    // ≈0.20 g/g and nearly flat: the zeolite cages fill at very low vapour pressure.
    capacityCurve: [
      [0, 0],
      [1, 0.17],
      [10, 0.2],
      [100, 0.21],
    ],
    lowestRhPercent: 1,
    regenerationC: [200, 315],
    cautions: [
      "Molecular sieve warms strongly when it takes up water; fill and handle it dry and in small amounts.",
      "Regeneration needs 200–315 °C: use an oven rated for it and let the sieve cool in a closed container before use.",
    ],
    source: MEM,
  },
  "silica-gel": {
    kind: "silica-gel",
    displayName: "Silica gel (regular density)",
    // Strongly RH-dependent: gel holds little water in very dry air, so it is a poor choice below ~10–20 %RH.
    capacityCurve: [
      [0, 0],
      [10, 0.05],
      [20, 0.11],
      [40, 0.21],
      [50, 0.26],
      [90, 0.35],
      [100, 0.35],
    ],
    lowestRhPercent: 10,
    regenerationC: [110, 150],
    cautions: [
      "Indicating gel: do not heat above about 120 °C or the indicator is destroyed.",
      "Orange/blue indicating gel coloured with cobalt chloride is classified H350i (may cause cancer by inhalation), H360F, H341, H334, H317: prefer a cobalt-free indicator.",
    ],
    source: MEM,
  },
  "magnesium-sulfate": {
    kind: "magnesium-sulfate",
    displayName: "Magnesium sulfate, dried",
    // Theory to the heptahydrate is 1.05 g/g, but practical uptake is far lower. 0.2 g/g is a
    // cautious planning figure of our own, not a measured value.
    capacityCurve: [
      [0, 0],
      [10, 0.2],
      [100, 0.2],
    ],
    // "Higher than sieve" is all the reference says; 10 % is a cautious planning figure of ours.
    lowestRhPercent: 10,
    regenerationC: [200, 320],
    cautions: ["Dry it at 200–320 °C only in an oven rated for it; it stays hot long after the oven is off."],
    source: `${MEM}; capacity and lowest RH are planning assumptions`,
  },
  other: {
    kind: "other",
    displayName: "Other desiccant",
    capacityCurve: null,
    lowestRhPercent: null,
    regenerationC: null,
    cautions: ["Check the supplier's data for capacity, regeneration temperature and hazards."],
    source: "user-supplied",
  },
};

export const GENERAL_DESICCANT_CAUTION = "Freshly regenerated desiccant is hot enough to burn: handle with gloves and let it cool covered.";

/** Capacity (g/g) at a given RH by linear interpolation on the kind's curve; null if unknown. */
export function desiccantCapacityGPerG(kind: DesiccantKind, rhPercent: number): number | null {
  const curve = DESICCANTS[kind].capacityCurve;
  if (!curve) return null;
  if (!Number.isFinite(rhPercent) || rhPercent < 0 || rhPercent > 100) {
    throw new RangeError(`RH must be between 0 % and 100 %; got ${rhPercent}`);
  }
  for (let i = 1; i < curve.length; i++) {
    const [rh1, c1] = curve[i];
    if (rhPercent <= rh1) {
      const [rh0, c0] = curve[i - 1];
      return c0 + ((c1 - c0) * (rhPercent - rh0)) / (rh1 - rh0);
    }
  }
  return curve[curve.length - 1][1];
}

export interface DesiccantBudgetInput {
  kind: DesiccantKind;
  massG: number;
  jarVolumeL: number;
  tempC: number;
  /** RH the jar is meant to hold (the target). */
  insideRhPercent: number;
  /** Room RH around the jar. */
  outsideRhPercent: number;
  /** Jar volumes of room air exchanged per day through the seal (leak rate). */
  airExchangePerDay: number;
  /** Extra water per day (e.g. a damp specimen drying out), g/day. */
  extraLoadGPerDay?: number;
  /** Overrides the kind's capacity curve (g/g), e.g. from the supplier's datasheet. */
  capacityGPerG?: number;
}

export interface DesiccantBudget {
  waterInGPerDay: number;
  capacityG: number | null;
  /** null when there is no capacity figure or no net water coming in. */
  daysUntilSpent: number | null;
  assumptions: string[];
}

function requireNonNegative(value: number, name: string): void {
  if (!Number.isFinite(value) || value < 0) throw new RangeError(`${name} must be a number ≥ 0; got ${value}`);
}

export function desiccantBudget(input: DesiccantBudgetInput): DesiccantBudget {
  const { kind, massG, jarVolumeL, tempC, insideRhPercent, outsideRhPercent, airExchangePerDay } = input;
  const extraLoadGPerDay = input.extraLoadGPerDay ?? 0;
  requireNonNegative(massG, "massG");
  requireNonNegative(jarVolumeL, "jarVolumeL");
  requireNonNegative(airExchangePerDay, "airExchangePerDay");
  requireNonNegative(extraLoadGPerDay, "extraLoadGPerDay");
  const info = DESICCANTS[kind];
  const assumptions: string[] = [];

  const insideGm3 = absoluteHumidityGm3(tempC, insideRhPercent);
  const outsideGm3 = absoluteHumidityGm3(tempC, outsideRhPercent);
  const volumeM3 = jarVolumeL / 1000;
  const leakGPerDay = airExchangePerDay * volumeM3 * (outsideGm3 - insideGm3);
  const waterInGPerDay = leakGPerDay + extraLoadGPerDay;
  assumptions.push(
    `Room air leaks in at ${airExchangePerDay} jar volume(s) per day and brings ${round(outsideGm3 - insideGm3, 2)} g/m³ more water than the jar air holds; room and jar are both at ${tempC} °C.`,
  );
  assumptions.push(
    `The jar air itself holds only ${round(insideGm3 * volumeM3 * 1000, 1)} mg of vapour; nearly all the water the desiccant takes up comes from leaks, surfaces and the specimen.`,
  );
  if (extraLoadGPerDay > 0) assumptions.push(`An extra ${extraLoadGPerDay} g of water per day is added (your estimate).`);

  let perGram: number | null = input.capacityGPerG ?? null;
  if (perGram !== null) {
    requireNonNegative(perGram, "capacityGPerG");
    assumptions.push(`Capacity ${perGram} g water per g desiccant, as you entered it.`);
  } else {
    perGram = desiccantCapacityGPerG(kind, insideRhPercent);
    if (perGram === null) {
      assumptions.push("No capacity data for this desiccant: enter its capacity (g water per g) to get a life estimate.");
    } else {
      assumptions.push(
        `${info.displayName} holds about ${round(perGram, 3)} g water per g at ${insideRhPercent} %RH (recalled typical value, not a datasheet figure).`,
      );
    }
  }
  if (info.lowestRhPercent !== null && insideRhPercent < info.lowestRhPercent) {
    assumptions.push(
      `${info.displayName} cannot hold a jar much below ${info.lowestRhPercent} %RH; expect the jar to sit above the target.`,
    );
  }
  assumptions.push("The desiccant counts as spent when it reaches that capacity; the RH starts rising before then, so recharge with a margin.");

  const capacityG = perGram === null ? null : perGram * massG;
  let daysUntilSpent: number | null = null;
  if (capacityG !== null && waterInGPerDay > 0) daysUntilSpent = capacityG / waterInGPerDay;
  else if (capacityG !== null) assumptions.push("No net water comes in under these figures, so no exhaustion date can be projected.");
  return { waterInGPerDay, capacityG, daysUntilSpent, assumptions };
}

const MS_PER_DAY = 86_400_000;

/** Date the charge is expected to be spent, or null when the budget gives no finite life. */
export function projectedExhaustionDate(chargedAt: Date, budget: Pick<DesiccantBudget, "daysUntilSpent">): Date | null {
  if (budget.daysUntilSpent === null || !Number.isFinite(budget.daysUntilSpent)) return null;
  return new Date(chargedAt.getTime() + budget.daysUntilSpent * MS_PER_DAY);
}

function round(value: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(value * f) / f;
}
