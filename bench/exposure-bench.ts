// Chamber exposure per placement (loadTrialExposure, as the comparison and the report load it) over
// the trials in DATABASE_URL (the demo trials and one large-demo trial under npm run bench): time per load and a
// fingerprint of the results, so a change of the query can be shown to leave them unchanged.
// Run: node --conditions=react-server --import tsx bench/exposure-bench.ts
import crypto from "node:crypto";
import pg from "pg";
import { pathToFileURL } from "node:url";
import { max } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { loadTrialExposure } from "@/db/queries/exposure";
import { DEFAULT_THRESHOLDS_RH_PERCENT } from "@/lib/climate/exposure";
import { percentiles } from "./support";

export type ExposureFigures = {
  trialTitle: string; placements: number; readings: number; p50Ms: number; p95Ms: number; runs: number; fingerprint: string;
  queriesPerLoad: number; rowsPerLoad: number; nodeCpuMsPerLoad: number;
};

/** Queries sent and rows received through node-postgres (wall times on a shared machine vary; these do not). */
const traffic = { queries: 0, rows: 0 };
const query = pg.Client.prototype.query as (...args: unknown[]) => unknown;
(pg.Client.prototype as unknown as { query: (...args: unknown[]) => unknown }).query = function (this: pg.Client, ...args: unknown[]) {
  const out = query.apply(this, args);
  traffic.queries++;
  if (out instanceof Promise) out.then((res: { rows?: unknown[] }) => void (traffic.rows += res?.rows?.length ?? 0), () => undefined);
  return out;
};

export async function runExposureBench(opts: { runs?: number } = {}): Promise<ExposureFigures[]> {
  const runs = opts.runs ?? 15;
  const all = await db.select({ id: s.trials.id, labId: s.trials.labId, title: s.trials.title, startedAt: s.trials.startedAt, concludedAt: s.trials.concludedAt }).from(s.trials).orderBy(s.trials.title);
  // Under npm run bench the large demo adds 50 alike "Load trial" trials: one of them is enough.
  const load = all.filter((t) => t.title.startsWith("Load trial"));
  const trials = [...all.filter((t) => !t.title.startsWith("Load trial")), ...load.slice(0, 1)];
  // A fixed "now" (the latest reading) so open placements end at the same time in every run and version.
  const [{ latest }] = await db.select({ latest: max(s.readings.takenAt) }).from(s.readings);
  const now = latest ?? new Date(0);
  const out: ExposureFigures[] = [];
  for (const t of trials) {
    const load = () => loadTrialExposure({ labId: t.labId, trial: t, thresholdsRhPercent: DEFAULT_THRESHOLDS_RH_PERCENT, now });
    const rows = await load(); // warm-up (prepared statements, JIT of the reduction)
    const times: number[] = [];
    Object.assign(traffic, { queries: 0, rows: 0 });
    const cpu0 = process.cpuUsage();
    for (let i = 0; i < runs; i++) {
      const t0 = performance.now();
      await load();
      times.push(performance.now() - t0);
    }
    const cpu = process.cpuUsage(cpu0);
    const p = percentiles(times);
    const fingerprint = crypto.createHash("sha256").update(JSON.stringify(rows)).digest("hex").slice(0, 16);
    out.push({ trialTitle: t.title, placements: rows.length, readings: rows.reduce((n, r) => n + r.exposure.readings, 0), p50Ms: p.p50, p95Ms: p.p95, runs, fingerprint,
      queriesPerLoad: traffic.queries / runs, rowsPerLoad: traffic.rows / runs, nodeCpuMsPerLoad: (cpu.user + cpu.system) / 1000 / runs });
  }
  return out;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  runExposureBench()
    .then((figures) => {
      if (!figures.length) console.log("no trials in this database (seed the demo first)");
      for (const f of figures) {
        console.log(`exposure of "${f.trialTitle}": ${f.placements} placements, ${f.readings.toLocaleString("en")} readings summed over placements: p50 ${f.p50Ms.toFixed(0)} ms, p95 ${f.p95Ms.toFixed(0)} ms (${f.runs} runs); per load ${f.queriesPerLoad} queries, ${f.rowsPerLoad.toLocaleString("en")} rows, node CPU ${f.nodeCpuMsPerLoad.toFixed(0)} ms; results ${f.fingerprint}`);
      }
    })
    .catch((err) => {
      console.error(err);
      process.exitCode = 1;
    })
    .finally(() => closeDb());
}
