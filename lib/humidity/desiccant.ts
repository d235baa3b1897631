// Desiccant references and a simple water budget for a desiccated jar.
//
// The capacity curves, lowest attainable RH and regeneration temperatures below are recalled
// values (recalled from manufacturers' published isotherms), not re-read from a datasheet: good enough to size a charge with a
// wide margin, not to promise a date. Suppliers' isotherms differ by grade and by batch.

import { ghsStatements, type GhsStatement } from "@/lib/humidity/ghs";
import { absoluteHumidityGm3 } from "@/lib/humidity/psychrometrics";

export type DesiccantKind = "molecular-sieve-4a" | "silica-gel" | "silica-gel-conditioned" | "calcium-chloride" | "magnesium-sulfate" | "other";

/** Colour indicator mixed into a silica gel charge. */
export type IndicatorKind = "none" | "cobalt-chloride" | "cobalt-free";
export const INDICATOR_KINDS: readonly IndicatorKind[] = ["none", "cobalt-chloride", "cobalt-free"];
export const INDICATOR_LABELS: Readonly<Record<IndicatorKind, string>> = {
  none: "No indicator",
  "cobalt-chloride": "Cobalt(II) chloride (blue when dry, pink when wet)",
  "cobalt-free": "Cobalt-free indicator (e.g. orange when dry, green or colourless when wet)",
};
export function isIndicatorKind(value: string): value is IndicatorKind {
  return (INDICATOR_KINDS as readonly string[]).includes(value);
}

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
  /**
   * Below this RH the desiccant still dries the jar but holds little water (a short charge life);
   * null when its capacity stays high in dry air.
   */
  smallCapacityBelowRhPercent: number | null;
  /**
   * A humidity buffer: conditioned to the target RH beforehand, it gives up or takes up water to
   * hold the jar in its band instead of drying it. Its usable capacity is the isotherm's rise
   * across the tolerance band, not its capacity at the target.
   */
  buffer: boolean;
  /** Whether a colour indicator (cobalt chloride or cobalt-free) can be chosen for this charge. */
  takesIndicator: boolean;
  /** GHS statements of the desiccant itself (an indicator's are added by the hazard notes). */
  ghs: GhsStatement[];
  regenerationC: readonly [number, number] | null;
  cautions: string[];
  source: string;
}

const MEM = "manufacturers' published isotherms, from memory (no datasheet at hand)";

/** Regular-density silica gel, g/g against %RH (recalled typical isotherm). */
const SILICA_GEL_CURVE: readonly (readonly [number, number])[] = [
  [0, 0],
  [10, 0.05],
  [20, 0.11],
  [40, 0.21],
  [50, 0.26],
  [90, 0.35],
  [100, 0.35],
];

