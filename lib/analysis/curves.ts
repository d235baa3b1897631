// Rust-free fraction curves for charts and tables: Turnbull (interval data) and right-endpoint
// Kaplan–Meier with Greenwood log limits, censoring marks, medians and numbers at risk.
import type { SurvivalObservation } from "@/lib/stats/observations";
import { kaplanMeier, kmQuantile } from "@/lib/stats/survival";
import { medianFromTurnbull, rightEndpointKm, survivalCurveFromTurnbull, turnbullFit, type IntervalObservation } from "@/lib/stats/turnbull";

export interface CurvePoint {
  time: number;
  survival: number;
  /** 95 % limits; null where the method gives none (Turnbull here). */
  lower: number | null;
  upper: number | null;
}

export interface CensorMark {
  time: number;
  survival: number;
  count: number;
}

export interface CurveResult {
  points: CurvePoint[];
  censorMarks: CensorMark[];
}

export interface TurnbullSummary extends CurveResult {
  /** The median lies in (lower, upper]; time is the upper end (drawn-curve convention). */
  median: { time: number; lower: number; upper: number } | null;
  converged: boolean;
}

export interface KmSummary extends CurveResult {
  median: number | null;
  /** 95 % interval for the median from the Greenwood log band (as R's survfit prints it). */
  medianLower: number | null;
  medianUpper: number | null;
}

function censorTimes(obs: readonly SurvivalObservation[]): Map<number, number> {
  const counts = new Map<number, number>();
  for (const o of obs) if (!o.event) counts.set(o.time, (counts.get(o.time) ?? 0) + 1);
  return counts;
}

/** Survival just after `time` from step points sorted by time (S = 1 before the first). */
function survivalAtPoints(points: readonly CurvePoint[], time: number): number {
  let s = 1;
  for (const p of points) {
    if (p.time > time) break;
    s = p.survival;
  }
  return s;
}

/** Close the step line at the last follow-up time so a curve with censored tails does not stop early. */
function extend(points: CurvePoint[], maxTime: number): CurvePoint[] {
  const last = points[points.length - 1];
  if (last && maxTime > last.time) points.push({ ...last, time: maxTime });
  return points;
}

function marks(obs: readonly SurvivalObservation[], points: readonly CurvePoint[]): CensorMark[] {
  return [...censorTimes(obs)]
    .sort(([a], [b]) => a - b)
    .map(([time, count]) => ({ time, count, survival: survivalAtPoints(points, time) }));
}

function maxTimeOf(obs: readonly SurvivalObservation[]): number {
  return obs.reduce((m, o) => Math.max(m, o.time), 0);
}

export function turnbullSummary(intervals: readonly IntervalObservation[]): TurnbullSummary {
  const right = rightEndpointKm(intervals);
  const fit = turnbullFit(intervals);
  const points: CurvePoint[] = [{ time: 0, survival: 1, lower: null, upper: null }];
  for (const step of survivalCurveFromTurnbull(fit)) {
    points.push({ time: step.time, survival: step.survival, lower: null, upper: null });
  }
  extend(points, maxTimeOf(right));
  const median = medianFromTurnbull(fit);
  return { points, censorMarks: marks(right, points), median, converged: fit.converged };
}

export function kmSummary(intervals: readonly IntervalObservation[]): KmSummary {
  const right = rightEndpointKm(intervals);
  const km = kaplanMeier(right);
  const points: CurvePoint[] = [{ time: 0, survival: 1, lower: 1, upper: 1 }];
  for (const s of km.steps) {
    // Censor-only steps change nothing on the curve; the marks show them.
    if (s.events === 0) continue;
    points.push({ time: s.time, survival: s.survival, lower: s.lower95, upper: s.upper95 });
  }
  extend(points, maxTimeOf(right));
  return {
    points,
    censorMarks: marks(right, points),
    median: km.median,
    // The lower band falls through 0.5 first, so it gives the lower limit (as R's quantile.survfit),
    // read by the same rule as the median.
    medianLower: kmQuantile(km.steps, 0.5, { curve: "lower95" }),
    medianUpper: kmQuantile(km.steps, 0.5, { curve: "upper95" }),
  };
}

/**
 * Numbers at risk at each time: specimens under observation and not yet seen rusted, i.e. that
 * entered before t (or at the start) and whose right-endpoint time (first rusted or last clean
 * inspection) is at or after t.
 */
export function numbersAtRisk(groups: readonly (readonly IntervalObservation[])[], times: readonly number[]): number[][] {
  return groups.map((intervals) => {
    const right = rightEndpointKm(intervals);
    return times.map((t) => right.filter((o) => o.time >= t && (o.entry === undefined || o.entry < t)).length);
  });
}
