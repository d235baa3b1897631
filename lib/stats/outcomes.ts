// From inspection scores to the outcomes the statistics work on: the time-to-first-rust interval
// per specimen and rusted-area summaries per inspection day.
import type { IntervalObservation } from "./turnbull";


/** A day number (days on the caller's scale, e.g. trial day) or a Date. */
export type DayValue = Date | number;

export interface InspectionOutcome {
  inspectedAt: DayValue;
  rusted: boolean;
  /** Rusted area of the scored face in percent; null when the photo was not area-scored. */
  areaPercent: number | null;
}

export interface RustEvidence {
  spotCount?: number | null;
  areaPercent?: number | null;
  weeping?: boolean | null;
}

/**
 * The single rule for "this inspection shows rust": any counted spot, any rusted area, or weeping
 * (akaganeite droplets appear before a visible spot on meteoritic iron, so weeping alone counts).
 */
export function isRusted(evidence: RustEvidence): boolean {
  return (evidence.spotCount ?? 0) > 0 || (evidence.areaPercent ?? 0) > 0 || evidence.weeping === true;
}

const MS_PER_DAY = 86_400_000;

/** Dates become fractional days since 1970-01-01 UTC, so they mix with day numbers on that scale. */
function toDays(value: DayValue): number {
  const days = value instanceof Date ? value.getTime() / MS_PER_DAY : value;
  if (!Number.isFinite(days)) throw new RangeError(`not a valid day or date: ${String(value)}`);
  return days;
}

/**
 * Days from start to `at`. An inspection before the start (a baseline photo taken just before the
 * jar was sealed) counts as at the start: the specimen was not yet exposed.
 */
export function daysSinceStart(at: DayValue, startDay: DayValue): number {
  return Math.max(0, toDays(at) - toDays(startDay));
}

function byTime(inspections: readonly InspectionOutcome[], startDay: DayValue) {
  return inspections
    .map((inspection) => ({ day: daysSinceStart(inspection.inspectedAt, startDay), inspection }))
    .sort((a, b) => a.day - b.day);
}

/**
 * Time to first rust as (last clean inspection, first rusted inspection] in days since start.
 * Rusted at the first inspection: lower = 0 (the start); if that inspection is itself at day 0
 * the result is (0, 0], which turnbull() reads as an exact time 0. Never rusted: right-censored at
 * the last clean inspection (upper = Infinity). No inspections: null. Inspections after the first
 * rusted one do not move the interval (a later "clean" call is a scoring disagreement, not healing).
 */
export function firstRustInterval(
  inspections: readonly InspectionOutcome[],
  startDay: DayValue,
): { lower: number; upper: number } | null {
  if (inspections.length === 0) return null;
  let lastClean = 0;
  for (const { day, inspection } of byTime(inspections, startDay)) {
    if (inspection.rusted) return { lower: lastClean, upper: day };
    lastClean = day;
  }
  return { lower: lastClean, upper: Infinity };
}

/** firstRustInterval for many specimens, dropping those never inspected. */
export function firstRustIntervals(
  specimens: readonly { startDay: DayValue; inspections: readonly InspectionOutcome[] }[],
): IntervalObservation[] {
  const out: IntervalObservation[] = [];
  for (const s of specimens) {
    const interval = firstRustInterval(s.inspections, s.startDay);
    if (interval) out.push(interval);
  }
  return out;
}

export interface AreaGroupInput {
  label: string;
  specimens: readonly { startDay: DayValue; inspections: readonly InspectionOutcome[] }[];
}

export interface AreaPoint {
  /** Whole days since start (inspections are grouped by the day they fall on). */
  day: number;
  n: number;
  median: number;
  q1: number;
  q3: number;
}

export interface AreaSeries {
  label: string;
  points: AreaPoint[];
}

/** Quantile of sorted values by linear interpolation between order statistics (R's default, type 7). */
export function quantileType7(sorted: readonly number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/**
 * Rusted-area median and quartiles per group per inspection day, for the growth chart. Inspections
 * without an area score are left out; a specimen inspected twice on one day counts with its last.
 */
export function areaOverTime(groups: readonly AreaGroupInput[]): AreaSeries[] {
  return groups.map(({ label, specimens }) => {
    const byDay = new Map<number, number[]>();
    for (const specimen of specimens) {
      const lastOnDay = new Map<number, number>();
      for (const { day, inspection } of byTime(specimen.inspections, specimen.startDay)) {
        if (inspection.areaPercent === null || !Number.isFinite(inspection.areaPercent)) continue;
        lastOnDay.set(Math.round(day), inspection.areaPercent);
      }
      for (const [day, area] of lastOnDay) {
        const values = byDay.get(day);
        if (values) values.push(area);
        else byDay.set(day, [area]);
      }
    }
    const points = [...byDay.entries()]
      .sort(([a], [b]) => a - b)
      .map(([day, values]) => {
        const sorted = values.sort((a, b) => a - b);
        return {
          day,
          n: sorted.length,
          median: quantileType7(sorted, 0.5),
          q1: quantileType7(sorted, 0.25),
          q3: quantileType7(sorted, 0.75),
        };
      });
    return { label, points };
  });
}
