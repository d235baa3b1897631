// Cox proportional-hazards regression as R survival's coxph: Efron ties by default (Breslow on request),
// strata with a baseline hazard each, delayed entry (a row is at risk on (entry, time]), Newton–Raphson
// from β = 0 with step halving, and the likelihood-ratio, Wald and score tests of β = 0.
// The risk-set sums live in cox-risk-sets.ts; the symmetric solves in cholesky.ts.
import { ldlFactor, ldlInverse, ldlQuadraticForm, ldlSolve } from "./cholesky";
import { CoxEvaluator, prepareCoxData, type CoxEvaluation, type TieMethod } from "./cox-risk-sets";
import { chiSquareUpperTail, Z_975 } from "./distributions";

export interface Test {
  chiSquare: number;
  df: number;
  pValue: number;
}

/**
 * One row: the time of the event (event true) or of the last look without it (event false), the
 * covariates, and optionally a stratum and the time the row entered the risk set (left truncation:
 * a specimen moved to another jar enters its new placement when that placement starts).
 */
export interface CoxRow {
  time: number;
  event: boolean;
  x: number[];
  stratum?: string;
  entry?: number;
}

export interface CoxOptions {
  ties?: TieMethod;
  /** Newton–Raphson iterations allowed; R's coxph.control default is 20. */
  maxIterations?: number;
}

export interface CoxResult {
  coefficients: number[];
  standardErrors: number[];
  hazardRatios: number[];
  lower95: number[];
  upper95: number[];
  /** Log partial likelihood at the estimate. */
  logLik: number;
  /** Log partial likelihood at β = 0. */
  nullLogLik: number;
  likelihoodRatio: Test;
  wald: Test;
  score: Test;
  /** Inverse of the information matrix at the estimate (p×p). */
  covariance: number[][];
  iterations: number;
  /** False when the iterations ran out before the log likelihood settled (R warns the same way). */
  converged: boolean;
  n: number;
  events: number;
}

/** R's coxph.control(eps = 1e-9): converged when the log likelihood's relative change is below this. */
const RELATIVE_TOLERANCE = 1e-9;
const DEFAULT_MAX_ITERATIONS = 20;

function collinearMessage(column: number): string {
  const c = column + 1;
  const before = c === 2 ? "column 1" : `columns 1–${c - 1}`;
  return c === 1
    ? "coxRegression: the covariates cannot be told apart: column 1 does not vary among the rows at risk (within each stratum)"
    : `coxRegression: the covariates cannot be told apart: column ${c} is a copy or combination of ${before}, or does not vary among the rows at risk (within each stratum)`;
}

function validate(rows: readonly CoxRow[]): { p: number; events: number; anyEntry: boolean } {
  if (!Array.isArray(rows) || rows.length === 0) throw new RangeError("coxRegression: there are no rows to fit");
  const p = rows[0].x?.length ?? 0;
  if (p === 0) throw new RangeError("coxRegression: each row needs at least one covariate in x");
  let events = 0;
  let anyEntry = false;
  const stratified = rows[0].stratum !== undefined;
  rows.forEach((row, i) => {
    const where = `coxRegression: row ${i + 1}`;
    if (!Number.isFinite(row.time)) throw new RangeError(`${where}: the time must be a finite number, got ${row.time}`);
    if (typeof row.event !== "boolean") throw new RangeError(`${where}: event must be true or false`);
    if (!Array.isArray(row.x) || row.x.length !== p) {
      throw new RangeError(`${where} has ${row.x?.length ?? 0} covariates but row 1 has ${p}: every row needs the same number`);
    }
    for (let k = 0; k < p; k++) {
      if (!Number.isFinite(row.x[k])) throw new RangeError(`${where}: covariate ${k + 1} must be a finite number, got ${row.x[k]}`);
    }
    if ((row.stratum !== undefined) !== stratified) {
      throw new RangeError(`${where}: a stratum is given for some rows but not for others; give one for every row or for none`);
    }
    if (row.stratum !== undefined && typeof row.stratum !== "string") throw new RangeError(`${where}: the stratum must be a string`);
    if (row.entry !== undefined) {
      if (!Number.isFinite(row.entry)) throw new RangeError(`${where}: the entry time must be a finite number, got ${row.entry}`);
      if (!(row.entry < row.time)) {
        throw new RangeError(`${where}: the entry time (${row.entry}) must be before the time (${row.time}); the row is at risk on (entry, time]`);
      }
      anyEntry = true;
    }
    if (row.event) events++;
  });
  if (events === 0) throw new RangeError("coxRegression: no events — every row is censored, so there is nothing to estimate");
  return { p, events, anyEntry };
}

function test(chiSquare: number, df: number): Test {
  const value = Math.max(0, chiSquare);
  return { chiSquare: value, df, pValue: chiSquareUpperTail(value, df) };
}

/**
 * Fits h(t | x) = h₀ₛ(t)·exp(β'x) by maximum partial likelihood, as R's
 * coxph(Surv(entry, time, event) ~ x + strata(stratum), ties = "efron" | "breslow"). Throws a RangeError
 * with a plain message on bad input: no rows or events, rows of different lengths, non-finite values,
 * an entry not before its time, or covariates that cannot be told apart (a singular information matrix).
 */
