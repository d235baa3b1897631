// How many specimens a time-to-first-rust comparison needs: Schoenfeld's formula for the log-rank
// test (Schoenfeld D. A. 1983, "Sample-size formula for the proportional-hazards regression model",
// Biometrics 39:499–503), two-sided. The normal quantile is Wichura's AS 241 (PPND16), which is
// what R's qnorm uses, good to about 1 part in 10^16.

// Wichura M. J. (1988) "Algorithm AS 241: The percentage points of the normal distribution",
// Applied Statistics 37:477–484 — coefficients of PPND16, lowest power first.
const A = [3.387132872796366608, 133.14166789178437745, 1971.5909503065514427, 13731.693765509461125, 45921.953931549871457, 67265.770927008700853, 33430.575583588128105, 2509.0809287301226727];
const B = [1, 42.313330701600911252, 687.1870074920579083, 5394.1960214247511077, 21213.794301586595867, 39307.89580009271061, 28729.085735721942674, 5226.495278852854561];
const C = [1.42343711074968357734, 4.6303378461565452959, 5.7694972214606914055, 3.64784832476320460504, 1.27045825245236838258, 0.24178072517745061177, 0.0227238449892691845833, 7.7454501427834140764e-4];
const D = [1, 2.05319162663775882187, 1.6763848301838038494, 0.68976733498510000455, 0.14810397642748007459, 0.0151986665636164571966, 5.475938084995344946e-4, 1.05075007164441684324e-9];
const E = [6.6579046435011037772, 5.4637849111641143699, 1.7848265399172913358, 0.29656057182850489123, 0.026532189526576123093, 0.0012426609473880784386, 2.71155556874348757815e-5, 2.01033439929228813265e-7];
const F = [1, 0.59983220655588793769, 0.13692988092273580531, 0.0148753612908506148525, 7.868691311456132591e-4, 1.8463183175100546818e-5, 1.4215117583164458887e-7, 2.04426310338993978564e-15];

function ratio(num: number[], den: number[], x: number): number {
  let n = 0;
  let d = 0;
  for (let i = num.length - 1; i >= 0; i--) {
    n = n * x + num[i];
    d = d * x + den[i];
  }
  return n / d;
}

/** The standard normal quantile Φ⁻¹(p) (R's qnorm(p)), for 0 < p < 1. */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`The normal quantile needs a probability strictly between 0 and 1 (got ${p}).`);
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) return q * ratio(A, B, 0.180625 - q * q);
  const r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
  const value = r <= 5 ? ratio(C, D, r - 1.6) : ratio(E, F, r - 5);
  return q < 0 ? -value : value;
}

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
