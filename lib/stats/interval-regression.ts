// Parametric accelerated-failure-time regression for interval-censored times to first rust:
// log T = β0 + x'β + σ·W, with W standard minimum extreme value (Weibull T) or standard normal
// (lognormal T). The log-likelihood, parametrisation (β, log σ), Newton–Raphson fit and its
// convergence rule follow R's survreg (survival package), so estimates, vcov(), loglik and
// predict(type = "quantile") can be checked against it.
import { normalQuantile } from "./distributions";
import { firstDependentColumn, spdFactor, spdInverse, spdSolve, type SpdFactor } from "./cholesky";

/**
 * One specimen. `lower = 0`: rust already at the first look (T ≤ upper); `upper = Infinity`: no rust
 * yet when last seen at `lower`; `lower === upper`: the exact time; otherwise lower < T ≤ upper.
 * A row from 0 to Infinity says nothing and is left out of the fit (R drops it as missing).
 */
export interface IntervalRow {
  lower: number;
  upper: number;
  x: number[];
}

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
// Tail functions. Probabilities of censored rows are taken on the log scale wherever plain numbers
// would underflow or cancel (far tails, narrow intervals), so a fit never meets log(0) or 0/0.

const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);
const INV_SQRT_2PI = 0.3989422804014327;

// W. J. Cody (1969), "Rational Chebyshev approximations for the error function", Math. Comp. 23,
// 631–637; the three ranges and coefficients as in R's pnorm (nmath/pnorm.c).
const CODY_A = [2.2352520354606839287, 161.02823106855587881, 1067.6894854603709582, 18154.981253343561249, 0.065682337918207449113];
const CODY_B = [47.20258190468824187, 976.09855173777669322, 10260.932208618978205, 45507.789335026729956];
const CODY_C = [
  0.39894151208813466764, 8.8831497943883759412, 93.506656132177855979, 597.27027639480026226,
  2494.5375852903726711, 6848.1904505362823326, 11602.651437647350124, 9842.7148383839780218, 1.0765576773720192317e-8,
];
const CODY_D = [
  22.266688044328115691, 235.38790178262499861, 1519.377599407554805, 6485.558298266760755,
  18615.571640885098091, 34900.952721145977266, 38912.003286093271411, 19685.429676859990727,
];
const CODY_P = [0.21589853405795699, 0.1274011611602473639, 0.022235277870649807, 0.001421619193227893466, 2.9112874951168792e-5, 0.02307344176494017303];
const CODY_Q = [1.28426009614491121, 0.468238212480865118, 0.0659881378689285515, 0.00378239633202758244, 7.29751555083966205e-5];

// Φ(−y) for y ≥ 0.67448975 (the small tail) = exp(−split²/2)·exp(−rest/2)·ratio: exp(−y²/2) split
// as Cody does so the square loses no digits. Set by smallNormalTail (module scratch: no allocation
// in the fit's inner loop).
let tailSplitSq = 0;
let tailRest = 0;
let tailRatio = 0;

function smallNormalTail(y: number): void {
  if (y <= 5.656854249492380195) {
    let num = CODY_C[8] * y;
    let den = y;
    for (let i = 0; i < 7; i++) {
      num = (num + CODY_C[i]) * y;
      den = (den + CODY_D[i]) * y;
    }
    tailRatio = (num + CODY_C[7]) / (den + CODY_D[7]);
  } else {
    const inv = 1 / (y * y);
    let num = CODY_P[5] * inv;
    let den = inv;
    for (let i = 0; i < 4; i++) {
      num = (num + CODY_P[i]) * inv;
      den = (den + CODY_Q[i]) * inv;
    }
    tailRatio = (INV_SQRT_2PI - (inv * (num + CODY_P[4])) / (den + CODY_Q[4])) / y;
  }
  const split = Math.trunc(y * 16) / 16;
  tailSplitSq = split * split;
  tailRest = (y - split) * (y + split);
}

/** log Φ(x) for the standard normal, accurate in both tails (far below where Φ underflows). */
export function logNormalCdf(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x === Infinity) return 0;
  if (x === -Infinity) return -Infinity;
  const y = Math.abs(x);
  if (y <= 0.67448975) {
    const sq = x * x;
    let num = CODY_A[4] * sq;
    let den = sq;
    for (let i = 0; i < 3; i++) {
      num = (num + CODY_A[i]) * sq;
      den = (den + CODY_B[i]) * sq;
    }
    return Math.log(0.5 + (x * (num + CODY_A[3])) / (den + CODY_B[3]));
  }
  smallNormalTail(y);
  if (x < 0) return -tailSplitSq * 0.5 - tailRest * 0.5 + Math.log(tailRatio);
  return Math.log1p(-Math.exp(-tailSplitSq * 0.5) * Math.exp(-tailRest * 0.5) * tailRatio);
}

