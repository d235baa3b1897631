// npm start — install what is missing, start the local services, migrate, seed the demo, build, serve.
import { spawn } from "node:child_process";
import { assertPortFree, bin, buildIfChanged, ensureDependencies, root, run } from "./lib/bootstrap.mjs";

ensureDependencies();
const { localEnv } = await import("./lib/env.mjs");
const { startServices, stopServices } = await import("./lib/services.mjs");

let env;
try {
  env = { ...process.env, ...localEnv("app"), NODE_ENV: "production" };
} catch (err) {
  // Refuse before starting anything: a missing or weak NEXTAUTH_SECRET outside demo mode (scripts/lib/secret.mjs).
  console.error(`\n[start] ${err instanceof Error ? err.message : err}`);
  process.exit(1);
}
let started = [];
const children = [];
let stopping = false;

async function shutdown(code) {
  if (stopping) return;
  stopping = true;
  for (const c of children) c.kill("SIGTERM");
  await new Promise((r) => setTimeout(r, 500));
  await stopServices(started);
  process.exit(code);
}
process.on("SIGINT", () => shutdown(0));
process.on("SIGTERM", () => shutdown(0));

try {
  await assertPortFree(env.PORT, "PORT");
  started = await startServices(env, { databases: ["rustline", "rustline_test"] });
  run(bin("tsx"), ["db/migrate.ts"], env, "migrating the database");
  run(bin("tsx"), ["db/seed.ts", "--if-empty"], env, "seeding the demo lab (only when the database is empty)");
  buildIfChanged(env);
  const worker = spawn(process.execPath, ["--conditions=react-server", "--import", "tsx", "scripts/worker.ts"], { cwd: root, env, stdio: "inherit" });
  children.push(worker);
  const next = spawn(process.execPath, ["scripts/serve.mjs"], { cwd: root, env, stdio: "inherit" });
  children.push(next);
  console.log(`\nRustline: ${env.APP_URL}  (demo logins in README.md; Ctrl-C stops everything this started)\n`);
  next.on("exit", (code) => shutdown(code ?? 0));
} catch (err) {
  console.error(`\n[start] ${err instanceof Error ? err.message : err}`);
  await shutdown(1);
}
