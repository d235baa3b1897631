// Turnbull's NPMLE for interval-censored times: rust is only ever seen at an inspection, so each
// specimen's first-rust time is known to lie in (last clean inspection, first rusted inspection].
// A specimen moved into a jar after the start is left-truncated at its entry (Turnbull 1976).
import type { SurvivalObservation } from "./observations";
import { SelfConsistency } from "./turnbull-em";

/** (lower, upper]; upper = Infinity when never seen to fail; lower = upper means an exact time. */
export interface IntervalObservation {
  lower: number;
  upper: number;
  /** How many identical observations this row stands for (default 1); lets tabulated data in. */
  count?: number;
  /**
   * Delayed entry (left truncation): the specimen came under observation at this time, clean, so
   * only failure times after it could have been seen. Absent: under observation from the start.
   */
  entry?: number;
}

export interface TurnbullInterval {
  lower: number;
  upper: number;
  probability: number;
}

export interface TurnbullResult {
  intervals: TurnbullInterval[];
  /**
   * 1 − mass of innermost intervals with upper ≤ t. The NPMLE says only how much mass falls in each
   * innermost interval, not where inside it; by convention the whole mass counts at its right end.
   */
  survivalAt(t: number): number;
}

export interface TurnbullFit extends TurnbullResult {
  iterations: number;
  converged: boolean;
}

export interface TurnbullOptions {
  /** Stop when no interval's probability moves by more than this in one step. */
  tolerance?: number;
  maxIterations?: number;
}

// Endpoint order at equal values: an exact time's closed left end, then right ends (closed), then
// open left ends. That makes (0,6] and (6,12] two classes and keeps an exact time t inside (s, t].
const LEFT_CLOSED = -1;
const RIGHT = 0;
const LEFT_OPEN = 1;

interface Endpoint {
  value: number;
  kind: number;
}

function compareEndpoints(a: Endpoint, b: Endpoint): number {
  return a.value !== b.value ? (a.value < b.value ? -1 : 1) : a.kind - b.kind;
}

interface Collapsed {
  lowers: number[];
  uppers: number[];
  /** −Infinity: no truncation. */
  entries: number[];
  weights: number[];
  total: number;
}

// Identical (lower, upper], entry rows are merged with summed weights: with a fixed inspection
// schedule a group of thousands of specimens has only a few hundred distinct intervals.
function collapse(obs: readonly IntervalObservation[]): Collapsed {
  const byKey = new Map<string, number>();
  const out: Collapsed = { lowers: [], uppers: [], entries: [], weights: [], total: 0 };
  for (const o of obs) {
    const w = o.count ?? 1;
    const entry = o.entry ?? -Infinity;
    if (!Number.isFinite(o.lower)) throw new RangeError(`turnbull: lower must be finite, got ${o.lower}`);
    if (Number.isNaN(o.upper) || o.upper < o.lower) {
      throw new RangeError(`turnbull: need lower ≤ upper, got (${o.lower}, ${o.upper}]`);
    }
    if (Number.isNaN(entry) || entry > o.lower) {
      throw new RangeError(`turnbull: an entry time must not be after the interval's lower end, got entry ${entry} for (${o.lower}, ${o.upper}]`);
    }
    if (!(w >= 0) || !Number.isFinite(w)) throw new RangeError(`turnbull: count must be ≥ 0, got ${w}`);
    if (w === 0) continue;
    const key = `${o.lower}|${o.upper}|${entry}`;
    const at = byKey.get(key);
    if (at !== undefined) out.weights[at] += w;
    else {
      byKey.set(key, out.weights.length);
      out.lowers.push(o.lower);
      out.uppers.push(o.upper);
      out.entries.push(entry);
      out.weights.push(w);
    }
    out.total += w;
  }
  return out;
}

const leftOf = (lower: number, upper: number): Endpoint => ({ value: lower, kind: lower === upper ? LEFT_CLOSED : LEFT_OPEN });

