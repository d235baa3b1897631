// Tail probabilities shared by the tests in lib/stats. simple-statistics supplies the log-gamma
// (Lanczos, ~1e-15 relative); its normal CDF is a 4-digit table and its chi-square helper is a
// critical-value table, so both tails are derived here from one accurate incomplete gamma.
import { gammaln } from "simple-statistics";

const EPS = 1e-15;
const TINY = 1e-300;
// Large enough for df in the thousands; series and continued fraction converge in ~sqrt(a) steps.
const MAX_ITERATIONS = 100_000;

function assertShape(a: number, x: number): void {
  if (!(a > 0) || !Number.isFinite(a)) throw new RangeError(`incomplete gamma: shape must be > 0, got ${a}`);
  if (Number.isNaN(x)) throw new RangeError("incomplete gamma: x is NaN");
}

// P(a, x) by its power series; converges quickly for x < a + 1.
function lowerSeries(a: number, x: number): number {
  let term = 1 / a;
  let sum = term;
  for (let n = 1; n < MAX_ITERATIONS; n++) {
    term *= x / (a + n);
    sum += term;
    if (Math.abs(term) < Math.abs(sum) * EPS) break;
  }
  return sum * Math.exp(-x + a * Math.log(x) - gammaln(a));
}

// Q(a, x) by Lentz's continued fraction; converges quickly for x >= a + 1.
function upperContinuedFraction(a: number, x: number): number {
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < MAX_ITERATIONS; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPS) break;
  }
  return Math.exp(-x + a * Math.log(x) - gammaln(a)) * h;
}

/** Regularized lower incomplete gamma P(a, x) = γ(a, x) / Γ(a). */
export function regularizedGammaP(a: number, x: number): number {
  assertShape(a, x);
  if (x <= 0) return 0;
  if (x === Infinity) return 1;
  return x < a + 1 ? lowerSeries(a, x) : 1 - upperContinuedFraction(a, x);
}

/** Regularized upper incomplete gamma Q(a, x) = 1 − P(a, x), computed directly in the tail. */
export function regularizedGammaQ(a: number, x: number): number {
  assertShape(a, x);
  if (x <= 0) return 1;
  if (x === Infinity) return 0;
  return x < a + 1 ? 1 - lowerSeries(a, x) : upperContinuedFraction(a, x);
}

/** Upper tail P(X ≥ x) of the chi-square distribution with `df` degrees of freedom. */
export function chiSquareUpperTail(x: number, df: number): number {
  if (!(df > 0)) throw new RangeError(`chi-square: df must be > 0, got ${df}`);
  return regularizedGammaQ(df / 2, x / 2);
}

/** Standard normal CDF Φ(z), via erfc(|z|/√2) = Q(1/2, z²/2) so the far tails keep full precision. */
export function normalCdf(z: number): number {
  if (Number.isNaN(z)) return NaN;
  const halfTail = 0.5 * regularizedGammaQ(0.5, (z * z) / 2);
  return z < 0 ? halfTail : 1 - halfTail;
}

/** R's qnorm(0.975): the multiplier R survival uses for 95 % limits. */
export const Z_975 = 1.959963984540054;

// M. J. Wichura (1988), "Algorithm AS 241: the percentage points of the normal distribution",
// Applied Statistics 37, 477–484 (PPND16, the algorithm of R's qnorm).
const AS241_A = [3.387132872796366608, 133.14166789178437745, 1971.5909503065514427, 13731.693765509461125, 45921.953931549871457, 67265.770927008700853, 33430.575583588128105, 2509.0809287301226727];
const AS241_B = [1, 42.313330701600911252, 687.1870074920579083, 5394.1960214247511077, 21213.794301586595867, 39307.89580009271061, 28729.085735721942674, 5226.495278852854561];
const AS241_C = [1.42343711074968357734, 4.6303378461565452959, 5.7694972214606914055, 3.64784832476320460504, 1.27045825245236838258, 0.24178072517745061177, 0.0227238449892691845833, 7.7454501427834140764e-4];
const AS241_D = [1, 2.05319162663775882187, 1.6763848301838038494, 0.68976733498510000455, 0.14810397642748007459, 0.0151986665636164571966, 5.475938084995344946e-4, 1.05075007164441684324e-9];
const AS241_E = [6.6579046435011037772, 5.4637849111641143699, 1.7848265399172913358, 0.29656057182850489123, 0.026532189526576123093, 0.0012426609473880784386, 2.71155556874348757815e-5, 2.01033439929228813265e-7];
const AS241_F = [1, 0.59983220655588793769, 0.13692988092273580531, 0.0148753612908506148525, 7.868691311456132591e-4, 1.8463183175100546818e-5, 1.4215117583164458887e-7, 2.04426310338993978564e-15];

function rational(num: readonly number[], den: readonly number[], r: number): number {
  let n = 0;
  let d = 0;
  for (let i = num.length - 1; i >= 0; i--) {
    n = n * r + num[i];
    d = d * r + den[i];
  }
  return n / d;
}

/** Standard normal quantile Φ⁻¹(p) for 0 < p < 1. */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`the probability must be between 0 and 1 (exclusive), got ${p}`);
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) return q * rational(AS241_A, AS241_B, 0.180625 - q * q);
  let r = Math.sqrt(-Math.log(q < 0 ? p : 0.5 - p + 0.5));
  const value = r <= 5 ? rational(AS241_C, AS241_D, (r -= 1.6)) : rational(AS241_E, AS241_F, (r -= 5));
  return q < 0 ? -value : value;
}
