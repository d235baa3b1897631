// A PostgreSQL cluster of the project's own under .data/postgres, run by Debian's server binaries.
// PostgreSQL refuses to run as root, so when we are root the cluster belongs to the `postgres` system user.
import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import pg from "pg";
import { dataDir } from "./env.mjs";

const clusterDir = path.join(dataDir, "postgres");
const isRoot = process.getuid?.() === 0;

function findBinDir() {
  const base = "/usr/lib/postgresql";
  if (fs.existsSync(base)) {
    const versions = fs.readdirSync(base).filter((v) => fs.existsSync(path.join(base, v, "bin", "pg_ctl")));
    versions.sort((a, b) => Number(b) - Number(a));
    if (versions.length) return path.join(base, versions[0], "bin");
  }
  return null;
}

function ensureServerInstalled() {
  let bin = findBinDir();
  if (bin) return bin;
  const cmd = "apt-get update && apt-get install -y postgresql";
  if (!isRoot) {
    throw new Error(`PostgreSQL server is not installed. Install Debian's package, then run again:\n  sudo sh -c '${cmd}'`);
  }
  console.log("[postgres] server not installed; installing Debian's postgresql package…");
  execFileSync("sh", ["-c", `DEBIAN_FRONTEND=noninteractive ${cmd} >/dev/null`], { stdio: "inherit" });
  bin = findBinDir();
  if (!bin) throw new Error("PostgreSQL install finished but no pg_ctl was found under /usr/lib/postgresql");
  return bin;
}

// Run a server binary as the cluster's owner.
function runAsOwner(binary, args, opts = {}) {
  const full = isRoot ? ["runuser", ["-u", "postgres", "--", binary, ...args]] : [binary, args];
  return spawnSync(full[0], full[1], { encoding: "utf8", ...opts });
}

// The postgres user must be able to reach the project folder; a fresh clone under a 0700 temp dir is not.
function ensureTraversable(dir) {
  if (!isRoot) return;
  const probe = spawnSync("runuser", ["-u", "postgres", "--", "test", "-x", dir]);
  if (probe.status === 0) return;
  let cur = dir;
  const changed = [];
  while (cur !== "/") {
    const st = fs.statSync(cur);
    if ((st.mode & 0o001) === 0) {
      fs.chmodSync(cur, st.mode | 0o001);
      changed.push(cur);
    }
    cur = path.dirname(cur);
  }
  if (changed.length) console.log(`[postgres] allowed the postgres user to traverse: ${changed.join(", ")}`);
}

export function clusterSocketDir() {
  return clusterDir;
}

async function portAnswers(port) {
  const client = new pg.Client({ host: clusterDir, port, user: "postgres", database: "postgres" });
  try {
    await client.connect();
    await client.end();
    return "ours";
  } catch {
    // Something else may hold the TCP port.
    const net = await import("node:net");
    return new Promise((resolve) => {
      const s = net.connect({ host: "127.0.0.1", port }, () => {
        s.destroy();
        resolve("other");
      });
      s.on("error", () => resolve("free"));
    });
  }
}

/** Start the cluster (initialising it on first use). Returns true when this call started it. */
export async function startPostgres({ port }) {
  const bin = ensureServerInstalled();
  fs.mkdirSync(dataDir, { recursive: true });
  ensureTraversable(dataDir);
  const state = await portAnswers(port);
  if (state === "ours") return false;
  if (state === "other") {
    throw new Error(`port ${port} is taken by another program; set RUSTLINE_PG_PORT to a free port`);
  }
  if (!fs.existsSync(path.join(clusterDir, "PG_VERSION"))) {
    fs.mkdirSync(clusterDir, { recursive: true });
    if (isRoot) execFileSync("chown", ["postgres:postgres", clusterDir]);
    fs.chmodSync(clusterDir, 0o700);
    const r = runAsOwner(path.join(bin, "initdb"), [
      "-D", clusterDir, "-U", "postgres", "--auth-local=trust", "--auth-host=scram-sha-256",
      "--encoding=UTF8", "--locale=C.UTF-8",
    ]);
    if (r.status !== 0) throw new Error(`initdb failed:\n${r.stderr || r.stdout}`);
    console.log("[postgres] initialised cluster in .data/postgres");
  }
  const log = path.join(clusterDir, "server.log");
  const opts = `-c listen_addresses=127.0.0.1 -p ${port} -k ${clusterDir} -c max_connections=200 -c fsync=on`;
  const r = runAsOwner(path.join(bin, "pg_ctl"), ["-D", clusterDir, "-l", log, "-o", opts, "-w", "-t", "60", "start"]);
  if (r.status !== 0) {
    const tail = fs.existsSync(log) ? fs.readFileSync(log, "utf8").split("\n").slice(-15).join("\n") : "";
    throw new Error(`PostgreSQL did not start:\n${r.stderr || r.stdout}\n${tail}`);
  }
  return true;
}

export function stopPostgres() {
  const bin = findBinDir();
  if (!bin || !fs.existsSync(path.join(clusterDir, "postmaster.pid"))) return;
  runAsOwner(path.join(bin, "pg_ctl"), ["-D", clusterDir, "-m", "fast", "-w", "stop"]);
}

/** Create the app role and the named databases when missing (idempotent). */
export async function ensureDatabases({ port, databases }) {
  const admin = new pg.Client({ host: clusterDir, port, user: "postgres", database: "postgres" });
  await admin.connect();
  try {
    const role = await admin.query("select 1 from pg_roles where rolname = 'rustline'");
    if (!role.rowCount) await admin.query("create role rustline login password 'rustline' createdb");
    for (const db of databases) {
      const exists = await admin.query("select 1 from pg_database where datname = $1", [db]);
      if (!exists.rowCount) await admin.query(`create database "${db}" owner rustline`);
    }
  } finally {
    await admin.end();
  }
}
