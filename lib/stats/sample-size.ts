// How many specimens a time-to-first-rust comparison needs: Schoenfeld's formula for the log-rank
// test (Schoenfeld D. A. 1983, "Sample-size formula for the proportional-hazards regression model",
// Biometrics 39:499–503), two-sided. The normal quantile is lib/stats/distributions' AS 241, as R's qnorm.

import { normalQuantile } from "./distributions";

export type EventsInput = {
  /** Hazard ratio to detect (e.g. 0.5: the treated specimens rust at half the rate). */
  hazardRatio: number;
  /** Two-sided significance level, e.g. 0.05. */
  alpha: number;
  /** Probability of detecting the hazard ratio if it is real, e.g. 0.8. */
  power: number;
  /** Share π of the specimens in the first of the two arms compared (default ½). */
  allocation?: number;
};
export type SpecimensInput = EventsInput & {
  /** Expected fraction of specimens that show first rust by the end of the trial, in (0, 1]. */
  fractionRusting: number;
};
export type PlanningField = "hazardRatio" | "alpha" | "power" | "allocation" | "fractionRusting";

const openUnit = (x: number) => Number.isFinite(x) && x > 0 && x < 1;

/** Per field, what is wrong with a planning input (empty when all are usable). One source for the
 *  RangeErrors below and for the messages shown at the form's fields. */
export function planningInputErrors(input: Partial<SpecimensInput>): Partial<Record<PlanningField, string>> {
  const errors: Partial<Record<PlanningField, string>> = {};
  const { hazardRatio, alpha, power, allocation, fractionRusting } = input;
  if (hazardRatio !== undefined) {
    if (!Number.isFinite(hazardRatio) || hazardRatio <= 0) errors.hazardRatio = "The hazard ratio must be a number greater than 0.";
    else if (hazardRatio === 1) errors.hazardRatio = "A hazard ratio of 1 means no difference, so there is nothing to detect; use e.g. 0.5 or 2.";
  }
  if (alpha !== undefined && !openUnit(alpha)) errors.alpha = "The significance level α must lie strictly between 0 and 1 (e.g. 0.05).";
  if (power !== undefined && !openUnit(power)) errors.power = "The power must lie strictly between 0 and 1 (e.g. 0.8).";
  if (allocation !== undefined && !openUnit(allocation)) errors.allocation = "The allocation share must lie strictly between 0 and 1 (½ for equal arms).";
  if (fractionRusting !== undefined && !(Number.isFinite(fractionRusting) && fractionRusting > 0 && fractionRusting <= 1)) {
    errors.fractionRusting = "The expected fraction rusting must be greater than 0 and at most 1 (e.g. 0.5).";
  }
  return errors;
}

function assertInput(input: Partial<SpecimensInput>): void {
  const first = Object.values(planningInputErrors(input))[0];
  if (first) throw new RangeError(first);
}

/** The number of events (specimens that show first rust) a two-sided log-rank test needs, unrounded:
 *  d = (z₁₋α/₂ + z₁₋β)² / (π(1−π)·(ln HR)²). */
export function schoenfeldEvents({ hazardRatio, alpha, power, allocation = 0.5 }: EventsInput): number {
  assertInput({ hazardRatio, alpha, power, allocation });
  const z = normalQuantile(1 - alpha / 2) + normalQuantile(power);
  const logHr = Math.log(hazardRatio);
  return (z * z) / (allocation * (1 - allocation) * logHr * logHr);
}

// Floating-point noise must not push an exact whole number up by one (46.000000000001 → 47).
const ceilWhole = (x: number) => Math.ceil(x - 1e-9);

export type SpecimenPlan = {
  /** Events needed, unrounded and rounded up. */
  eventsExact: number;
  events: number;
  /** Specimens in the two arms compared together: ⌈d / fraction rusting⌉. */
  total: number;
  /** Specimens in each of the two arms compared: ⌈total·π⌉ and ⌈total·(1−π)⌉. */
  perArm: [number, number];
};

/** Specimens needed for the events: n = ⌈d / fraction rusting⌉, split between the two arms by π. */
export function specimensNeeded(input: SpecimensInput): SpecimenPlan {
  assertInput(input);
  const allocation = input.allocation ?? 0.5;
  const eventsExact = schoenfeldEvents({ ...input, allocation });
  const total = ceilWhole(eventsExact / input.fractionRusting);
  return { eventsExact, events: ceilWhole(eventsExact), total, perArm: [ceilWhole(total * allocation), ceilWhole(total * (1 - allocation))] };
}
