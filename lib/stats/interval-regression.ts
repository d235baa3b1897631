// Parametric accelerated-failure-time regression for interval-censored times to first rust:
// log T = β0 + x'β + σ·W, with W standard minimum extreme value (Weibull T) or standard normal
// (lognormal T). The log-likelihood, parametrisation (β, log σ), Newton–Raphson fit and its
// convergence rule follow R's survreg (survival package), so estimates, vcov(), loglik and
// predict(type = "quantile") can be checked against it.
import { EXTREME_VALUE, NORMAL, type ErrorLaw } from "./interval-laws";
import { spdFactor, spdInverse, spdSolve, type SpdFactor } from "./cholesky";
import { EXACT, LEFT, RIGHT, describeNumber, prepare, type Design, type IntervalRow } from "./interval-design";

export interface IntervalRegressionFit {
  distribution: "weibull" | "lognormal";
  intercept: number;
  coefficients: number[];
  /** σ, R's fit$scale. */
  scale: number;
  /** √diag(covariance): intercept, coefficients…, then log(scale), as R's sqrt(diag(vcov(fit))). */
  standardErrors: number[];
  /** R's vcov(fit): parameters in the order intercept, coefficients…, log(scale). */
  covariance: number[][];
  /** R's fit$loglik[2], the Jacobian −Σ log t of exact times included. */
  logLik: number;
  /** Rows used (rows from 0 to Infinity are left out). */
  n: number;
  iterations: number;
  converged: boolean;
  /** The p-quantile of T at covariates x: R's predict(fit, newdata, type = "quantile", p = p). */
  quantile(p: number, x: number[]): number;
}

// ---------------------------------------------------------------------------------------------
// Log-likelihood with its gradient and Hessian in θ = (β0, β…, log σ), on the standardised scale.

interface Evaluation {
  logLik: number;
  gradient: number[];
  /** full symmetric p × p */
  hessian: number[][];
}

function evaluate(d: Design, law: ErrorLaw, theta: readonly number[], derivatives: boolean): Evaluation {
  const { n, k, kind, logLower, logUpper, z } = d;
  const p = k + 2;
  const tau = theta[k + 1];
  const sigma = Math.exp(tau);
  const grad = new Float64Array(p);
  const hess = new Float64Array(p * p);
  const xi = new Float64Array(p - 1);
  const ends = new Float64Array(5);
  let logLik = d.jacobian;
  for (let i = 0; i < n; i++) {
    let eta = theta[0];
    for (let j = 0; j < k; j++) eta += theta[j + 1] * z[i * k + j];
    let dEta: number; // ∂ℓ/∂η
    let dTau: number; // ∂ℓ/∂log σ
    let dEtaEta: number;
    let dEtaTau: number;
    let dTauTau: number;
    if (kind[i] === EXACT) {
      const w = (logLower[i] - eta) / sigma;
      logLik += law.logDensity(w) - tau;
      if (!derivatives) continue;
      const s = law.score(w);
      const s1 = law.scoreSlope(w);
      dEta = -s / sigma;
      dTau = -s * w - 1;
      dEtaEta = s1 / (sigma * sigma);
      dEtaTau = (s1 * w + s) / sigma;
      dTauTau = s1 * w * w + s * w;
    } else {
      const wl = kind[i] === LEFT ? -Infinity : (logLower[i] - eta) / sigma;
      const wu = kind[i] === RIGHT ? Infinity : (logUpper[i] - eta) / sigma;
      law.censored(wl, wu, ends);
      logLik += ends[0];
      if (!derivatives) continue;
      const fu = ends[1];
      const fl = ends[2];
      let fuW = 0, fuSW = 0, fuSWW = 0, fuS = 0;
      let flW = 0, flSW = 0, flSWW = 0, flS = 0;
      if (fu > 0) {
        fuW = fu * wu;
        fuS = fu * ends[3];
        fuSW = fuS * wu;
        fuSWW = fuSW * wu;
      }
      if (fl > 0) {
        flW = fl * wl;
        flS = fl * ends[4];
        flSW = flS * wl;
        flSWW = flSW * wl;
      }
      dEta = -(fu - fl) / sigma;
      dTau = -(fuW - flW);
      dEtaEta = (fuS - flS) / (sigma * sigma) - dEta * dEta;
      dEtaTau = (fuSW - flSW + fu - fl) / sigma - dEta * dTau;
      dTauTau = fuSWW + fuW - flSWW - flW - dTau * dTau;
    }
    xi[0] = 1;
    for (let j = 0; j < k; j++) xi[j + 1] = z[i * k + j];
    for (let a = 0; a < p - 1; a++) {
      grad[a] += dEta * xi[a];
      const row = a * p;
      for (let b = a; b < p - 1; b++) hess[row + b] += dEtaEta * xi[a] * xi[b];
      hess[row + p - 1] += dEtaTau * xi[a];
    }
    grad[p - 1] += dTau;
    hess[p * p - 1] += dTauTau;
  }
  const hessian: number[][] = [];
  for (let a = 0; a < p; a++) {
    const row: number[] = [];
    for (let b = 0; b < p; b++) row.push(a <= b ? hess[a * p + b] : hess[b * p + a]);
    hessian.push(row);
  }
  return { logLik, gradient: Array.from(grad), hessian };
}

