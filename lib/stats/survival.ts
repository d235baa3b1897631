// Right-censored survival: Kaplan–Meier with Greenwood/log limits and the k-group log-rank test,
// both matching R survival's defaults. Interval-censored data live in turnbull.ts (re-exported).
import { chiSquareUpperTail, Z_975 } from "./distributions";

export interface SurvivalObservation {
  time: number;
  event: boolean;
}

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

function checkTimes(obs: readonly SurvivalObservation[], who: string): void {
  for (const o of obs) {
    if (!Number.isFinite(o.time)) throw new RangeError(`${who}: every time must be a finite number, got ${o.time}`);
  }
}

// All times and event times as natively sorted typed arrays: far faster than comparator sorts on objects.
function sortedTimes(obs: readonly SurvivalObservation[]): { all: Float64Array; events: Float64Array } {
  const all = new Float64Array(obs.length);
  let eventCount = 0;
  for (let i = 0; i < obs.length; i++) {
    all[i] = obs[i].time;
    if (obs[i].event) eventCount++;
  }
  const events = new Float64Array(eventCount);
  for (let i = 0, e = 0; i < obs.length; i++) if (obs[i].event) events[e++] = obs[i].time;
  return { all: all.sort(), events: events.sort() };
}

/**
 * Kaplan–Meier estimate with a step at every distinct time (censor-only times carry events 0).
 * Limits: S·exp(±z·√Σ d/(n(n−d))), R's conf.type = "log", clipped to [0, 1]; z = qnorm(0.975).
 * Where S reaches 0 the log limits are undefined (R prints NA); we report 0 for both.
 * Median: first time with S ≤ 0.5, no interpolation; null when the curve never gets there.
 */
export function kaplanMeier(obs: readonly SurvivalObservation[]): KaplanMeierResult {
  checkTimes(obs, "kaplanMeier");
  const { all, events } = sortedTimes(obs);
  const n = all.length;
  const steps: KaplanMeierStep[] = [];
  let survival = 1;
  let greenwood = 0;
  let median: number | null = null;
  let e = 0;
  for (let i = 0; i < n; ) {
    const time = all[i];
    const atRisk = n - i;
    while (i < n && all[i] === time) i++;
    let d = 0;
    while (e < events.length && events[e] === time) {
      d++;
      e++;
    }
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
    steps.push({ time, atRisk, events: d, survival, lower95, upper95 });
    if (median === null && survival <= 0.5 + MEDIAN_SLACK) median = time;
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
  groups.forEach((g, i) => checkTimes(g, `logRank (group ${i + 1})`));
  const sorted = groups.map(sortedTimes);
  const allEvents = new Float64Array(sorted.reduce((s, g) => s + g.events.length, 0));
  let offset = 0;
  for (const g of sorted) {
    allEvents.set(g.events, offset);
    offset += g.events.length;
  }
  allEvents.sort();

  const observed = new Array<number>(k).fill(0);
  const expected = new Array<number>(k).fill(0);
  const covariance = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  const allPos = new Array<number>(k).fill(0); // first index in `all` with time ≥ current
  const eventPos = new Array<number>(k).fill(0);
  const atRisk = new Array<number>(k).fill(0);
  const deaths = new Array<number>(k).fill(0);

  for (let i = 0; i < allEvents.length; ) {
    const t = allEvents[i];
    while (i < allEvents.length && allEvents[i] === t) i++;
    let total = 0;
    let dTotal = 0;
    for (let j = 0; j < k; j++) {
      const g = sorted[j];
      while (allPos[j] < g.all.length && g.all[allPos[j]] < t) allPos[j]++;
      while (eventPos[j] < g.events.length && g.events[eventPos[j]] < t) eventPos[j]++;
      let d = 0;
      while (eventPos[j] < g.events.length && g.events[eventPos[j]] === t) {
        d++;
        eventPos[j]++;
      }
      atRisk[j] = g.all.length - allPos[j];
      deaths[j] = d;
      total += atRisk[j];
      dTotal += d;
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

export {
  turnbull,
  turnbullFit,
  survivalCurveFromTurnbull,
  medianFromTurnbull,
  rightEndpointKm,
} from "./turnbull";
export type {
  IntervalObservation,
  TurnbullInterval,
  TurnbullResult,
  TurnbullFit,
  TurnbullCurveStep,
  TurnbullMedian,
} from "./turnbull";
