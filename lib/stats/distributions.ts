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
