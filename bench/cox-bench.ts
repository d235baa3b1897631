// Cox regression at trial scale: 10,000 rows × 5 covariates, Efron ties (times in whole days, so heavily
// tied), plain, with 4 strata, and with delayed entry. No database needed:
// `npx tsx bench/cox-bench.ts`; a bench runner can import runCoxBench().
import { coxRegression, type CoxRow } from "@/lib/stats/cox";
import { createRng, randomNormal } from "@/lib/allocation/prng"; // seeded, so runs are repeatable

const ROWS = 10_000;
const COVARIATES = 5;
const STRATA = 4;
const TRUE_BETA = [0.5, -0.3, 0.2, 0, 0.1];
const MEAN_DAYS_TO_RUST = 60;
const LAST_DAY = 140;
const TARGET_MS = 50;

type Variant = "plain" | "strata" | "entry";

/** Exponential latent days to rust with hazard ∝ exp(β'x), seen in whole days, censored at LAST_DAY. */
export function generateCoxRows(variant: Variant, seed = "cox-bench"): CoxRow[] {
  const rng = createRng(seed);
  const rows: CoxRow[] = [];
  for (let i = 0; i < ROWS; i++) {
    const x = Array.from({ length: COVARIATES }, (_, k) => (k === 0 ? (rng() < 0.5 ? 1 : 0) : randomNormal(rng)));
    const risk = Math.exp(x.reduce((s, v, k) => s + v * TRUE_BETA[k], 0));
    const rustDay = Math.ceil((-Math.log(1 - rng()) * MEAN_DAYS_TO_RUST) / risk);
    const row: CoxRow = { time: Math.min(rustDay, LAST_DAY), event: rustDay <= LAST_DAY, x };
    if (variant === "strata") row.stratum = `jar ${i % STRATA}`;
    // A third of the specimens were moved into this placement part-way through.
    if (variant === "entry" && i % 3 === 0) row.entry = Math.floor(rng() * row.time) - 0.5;
    rows.push(row);
  }
  return rows;
}

export interface CoxBenchResult {
  name: string;
  runs: number;
  medianMs: number;
  minMs: number;
  maxMs: number;
  /** Median CPU time of this process per fit: on a shared machine the wall time also counts waiting. */
  medianCpuMs: number;
  iterations: number;
  targetMs: number;
  withinTarget: boolean;
}

function time(variant: Variant, runs: number): CoxBenchResult {
  const rows = generateCoxRows(variant);
  for (let i = 0; i < 5; i++) coxRegression(rows); // warm-up so the JIT has compiled the hot loops
  const times: number[] = [];
  const cpuTimes: number[] = [];
  let sink = 0;
  let iterations = 0;
  for (let i = 0; i < runs; i++) {
    const cpu0 = process.cpuUsage();
    const t0 = performance.now();
    const fit = coxRegression(rows);
    times.push(performance.now() - t0);
    const cpu = process.cpuUsage(cpu0);
    cpuTimes.push((cpu.user + cpu.system) / 1000);
    sink += fit.logLik;
    iterations = fit.iterations;
  }
  if (!Number.isFinite(sink)) throw new Error("cox bench produced a non-finite result");
  times.sort((a, b) => a - b);
  cpuTimes.sort((a, b) => a - b);
  const medianMs = times[Math.floor(times.length / 2)];
  const label = { plain: "", strata: `, ${STRATA} strata`, entry: ", a third with delayed entry" }[variant];
  return {
    name: `cox: Efron, ${ROWS.toLocaleString("en")} rows × ${COVARIATES} covariates${label}`,
    runs,
    medianMs,
    minMs: times[0],
    maxMs: times[times.length - 1],
    medianCpuMs: cpuTimes[Math.floor(cpuTimes.length / 2)],
    iterations,
    targetMs: TARGET_MS,
    withinTarget: medianMs < TARGET_MS,
  };
}

export function runCoxBench(runs = 31): CoxBenchResult[] {
  return (["plain", "strata", "entry"] as const).map((v) => time(v, runs));
}

if (/cox-bench\.[cm]?[jt]s$/.test(process.argv[1] ?? "")) {
  for (const r of runCoxBench()) {
    console.log(r.name);
    console.log(
      `median ${r.medianMs.toFixed(2)} ms (min ${r.minMs.toFixed(2)}, max ${r.maxMs.toFixed(2)}, ${r.runs} runs, ` +
        `${r.iterations} Newton steps; median CPU ${r.medianCpuMs.toFixed(2)} ms); target < ${r.targetMs} ms: ${r.withinTarget ? "met" : "NOT met"}`,
    );
  }
}