/** The NPMLE with fit diagnostics; `turnbull` is this without them. */
export function turnbullFit(obs: readonly IntervalObservation[], options: TurnbullOptions = {}): TurnbullFit {
  const tolerance = options.tolerance ?? 1e-10;
  const maxIterations = options.maxIterations ?? 100_000;
  const data = collapse(obs);
  const m = data.weights.length;
  if (m === 0) return withSurvival([], 0, true);

  // Innermost intervals (Turnbull's equivalence classes): a left end directly followed by a right end.
  const ends: (Endpoint & { isLeft: boolean })[] = [];
  for (let i = 0; i < m; i++) {
    ends.push({ ...leftOf(data.lowers[i], data.uppers[i]), isLeft: true });
    ends.push({ value: data.uppers[i], kind: RIGHT, isLeft: false });
  }
  ends.sort(compareEndpoints);
  const innerLeft: Endpoint[] = [];
  const innerRight: Endpoint[] = [];
  for (let e = 0; e + 1 < ends.length; e++) {
    if (ends[e].isLeft && !ends[e + 1].isLeft) {
      innerLeft.push(ends[e]);
      innerRight.push(ends[e + 1]);
    }
  }
  const count = innerLeft.length;

  // Each observation covers a contiguous run [first, last] of innermost intervals.
  const first = new Int32Array(m);
  const last = new Int32Array(m);
  for (let i = 0; i < m; i++) {
    const left = leftOf(data.lowers[i], data.uppers[i]);
    const right: Endpoint = { value: data.uppers[i], kind: RIGHT };
    let a = 0;
    while (compareEndpoints(innerLeft[a], left) < 0) a++;
    let b = count - 1;
    while (compareEndpoints(innerRight[b], right) > 0) b--;
    first[i] = a;
    last[i] = b;
  }

  // Truncation (Turnbull 1976, §3): a row that entered at e could only have been seen to fail after
  // e, so its likelihood is P(interval) / P(T > e). Innermost intervals inside (e, ∞) form a suffix
  // of the sorted list; truncStart is where it begins (0: the row was at risk from the start).
  const truncStart = new Int32Array(m);
  let truncated = false;
  for (let i = 0; i < m; i++) {
    if (data.entries[i] === -Infinity) continue;
    const entryEnd: Endpoint = { value: data.entries[i], kind: LEFT_OPEN };
    let a = 0;
    while (a < count && compareEndpoints(innerLeft[a], entryEnd) < 0) a++;
    truncStart[i] = a;
    if (a > 0) truncated = true;
  }

  const em = new SelfConsistency(Float64Array.from(data.weights), data.total, first, last, count, truncated ? truncStart : null);
  const { p, iterations, converged } = em.solve(tolerance, maxIterations);

  const intervals = innerLeft.map((l, j) => ({ lower: l.value, upper: innerRight[j].value, probability: p[j] }));
  return withSurvival(intervals, iterations, converged);
}

function withSurvival(intervals: TurnbullInterval[], iterations: number, converged: boolean): TurnbullFit {
  const uppers = intervals.map((iv) => iv.upper);
  const cumulative: number[] = [];
  let acc = 0;
  for (const iv of intervals) cumulative.push((acc += iv.probability));
  return {
    intervals,
    iterations,
    converged,
    survivalAt(t: number): number {
      // Innermost intervals are disjoint and sorted, so their right ends are increasing.
      let lo = 0;
      let hi = uppers.length;
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (uppers[mid] <= t) lo = mid + 1;
        else hi = mid;
      }
      return lo === 0 ? 1 : Math.min(1, Math.max(0, 1 - cumulative[lo - 1]));
    },
  };
}

/** Turnbull NPMLE: innermost intervals with their probability mass, and S(t). */
export function turnbull(obs: readonly IntervalObservation[]): TurnbullResult {
  const fit = turnbullFit(obs);
  return { intervals: fit.intervals, survivalAt: fit.survivalAt };
}

export interface TurnbullCurveStep {
  /** Where the chart draws the drop (the innermost interval's right end, by our convention). */
  time: number;
  /** Where the drop could have begun: the innermost interval's left end. */
  intervalLower: number;
  /** Survival after this interval. */
  survival: number;
}

// Masses this small are EM leftovers on intervals the NPMLE leaves empty, not real drops.
const NEGLIGIBLE_MASS = 1e-9;

/** Chart steps: S = 1 before the first step; one step per innermost interval holding mass. */
export function survivalCurveFromTurnbull(result: TurnbullResult): TurnbullCurveStep[] {
  const steps: TurnbullCurveStep[] = [];
  let survival = 1;
  for (const iv of result.intervals) {
    if (iv.probability <= NEGLIGIBLE_MASS || !Number.isFinite(iv.upper)) continue;
    survival = Math.max(0, survival - iv.probability);
    steps.push({ time: iv.upper, intervalLower: iv.lower, survival });
  }
  return steps;
}

export interface TurnbullMedian {
  /** Right end of the innermost interval where S first reaches 0.5 (same convention as survivalAt). */
  time: number;
  /** The median is only known to lie in (lower, upper]. */
  lower: number;
  upper: number;
}

/** Median time from the NPMLE, or null when S never gets down to 0.5. */
export function medianFromTurnbull(result: TurnbullResult): TurnbullMedian | null {
  let survival = 1;
  for (const iv of result.intervals) {
    if (!Number.isFinite(iv.upper)) break;
    survival -= iv.probability;
    if (iv.probability > NEGLIGIBLE_MASS && survival <= 0.5 + 1e-9) {
      return { time: iv.upper, lower: iv.lower, upper: iv.upper };
    }
  }
  return null;
}

/**
 * Right-endpoint imputation for KM/log-rank: a failure counts at the inspection where rust was seen,
 * a never-rusted specimen is censored at its last clean inspection. Counts expand to repeated rows.
 */
export function rightEndpointKm(intervalObs: readonly IntervalObservation[]): SurvivalObservation[] {
  const out: SurvivalObservation[] = [];
  for (const o of intervalObs) {
    const count = o.count ?? 1;
    if (!Number.isInteger(count) || count < 0) throw new RangeError(`rightEndpointKm: count must be a whole number, got ${count}`);
    const row = Number.isFinite(o.upper) ? { time: o.upper, event: true } : { time: o.lower, event: false };
    for (let c = 0; c < count; c++) {
      out.push(o.entry === undefined ? { time: row.time, event: row.event } : { time: row.time, event: row.event, entry: o.entry });
    }
  }
  return out;
}