/** log(Φ(b) − Φ(a)) for a < b (either may be infinite), without cancellation in the tails. */
export function logNormalBetween(a: number, b: number): number {
  if (b === Infinity) return logNormalCdf(-a);
  if (a === -Infinity) return logNormalCdf(b);
  if (a >= 0) {
    const upperA = logNormalCdf(-a);
    return upperA + Math.log(-Math.expm1(logNormalCdf(-b) - upperA));
  }
  if (b <= 0) {
    const lowerB = logNormalCdf(b);
    return lowerB + Math.log(-Math.expm1(logNormalCdf(a) - lowerB));
  }
  return Math.log1p(-(Math.exp(logNormalCdf(a)) + Math.exp(logNormalCdf(-b))));
}

/**
 * log(S(a) − S(b)) for the standard minimum extreme-value law, S(w) = exp(−eʷ), a < b (either may be
 * infinite): the log of the probability that a Weibull time falls between the two looks.
 * S(a) − S(b) = S(a)·(1 − exp(−(eᵇ − eᵃ))), with eᵇ − eᵃ = eᵃ·expm1(b − a).
 */
export function logExtremeValueBetween(a: number, b: number): number {
  if (b === Infinity) return -Math.exp(a);
  if (a === -Infinity) return Math.log(-Math.expm1(-Math.exp(b)));
  const ea = Math.exp(a);
  return -ea + Math.log(-Math.expm1(-ea * Math.expm1(b - a)));
}

// Fit terms of a censored row, from the fewest exponentials (these dominate the cost of a fit).
// Extreme value: S(w) = exp(−eʷ), f(w) = eʷ·S(w), score 1 − eʷ.
function extremeValueCensored(wl: number, wu: number, out: Float64Array): void {
  if (wu === Infinity) {
    const el = Math.exp(wl); // P = S(wl), f(wl)/P = e^wl
    out[0] = -el;
    out[1] = 0;
    out[2] = el;
    out[3] = 0;
    out[4] = 1 - el;
    return;
  }
  const eu = Math.exp(wu);
  if (wl === -Infinity) {
    const q = -Math.expm1(-eu); // P = F(wu)
    out[0] = Math.log(q);
    out[1] = eu > 700 ? 0 : (eu * Math.exp(-eu)) / q;
    out[2] = 0;
    out[3] = 1 - eu;
    out[4] = 0;
    return;
  }
  // P = S(wl)·q with q = 1 − S(wu)/S(wl) = 1 − exp(−(eu − el)), eu − el = el·expm1(wu − wl).
  const el = Math.exp(wl);
  const gap = el * Math.expm1(wu - wl);
  const q = -Math.expm1(-gap);
  const ratio = Math.exp(-gap); // S(wu)/S(wl)
  out[0] = -el + Math.log(q);
  out[1] = ratio === 0 ? 0 : (eu * ratio) / q;
  out[2] = el / q;
  out[3] = 1 - eu;
  out[4] = 1 - el;
}

// Φ(x), 1 − Φ(x) and φ(x) as plain numbers (module scratch, set by normalValues): the fit's common
// case, where no probability underflows, needs no logarithms of tails.
let valueLower = 0;
let valueUpper = 0;
let valueDensity = 0;

function normalValues(x: number): void {
  if (Math.abs(x) <= 0.67448975) {
    const sq = x * x;
    let num = CODY_A[4] * sq;
    let den = sq;
    for (let i = 0; i < 3; i++) {
      num = (num + CODY_A[i]) * sq;
      den = (den + CODY_B[i]) * sq;
    }
    const temp = (x * (num + CODY_A[3])) / (den + CODY_B[3]);
    valueLower = 0.5 + temp;
    valueUpper = 0.5 - temp;
    valueDensity = Math.exp(-0.5 * sq) * INV_SQRT_2PI;
    return;
  }
  smallNormalTail(Math.abs(x));
  const gauss = Math.exp(-tailSplitSq * 0.5) * Math.exp(-tailRest * 0.5);
  const small = gauss * tailRatio;
  valueDensity = gauss * INV_SQRT_2PI;
  valueLower = x < 0 ? small : 1 - small;
  valueUpper = x < 0 ? 1 - small : small;
}

