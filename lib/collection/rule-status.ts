// How a storage location keeps the lab's storage rules: the strictest rule of the objects it holds,
// time in rule over the last days, each exceedance, and what needs a keeper's attention. Pure: the
// caller loads readings, rules and upkeep. "In rule" means RH at or below the rule's threshold; the
// time arithmetic (step readings, gaps not counted) is the chambers' (lib/climate/band-stats.ts).
import { bandStats, type ClimateReading, type Excursion, type RhBand } from "@/lib/climate/band-stats";

const MS_PER_MIN = 60_000;
const MS_PER_DAY = 86_400_000;

/** The windows the product reports time in rule over. */
export const TIME_IN_RULE_DAYS = [7, 30, 365] as const;
/** A logger silent this long makes the location "no readings" on the overview. */
export const NO_READINGS_AFTER_HOURS = 48;
/** Default: an e-mail when a location stays out of rule this long. */
export const DEFAULT_ALERT_AFTER_HOURS = 6;
/** Default readings gap that is not counted (the logger was off): the chambers' default. */
export const DEFAULT_MAX_GAP_MINUTES = 60;

export interface RuleThreshold {
  thresholdRhPercent: number;
}

/**
 * The strictest of the rules that apply to a location's objects: the lowest threshold. Ties keep the
 * first given, so callers pass rules in a stable order. null when no object has a rule.
 */
export function strictestRule<R extends RuleThreshold>(rules: readonly R[]): R | null {
  let best: R | null = null;
  for (const rule of rules) {
    if (!Number.isFinite(rule.thresholdRhPercent)) throw new RangeError(`A rule's threshold must be a number, got ${rule.thresholdRhPercent}.`);
    if (best === null || rule.thresholdRhPercent < best.thresholdRhPercent) best = rule;
  }
  return best;
}

/** The band a rule asks for: anywhere from dry up to the threshold. */
export function ruleBand(thresholdRhPercent: number): RhBand {
  if (!Number.isFinite(thresholdRhPercent) || thresholdRhPercent <= 0 || thresholdRhPercent > 100) {
    throw new RangeError(`A rule's threshold must be above 0 and at most 100 %RH, got ${thresholdRhPercent}.`);
  }
  return { minRh: 0, maxRh: thresholdRhPercent };
}

/**
 * The readings that describe [from, to]: the reading in force at `from` moved to `from`, those inside,
 * and a closing copy of the last one at `to` when the series goes on. A clipped interval counts only
 * when the whole interval it was cut from is no longer than the gap limit, as in the unclipped series.
 */
export function readingsWithin(
  readings: readonly ClimateReading[],
  from: Date,
  to: Date,
  maxGapMinutes = DEFAULT_MAX_GAP_MINUTES,
): ClimateReading[] {
  const fromMs = from.getTime();
  const toMs = to.getTime();
  if (!(fromMs < toMs)) throw new RangeError("The window must start before it ends.");
  const maxGapMs = maxGapMinutes * MS_PER_MIN;
  const out: ClimateReading[] = [];
  let i = 0;
  while (i < readings.length && readings[i].takenAt.getTime() <= fromMs) i++;
  const before = readings[i - 1];
  const first = readings[i];
  if (before && before.takenAt.getTime() === fromMs) out.push(before);
  else if (before && first && first.takenAt.getTime() - before.takenAt.getTime() <= maxGapMs) out.push({ takenAt: from, rhPercent: before.rhPercent });
  for (; i < readings.length && readings[i].takenAt.getTime() <= toMs; i++) out.push(readings[i]);
  const last = readings[i - 1];
  const after = readings[i];
  if (last && after && last.takenAt.getTime() < toMs && after.takenAt.getTime() - last.takenAt.getTime() <= maxGapMs) {
    out.push({ takenAt: to, rhPercent: last.rhPercent });
  }
  return out;
}

export interface TimeInRule {
  days: number;
  /** Counted in-rule time / counted time; null when no time could be counted. */
  fractionInRule: number | null;
  countedMinutes: number;
  outOfRuleMinutes: number;
  /** Each stretch above the threshold: start, end, counted duration and the peak RH. */
  exceedances: Excursion[];
}

