// Interval-censored rows → the compact design the regression fits (lib/stats/interval-regression.ts):
// rows checked with a message naming the row, kinds of censoring, log times and standardised covariates.
import { firstDependentColumn } from "./cholesky";

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

// ---------------------------------------------------------------------------------------------
// Rows → a compact design. Covariates are centred and scaled for the iterations (better
// conditioned Newton steps); estimates and covariance are mapped back to the caller's units.

export const EXACT = 0;
export const RIGHT = 1;
export const LEFT = 2;
export const INTERVAL = 3;

export interface Design {
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

export function describeNumber(value: number): string {
  return Number.isNaN(value) ? "not a number" : String(value);
}

export function prepare(rows: IntervalRow[]): Design {
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
      if (typeof v !== "number" || !Number.isFinite(v)) throw new RangeError(`Row ${i + 1}: covariate ${j + 1} must be a finite number, got ${describeNumber(v)}.`);
    }
    const { lower, upper } = row;
    if (typeof lower !== "number" || !Number.isFinite(lower) || lower < 0) {
      throw new RangeError(`Row ${i + 1}: the lower time must be a finite number of 0 or more, got ${describeNumber(lower)}.`);
    }
    if (typeof upper !== "number" || Number.isNaN(upper) || upper <= 0) {
      throw new RangeError(`Row ${i + 1}: the upper time must be above 0 (or Infinity when no rust was seen), got ${describeNumber(upper)}.`);
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
