// Interval-censored AFT regression at trial scale: 10,000 specimens with 3 covariates, seen at
// weekly looks. Run directly with `npx tsx bench/interval-regression-bench.ts` (no database).
import { createRng, randomNormal, type Rng } from "@/lib/allocation/prng"; // seeded, so runs are repeatable
import {
  lognormalIntervalRegression,
  weibullIntervalRegression,
  type IntervalRegressionFit,
} from "@/lib/stats/interval-regression";
import type { IntervalRow } from "@/lib/stats/interval-design";

const SPECIMENS = 10_000;
const LOOKS = 20;
const LOOK_SPACING_DAYS = 7;
const TARGET_MS = 50;

/**
 * Latent log time = 3.2 + 0.015·coatingUm − 0.6·salted − 0.04·(rhPercent − 75) + 0.6·W, with W the
 * standard minimum extreme value (Weibull times) or standard normal (lognormal times); each specimen
 * is seen every 7 days for 20 looks.
 */
export function simulateIntervalRows(law: "weibull" | "lognormal", seed = "interval-regression-bench"): IntervalRow[] {
  const rng: Rng = createRng(`${seed}-${law}`);
  const lastDay = LOOKS * LOOK_SPACING_DAYS;
  const rows: IntervalRow[] = [];
  for (let s = 0; s < SPECIMENS; s++) {
    const coatingUm = 20 + 60 * rng();
    const salted = rng() < 0.5 ? 1 : 0;
    const rhPercent = 60 + 35 * rng();
    const w = law === "weibull" ? Math.log(-Math.log(1 - rng())) : randomNormal(rng);
    const logDays = 3.2 + 0.015 * coatingUm - 0.6 * salted - 0.04 * (rhPercent - 75) + 0.6 * w;
    const days = Math.exp(logDays);
    const x = [coatingUm, salted, rhPercent];
    if (days > lastDay) rows.push({ lower: lastDay, upper: Infinity, x });
    else {
      const firstRusted = Math.max(1, Math.ceil(days / LOOK_SPACING_DAYS)) * LOOK_SPACING_DAYS;
      rows.push({ lower: firstRusted - LOOK_SPACING_DAYS, upper: firstRusted, x });
    }
  }
  return rows;
}

export interface IntervalRegressionBenchResult {
  name: string;
  runs: number;
  medianMs: number;
  minMs: number;
  maxMs: number;
  targetMs: number;
  withinTarget: boolean;
  fit: IntervalRegressionFit;
}

function time(name: string, fit: (rows: IntervalRow[]) => IntervalRegressionFit, rows: IntervalRow[], runs: number): IntervalRegressionBenchResult {
  for (let i = 0; i < 5; i++) fit(rows); // warm-up so the JIT has compiled the hot loops
  const times: number[] = [];
  let last = fit(rows);
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    last = fit(rows);
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  const medianMs = times[Math.floor(times.length / 2)];
  return { name, runs, medianMs, minMs: times[0], maxMs: times[times.length - 1], targetMs: TARGET_MS, withinTarget: medianMs < TARGET_MS, fit: last };
}

export function runIntervalRegressionBench(runs = 21): IntervalRegressionBenchResult[] {
  return [
    time("weibullIntervalRegression, 10,000 rows × 3 covariates, weekly looks", weibullIntervalRegression, simulateIntervalRows("weibull"), runs),
    time("lognormalIntervalRegression, 10,000 rows × 3 covariates, weekly looks", lognormalIntervalRegression, simulateIntervalRows("lognormal"), runs),
  ];
}

if (/interval-regression-bench\.[cm]?[jt]s$/.test(process.argv[1] ?? "")) {
  for (const r of runIntervalRegressionBench()) {
    console.log(r.name);
    console.log(
      `median ${r.medianMs.toFixed(2)} ms (min ${r.minMs.toFixed(2)}, max ${r.maxMs.toFixed(2)}, ${r.runs} runs); ` +
        `target < ${r.targetMs} ms: ${r.withinTarget ? "met" : "NOT met"}`,
    );
    const f = r.fit;
    console.log(
      `  fit: intercept ${f.intercept.toFixed(4)}, coefficients ${f.coefficients.map((c) => c.toFixed(4)).join(", ")}, ` +
        `scale ${f.scale.toFixed(4)} (simulated: intercept 6.2; 0.015, -0.6, -0.04; scale 0.6), ${f.iterations} iterations`,
    );
  }
}
