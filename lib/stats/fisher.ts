// Fisher's exact test for r × c tables: e.g. rusted / not rusted by treatment, or ISO grade by
// chamber, where groups are too small for a chi-square approximation.

export interface FisherResult {
  pValue: number;
}

/** R's fisher.test counts tables whose probability is within this relative tolerance of the observed one as "as extreme". */
const RELATIVE_TOLERANCE = 1e-7;
const LOG_TOLERANCE = Math.log1p(RELATIVE_TOLERANCE);
/** Default number of tables enumerated before giving up: about 0.5 s on a 2-core server. */
export const FISHER_ENUMERATION_BUDGET = 10_000_000;

export interface FisherOptions {
  /** Raise for a one-off analysis that may take longer; each 1e7 tables costs roughly 0.5 s. */
  maxTables?: number;
}

function logFactorials(n: number): Float64Array {
  const lf = new Float64Array(n + 1);
  for (let i = 2; i <= n; i++) lf[i] = lf[i - 1] + Math.log(i);
  return lf;
}

function validate(table: readonly (readonly number[])[], who: string): void {
  if (table.length === 0) throw new RangeError(`${who}: empty table`);
  const width = table[0].length;
  for (const row of table) {
    if (row.length !== width) throw new RangeError(`${who}: rows must all have the same length`);
    for (const x of row) {
      if (!Number.isInteger(x) || x < 0) throw new RangeError(`${who}: cells must be whole counts ≥ 0, got ${x}`);
    }
  }
}

// All-zero rows and columns carry no information and do not change any table's probability.
function dropEmpty(table: readonly (readonly number[])[]): number[][] {
  const colSums = table[0].map((_, j) => table.reduce((s, row) => s + row[j], 0));
  return table
    .filter((row) => row.some((x) => x > 0))
    .map((row) => row.filter((_, j) => colSums[j] > 0));
}

// Streaming log-sum-exp so neither sum under- or overflows however small the probabilities get.
class LogSums {
  private shift = -Infinity;
  all = 0;
  extreme = 0;
  add(logP: number, isExtreme: boolean): void {
    if (logP > this.shift) {
      const rescale = Math.exp(this.shift - logP);
      this.all *= rescale;
      this.extreme *= rescale;
      this.shift = logP;
    }
    const p = Math.exp(logP - this.shift);
    this.all += p;
    if (isExtreme) this.extreme += p;
  }
  ratio(): number {
    return Math.min(1, this.extreme / this.all);
  }
}

// Hypergeometric log-probabilities of cell [0][0] over its support, for a 2 × 2 table.
function hypergeometric(table: readonly (readonly number[])[]) {
  const [[a, b], [c, d]] = table;
  const row1 = a + b;
  const row2 = c + d;
  const col1 = a + c;
  const n = row1 + row2;
  const lf = logFactorials(n);
  const lo = Math.max(0, col1 - row2);
  const hi = Math.min(row1, col1);
  const logP = (x: number) => -(lf[x] + lf[row1 - x] + lf[col1 - x] + lf[row2 - col1 + x]);
  return { a, lo, hi, logP };
}

/**
 * Two-sided Fisher exact test: the probability of all tables with the observed margins that are no
 * more likely than the observed one. 2 × 2 uses the hypergeometric directly; larger tables are
 * enumerated and throw past `maxTables` (default FISHER_ENUMERATION_BUDGET). A table with fewer than two non-empty
 * rows or columns has only one possible arrangement, so p = 1.
 */
export function fisherExact(table: readonly (readonly number[])[], options: FisherOptions = {}): FisherResult {
  validate(table, "fisherExact");
  const t = dropEmpty(table);
  if (t.length < 2 || t[0].length < 2) return { pValue: 1 };
  if (t.length === 2 && t[0].length === 2) {
    const { a, lo, hi, logP } = hypergeometric(t);
    const observed = logP(a);
    const sums = new LogSums();
    for (let x = lo; x <= hi; x++) {
      const lp = logP(x);
      sums.add(lp, lp <= observed + LOG_TOLERANCE);
    }
    return { pValue: sums.ratio() };
  }
  return { pValue: enumerate(t, options.maxTables ?? FISHER_ENUMERATION_BUDGET) };
}

function enumerate(t: number[][], budget: number): number {
  // Fewer rows make shallower column compositions; transposing does not change the p-value.
  const table = t.length <= t[0].length ? t : t[0].map((_, j) => t.map((row) => row[j]));
  const r = table.length;
  const c = table[0].length;
  const rowSums = table.map((row) => row.reduce((s, x) => s + x, 0));
  const colSums = table[0].map((_, j) => table.reduce((s, row) => s + row[j], 0));
  const n = rowSums.reduce((s, x) => s + x, 0);
  const lf = logFactorials(n);
  // The margins' factorials are common to every table: only −Σ log x_ij! differs.
  const observed = -table.reduce((s, row) => s + row.reduce((q, x) => q + lf[x], 0), 0);
  const sums = new LogSums();
  const remaining = rowSums.slice();
  let visited = 0;

  const fillColumn = (col: number, row: number, left: number, logP: number): void => {
    if (col === c - 1) {
      // The last column is forced: whatever each row still needs.
      let lp = logP;
      for (let i = 0; i < r; i++) lp -= lf[remaining[i]];
      if (++visited > budget) {
        throw new RangeError(
          `fisherExact: more than ${budget.toLocaleString("en")} tables share these margins; ` +
            "merge categories or use a chi-square test instead",
        );
      }
      sums.add(lp, lp <= observed + LOG_TOLERANCE);
      return;
    }
    if (row === r - 1) {
      if (left > remaining[row]) return;
      remaining[row] -= left;
      fillColumn(col + 1, 0, colSums[col + 1], logP - lf[left]);
      remaining[row] += left;
      return;
    }
    let capacityBelow = 0;
    for (let i = row + 1; i < r; i++) capacityBelow += remaining[i];
    const lo = Math.max(0, left - capacityBelow);
    const hi = Math.min(remaining[row], left);
    for (let x = lo; x <= hi; x++) {
      remaining[row] -= x;
      fillColumn(col, row + 1, left - x, logP - lf[x]);
      remaining[row] += x;
    }
  };
  fillColumn(0, 0, colSums[0], 0);
  return sums.ratio();
}

/** One-sided 2 × 2 Fisher test on cell [0][0]: "greater" = P(X ≥ a), "less" = P(X ≤ a), as R's alternative. */
export function fisherExact2x2OneSided(
  table: readonly (readonly number[])[],
  alternative: "greater" | "less",
): FisherResult {
  validate(table, "fisherExact2x2OneSided");
  if (table.length !== 2 || table[0].length !== 2) throw new RangeError("fisherExact2x2OneSided: needs a 2 × 2 table");
  const { a, lo, hi, logP } = hypergeometric(table);
  const sums = new LogSums();
  for (let x = lo; x <= hi; x++) sums.add(logP(x), alternative === "greater" ? x >= a : x <= a);
  return { pValue: sums.ratio() };
}