// ---------------------------------------------------------------------------------------------
// Newton–Raphson with step halving, stopping as survreg does (relative change in loglik ≤ 1e-9).

const MAX_ITERATIONS = 30; // survreg.control() default
const REL_TOLERANCE = 1e-9; // survreg.control() default
const MAX_HALVINGS = 40;

/** Least squares on log "midpoints" for the location, the residual spread for σ. */
function startingValues(d: Design, law: ErrorLaw): number[] {
  const { n, k, kind, logLower, logUpper, z } = d;
  const p = k + 1;
  const gram = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  const rhs = new Array<number>(p).fill(0);
  const y = new Float64Array(n);
  const xi = new Array<number>(p);
  for (let i = 0; i < n; i++) {
    const mid =
      kind[i] === EXACT ? logLower[i]
      : kind[i] === RIGHT ? logLower[i] + Math.LN2
      : kind[i] === LEFT ? logUpper[i] - Math.LN2
      : (logLower[i] + logUpper[i]) / 2;
    y[i] = mid;
    xi[0] = 1;
    for (let j = 0; j < k; j++) xi[j + 1] = z[i * k + j];
    for (let a = 0; a < p; a++) {
      rhs[a] += xi[a] * mid;
      for (let b = 0; b < p; b++) gram[a][b] += xi[a] * xi[b];
    }
  }
  const l = spdFactor(gram);
  const beta = l ? spdSolve(l, rhs) : [rhs[0] / n, ...new Array<number>(k).fill(0)];
  let ss = 0;
  for (let i = 0; i < n; i++) {
    let fitted = beta[0];
    for (let j = 0; j < k; j++) fitted += beta[j + 1] * z[i * k + j];
    ss += (y[i] - fitted) ** 2;
  }
  const spread = Math.sqrt(ss / n) / law.sd;
  const sigma = spread > 1e-3 && Number.isFinite(spread) ? spread : 1;
  beta[0] -= law.mean * sigma;
  return [...beta, Math.log(sigma)];
}

interface Optimum {
  theta: number[];
  at: Evaluation;
  iterations: number;
  converged: boolean;
}

/** −H made positive definite (a growing ridge where it is not), as its Cholesky factor. */
function newtonFactor(hessian: number[][]): SpdFactor | null {
  const neg = hessian.map((row) => row.map((v) => -v));
  let factor = spdFactor(neg);
  const size = Math.max(...neg.map((row, i) => Math.abs(row[i])), 1e-8);
  for (let ridge = 1e-8 * size; !factor && ridge < 1e8 * size; ridge *= 10) {
    factor = spdFactor(neg.map((row, i) => row.map((v, j) => (i === j ? v + ridge : v))));
  }
  return factor;
}

/**
 * One more full Newton step once survreg's rule is met, kept unless the loglik drops by more than its
 * rounding noise: the estimates then sit at the maximum to about machine precision instead of anywhere
 * within the tolerance.
 */
