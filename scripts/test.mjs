// npm test — the same set-up as npm start (test database and bucket), then every test:
// type check, unit, integration (real PostgreSQL, S3 fake, SMTP fake) and browser tests against a built app.
import { spawn, spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { assertPortFree, bin, buildIfChanged, ensureChromium, ensureDependencies, root, run, waitForHttp } from "./lib/bootstrap.mjs";

ensureDependencies();
const { localEnv } = await import("./lib/env.mjs");
const { startServices, stopServices } = await import("./lib/services.mjs");

const testPort = process.env.TEST_APP_PORT ?? "3210";
const appUrl = `http://localhost:${testPort}`;
const env = {
  ...process.env,
  ...localEnv("test"),
  PORT: testPort,
  APP_URL: appUrl,
  NEXTAUTH_URL: appUrl,
  NODE_ENV: "production",
  CHROMIUM_PATH: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
};
const args = process.argv.slice(2);
let started = [];
const children = [];
let exitCode = 1;

try {
  const testDb = new URL(env.DATABASE_URL).pathname.slice(1);
  await assertPortFree(testPort, "TEST_APP_PORT");
  started = await startServices(env, { databases: ["rustline", "rustline_test", testDb] });
  run(bin("tsx"), ["db/migrate.ts", "--reset"], env, "resetting and migrating the test database");
  run(bin("tsx"), ["db/seed.ts"], env, "seeding the demo lab into the test database");
  run(bin("tsc"), ["--noEmit", "-p", "."], env, "type-checking");
  buildIfChanged(env);
  ensureChromium();
  const worker = spawn(process.execPath, ["--conditions=react-server", "--import", "tsx", "scripts/worker.ts"], { cwd: root, env: { ...env, WORKER_POLL_S: "1", REMINDER_RETRY_DELAY_S: "1" }, stdio: ["ignore", "inherit", "inherit"] });
  children.push(worker);
  const next = spawn(process.execPath, ["scripts/serve.mjs"], { cwd: root, env: { ...env, PORT: testPort }, stdio: ["ignore", "ignore", "inherit"] });
  children.push(next);
  await waitForHttp(`${appUrl}/sign-in`);
  const report = path.join(root, ".data", "vitest-report.json");
  const r = spawnSync(bin("vitest"), ["run", "--reporter=default", "--reporter=json", `--outputFile.json=${report}`, ...args], {
    cwd: root, env, stdio: "inherit",
  });
  exitCode = r.status ?? 1;
  if (fs.existsSync(report)) {
    const j = JSON.parse(fs.readFileSync(report, "utf8"));
    console.log(`\ntests: ${j.numPassedTests} passed, ${j.numFailedTests} failed`);
  }
} catch (err) {
  console.error(`\n[test] ${err instanceof Error ? err.message : err}`);
  exitCode = 1;
} finally {
  for (const c of children) c.kill("SIGTERM");
  await new Promise((r) => setTimeout(r, 500));
  await stopServices(started);
}
process.exit(exitCode);
