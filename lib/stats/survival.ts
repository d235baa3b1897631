// Right-censored survival: Kaplan–Meier with Greenwood/log limits and the k-group log-rank test,
// both matching R survival's defaults. Interval-censored data live in turnbull.ts.
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

// Products of (1 − d/n) that are mathematically 0.5 can land a hair above it in floating point.
const MEDIAN_SLACK = 1e-12;

/**
 * Distinct times in increasing order with how many observations and events fall on each. Trial data
 * are heavily tied (everyone is inspected on the same days), so tallying through a Map and sorting
 * only the distinct times beats sorting every observation.
 */
interface Tally {
  times: number[];
  counts: number[];
  events: number[];
  n: number;
}

function tally(obs: readonly SurvivalObservation[], who: string): Tally {
  const slot = new Map<number, number>();
  const rawTimes: number[] = [];
  const rawCounts: number[] = [];
  const rawEvents: number[] = [];
  for (const o of obs) {
    if (!Number.isFinite(o.time)) throw new RangeError(`${who}: every time must be a finite number, got ${o.time}`);
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
  }
  const order = rawTimes.map((_, i) => i).sort((x, y) => rawTimes[x] - rawTimes[y]);
  return {
    times: order.map((i) => rawTimes[i]),
    counts: order.map((i) => rawCounts[i]),
    events: order.map((i) => rawEvents[i]),
    n: obs.length,
  };
}

/**
 * Kaplan–Meier estimate with a step at every distinct time (censor-only times carry events 0).
 * Limits: S·exp(±z·√Σ d/(n(n−d))), R's conf.type = "log", clipped to [0, 1]; z = qnorm(0.975).
 * Where S reaches 0 the log limits are undefined (R prints NA); we report 0 for both.
 * Median: first time with S ≤ 0.5, no interpolation; null when the curve never gets there.
 */
export function kaplanMeier(obs: readonly SurvivalObservation[]): KaplanMeierResult {
  const { times, counts, events, n } = tally(obs, "kaplanMeier");
  const steps: KaplanMeierStep[] = [];
  let survival = 1;
  let greenwood = 0;
  let median: number | null = null;
  let atRisk = n;
  for (let k = 0; k < times.length; k++) {
    const d = events[k];
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
    if (median === null && survival <= 0.5 + MEDIAN_SLACK) median = times[k];
    atRisk -= counts[k];
  }
  return { steps, median };
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

/**
 * k-group log-rank test (k ≥ 2) with the full hypergeometric covariance, as R's survdiff(rho = 0).
 * Like survdiff, groups with expected 0 (empty, or gone before the first event) are left out of
 * the statistic, and one remaining group is dropped to make the covariance invertible.
 */
export function logRank(groups: readonly (readonly SurvivalObservation[])[]): LogRankResult {
  const k = groups.length;
  if (k < 2) throw new RangeError("logRank: needs at least 2 groups");
  const tallies = groups.map((g, i) => tally(g, `logRank (group ${i + 1})`));
  const eventTimes = [...new Set(tallies.flatMap((t) => t.times.filter((_, j) => t.events[j] > 0)))].sort((x, y) => x - y);

  const observed = new Array<number>(k).fill(0);
  const expected = new Array<number>(k).fill(0);
  const covariance = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  const cursor = new Array<number>(k).fill(0); // first distinct time ≥ the current event time
  const atRisk = tallies.map((t) => t.n);
  const deaths = new Array<number>(k).fill(0);

  for (const t of eventTimes) {
    let total = 0;
    let dTotal = 0;
    for (let j = 0; j < k; j++) {
      const g = tallies[j];
      while (cursor[j] < g.times.length && g.times[cursor[j]] < t) atRisk[j] -= g.counts[cursor[j]++];
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

  const kept = expected.map((e, j) => (e > 0 ? j : -1)).filter((j) => j >= 0).slice(1);
  if (kept.length === 0) return { chiSquare: 0, df: 0, pValue: 1, observed, expected };
  const z = kept.map((j) => observed[j] - expected[j]);
  const v = kept.map((j) => kept.map((l) => covariance[j][l]));
  const { value, rank } = quadraticForm(v, z);
  const pValue = rank > 0 ? chiSquareUpperTail(value, rank) : 1;
  return { chiSquare: value, df: rank, pValue, observed, expected };
}
