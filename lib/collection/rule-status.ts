// How a storage location keeps the lab's storage rules: the strictest rule of the objects it holds,
// time in rule over the last days, each exceedance, and what needs a keeper's attention. Pure: the
// caller loads readings, rules and upkeep. "In rule" means RH at or below the rule's threshold; the
// time arithmetic (step readings, gaps not counted) is the chambers' (lib/climate/band-stats.ts).
import { ANY_TREATMENT } from "@/lib/validation/storage-rules";
import type { BandStats, ClimateReading, Excursion, RhBand } from "@/lib/climate/band-stats";

/** The windows the product reports time in rule over. */
export const TIME_IN_RULE_DAYS = [7, 30, 365] as const;
/** A logger silent this long makes the location "no readings" on the overview. */
export const NO_READINGS_AFTER_HOURS = 48;
/** Default: an e-mail when a location stays out of rule this long. */
export const DEFAULT_ALERT_AFTER_HOURS = 6;

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

export interface TimeInRule {
  days: number;
  /** Counted in-rule time / counted time; null when no time could be counted. */
  fractionInRule: number | null;
  countedMinutes: number;
  outOfRuleMinutes: number;
  /** Each stretch above the threshold: start, end, counted duration and the peak RH. */
  exceedances: Excursion[];
}

/**
 * Time in rule from band statistics against the rule's band (ruleBand), counted by the chambers' rule
 * over the readings taken within the window (db/queries/readings-series getBandWindowStats).
 */
export function timeInRuleOf(stats: Pick<BandStats, "fractionInBand" | "countedMinutes" | "inBandMinutes" | "excursions">, days: number): TimeInRule {
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

export interface RuleForMatch extends RuleThreshold {
  materialClass: string;
  treatmentName: string;
}

const ANY = ANY_TREATMENT.toLowerCase();

/** An object's treatments as listed in the register: one per line, or separated by commas or semicolons. */
export function treatmentNames(treatmentsApplied: string): string[] {
  return treatmentsApplied.split(/[\n,;]+/).map((t) => t.trim().toLowerCase()).filter(Boolean);
}

/**
 * The rules in force that hold for an object: same material class, and either any treatment or a
 * treatment the register lists for it; an untreated object (none listed) takes the rules for its bare
 * material, i.e. those named for an uncoated or untreated control as well as any-treatment rules.
 */
export function rulesForObject<R extends RuleForMatch>(object: { materialClass: string; treatmentsApplied: string }, rules: readonly R[]): R[] {
  const applied = treatmentNames(object.treatmentsApplied);
  return rules.filter((r) => {
    if (r.materialClass !== object.materialClass) return false;
    const name = r.treatmentName.trim().toLowerCase();
    if (name === ANY) return true;
    if (applied.length === 0) return /\b(uncoated|untreated|bare|none)\b/.test(name);
    return applied.includes(name);
  });
}

/** Each object's own rule (the strictest that holds for it) and the location's: the strictest of those. */
export function locationRule<O extends { materialClass: string; treatmentsApplied: string }, R extends RuleForMatch>(objects: readonly O[], rules: readonly R[]) {
  const perObject = objects.map((object) => ({ object, rule: strictestRule(rulesForObject(object, rules)) }));
  return { perObject, rule: strictestRule(perObject.flatMap((x) => (x.rule ? [x.rule] : []))) };
}

/**
 * Whether a location's stored count (time in rule, exceedances, objects at risk) still stands at
 * `now`: counted at most maxAgeMs before it, and nothing logged since that could start or lengthen an
 * exceedance — no reading since above the rule (sinceMaxRh: the highest logged RH since the count,
 * null when none), and the location was not out of rule when counted. Readings in rule appended since
 * only lengthen the time in rule until the next count. Changes to the past are the database's to
 * catch (the stored row is deleted).
 */
export function storedCountStands(
  stored: { computedAt: Date; thresholdRhPercent: number | null; lastAtCountRh: number | null }, sinceMaxRh: number | null, now: Date, maxAgeMs: number,
): boolean {
  const age = now.getTime() - stored.computedAt.getTime();
  if (age < 0 || age > maxAgeMs) return false;
  if (sinceMaxRh === null || stored.thresholdRhPercent === null) return true;
  return sinceMaxRh <= stored.thresholdRhPercent && !(stored.lastAtCountRh !== null && stored.lastAtCountRh > stored.thresholdRhPercent);
}
