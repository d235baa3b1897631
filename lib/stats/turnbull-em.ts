// The fitting half of the Turnbull estimator (turnbull.ts builds the innermost intervals).

/**
 * Self-consistency (EM) for the innermost-interval masses, each step O(m + count): prefix sums give
 * every observation's covered mass, a difference array spreads weight/mass back over its run.
 * Plain EM crawls (thousands of steps) when intervals overlap heavily, so steps are accelerated with
 * SQUAREM (Varadhan & Roland 2008, scheme S3), falling back to plain EM whenever an extrapolated
 * point would lower the likelihood. Convergence is still judged on one plain EM step.
 *
 * With truncation (row i observable only when the time falls in (entry_i, ∞), innermost intervals
 * truncStart[i]…count−1) this is Turnbull's (1976) self-consistency algorithm: besides its own
 * weight spread over (L_i, R_i], each row adds "ghost" weight w_i·p_j / P(B_i) on every innermost
 * interval j outside its truncation set B_i — the unseen specimens that would have failed before
 * they could enter — and the new masses are the normalized sums. The likelihood maximized is
 * Σ w_i·log(P(A_i) / P(B_i)).
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
    private readonly truncStart: Int32Array | null = null,
  ) {
    this.prefix = new Float64Array(count + 1);
    this.spread = new Float64Array(count + 1);
  }

  private fillPrefix(p: Float64Array): void {
    for (let j = 0; j < this.count; j++) this.prefix[j + 1] = this.prefix[j] + p[j];
  }

  /** P(T > entry) for row i from the filled prefix sums (1 without truncation). */
  private observable(i: number): number {
    const start = this.truncStart ? this.truncStart[i] : 0;
    return start === 0 ? 1 : this.prefix[this.count] - this.prefix[start];
  }

  /** Log-likelihood Σ w·log(mass covered / mass observable); −Infinity if a row is left with no mass. */
  logLikelihood(p: Float64Array): number {
    this.fillPrefix(p);
    let ll = 0;
    for (let i = 0; i < this.weights.length; i++) {
      const covered = this.prefix[this.last[i] + 1] - this.prefix[this.first[i]];
      if (!(covered > 0)) return -Infinity;
      ll += this.weights[i] * (Math.log(covered) - Math.log(this.observable(i)));
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
      const start = this.truncStart ? this.truncStart[i] : 0;
      if (start > 0) {
        // Ghosts: weight w/P(B) on the intervals before the row's entry.
        const ghost = this.weights[i] / this.observable(i);
        spread[0] += ghost;
        spread[start] -= ghost;
      }
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