function normalCensored(wl: number, wu: number, out: Float64Array): void {
  let probability: number;
  let larger: number; // the larger term of the difference, to see cancellation
  let fl = 0;
  let fu = 0;
  if (wu === Infinity) {
    normalValues(wl);
    probability = larger = valueUpper;
    fl = valueDensity;
  } else if (wl === -Infinity) {
    normalValues(wu);
    probability = larger = valueLower;
    fu = valueDensity;
  } else {
    normalValues(wl);
    const lowerOfL = valueLower;
    const upperOfL = valueUpper;
    fl = valueDensity;
    normalValues(wu);
    fu = valueDensity;
    if (wl >= 0) {
      probability = upperOfL - valueUpper;
      larger = upperOfL;
    } else if (wu <= 0) {
      probability = valueLower - lowerOfL;
      larger = valueLower;
    } else {
      probability = 1 - lowerOfL - valueUpper;
      larger = 1;
    }
  }
  if (probability > 1e-280 && probability > 1e-3 * larger) {
    out[0] = Math.log(probability);
    out[1] = fu / probability;
    out[2] = fl / probability;
  } else {
    // Far tails or a difference that cancels: the log-scale route.
    const logP = logNormalBetween(wl, wu);
    out[0] = logP;
    out[1] = wu === Infinity ? 0 : Math.exp(-0.5 * wu * wu - LOG_SQRT_2PI - logP);
    out[2] = wl === -Infinity ? 0 : Math.exp(-0.5 * wl * wl - LOG_SQRT_2PI - logP);
  }
  out[3] = -wu;
  out[4] = -wl;
}

interface ErrorLaw {
  name: "weibull" | "lognormal";
  logDensity(z: number): number;
  /** d log f / dz */
  score(z: number): number;
  /** d² log f / dz² */
  scoreSlope(z: number): number;
  /**
   * For lower < W ≤ upper (lower may be −Infinity, upper Infinity), writes into `out`: the log of its
   * probability P, f(upper)/P, f(lower)/P (0 at an open end) and the score at each end.
   */
  censored(lower: number, upper: number, out: Float64Array): void;
  quantile(p: number): number;
  mean: number;
  sd: number;
}

const EXTREME_VALUE: ErrorLaw = {
  name: "weibull",
  logDensity: (z) => z - Math.exp(z),
  score: (z) => 1 - Math.exp(z),
  scoreSlope: (z) => -Math.exp(z),
  censored: extremeValueCensored,
  quantile: (p) => {
    if (!(p > 0 && p < 1)) throw new RangeError(`the probability must be between 0 and 1 (exclusive), got ${p}`);
    return Math.log(-Math.log1p(-p));
  },
  mean: -0.5772156649015329, // −(Euler's constant)
  sd: Math.PI / Math.sqrt(6),
};

const NORMAL: ErrorLaw = {
  name: "lognormal",
  logDensity: (z) => -0.5 * z * z - LOG_SQRT_2PI,
  score: (z) => -z,
  scoreSlope: () => -1,
  censored: normalCensored,
  quantile: normalQuantile,
  mean: 0,
  sd: 1,
};

// ---------------------------------------------------------------------------------------------
// Rows → a compact design. Covariates are centred and scaled for the iterations (better
// conditioned Newton steps); estimates and covariance are mapped back to the caller's units.

const EXACT = 0;
const RIGHT = 1;
const LEFT = 2;
const INTERVAL = 3;

interface Design {
  n: number;
  k: number;
  kind: Uint8Array;
  logLower: Float64Array;
  logUpper: Float64Array;
  /** standardised covariates, row-major n × k */
  z: Float64Array;
  means: number[];
  sds: number[];
  /** −Σ log t over exact rows: survreg's correction from log T back to T */
  jacobian: number;
  exactRows: number;
}

function describe(value: number): string {
  return Number.isNaN(value) ? "not a number" : String(value);
}