export const CALCIUM_CHLORIDE_CAUTION =
  "Calcium chloride deliquesces: above roughly 30 %RH at room temperature it turns into a chloride brine that creeps and drips. Chloride is what drives akaganeite and weeping on iron, so never place it where the brine or its dust can reach a specimen: use a separate, covered, leak-proof tray below or away from the specimens, or choose a chloride-free desiccant.";

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
    smallCapacityBelowRhPercent: null,
    buffer: false,
    takesIndicator: false,
    ghs: [],
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
    // Strongly RH-dependent: gel still dries a jar well below 10 %RH, but it holds little water
    // there (≈0.05 g/g at 10 %RH against ≈0.2 g/g at 40 %RH), so a charge run that dry is short-lived.
    capacityCurve: SILICA_GEL_CURVE,
    lowestRhPercent: null,
    smallCapacityBelowRhPercent: 20,
    buffer: false,
    takesIndicator: true,
    ghs: [],
    regenerationC: [110, 150],
    cautions: [
      "Silica gel can dry a jar below 10 %RH, but its capacity there is small: weigh it or watch the RH, and recharge often.",
      "Indicating gel: do not heat above about 120 °C or the indicator is destroyed.",
    ],
    source: MEM,
  },
  "silica-gel-conditioned": {
    kind: "silica-gel-conditioned",
    displayName: "Silica gel conditioned to the target RH (humidity buffer)",
    // Same isotherm as the regular-density gel above; what it can absorb or give up is its rise
    // across the band (≈0.005 g/g per %RH between 40 and 50 %RH on that curve).
    capacityCurve: SILICA_GEL_CURVE,
    lowestRhPercent: null,
    smallCapacityBelowRhPercent: 20,
    buffer: true,
    takesIndicator: true,
    ghs: [],
    regenerationC: null,
    cautions: [
      "Condition the gel at the target RH before use (over a saturated salt or in a room held at that RH) until its mass stops changing, and record that mass: it buffers the jar at that RH rather than drying it.",
      "A buffer drifts towards the room RH through leaks: recondition it when the jar leaves its band.",
    ],
    source: `${MEM}; buffer capacity from the regular-density gel isotherm`,
  },
  "calcium-chloride": {
    kind: "calcium-chloride",
    displayName: "Calcium chloride, anhydrous",
    // To the dihydrate: 2 × 18.015 / 110.98 = 0.32 g/g (molar masses). It takes up far more as it
    // turns to hexahydrate and then brine, but that is exactly what must not happen near iron.
    capacityCurve: [
      [0, 0],
      [10, 0.32],
      [100, 0.32],
    ],
    lowestRhPercent: null,
    smallCapacityBelowRhPercent: null,
    buffer: false,
    takesIndicator: false,
    // Suppliers' SDS for anhydrous calcium chloride, from memory: Eye Irrit. 2.
    ghs: ghsStatements(["H319"]),
    regenerationC: null,
    cautions: [
      CALCIUM_CHLORIDE_CAUTION,
      "Calcium chloride warms as it takes up water and irritates the eyes: handle it with gloves and eye protection, and replace a charge that has caked or wetted rather than regenerating it.",
    ],
    source: "stoichiometric capacity to CaCl2·2H2O; deliquescence near 30 %RH at room temperature (hexahydrate, from memory)",
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
    smallCapacityBelowRhPercent: null,
    buffer: false,
    takesIndicator: false,
    ghs: [],
    regenerationC: [200, 320],
    cautions: ["Dry it at 200–320 °C only in an oven rated for it; it stays hot long after the oven is off."],
    source: `${MEM}; capacity and lowest RH are planning assumptions`,
  },
  other: {
    kind: "other",
    displayName: "Other desiccant",
    capacityCurve: null,
    lowestRhPercent: null,
    smallCapacityBelowRhPercent: null,
    buffer: false,
    takesIndicator: false,
    ghs: [],
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

/**
 * Water (g/g) a buffer conditioned at rhPercent can take up (wetter room) or give up (drier room)
 * before the jar leaves rhPercent ± toleranceRhPercent: the isotherm's rise across that half band.
 * null when the kind has no isotherm or no tolerance is given.
 */
export function bufferCapacityGPerG(kind: DesiccantKind, rhPercent: number, toleranceRhPercent: number | undefined, takingUp: boolean): number | null {
  if (toleranceRhPercent === undefined) return null;
  requireNonNegative(toleranceRhPercent, "toleranceRhPercent");
  const edge = Math.min(100, Math.max(0, takingUp ? rhPercent + toleranceRhPercent : rhPercent - toleranceRhPercent));
  const here = desiccantCapacityGPerG(kind, rhPercent);
  const there = desiccantCapacityGPerG(kind, edge);
  return here === null || there === null ? null : Math.abs(there - here);
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
  /** Band half-width (± %RH) a humidity buffer may drift through before it counts as spent. */
  toleranceRhPercent?: number;
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
  } else if (info.buffer) {
    perGram = bufferCapacityGPerG(kind, insideRhPercent, input.toleranceRhPercent, waterInGPerDay >= 0);
    if (perGram === null) {
      assumptions.push("Enter the tolerance (± %RH) to estimate how long the buffer holds the jar in its band.");
    } else {
      const tol = input.toleranceRhPercent!;
      assumptions.push(
        `Conditioned at ${insideRhPercent} %RH, the gel can ${waterInGPerDay >= 0 ? "take up" : "give up"} about ${round(perGram, 4)} g water per g before the jar drifts ${tol} %RH ${waterInGPerDay >= 0 ? "above" : "below"} its target (rise of the recalled isotherm across the band).`,
      );
    }
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
  if (!info.buffer && info.smallCapacityBelowRhPercent !== null && insideRhPercent < info.smallCapacityBelowRhPercent) {
    assumptions.push(
      `${info.displayName} still dries a jar below ${info.smallCapacityBelowRhPercent} %RH, but its capacity there is small, so the charge is spent sooner than at mid RH.`,
    );
  }
  assumptions.push("The desiccant counts as spent when it reaches that capacity; the RH starts rising before then, so recharge with a margin.");

  const capacityG = perGram === null ? null : perGram * massG;
  let daysUntilSpent: number | null = null;
  // A buffer is spent by water going either way; a desiccant only by water coming in.
  const netFlow = info.buffer ? Math.abs(waterInGPerDay) : waterInGPerDay;
  if (capacityG !== null && netFlow > 0) daysUntilSpent = capacityG / netFlow;
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
