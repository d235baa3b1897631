// Load on the large demo (db/seed-large.ts): the main pages and endpoints at 50 concurrent connections
// for LOAD_SECONDS each (default 30), signed in as the demo lead. Prints p50/p95/p99 and errors.
import autocannon from "autocannon";
import { and, eq, like } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { signedInClient, APP_URL } from "../tests/support/http";

const seconds = Number(process.env.LOAD_SECONDS ?? 30);
const connections = Number(process.env.LOAD_CONNECTIONS ?? 50);

type Row = { name: string; p50: number; p95: number; p99: number; rps: number; errors: number; non2xx: number };

async function hit(name: string, path: string, cookie: string): Promise<Row> {
  const r = await autocannon({ url: `${APP_URL}${path}`, connections, duration: seconds, headers: { cookie } });
  // autocannon reports latency percentiles in ms; p95 is not among its defaults, so take p97.5 as the upper bound if absent.
  const lat = r.latency as unknown as Record<string, number>;
  return { name, p50: lat.p50, p95: lat.p95 ?? lat.p97_5, p99: lat.p99, rps: Math.round(r.requests.average), errors: r.errors + r.timeouts, non2xx: r.non2xx };
}

export async function runLoadBench() {
  const client = await signedInClient("lead@tarrow.example", "rustline-demo-1");
  const [logger] = await db.select({ id: s.chambers.id }).from(s.chambers).where(like(s.chambers.name, "Jar L%"));
  const [demoTrial] = await db.select({ id: s.trials.id }).from(s.trials).where(and(like(s.trials.title, "Storage humidity%"), eq(s.trials.status, "running")));
  const targets: [string, string][] = [
    ["lab home", "/"],
    ["due list (API)", "/api/inspections?status=open&pageSize=50"],
    ["specimen table", "/specimens?page=1&pageSize=50"],
    ["chamber chart", `/chambers/${logger?.id}?period=all`],
    ["analysis endpoint", `/api/trials/${demoTrial?.id}/analysis?groupBy=treatment`],
  ];
  const rows: Row[] = [];
  for (const [name, path] of targets) {
    rows.push(await hit(name, path, client.cookie));
    const last = rows[rows.length - 1];
    console.log(`${name.padEnd(20)} p50 ${String(last.p50).padStart(5)} ms  p95 ${String(last.p95).padStart(5)} ms  p99 ${String(last.p99).padStart(5)} ms  ${String(last.rps).padStart(5)} req/s  errors ${last.errors}  non-2xx ${last.non2xx}`);
  }
  return rows;
}

if (process.argv[1]?.endsWith("load-bench.ts")) {
  console.log(`load: ${connections} connections × ${seconds} s per target against ${APP_URL} (target: 0 errors, p95 < 150 ms for lists)`);
  runLoadBench()
    .then(() => closeDb())
    .catch(async (e) => {
      console.error(e);
      await closeDb();
      process.exit(1);
    });
}
