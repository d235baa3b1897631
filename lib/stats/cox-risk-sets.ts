// The Cox log partial likelihood with its score and information, by one walk per stratum from the
// latest time to the earliest: rows join the risk set as their time is reached and, with delayed entry,
// leave it once the walk passes their entry time (a row is at risk on (entry, time], as R's
// Surv(entry, time, event)). The risk-set sums S0 = Σw, S1 = Σw·x, S2 = Σw·x·x' are kept up to date
// as rows join and leave, so one evaluation costs O(n·p²) after the one sort done in prepareCoxData.

export type TieMethod = "efron" | "breslow";

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
  time: ArrayLike<number>;
  event: ArrayLike<boolean>;
  /** Row-major n×p covariates in input order. */
  x: ArrayLike<number>;
  entry: ArrayLike<number> | null;
  /** Stratum number per input row (0 … strata − 1). */
  stratum: ArrayLike<number>;
  p: number;
}

export function prepareCoxData(input: CoxInput): CoxData {
  const n = input.time.length;
  const p = input.p;
  const order = Array.from({ length: n }, (_, i) => i);
  order.sort((i, j) => input.stratum[i] - input.stratum[j] || input.time[j] - input.time[i] || i - j);

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
    event[r] = input.event[i] ? 1 : 0;
    entry[r] = input.entry ? input.entry[i] : -Infinity;
    if (r === 0 || input.stratum[i] !== input.stratum[order[r - 1]]) strataList.push(r);
  }
  strataList.push(n);

  const entryOrder = new Int32Array(n);
  for (let r = 0; r < n; r++) entryOrder[r] = r;
  if (input.entry) {
    const sortedStratum = new Int32Array(n);
    for (let s = 0; s + 1 < strataList.length; s++) sortedStratum.fill(s, strataList[s], strataList[s + 1]);
    const idx = Array.from(entryOrder);
    idx.sort((a, b) => sortedStratum[a] - sortedStratum[b] || entry[b] - entry[a] || a - b);
    entryOrder.set(idx);
  }
  return { n, p, x, time, event, entry, entryOrder, strataStart: Int32Array.from(strataList), hasEntry: input.entry !== null };
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
          atRisk--;
          for (let k = 0; k < p; k++) {
            const wx = w * x[q * p + k];
            s1[k] -= wx;
            for (let l = 0; l <= k; l++) s2[k * p + l] -= wx * x[q * p + l];
          }
        }
        // An emptied risk set restarts from exact zeros rather than from rounding residue.
        if (atRisk === 0) {
          s0 = 0;
          s1.fill(0);
          s2.fill(0);
        }
      }

      let deaths = 0;
      let dw0 = 0;
      for (; r < end && time[r] === t; r++) {
        const w = weight[r];
        const isEvent = event[r] === 1;
        s0 += w;
        atRisk++;
        if (isEvent) {
          deaths++;
          dw0 += w;
          logLik += eta[r];
          if (deaths === 1) {
            d1.fill(0);
            d2.fill(0);
          }
        }
        for (let k = 0; k < p; k++) {
          const xk = x[r * p + k];
          const wx = w * xk;
          s1[k] += wx;
          if (isEvent) {
            score[k] += xk;
            d1[k] += wx;
          }
          for (let l = 0; l <= k; l++) {
            const term = wx * x[r * p + l];
            s2[k * p + l] += term;
            if (isEvent) d2[k * p + l] += term;
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
