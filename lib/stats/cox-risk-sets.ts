// The Cox log partial likelihood with its score and information, by one walk per stratum from the
// latest time to the earliest: rows join the risk set as their time is reached and, with delayed entry,
// leave it once the walk passes their entry time (a row is at risk on (entry, time], as R's
// Surv(entry, time, event)). The risk-set sums S0 = Σw, S1 = Σw·x, S2 = Σw·x·x' are kept up to date
// as rows join and leave, so one evaluation costs O(n·p²) after the one sort done in prepareCoxData.

export type TieMethod = "efron" | "breslow";

/** Re-sum the risk set from its rows once the weight taken out exceeds this multiple of what remains. */
const RESUM_RATIO = 1e4;

/** Rows sorted by stratum, then by time from latest to earliest; covariates centred on their means. */
export interface CoxData {
  n: number;
  p: number;
  /** Row-major n×p centred covariates, in sorted order. */
  x: Float64Array;
  time: Float64Array;
  event: Uint8Array;
  /** Entry time per sorted row; −∞ where the row is at risk from the start. */
  entry: Float64Array;
  /** Sorted-row indices ordered by stratum, then by entry from latest to earliest. */
  entryOrder: Int32Array;
  /** Stratum s holds sorted rows strataStart[s] … strataStart[s + 1] − 1. */
  strataStart: Int32Array;
  hasEntry: boolean;
}

export interface CoxInput {
  time: Float64Array;
  /** 1 for an event, 0 for a censored row. */
  event: Uint8Array;
  /** Row-major n×p covariates in input order. */
  x: Float64Array;
  entry: Float64Array | null;
  /** Stratum number per input row (0 … strata − 1). */
  stratum: Int32Array;
  p: number;
}

export function prepareCoxData(input: CoxInput): CoxData {
  const n = input.time.length;
  const p = input.p;
  const order = orderByStratumThenLatest(input.stratum, input.time);

  const means = new Float64Array(p);
  for (let i = 0; i < n; i++) for (let k = 0; k < p; k++) means[k] += input.x[i * p + k];
  for (let k = 0; k < p; k++) means[k] /= n;

  const x = new Float64Array(n * p);
  const time = new Float64Array(n);
  const event = new Uint8Array(n);
  const entry = new Float64Array(n);
  const strataList: number[] = [];
  for (let r = 0; r < n; r++) {
    const i = order[r];
    for (let k = 0; k < p; k++) x[r * p + k] = input.x[i * p + k] - means[k];
    time[r] = input.time[i];
    event[r] = input.event[i];
    entry[r] = input.entry ? input.entry[i] : -Infinity;
    if (r === 0 || input.stratum[i] !== input.stratum[order[r - 1]]) strataList.push(r);
  }
  strataList.push(n);

  let entryOrder: Int32Array;
  if (input.entry) {
    const sortedStratum = new Int32Array(n);
    for (let s = 0; s + 1 < strataList.length; s++) sortedStratum.fill(s, strataList[s], strataList[s + 1]);
    entryOrder = orderByStratumThenLatest(sortedStratum, entry);
  } else {
    entryOrder = new Int32Array(n);
    for (let r = 0; r < n; r++) entryOrder[r] = r;
  }
  return { n, p, x, time, event, entry, entryOrder, strataStart: Int32Array.from(strataList), hasEntry: input.entry !== null };
}

/**
 * Indices ordered by stratum, then by value from largest to smallest, ties in index order. A comparator
 * sort of 10,000 indices costs far more than the whole fit, so: rank the values with the engine's own
 * numeric sort, then two stable counting passes (by rank, then by stratum).
 */
function orderByStratumThenLatest(stratum: Int32Array, value: Float64Array): Int32Array {
  const n = value.length;
  const sorted = Float64Array.from(value).sort();
  let distinct = 0;
  for (let i = 0; i < n; i++) if (i === 0 || sorted[i] !== sorted[i - 1]) sorted[distinct++] = sorted[i];
  // Rank 0 is the largest value, so ascending ranks walk the values from latest to earliest.
  const rank = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    let lo = 0;
    let hi = distinct - 1;
    const v = value[i];
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (sorted[mid] < v) lo = mid + 1;
      else hi = mid;
    }
    rank[i] = distinct - 1 - lo;
  }
  let strata = 0;
  for (let i = 0; i < n; i++) if (stratum[i] + 1 > strata) strata = stratum[i] + 1;
  const identity = new Int32Array(n);
  for (let i = 0; i < n; i++) identity[i] = i;
  const byRank = countingSort(identity, rank, distinct);
  return countingSort(byRank, stratum, strata);
}

/** Stable counting sort of `items` by key[item] ∈ [0, buckets). */
function countingSort(items: Int32Array, key: Int32Array, buckets: number): Int32Array {
  const start = new Int32Array(buckets + 1);
  for (let i = 0; i < items.length; i++) start[key[items[i]] + 1]++;
  for (let b = 0; b < buckets; b++) start[b + 1] += start[b];
  const out = new Int32Array(items.length);
  for (let i = 0; i < items.length; i++) out[start[key[items[i]]]++] = items[i];
  return out;
}

/** Log partial likelihood, score vector U and information matrix I (full p×p) at one β. */
export interface CoxEvaluation {
  logLik: number;
  score: Float64Array;
  information: Float64Array;
}

/** Reusable work space so the Newton–Raphson loop allocates nothing per iteration. */
export class CoxEvaluator {
  private readonly eta: Float64Array;
  private readonly weight: Float64Array;
  private readonly s1: Float64Array;
  private readonly s2: Float64Array;
  private readonly d1: Float64Array;
  private readonly d2: Float64Array;
  private readonly mean: Float64Array;

