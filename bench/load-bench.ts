// Load on the large demo (db/seed-large.ts): the main pages and list requests at 50 concurrent
// connections for LOAD_SECONDS each (default 30), signed in as the demo lead. Prints p50/p95/p99 over
// every response's time (bench/support.ts), requests/s and errors.
// Target (issue: proof under load): zero errors, p95 < 150 ms for the lists — the due list as the due
// page asks for it and the specimen table's page flips (which fetch /api/specimens). Pages are printed too.
import { and, eq, like } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { DUE_PAGE_SIZE } from "@/lib/schedule/status";
import { signedInClient, APP_URL } from "../tests/support/http";
import { loadRun } from "./support";

const seconds = Number(process.env.LOAD_SECONDS ?? 30);
const connections = Number(process.env.LOAD_CONNECTIONS ?? 50);
const LIST_TARGET_MS = 150;

export type LoadRow = { name: string; list: boolean; p50: number; p95: number; p99: number; rps: number; errors: number; non2xx: number; requests: number };

async function hit(name: string, path: string, cookie: string, list: boolean): Promise<LoadRow> {
  const r = await loadRun({ url: `${APP_URL}${path}`, connections, duration: seconds, headers: { cookie } });
  return { name, list, p50: Math.round(r.p50), p95: Math.round(r.p95), p99: Math.round(r.p99), rps: r.rps, errors: r.errors, non2xx: r.non2xx, requests: r.requests };
}

export async function runLoadBench() {
  const client = await signedInClient("lead@tarrow.example", "rustline-demo-1");
  const [logger] = await db.select({ id: s.chambers.id }).from(s.chambers).where(like(s.chambers.name, "Jar L%"));
  const [demoTrial] = await db.select({ id: s.trials.id }).from(s.trials).where(and(like(s.trials.title, "Storage humidity%"), eq(s.trials.status, "running")));
  const weekAhead = encodeURIComponent(new Date(Date.now() + 7 * 86_400_000).toISOString());
  const targets: [string, string, boolean][] = [
    ["due list (as /due asks)", `/api/inspections?status=open&pageSize=${DUE_PAGE_SIZE}&before=${weekAhead}`, true],
    ["specimen table flip", "/api/specimens?pageSize=50&page=2", true],
    ["lab home page", "/", false],
    ["specimens page (HTML)", "/specimens?page=1&pageSize=50", false],
    ["chamber chart page", `/chambers/${logger?.id}?period=all`, false],
    ["analysis endpoint", `/api/trials/${demoTrial?.id}/analysis?groupBy=treatment`, false],
  ];
  const rows: LoadRow[] = [];
  for (const [name, path, list] of targets) {
    const row = await hit(name, path, client.cookie, list);
    rows.push(row);
    const verdict = list ? (row.p95 < LIST_TARGET_MS && row.errors + row.non2xx === 0 ? "  target met" : "  TARGET NOT MET") : "";
    console.log(`${name.padEnd(24)} p50 ${String(row.p50).padStart(5)} ms  p95 ${String(row.p95).padStart(5)} ms  p99 ${String(row.p99).padStart(5)} ms  ${String(row.rps).padStart(5)} req/s  errors ${row.errors}  non-2xx ${row.non2xx}${verdict}`);
  }
  return rows;
}

if (process.argv[1]?.endsWith("load-bench.ts")) {
  console.log(`load: ${connections} connections × ${seconds} s per target against ${APP_URL} (target: 0 errors, p95 < ${LIST_TARGET_MS} ms for lists)`);
  runLoadBench()
    .then(() => closeDb())
    .catch(async (e) => {
      console.error(e);
      await closeDb();
      process.exit(1);
    });
}
