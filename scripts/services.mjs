// npm run services — only the local services (PostgreSQL, the S3 fake, the mail fake) on loopback,
// with both databases migrated, for running `npm run dev` or single test files by hand. Ctrl-C stops
// what this started; services that were already running are left alone.
import { bin, ensureDependencies, run } from "./lib/bootstrap.mjs";

ensureDependencies();
const { localEnv } = await import("./lib/env.mjs");
const { startServices, stopServices } = await import("./lib/services.mjs");

const env = { ...process.env, ...localEnv("app") };
let started = [];
async function shutdown(code) {
  await stopServices(started);
  process.exit(code);
}
process.on("SIGINT", () => shutdown(0));
process.on("SIGTERM", () => shutdown(0));

try {
  started = await startServices(env, { databases: ["rustline", "rustline_test"] });
  run(bin("tsx"), ["db/migrate.ts"], env, "migrating the app database");
  run(bin("tsx"), ["db/migrate.ts"], { ...env, ...localEnv("test") }, "migrating the test database");
  console.log(`\nServices up: PostgreSQL ${env.DATABASE_URL.replace(/:[^:@/]+@/, ":…@")}, S3 fake ${env.S3_ENDPOINT}, mail fake ${env.SMTP_URL}.`);
  console.log('Use them from another shell with: eval "$(node scripts/print-env.mjs test)". Ctrl-C stops them.\n');
  await new Promise(() => {});
} catch (err) {
  console.error(`\n[services] ${err instanceof Error ? err.message : err}`);
  await shutdown(1);
}
