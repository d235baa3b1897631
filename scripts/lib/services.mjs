// Start, check and stop the local services: PostgreSQL, the S3 fake and the mail fake.
// Idempotent: a service of ours that already answers is reused (and left running on exit);
// a port held by some other program stops us with a message naming the variable to change.
import { spawn } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import { dataDir, root } from "./env.mjs";
import { ensureDatabases, startPostgres, stopPostgres } from "./postgres.mjs";

const runDir = path.join(dataDir, "run");
const logDir = path.join(dataDir, "logs");

function connectBanner(port, timeoutMs = 1500) {
  return new Promise((resolve) => {
    const s = net.connect({ host: "127.0.0.1", port });
    let buf = "";
    const done = (v) => {
      s.destroy();
      resolve(v);
    };
    s.setTimeout(timeoutMs, () => done({ open: true, banner: buf }));
    s.on("data", (d) => {
      buf += d.toString();
      if (buf.includes("\n")) done({ open: true, banner: buf });
    });
    s.on("error", () => done({ open: false, banner: "" }));
  });
}

async function s3State(port) {
  try {
    const res = await fetch(`http://127.0.0.1:${port}/__health`, { signal: AbortSignal.timeout(1500) });
    const body = await res.text();
    if (body.includes("rustline-s3-fake")) return "ours";
    return "other";
  } catch {
    const { open } = await connectBanner(port, 500);
    return open ? "other" : "free";
  }
}

async function mailState(port) {
  const { open, banner } = await connectBanner(port);
  if (!open) return "free";
  return banner.includes("rustline-mail-fake") ? "ours" : "other";
}

async function waitFor(check, what, logFile, ms = 30_000) {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    if ((await check()) === "ours") return;
    await new Promise((r) => setTimeout(r, 200));
  }
  const tail = fs.existsSync(logFile) ? fs.readFileSync(logFile, "utf8").split("\n").slice(-15).join("\n") : "";
  throw new Error(`${what} did not become ready within ${ms / 1000} s. Log ${logFile}:\n${tail}`);
}

function spawnDetached(name, args, env) {
  fs.mkdirSync(runDir, { recursive: true });
  fs.mkdirSync(logDir, { recursive: true });
  const logFile = path.join(logDir, `${name}.log`);
  const out = fs.openSync(logFile, "a");
  const child = spawn(process.execPath, args, { cwd: root, env, detached: true, stdio: ["ignore", out, out] });
  child.unref();
  fs.writeFileSync(path.join(runDir, `${name}.pid`), String(child.pid));
  return logFile;
}

function killPidFile(name) {
  const file = path.join(runDir, `${name}.pid`);
  if (!fs.existsSync(file)) return;
  const pid = Number(fs.readFileSync(file, "utf8"));
  try {
    process.kill(pid, "SIGTERM");
  } catch {
    /* already gone */
  }
  fs.rmSync(file, { force: true });
}

/**
 * Start every service; returns the list of names this call started, for stopServices.
 * `env` is the full environment (from localEnv) the services and the app share.
 */
export async function startServices(env, { databases }) {
  const started = [];
  const pgPort = Number(env.RUSTLINE_PG_PORT);
  const usesLocalPg = env.DATABASE_URL.includes(`127.0.0.1:${pgPort}`);
  if (usesLocalPg) {
    if (await startPostgres({ port: pgPort })) started.push("postgres");
    await ensureDatabases({ port: pgPort, databases });
    console.log(`[services] PostgreSQL on 127.0.0.1:${pgPort}${started.includes("postgres") ? "" : " (already running)"}`);
  }

  const s3Port = Number(env.S3_PORT);
  if (env.S3_ENDPOINT.includes(`127.0.0.1:${s3Port}`)) {
    const st = await s3State(s3Port);
    if (st === "other") throw new Error(`port ${s3Port} is taken by another program; set S3_PORT to a free port`);
    if (st === "free") {
      const log = spawnDetached("s3-fake", [path.join(root, "docker-free-minio-fake", "server.mjs")], env);
      await waitFor(() => s3State(s3Port), "S3 fake", log);
      started.push("s3-fake");
    }
    console.log(`[services] S3 fake on http://127.0.0.1:${s3Port}${st === "ours" ? " (already running)" : ""}`);
  }

  const mailPort = Number(env.MAIL_PORT);
  if (env.SMTP_URL.includes(`127.0.0.1:${mailPort}`)) {
    const st = await mailState(mailPort);
    if (st === "other") throw new Error(`port ${mailPort} is taken by another program; set MAIL_PORT to a free port`);
    if (st === "free") {
      const log = spawnDetached("mail-fake", [path.join(root, "scripts", "mail-fake.mjs")], env);
      await waitFor(() => mailState(mailPort), "mail fake", log);
      started.push("mail-fake");
    }
    console.log(`[services] mail fake on smtp://127.0.0.1:${mailPort}${st === "ours" ? " (already running)" : ""}`);
  }
  return started;
}

export async function stopServices(names) {
  for (const name of names) {
    if (name === "postgres") stopPostgres();
    else killPidFile(name);
  }
  if (names.length) console.log(`[services] stopped ${names.join(", ")}`);
}

export async function stopAll() {
  await stopServices(["s3-fake", "mail-fake", "postgres"]);
}