function polish(d: Design, law: ErrorLaw, optimum: Optimum): Optimum {
  const factor = newtonFactor(optimum.at.hessian);
  if (!factor) return optimum;
  const step = spdSolve(factor, optimum.at.gradient);
  const theta = optimum.theta.map((v, i) => v + step[i]);
  const at = evaluate(d, law, theta, true);
  if (!Number.isFinite(at.logLik) || at.logLik < optimum.at.logLik - 1e-11 * Math.abs(optimum.at.logLik) || !theta.every(Number.isFinite)) return optimum;
  return { ...optimum, theta, at };
}

function maximise(d: Design, law: ErrorLaw, start: number[]): Optimum {
  let theta = start;
  let at = evaluate(d, law, theta, true);
  if (!Number.isFinite(at.logLik)) return { theta, at, iterations: 0, converged: false };
  for (let iteration = 1; iteration <= MAX_ITERATIONS; iteration++) {
    const factor = newtonFactor(at.hessian);
    if (!factor) return { theta, at, iterations: iteration, converged: false };
    const step = spdSolve(factor, at.gradient);
    if (!step.every(Number.isFinite)) return { theta, at, iterations: iteration, converged: false };
    // The full step is tried with derivatives (it is nearly always taken); halved steps without.
    let next: Evaluation | null = null;
    let nextTheta = theta;
    let length = 1;
    for (let h = 0; h <= MAX_HALVINGS; h++, length /= 2) {
      const candidate = theta.map((v, i) => v + length * step[i]);
      const tried = evaluate(d, law, candidate, h === 0);
      if (Number.isFinite(tried.logLik) && tried.logLik >= at.logLik) {
        next = h === 0 ? tried : evaluate(d, law, candidate, true);
        nextTheta = candidate;
        break;
      }
    }
    if (!next) {
      // No step along the Newton direction raises the loglik: at the maximum to machine precision
      // when the predicted gain there is negligible, stuck otherwise.
      const gain = step.reduce((s, v, i) => s + v * at.gradient[i], 0);
      return { theta, at, iterations: iteration, converged: gain <= 1e-8 * (Math.abs(at.logLik) + 1) };
    }
    const change = Math.abs(next.logLik - at.logLik) / Math.max(Math.abs(next.logLik), Number.MIN_VALUE);
    theta = nextTheta;
    at = next;
    if (change <= REL_TOLERANCE) return polish(d, law, { theta, at, iterations: iteration, converged: true });
  }
  return { theta, at, iterations: MAX_ITERATIONS, converged: false };
}