export function coxRegression(rows: readonly CoxRow[], options: CoxOptions = {}): CoxResult {
  const ties = options.ties ?? "efron";
  if (ties !== "efron" && ties !== "breslow") throw new RangeError(`coxRegression: ties must be "efron" or "breslow", got ${String(ties)}`);
  const maxIterations = options.maxIterations ?? DEFAULT_MAX_ITERATIONS;
  if (!Number.isInteger(maxIterations) || maxIterations < 1) throw new RangeError("coxRegression: maxIterations must be a whole number ≥ 1");
  const { p, events, anyEntry } = validate(rows);
  const n = rows.length;

  const strataIds = new Map<string, number>();
  const stratum = new Int32Array(n);
  const x = new Float64Array(n * p);
  const time = new Float64Array(n);
  const event = new Uint8Array(n);
  const entry = anyEntry ? new Float64Array(n) : null;
  rows.forEach((row, i) => {
    const key = row.stratum ?? "";
    let id = strataIds.get(key);
    if (id === undefined) strataIds.set(key, (id = strataIds.size));
    stratum[i] = id;
    time[i] = row.time;
    event[i] = row.event ? 1 : 0;
    if (entry) entry[i] = row.entry ?? -Infinity;
    for (let k = 0; k < p; k++) x[i * p + k] = row.x[k];
  });
  for (let k = 0; k < p; k++) {
    let same = true;
    for (let i = 1; i < n && same; i++) same = x[i * p + k] === x[k];
    if (same) throw new RangeError(`coxRegression: column ${k + 1} has the same value in every row, so its effect cannot be estimated`);
  }

  const data = prepareCoxData({ time, event, x, entry, stratum, p });
  const evaluator = new CoxEvaluator(data, ties);
  const factorOrThrow = (evaluation: CoxEvaluation): Float64Array => {
    const factor = Float64Array.from(evaluation.information);
    const column = ldlFactor(factor, p);
    if (column >= 0) throw new RangeError(collinearMessage(column));
    return factor;
  };

  // Newton–Raphson as R's coxfit6: a step that lowers the log likelihood is halved back towards the
  // last accepted β, and convergence is only declared after a full (unhalved) step.
  const beta = new Float64Array(p);
  const atZero = evaluator.evaluate(beta);
  if (!Number.isFinite(atZero.logLik)) throw new RangeError("coxRegression: the log likelihood at β = 0 is not finite");
  let factor = factorOrThrow(atZero);
  const scoreStatistic = ldlQuadraticForm(factor, p, atZero.score);

  let logLik = atZero.logLik;
  const step = Float64Array.from(atZero.score);
  const trial = new Float64Array(p);
  ldlSolve(factor, p, step);
  for (let k = 0; k < p; k++) trial[k] = beta[k] + step[k];
  let halving = false;
  let converged = false;
  let iterations = 0;
  let current: CoxEvaluation = atZero;
  for (iterations = 1; iterations <= maxIterations; iterations++) {
    current = evaluator.evaluate(trial);
    const newLogLik = current.logLik;
    if (Number.isFinite(newLogLik) && !halving && Math.abs(1 - logLik / newLogLik) <= RELATIVE_TOLERANCE) {
      logLik = newLogLik;
      converged = true;
      break;
    }
    if (iterations === maxIterations) break;
    if (!(newLogLik >= logLik)) {
      halving = true;
      for (let k = 0; k < p; k++) trial[k] = (trial[k] + beta[k]) / 2;
    } else {
      halving = false;
      logLik = newLogLik;
      factor = factorOrThrow(current);
      step.set(current.score);
      ldlSolve(factor, p, step);
      for (let k = 0; k < p; k++) {
        beta[k] = trial[k];
        trial[k] += step[k];
      }
    }
  }
  if (!converged) logLik = current.logLik;
  if (!Number.isFinite(logLik)) {
    throw new RangeError("coxRegression: the fit broke down (a coefficient is running off to infinity: one group may have all the events)");
  }

  const finalFactor = factorOrThrow(current);
  const inverse = ldlInverse(finalFactor, p);
  const coefficients = Array.from(trial);
  const standardErrors = coefficients.map((_, k) => Math.sqrt(inverse[k * p + k]));
  let waldStatistic = 0;
  for (let k = 0; k < p; k++) for (let l = 0; l < p; l++) waldStatistic += trial[k] * current.information[k * p + l] * trial[l];
  const result: CoxResult = {
    coefficients,
    standardErrors,
    hazardRatios: coefficients.map(Math.exp),
    lower95: coefficients.map((b, k) => Math.exp(b - Z_975 * standardErrors[k])),
    upper95: coefficients.map((b, k) => Math.exp(b + Z_975 * standardErrors[k])),
    logLik,
    nullLogLik: atZero.logLik,
    likelihoodRatio: test(2 * (logLik - atZero.logLik), p),
    wald: test(waldStatistic, p),
    score: test(scoreStatistic, p),
    covariance: Array.from({ length: p }, (_, k) => Array.from(inverse.subarray(k * p, k * p + p))),
    iterations: Math.min(iterations, maxIterations),
    converged,
    n,
    events,
  };
  assertFinite(result);
  return result;
}

function assertFinite(result: CoxResult): void {
  const numbers = [
    ...result.coefficients, ...result.standardErrors, ...result.lower95, ...result.upper95, ...result.hazardRatios,
    result.logLik, result.likelihoodRatio.chiSquare, result.wald.chiSquare, result.score.chiSquare,
  ];
  if (numbers.some((v) => Number.isNaN(v))) {
    throw new RangeError("coxRegression: the fit gave no usable numbers (the covariates may separate the events perfectly)");
  }
}
