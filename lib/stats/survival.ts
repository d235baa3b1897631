// Right-censored survival: Kaplan–Meier with Greenwood/log limits and the k-group log-rank test,
// both matching R survival's defaults, with delayed entry and strata. Interval data live in turnbull.ts.
import { chiSquareUpperTail, Z_975 } from "./distributions";
import type { SurvivalObservation } from "./observations";


export interface KaplanMeierStep {
  time: number;
  atRisk: number;
  events: number;
  survival: number;
  lower95: number;
  upper95: number;
}

export interface KaplanMeierResult {
  steps: KaplanMeierStep[];
  median: number | null;
}

export interface LogRankResult {
  chiSquare: number;
  df: number;
  pValue: number;
  observed: number[];
  expected: number[];
}

/**
 * Distinct times in increasing order with how many observations and events fall on each, plus the
 * sorted entry and exit times that give the risk set at any time: at risk at t are the rows with
 * entry < t ≤ time. Trial data are heavily tied (everyone is inspected on the same days), so
 * tallying through a Map and sorting only the distinct times beats sorting every observation.
 */
interface Tally {
  times: number[];
  counts: number[];
  events: number[];
  n: number;
  /** Sorted entries of the rows that have one (finite), and every row's time, sorted. */
  entries: number[];
  exits: number[];
}

function tally(obs: readonly SurvivalObservation[], who: string): Tally {
  const slot = new Map<number, number>();
  const rawTimes: number[] = [];
  const rawCounts: number[] = [];
  const rawEvents: number[] = [];
  const entries: number[] = [];
  const exits: number[] = [];
  for (const o of obs) {
    if (!Number.isFinite(o.time)) throw new RangeError(`${who}: every time must be a finite number, got ${o.time}`);
    if (o.entry !== undefined && Number.isNaN(o.entry)) throw new RangeError(`${who}: an entry time must be a number, got NaN`);
    const entry = o.entry ?? -Infinity;
    if (!(o.time > entry)) continue; // never at risk
    let k = slot.get(o.time);
    if (k === undefined) {
      k = rawTimes.length;
      slot.set(o.time, k);
      rawTimes.push(o.time);
      rawCounts.push(0);
      rawEvents.push(0);
    }
    rawCounts[k]++;
    if (o.event) rawEvents[k]++;
    if (entry > -Infinity) entries.push(entry);
    exits.push(o.time);
  }
  const order = rawTimes.map((_, i) => i).sort((x, y) => rawTimes[x] - rawTimes[y]);
  return {
    times: order.map((i) => rawTimes[i]),
    counts: order.map((i) => rawCounts[i]),
    events: order.map((i) => rawEvents[i]),
    n: exits.length,
    entries: entries.sort((a, b) => a - b),
    exits: exits.sort((a, b) => a - b),
  };
}

/** How many sorted values are < t. */
function countBelow(sorted: readonly number[], t: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid] < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Rows at risk at t: entered before t (or at the start) and not gone before t. */
function atRiskAt(t: Tally, time: number): number {
  const late = t.entries.length - countBelow(t.entries, time); // entered at or after `time`
  return t.n - late - countBelow(t.exits, time);
}

/**
 * Kaplan–Meier estimate with a step at every distinct time (censor-only times carry events 0).
 * With delayed entry a row counts in the risk set only on (entry, time] (R: survfit(Surv(entry,
 * time, status) ~ 1)). Limits: S·exp(±z·√Σ d/(n(n−d))), R's conf.type = "log", clipped to [0, 1];
 * z = qnorm(0.975). Where S reaches 0 the log limits are undefined (R prints NA); we report 0 for
 * both. Median: R's rule (kmQuantile); null when the curve never gets there.
 */
export function kaplanMeier(obs: readonly SurvivalObservation[]): KaplanMeierResult {
  const t = tally(obs, "kaplanMeier");
  const { times, events } = t;
  const steps: KaplanMeierStep[] = [];
  let survival = 1;
  let greenwood = 0;
  for (let k = 0; k < times.length; k++) {
    const d = events[k];
    const atRisk = atRiskAt(t, times[k]);
    if (d > 0) {
      survival *= 1 - d / atRisk;
      greenwood = d < atRisk ? greenwood + d / (atRisk * (atRisk - d)) : Infinity;
    }
    let lower95 = 0;
    let upper95 = 0;
    if (survival > 0) {
      const halfWidth = Z_975 * Math.sqrt(greenwood);
      lower95 = Math.max(0, survival * Math.exp(-halfWidth));
      upper95 = Math.min(1, survival * Math.exp(halfWidth));
    }
    steps.push({ time: times[k], atRisk, events: d, survival, lower95, upper95 });
  }
  return { steps, median: kmQuantile(steps, 0.5) };
}

