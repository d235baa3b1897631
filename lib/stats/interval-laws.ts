// Error laws of the interval regression (lib/stats/interval-regression.ts): the standard minimum
// extreme value (Weibull T) and the standard normal (lognormal T), with the censored-row terms the
// fit needs. Probabilities are taken on the log scale wherever plain numbers would underflow.
import { normalQuantile } from "./distributions";
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

/** Φ(x) − 0.5 for |x| ≤ 0.67448975: Cody's central rational approximation (as R's pnorm). */
function codyCentral(x: number): number {
  const sq = x * x;
  let num = CODY_A[4] * sq;
  let den = sq;
  for (let i = 0; i < 3; i++) {
    num = (num + CODY_A[i]) * sq;
    den = (den + CODY_B[i]) * sq;
  }
  return (x * (num + CODY_A[3])) / (den + CODY_B[3]);
}

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
    return Math.log(0.5 + codyCentral(x));
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
    const temp = codyCentral(x);
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

export interface ErrorLaw {
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

export const EXTREME_VALUE: ErrorLaw = {
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

export const NORMAL: ErrorLaw = {
  name: "lognormal",
  logDensity: (z) => -0.5 * z * z - LOG_SQRT_2PI,
  score: (z) => -z,
  scoreSlope: () => -1,
  censored: normalCensored,
  quantile: normalQuantile,
  mean: 0,
  sd: 1,
};