  constructor(
    private readonly data: CoxData,
    private readonly ties: TieMethod,
  ) {
    const { n, p } = data;
    this.eta = new Float64Array(n);
    this.weight = new Float64Array(n);
    this.s1 = new Float64Array(p);
    this.s2 = new Float64Array(p * p);
    this.d1 = new Float64Array(p);
    this.d2 = new Float64Array(p * p);
    this.mean = new Float64Array(p);
  }

  evaluate(beta: ArrayLike<number>): CoxEvaluation {
    const { p, strataStart } = this.data;
    const score = new Float64Array(p);
    const information = new Float64Array(p * p);
    let logLik = 0;
    for (let s = 0; s + 1 < strataStart.length; s++) {
      logLik += this.stratum(beta, strataStart[s], strataStart[s + 1], score, information);
    }
    for (let k = 0; k < p; k++) for (let l = 0; l < k; l++) information[l * p + k] = information[k * p + l];
    return { logLik, score, information };
  }

  private stratum(beta: ArrayLike<number>, start: number, end: number, score: Float64Array, info: Float64Array): number {
    const { p, x, time, event, entry, entryOrder, hasEntry } = this.data;
    const { eta, weight, s1, s2, d1, d2, mean } = this;
    const efron = this.ties === "efron";

    // Weights relative to the stratum's largest linear predictor, so exp never overflows; the shift
    // cancels within the stratum's partial likelihood.
    let etaMax = -Infinity;
    for (let r = start; r < end; r++) {
      let e = 0;
      for (let k = 0; k < p; k++) e += x[r * p + k] * beta[k];
      eta[r] = e;
      if (e > etaMax) etaMax = e;
    }
    for (let r = start; r < end; r++) {
      eta[r] -= etaMax;
      weight[r] = Math.exp(eta[r]);
    }

    let logLik = 0;
    let s0 = 0;
    let atRisk = 0;
    let removed = 0; // weight subtracted since the sums were last built from scratch
    s1.fill(0);
    s2.fill(0);
    let leaving = start; // next row (in entry order) to leave the risk set
    let r = start;
    while (r < end) {
      const t = time[r];
      if (hasEntry) {
        // Rows whose entry is at or after t are not at risk at t: take them out before t's rows join.
        while (leaving < end && entry[entryOrder[leaving]] >= t) {
          const q = entryOrder[leaving++];
          const w = weight[q];
          s0 -= w;
          removed += w;
          atRisk--;
          for (let k = 0; k < p; k++) {
            const wx = w * x[q * p + k];
            s1[k] -= wx;
            for (let l = 0; l <= k; l++) s2[k * p + l] -= wx * x[q * p + l];
          }
        }
        // An emptied risk set restarts from exact zeros rather than from rounding residue; one that has
        // shed far more weight than it keeps is summed again, as the subtractions' rounding error would
        // otherwise be a visible part of what is left.
        if (atRisk === 0 || removed > RESUM_RATIO * s0) {
          s0 = 0;
          s1.fill(0);
          s2.fill(0);
          removed = 0;
          for (let q = start; q < r && atRisk > 0; q++) {
            if (!(entry[q] < t)) continue;
            const w = weight[q];
            s0 += w;
            for (let k = 0; k < p; k++) {
              const wx = w * x[q * p + k];
              s1[k] += wx;
              for (let l = 0; l <= k; l++) s2[k * p + l] += wx * x[q * p + l];
            }
          }
        }
      }

      // Rows at t join the risk set; the events among them also go into the tied-event sums D.
      let deaths = 0;
      let dw0 = 0;
      for (; r < end && time[r] === t; r++) {
        const w = weight[r];
        const base = r * p;
        s0 += w;
        atRisk++;
        if (event[r] === 0) {
          for (let k = 0; k < p; k++) {
            const wx = w * x[base + k];
            s1[k] += wx;
            for (let l = 0; l <= k; l++) s2[k * p + l] += wx * x[base + l];
          }
          continue;
        }
        if (deaths === 0) {
          d1.fill(0);
          d2.fill(0);
        }
        deaths++;
        dw0 += w;
        logLik += eta[r];
        for (let k = 0; k < p; k++) {
          const xk = x[base + k];
          const wx = w * xk;
          s1[k] += wx;
          score[k] += xk;
          d1[k] += wx;
          for (let l = 0; l <= k; l++) {
            const term = wx * x[base + l];
            s2[k * p + l] += term;
            d2[k * p + l] += term;
          }
        }
      }
      if (deaths === 0) continue;

      // Efron: the j-th of d tied events sees the risk set with j/d of each tied event's weight gone.
      // Breslow: every tied event sees the whole risk set, so d identical terms.
      const terms = efron ? deaths : 1;
      const multiplier = efron ? 1 : deaths;
      for (let j = 0; j < terms; j++) {
        const f = efron ? j / deaths : 0;
        const denom = s0 - f * dw0;
        logLik -= multiplier * Math.log(denom);
        for (let k = 0; k < p; k++) {
          mean[k] = (s1[k] - f * d1[k]) / denom;
          score[k] -= multiplier * mean[k];
        }
        for (let k = 0; k < p; k++) {
          for (let l = 0; l <= k; l++) {
            info[k * p + l] += multiplier * ((s2[k * p + l] - f * d2[k * p + l]) / denom - mean[k] * mean[l]);
          }
        }
      }
    }
    return logLik;
  }
}