// R survival's tolerance for "S equals the level": sqrt(.Machine$double.eps).
const QUANTILE_TOLERANCE = Math.sqrt(Number.EPSILON);

export interface KmQuantileOptions {
  /** The estimate (default) or one of its 95 % limits: the limits' crossing gives the quantile's interval. */
  curve?: "survival" | "lower95" | "upper95";
  /**
   * When the level is met exactly on the curve's last step (no later drop), R's two readers differ:
   * print.survfit keeps the time the curve got there ("print", the default, and what `median` uses);
   * quantile.survfit takes the midpoint with the last follow-up time ("quantile").
   */
  lastPlateau?: "print" | "quantile";
}

/**
 * The time by which a fraction p has failed (p = 0.5: the median) from Kaplan–Meier steps, by R
 * survival's rule (print.survfit's minmin, quantile.survfit's findq; survival 3.5-3): the first time
 * with S < 1 − p, except that where S equals 1 − p exactly over a plateau (within √ε) the answer is
 * the midpoint between the time it got there and the time of the next drop. Null when S never gets
 * down to 1 − p. A limit of 0 where S is 0 counts as missing, as R's NA.
 */
export function kmQuantile(steps: readonly KaplanMeierStep[], p: number, options: KmQuantileOptions = {}): number | null {
  if (!(p > 0 && p < 1)) throw new RangeError(`kmQuantile: p must lie strictly between 0 and 1, got ${p}`);
  const curve = options.curve ?? "survival";
  const level = 1 - p;
  const points = steps
    .filter((s) => curve === "survival" || s.survival > 0)
    .map((s) => ({ time: s.time, y: s[curve] }))
    .filter((s) => s.y < level + QUANTILE_TOLERANCE);
  const first = points[0];
  if (!first) return null;
  if (Math.abs(first.y - level) >= QUANTILE_TOLERANCE) return first.time;
  const nextDrop = points.find((s) => s.y < first.y);
  if (nextDrop) return (first.time + nextDrop.time) / 2;
  const lastTime = steps[steps.length - 1].time;
  return options.lastPlateau === "quantile" ? (first.time + lastTime) / 2 : first.time;
}

/**
 * Quadratic form z'V⁻z by symmetric elimination; a pivot that vanishes (a direction with no
 * variance) is dropped and lowers the rank, like a generalized inverse. Returns the form and rank.
 */
function quadraticForm(v: number[][], z: number[]): { value: number; rank: number } {
  const m = z.length;
  const a = v.map((row) => row.slice());
  const b = z.slice();
  const scale = Math.max(1e-300, ...a.map((row, i) => Math.abs(row[i])));
  let value = 0;
  let rank = 0;
  for (let p = 0; p < m; p++) {
    const pivot = a[p][p];
    if (!(pivot > 1e-10 * scale)) continue;
    rank++;
    value += (b[p] * b[p]) / pivot;
    for (let i = p + 1; i < m; i++) {
      const f = a[i][p] / pivot;
      if (f === 0) continue;
      for (let j = p + 1; j < m; j++) a[i][j] -= f * a[p][j];
      b[i] -= f * b[p];
    }
  }
  return { value, rank };
}

interface LogRankParts {
  observed: number[];
  expected: number[];
  covariance: number[][];
}