function fitWithLaw(rows: IntervalRow[], law: ErrorLaw): IntervalRegressionFit {
  const d = prepare(rows);
  const { k, means, sds } = d;
  const p = k + 2;
  let best = maximise(d, law, startingValues(d, law));
  if (!best.converged) {
    // A second start: the least-squares location, no covariate effect and σ = 1.
    const fallback = maximise(d, law, [startingValues(d, law)[0], ...new Array<number>(k).fill(0), 0]);
    if (fallback.converged) best = fallback;
  }
  if (!best.converged) {
    throw new RangeError(
      `The ${law.name} fit did not converge within ${MAX_ITERATIONS} iterations: the data may not pin down every parameter (for example a group in which no specimen rusted, one in which all had rusted by the first look, or times that a line fits exactly).`,
    );
  }
  if (d.exactRows === 0 && best.at.logLik > -1e-9 * d.n) {
    // Every row's probability is 1 to within rounding: σ has shrunk toward 0 around a line that
    // threads every interval, which is no fit to report (R stops here without converging).
    throw new RangeError(
      `The ${law.name} fit did not converge: a straight line in the covariates passes through every row's interval, so the scale shrinks toward 0 without end.`,
    );
  }
  const factor = spdFactor(best.at.hessian.map((row) => row.map((v) => -v)));
  if (!factor) {
    throw new RangeError(`The ${law.name} fit found no clear maximum (the information matrix is singular): the data do not pin down every parameter.`);
  }
  const standardised = spdInverse(factor);
  // A monotone likelihood (say a group in which no specimen rusted) "converges" as in R, with one
  // coefficient drifting off and a huge standard error. Per standard deviation of its covariate, a
  // real effect's standard error is of the order σ/√(rows), far below a thousand σ.
  const sigmaAtFit = Math.exp(best.theta[p - 1]);
  for (let j = 0; j < k; j++) {
    if (!(Math.sqrt(standardised[j + 1][j + 1]) <= 1000 * sigmaAtFit)) {
      throw new RangeError(
        `The ${law.name} fit cannot pin down the effect of covariate ${j + 1}: its estimate drifts off without end (for example a group in which no specimen rusted, or one in which all had rusted by the first look).`,
      );
    }
  }
  // θ = A θ_std: β_j = c_j / sd_j, β0 = c0 − Σ c_j mean_j / sd_j, log σ unchanged.
  const map = Array.from({ length: p }, (_, i) => new Array<number>(p).fill(0));
  map[0][0] = 1;
  for (let j = 0; j < k; j++) {
    map[0][j + 1] = -means[j] / sds[j];
    map[j + 1][j + 1] = 1 / sds[j];
  }
  map[p - 1][p - 1] = 1;
  const theta = map.map((row) => row.reduce((s, v, j) => s + v * best.theta[j], 0));
  const covariance = map.map((ri) => map.map((rj) => {
    let s = 0;
    for (let a = 0; a < p; a++) {
      if (ri[a] === 0) continue;
      for (let b = 0; b < p; b++) s += ri[a] * standardised[a][b] * rj[b];
    }
    return s;
  }));
  const standardErrors = covariance.map((row, i) => Math.sqrt(row[i]));
  const values = [...theta, ...standardErrors, best.at.logLik, ...covariance.flat()];
  if (!values.every(Number.isFinite)) {
    throw new RangeError(`The ${law.name} fit gave numbers that cannot be represented: the data do not pin down every parameter.`);
  }
  const intercept = theta[0];
  const coefficients = theta.slice(1, k + 1);
  const scale = Math.exp(theta[k + 1]);
  return {
    distribution: law.name,
    intercept,
    coefficients,
    scale,
    standardErrors,
    covariance,
    logLik: best.at.logLik,
    n: d.n,
    iterations: best.iterations,
    converged: true,
    quantile(prob: number, x: number[]): number {
      if (!Array.isArray(x) || x.length !== k) throw new RangeError(`The quantile needs ${k} covariates, got ${Array.isArray(x) ? x.length : "none"}.`);
      if (!x.every(Number.isFinite)) throw new RangeError("The quantile needs finite covariate values.");
      let eta = intercept;
      for (let j = 0; j < k; j++) eta += coefficients[j] * x[j];
      return Math.exp(eta + scale * law.quantile(prob));
    },
  };
}

/** R: survreg(Surv(lower, upper, type = "interval2") ~ x, dist = "weibull"). */
export function weibullIntervalRegression(rows: IntervalRow[]): IntervalRegressionFit {
  return fitWithLaw(rows, EXTREME_VALUE);
}

/** R: survreg(Surv(lower, upper, type = "interval2") ~ x, dist = "lognormal"). */
export function lognormalIntervalRegression(rows: IntervalRow[]): IntervalRegressionFit {
  return fitWithLaw(rows, NORMAL);
}

/**
 * The log-likelihood of `rows` at given parameters (survreg's, exact-time Jacobian included), for
 * likelihood-ratio comparisons between models; the rows are checked as for a fit.
 */
export function intervalLogLik(
  rows: IntervalRow[],
  distribution: "weibull" | "lognormal",
  params: { intercept: number; coefficients: number[]; scale: number },
): number {
  const d = prepare(rows);
  if (params.coefficients.length !== d.k) throw new RangeError(`The rows have ${d.k} covariates but ${params.coefficients.length} coefficients were given.`);
  if (!(params.scale > 0) || !Number.isFinite(params.scale)) throw new RangeError(`The scale must be a finite number above 0, got ${describeNumber(params.scale)}.`);
  const values = [params.intercept, ...params.coefficients];
  if (!values.every(Number.isFinite)) throw new RangeError("The intercept and coefficients must be finite numbers.");
  // The same parameters on the standardised covariates the fit works with.
  let c0 = params.intercept;
  for (let j = 0; j < d.k; j++) c0 += params.coefficients[j] * d.means[j];
  const theta = [c0, ...params.coefficients.map((b, j) => b * d.sds[j]), Math.log(params.scale)];
  return evaluate(d, distribution === "weibull" ? EXTREME_VALUE : NORMAL, theta, false).logLik;
}
