// Inspection plans: which days after the start of exposure a specimen is inspected.
import { addCalendarDays, assertValidDate } from "./calendar";

export type InspectionPlan =
  | { kind: "fixed"; intervalDays: number; count: number }
  | { kind: "geometric"; count: number }
  | { kind: "custom"; days: number[] };

export type ScheduleOptions = {
  /** IANA zone whose calendar the days are counted on; default "UTC". */
  timeZone?: string;
};

/**
 * Geometric plan: days 0, 1, 2, 4, 7, then doubling from day 7 (14, 28, 56, 112, 224, …).
 * Dense early, because first rust on chloride-bearing iron often shows within days, sparse later.
 */
export const GEOMETRIC_LEADING_DAYS: readonly number[] = [0, 1, 2, 4, 7];
export const GEOMETRIC_RULE_TEXT =
  "Days 0, 1, 2, 4 and 7 after the start, then doubling from day 7: 14, 28, 56, 112, 224, …";

// Limits keep plans meaningful and every planned date representable (Date spans ±100 million days).
export const MAX_INSPECTIONS = 1000;
export const MAX_GEOMETRIC_COUNT = 20; // day 7·2^15 ≈ 630 years already
export const MAX_PLAN_DAY = 36_500; // a century of exposure

function assertCount(count: number, max: number): void {
  if (!Number.isInteger(count) || count < 1 || count > max) {
    throw new RangeError(`count must be an integer from 1 to ${max}, got ${count}`);
  }
}

/** Day offsets of a plan, validated. The first inspection of a fixed plan is day 0 (the baseline). */
export function planDays(plan: InspectionPlan): number[] {
  switch (plan.kind) {
    case "fixed": {
      assertCount(plan.count, MAX_INSPECTIONS);
      const { intervalDays } = plan;
      if (!Number.isInteger(intervalDays) || intervalDays < 1 || intervalDays * (plan.count - 1) > MAX_PLAN_DAY) {
        throw new RangeError(`intervalDays must be a whole number ≥ 1 with the last day ≤ ${MAX_PLAN_DAY}, got ${intervalDays}`);
      }
      return Array.from({ length: plan.count }, (_, i) => i * intervalDays);
    }
    case "geometric": {
      assertCount(plan.count, MAX_GEOMETRIC_COUNT);
      const days: number[] = [];
      for (let i = 0; i < plan.count; i++) {
        days.push(i < GEOMETRIC_LEADING_DAYS.length ? GEOMETRIC_LEADING_DAYS[i] : 2 * days[i - 1]);
      }
      return days;
    }
    case "custom":
      validateCustomDays(plan.days);
      return plan.days.slice();
    default:
      throw new RangeError(`unknown plan kind ${(plan as { kind: string }).kind}`);
  }
}

/** Custom days must be whole, non-negative, strictly increasing (so sorted and unique). */
export function validateCustomDays(days: readonly number[]): void {
  if (days.length === 0 || days.length > MAX_INSPECTIONS) {
    throw new RangeError(`a custom plan needs 1 to ${MAX_INSPECTIONS} days, got ${days.length}`);
  }
  days.forEach((d, i) => {
    if (!Number.isInteger(d) || d < 0 || d > MAX_PLAN_DAY) {
      throw new RangeError(`day ${d} must be a whole number from 0 to ${MAX_PLAN_DAY}`);
    }
    if (i > 0 && d <= days[i - 1]) throw new RangeError(`days must be sorted and unique; ${d} follows ${days[i - 1]}`);
  });
}

/** For a form: sort and drop repeats of what the user typed; validation still applies afterwards. */
export function normaliseCustomDays(days: readonly number[]): number[] {
  return [...new Set(days)].sort((a, b) => a - b);
}

/** Planned inspection times: start + each plan day, at the start's time of day. */
export function buildSchedule(plan: InspectionPlan, startAt: Date, options: ScheduleOptions = {}): Date[] {
  assertValidDate(startAt, "startAt");
  return planDays(plan).map((d) => addCalendarDays(startAt, d, options.timeZone));
}