export function timeInRule(
  readings: readonly ClimateReading[],
  thresholdRhPercent: number,
  now: Date,
  days: number,
  maxGapMinutes = DEFAULT_MAX_GAP_MINUTES,
): TimeInRule {
  if (!(days > 0)) throw new RangeError(`The window must be a positive number of days, got ${days}.`);
  const window = readingsWithin(readings, new Date(now.getTime() - days * MS_PER_DAY), now, maxGapMinutes);
  const stats = bandStats(window, ruleBand(thresholdRhPercent), { maxGapMinutes });
  return {
    days,
    fractionInRule: stats.fractionInBand,
    countedMinutes: stats.countedMinutes,
    outOfRuleMinutes: stats.countedMinutes - stats.inBandMinutes,
    exceedances: stats.excursions,
  };
}

/**
 * Exceedances that call for an e-mail: out of rule for at least `afterHours` of counted time. An
 * exceedance still going on at the end of the data counts once it has lasted that long.
 */
export function exceedancesToAlert(exceedances: readonly Excursion[], afterHours = DEFAULT_ALERT_AFTER_HOURS): Excursion[] {
  if (!(afterHours > 0)) throw new RangeError(`The alert delay must be above 0 hours, got ${afterHours}.`);
  return exceedances.filter((e) => e.durationMinutes >= afterHours * 60);
}

export interface LocationNeedsInput {
  now: Date;
  thresholdRhPercent: number | null;
  lastReading: ClimateReading | null;
  /** Time in rule over the last 30 days (null when none could be counted). */
  fractionInRule30d: number | null;
  /** The overview flags a location out of rule for more than this share of the last 30 days. */
  outOfRuleShareLimit: number;
  desiccantDueAt: Date | null;
}

export type LocationNeed = "out-of-rule-now" | "often-out-of-rule" | "no-readings" | "desiccant-due" | "no-rule";

export const NEED_LABELS: Readonly<Record<LocationNeed, string>> = {
  "out-of-rule-now": "Out of rule now",
  "often-out-of-rule": "Often out of rule (last 30 days)",
  "no-readings": "No readings for over 2 days",
  "desiccant-due": "Desiccant due",
  "no-rule": "No storage rule for its objects",
};

/** What a location needs, most urgent first; the overview sorts locations by their first need. */
export function locationNeeds(input: LocationNeedsInput): LocationNeed[] {
  const { now, thresholdRhPercent, lastReading, fractionInRule30d, outOfRuleShareLimit, desiccantDueAt } = input;
  if (!(outOfRuleShareLimit >= 0 && outOfRuleShareLimit <= 1)) throw new RangeError(`The share must be between 0 and 1, got ${outOfRuleShareLimit}.`);
  const needs: LocationNeed[] = [];
  const fresh = lastReading !== null && now.getTime() - lastReading.takenAt.getTime() <= NO_READINGS_AFTER_HOURS * 3_600_000;
  if (thresholdRhPercent !== null && fresh && lastReading!.rhPercent > thresholdRhPercent) needs.push("out-of-rule-now");
  if (thresholdRhPercent !== null && fractionInRule30d !== null && 1 - fractionInRule30d > outOfRuleShareLimit) needs.push("often-out-of-rule");
  if (!fresh) needs.push("no-readings");
  if (desiccantDueAt !== null && desiccantDueAt.getTime() <= now.getTime()) needs.push("desiccant-due");
  if (thresholdRhPercent === null) needs.push("no-rule");
  return needs;
}

export const NEED_ORDER: readonly LocationNeed[] = ["out-of-rule-now", "often-out-of-rule", "no-readings", "desiccant-due", "no-rule"];

/** Sort key: index of the most urgent need; locations that need nothing go last. */
export function needRank(needs: readonly LocationNeed[]): number {
  let rank = NEED_ORDER.length;
  for (const n of needs) rank = Math.min(rank, NEED_ORDER.indexOf(n));
  return rank;
}