/** Observed and expected events and their hypergeometric covariance, summed over event times. */
function logRankParts(groups: readonly (readonly SurvivalObservation[])[], who: string): LogRankParts {
  const k = groups.length;
  const tallies = groups.map((g, i) => tally(g, `${who} (group ${i + 1})`));
  const eventTimes = [...new Set(tallies.flatMap((t) => t.times.filter((_, j) => t.events[j] > 0)))].sort((x, y) => x - y);

  const observed = new Array<number>(k).fill(0);
  const expected = new Array<number>(k).fill(0);
  const covariance = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  const cursor = new Array<number>(k).fill(0); // first distinct time ≥ the current event time
  const atRisk = new Array<number>(k).fill(0);
  const deaths = new Array<number>(k).fill(0);

  for (const t of eventTimes) {
    let total = 0;
    let dTotal = 0;
    for (let j = 0; j < k; j++) {
      const g = tallies[j];
      while (cursor[j] < g.times.length && g.times[cursor[j]] < t) cursor[j]++;
      atRisk[j] = atRiskAt(g, t);
      deaths[j] = cursor[j] < g.times.length && g.times[cursor[j]] === t ? g.events[cursor[j]] : 0;
      total += atRisk[j];
      dTotal += deaths[j];
    }
    const varFactor = total > 1 ? (dTotal * (total - dTotal)) / (total * total * (total - 1)) : 0;
    for (let j = 0; j < k; j++) {
      observed[j] += deaths[j];
      expected[j] += (atRisk[j] * dTotal) / total;
      if (varFactor === 0) continue;
      for (let l = 0; l < k; l++) {
        covariance[j][l] += varFactor * atRisk[j] * ((j === l ? total : 0) - atRisk[l]);
      }
    }
  }
  return { observed, expected, covariance };
}

/**
 * Like survdiff, groups with expected 0 (empty, or gone before the first event) are left out of
 * the statistic, and one remaining group is dropped to make the covariance invertible.
 */
function finishLogRank({ observed, expected, covariance }: LogRankParts): LogRankResult {
  const kept = expected.map((e, j) => (e > 0 ? j : -1)).filter((j) => j >= 0).slice(1);
  if (kept.length === 0) return { chiSquare: 0, df: 0, pValue: 1, observed, expected };
  const z = kept.map((j) => observed[j] - expected[j]);
  const v = kept.map((j) => kept.map((l) => covariance[j][l]));
  const { value, rank } = quadraticForm(v, z);
  const pValue = rank > 0 ? chiSquareUpperTail(value, rank) : 1;
  return { chiSquare: value, df: rank, pValue, observed, expected };
}

/**
 * k-group log-rank test (k ≥ 2) with the full hypergeometric covariance, as R's survdiff(rho = 0).
 * Rows with an entry time are at risk only on (entry, time]; survdiff takes no such data, but the
 * statistic is the score test of coxph(Surv(entry, time, event) ~ group), which does.
 */
export function logRank(groups: readonly (readonly SurvivalObservation[])[]): LogRankResult {
  if (groups.length < 2) throw new RangeError("logRank: needs at least 2 groups");
  return finishLogRank(logRankParts(groups, "logRank"));
}

export interface StratifiedRow extends SurvivalObservation {
  group: string;
  stratum: string;
}

/**
 * Log-rank test of `group` stratified by `stratum`, as R's survdiff(Surv(time, status) ~ group +
 * strata(stratum)): observed − expected and their covariance are computed within each stratum and
 * summed before the quadratic form, so groups are only compared with each other inside a stratum.
 * Groups are ordered by name (survdiff uses the factor levels, sorted); the statistic does not
 * depend on which group is dropped.
 */
export function stratifiedLogRank(rows: readonly StratifiedRow[]): { chiSquare: number; df: number; pValue: number } {
  const groupNames = [...new Set(rows.map((r) => r.group))].sort();
  if (groupNames.length < 2) throw new RangeError("stratifiedLogRank: needs at least 2 groups");
  const index = new Map(groupNames.map((g, i) => [g, i]));
  const k = groupNames.length;
  const byStratum = new Map<string, SurvivalObservation[][]>();
  for (const r of rows) {
    let groups = byStratum.get(r.stratum);
    if (!groups) byStratum.set(r.stratum, (groups = Array.from({ length: k }, () => [])));
    groups[index.get(r.group)!].push({ time: r.time, event: r.event, entry: r.entry });
  }
  const sum: LogRankParts = {
    observed: new Array<number>(k).fill(0),
    expected: new Array<number>(k).fill(0),
    covariance: Array.from({ length: k }, () => new Array<number>(k).fill(0)),
  };
  for (const [stratum, groups] of byStratum) {
    const part = logRankParts(groups, `stratifiedLogRank (stratum ${stratum})`);
    for (let j = 0; j < k; j++) {
      sum.observed[j] += part.observed[j];
      sum.expected[j] += part.expected[j];
      for (let l = 0; l < k; l++) sum.covariance[j][l] += part.covariance[j][l];
    }
  }
  const { chiSquare, df, pValue } = finishLogRank(sum);
  return { chiSquare, df, pValue };
}
