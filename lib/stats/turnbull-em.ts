// The fitting half of the Turnbull estimator (turnbull.ts builds the innermost intervals).

/**
 * Self-consistency (EM) for the innermost-interval masses, each step O(m + count): prefix sums give
 * every observation's covered mass, a difference array spreads weight/mass back over its run.
 * Plain EM crawls (thousands of steps) when intervals overlap heavily, so steps are accelerated with
 * SQUAREM (Varadhan & Roland 2008, scheme S3), falling back to plain EM whenever an extrapolated
 * point would lower the likelihood. Convergence is still judged on one plain EM step.
 */
export class SelfConsistency {
  private readonly prefix: Float64Array;
  private readonly spread: Float64Array;

  constructor(
    private readonly weights: Float64Array,
    private readonly total: number,
    private readonly first: Int32Array,
    private readonly last: Int32Array,
    private readonly count: number,
  ) {
    this.prefix = new Float64Array(count + 1);
    this.spread = new Float64Array(count + 1);
  }

  private fillPrefix(p: Float64Array): void {
    for (let j = 0; j < this.count; j++) this.prefix[j + 1] = this.prefix[j] + p[j];
  }

  /** Log-likelihood Σ w·log(mass covered); −Infinity if an observation is left with no mass. */
  logLikelihood(p: Float64Array): number {
    this.fillPrefix(p);
    let ll = 0;
    for (let i = 0; i < this.weights.length; i++) {
      const covered = this.prefix[this.last[i] + 1] - this.prefix[this.first[i]];
      if (!(covered > 0)) return -Infinity;
      ll += this.weights[i] * Math.log(covered);
    }
    return ll;
  }

  /** out = EM(p); returns max |out − p|, or NaN if p leaves an observation with no mass. */
  step(p: Float64Array, out: Float64Array): number {
    this.fillPrefix(p);
    const spread = this.spread;
    spread.fill(0);
    for (let i = 0; i < this.weights.length; i++) {
      const covered = this.prefix[this.last[i] + 1] - this.prefix[this.first[i]];
      if (!(covered > 0)) return NaN;
      const share = this.weights[i] / covered;
      spread[this.first[i]] += share;
      spread[this.last[i] + 1] -= share;
    }
    let running = 0;
    let sum = 0;
    for (let j = 0; j < this.count; j++) {
      running += spread[j];
      out[j] = (p[j] * running) / this.total;
      sum += out[j];
    }
    let change = 0;
    for (let j = 0; j < this.count; j++) {
      out[j] /= sum; // guards drift from the running sum's rounding
      change = Math.max(change, Math.abs(out[j] - p[j]));
    }
    return change;
  }

  solve(tolerance: number, maxIterations: number): { p: Float64Array; iterations: number; converged: boolean } {
    const n = this.count;
    let p0 = new Float64Array(n).fill(1 / n);
    const p1 = new Float64Array(n);
    let p2 = new Float64Array(n);
    let extrapolated = new Float64Array(n);
    let stabilized = new Float64Array(n);
    let iterations = 0;
    while (iterations < maxIterations) {
      iterations++;
      if (this.step(p0, p1) < tolerance) return { p: p1, iterations, converged: true };
      iterations++;
      this.step(p1, p2);
      let rr = 0;
      let vv = 0;
      for (let j = 0; j < n; j++) {
        const r = p1[j] - p0[j];
        const v = p2[j] - 2 * p1[j] + p0[j];
        rr += r * r;
        vv += v * v;
      }
      const alpha = vv > 0 ? Math.min(-1, -Math.sqrt(rr / vv)) : -1;
      let sum = 0;
      for (let j = 0; j < n; j++) {
        const r = p1[j] - p0[j];
        const v = p2[j] - 2 * p1[j] + p0[j];
        extrapolated[j] = Math.max(0, p0[j] - 2 * alpha * r + alpha * alpha * v);
        sum += extrapolated[j];
      }
      for (let j = 0; j < n; j++) extrapolated[j] /= sum;
      iterations++;
      const usable =
        alpha < -1 &&
        !Number.isNaN(this.step(extrapolated, stabilized)) &&
        this.logLikelihood(stabilized) >= this.logLikelihood(p2);
      if (usable) [p0, stabilized] = [stabilized, p0];
      else [p0, p2] = [p2, p0];
    }
    return { p: p0, iterations, converged: false };
  }
}
