// Stop and start the project's local services from a test (fault tests), the same way npm test does.
import fs from "node:fs";
import path from "node:path";
// @ts-expect-error plain ESM scripts without type declarations
import { startServices } from "../../scripts/lib/services.mjs";
// @ts-expect-error plain ESM scripts without type declarations
import { startPostgres, stopPostgres } from "../../scripts/lib/postgres.mjs";
// @ts-expect-error plain ESM scripts without type declarations
import { localEnv } from "../../scripts/lib/env.mjs";
import { repoRoot } from "./s3";

export function stopMailFake() {
  const pidFile = path.join(repoRoot, ".data", "run", "mail-fake.pid");
  const pid = Number(fs.readFileSync(pidFile, "utf8"));
  process.kill(pid, "SIGTERM");
  fs.rmSync(pidFile, { force: true });
}

export async function startMailFake() {
  const env = { ...process.env, ...localEnv("test") };
  await startServices({ ...env, DATABASE_URL: "postgres://external/none", S3_ENDPOINT: "http://external" }, { databases: [] });
}

export function stopDatabase() {
  stopPostgres();
}

export async function startDatabase() {
  await startPostgres({ port: Number(process.env.RUSTLINE_PG_PORT ?? 54329) });
}

export function stopS3Fake() {
  const pidFile = path.join(repoRoot, ".data", "run", "s3-fake.pid");
  const pid = Number(fs.readFileSync(pidFile, "utf8"));
  process.kill(pid, "SIGTERM");
  fs.rmSync(pidFile, { force: true });
}

export async function startS3Fake() {
  const env = { ...process.env, ...localEnv("test") };
  await startServices({ ...env, DATABASE_URL: "postgres://external/none", SMTP_URL: "smtp://external" }, { databases: [] });
}
