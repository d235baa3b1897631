// npm run bench — start the local services, use a throwaway database (rustline_bench, reset each run),
// and run every benchmark in bench/, each printing its own figures. Nothing here asserts a time.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { spawn } from "node:child_process";
import { assertPortFree, bin, buildIfChanged, ensureDependencies, root, run, waitForHttp } from "./lib/bootstrap.mjs";

ensureDependencies();
const { localEnv } = await import("./lib/env.mjs");
const { startServices, stopServices } = await import("./lib/services.mjs");

const base = localEnv("test");
const port = process.env.BENCH_APP_PORT ?? "3220";
const appUrl = `http://localhost:${port}`;
const env = {
  ...process.env,
  ...base,
  DATABASE_URL: base.DATABASE_URL.replace(/\/rustline_test$/, "/rustline_bench_test"),
  NODE_ENV: "production",
  PORT: port,
  APP_URL: appUrl,
  NEXTAUTH_URL: appUrl,
  PG_POOL_MAX: process.env.PG_POOL_MAX ?? "20",
};
let app = null;
const only = process.argv.slice(2);
let started = [];
let failed = 0;
try {
  await assertPortFree(port, "BENCH_APP_PORT");
  started = await startServices(env, { databases: ["rustline", "rustline_test", "rustline_bench_test"] });
  run(bin("tsx"), ["db/migrate.ts", "--reset"], env, "resetting and migrating the bench database");
  run(bin("tsx"), ["db/seed.ts"], env, "seeding the demo lab");
  run(bin("tsx"), ["db/seed-large.ts"], env, "adding the large demo (5,000 specimens, 100,000 inspections, 500,000 readings)");
  buildIfChanged(env);
  app = spawn(process.execPath, ["scripts/serve.mjs"], { cwd: root, env, stdio: ["ignore", "ignore", "inherit"] });
  await waitForHttp(`${appUrl}/sign-in`);
  env.APP_PID = String(app.pid); // lets benches read the app server's CPU time
  const files = fs.readdirSync(path.join(root, "bench")).filter((f) => f.endsWith("-bench.ts") && (!only.length || only.some((o) => f.includes(o)))).sort();
  for (const f of files) {
    console.log(`\n=== ${f} ===`);
    const r = spawnSync(process.execPath, ["--conditions=react-server", "--import", "tsx", path.join("bench", f)], { cwd: root, env, stdio: "inherit" });
    if (r.status !== 0) {
      failed++;
      console.log(`(${f} exited with ${r.status})`);
    }
  }
} catch (err) {
  console.error(`\n[bench] ${err instanceof Error ? err.message : err}`);
  failed++;
} finally {
  app?.kill("SIGTERM");
  await stopServices(started);
}
process.exit(failed ? 1 : 0);