function prepare(rows: IntervalRow[]): Design {
  if (!Array.isArray(rows) || rows.length === 0) throw new RangeError("There are no rows to fit.");
  const used: number[] = [];
  let rightOnly = true;
  let leftOnly = true;
  let k = 0;
  for (let i = 0; i < rows.length; i++) {
    const row = rows[i];
    if (!row || typeof row !== "object" || !Array.isArray(row.x)) {
      throw new RangeError(`Row ${i + 1} has no list of covariates (x); give x: [] when there are none.`);
    }
    if (i === 0) k = row.x.length;
    if (row.x.length !== k) {
      throw new RangeError(`Row ${i + 1} has ${row.x.length} covariates but row 1 has ${k}: every row needs the same covariates.`);
    }
    for (let j = 0; j < k; j++) {
      const v = row.x[j];
      if (typeof v !== "number" || !Number.isFinite(v)) throw new RangeError(`Row ${i + 1}: covariate ${j + 1} must be a finite number, got ${describe(v)}.`);
    }
    const { lower, upper } = row;
    if (typeof lower !== "number" || !Number.isFinite(lower) || lower < 0) {
      throw new RangeError(`Row ${i + 1}: the lower time must be a finite number of 0 or more, got ${describe(lower)}.`);
    }
    if (typeof upper !== "number" || Number.isNaN(upper) || upper <= 0) {
      throw new RangeError(`Row ${i + 1}: the upper time must be above 0 (or Infinity when no rust was seen), got ${describe(upper)}.`);
    }
    if (lower > upper) throw new RangeError(`Row ${i + 1}: the lower time ${lower} is above the upper time ${upper}.`);
    if (lower === 0 && upper === Infinity) continue; // says nothing about the time
    used.push(i);
    if (upper !== Infinity) rightOnly = false;
    if (lower !== 0) leftOnly = false;
  }
  if (used.length === 0) throw new RangeError("Every row runs from 0 to Infinity: no row says anything about the time, so there is nothing to fit.");
  if (rightOnly) throw new RangeError("Every row is right-censored (no rust seen yet): there is nothing to fit.");
  if (leftOnly) throw new RangeError("Every row is left-censored (rust already at the first look): there is nothing to fit.");

  const n = used.length;
  const kind = new Uint8Array(n);
  const logLower = new Float64Array(n);
  const logUpper = new Float64Array(n);
  let jacobian = 0;
  let exactRows = 0;
  for (let i = 0; i < n; i++) {
    const { lower, upper } = rows[used[i]];
    logLower[i] = lower > 0 ? Math.log(lower) : -Infinity;
    logUpper[i] = Math.log(upper);
    if (lower === upper) {
      kind[i] = EXACT;
      jacobian -= logLower[i];
      exactRows++;
    } else kind[i] = upper === Infinity ? RIGHT : lower === 0 ? LEFT : INTERVAL;
  }

  const means: number[] = [];
  const sds: number[] = [];
  const z = new Float64Array(n * k);
  for (let j = 0; j < k; j++) {
    let sum = 0;
    const first = rows[used[0]].x[j];
    let constant = true;
    for (const r of used) {
      const v = rows[r].x[j];
      sum += v;
      if (v !== first) constant = false;
    }
    if (constant) throw new RangeError(`Covariate ${j + 1} has the same value in every row: its effect cannot be estimated.`);
    const mean = sum / n;
    let ss = 0;
    for (const r of used) ss += (rows[r].x[j] - mean) ** 2;
    const sd = Math.sqrt(ss / n);
    means.push(mean);
    sds.push(sd);
    for (let i = 0; i < n; i++) z[i * k + j] = (rows[used[i]].x[j] - mean) / sd;
  }
  const gram = Array.from({ length: k }, (_, a) =>
    Array.from({ length: k }, (_, b) => {
      let s = 0;
      for (let i = 0; i < n; i++) s += z[i * k + a] * z[i * k + b];
      return s;
    }),
  );
  const dependent = firstDependentColumn(gram);
  if (dependent >= 0) {
    throw new RangeError(`Covariate ${dependent + 1} is a copy of another covariate (or a sum of others, or nearly so): its effect cannot be estimated.`);
  }
  return { n, k, kind, logLower, logUpper, z, means, sds, jacobian, exactRows };
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
  if (!(params.scale > 0) || !Number.isFinite(params.scale)) throw new RangeError(`The scale must be a finite number above 0, got ${describe(params.scale)}.`);
  const values = [params.intercept, ...params.coefficients];
  if (!values.every(Number.isFinite)) throw new RangeError("The intercept and coefficients must be finite numbers.");
  // The same parameters on the standardised covariates the fit works with.
  let c0 = params.intercept;
  for (let j = 0; j < d.k; j++) c0 += params.coefficients[j] * d.means[j];
  const theta = [c0, ...params.coefficients.map((b, j) => b * d.sds[j]), Math.log(params.scale)];
  return evaluate(d, distribution === "weibull" ? EXTREME_VALUE : NORMAL, theta, false).logLik;
}
