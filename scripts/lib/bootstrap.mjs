// Steps shared by `npm start` and `npm test`; only Node built-ins here, since it runs before npm install.
import { execFileSync, spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..", "..");

/** Install dependencies when node_modules is missing or older than the lock file. */
export function ensureDependencies() {
  const lock = path.join(root, "package-lock.json");
  const stamp = path.join(root, "node_modules", ".package-lock.json");
  const stale = !fs.existsSync(stamp) || fs.statSync(lock).mtimeMs > fs.statSync(stamp).mtimeMs + 1000;
  if (!stale) return;
  console.log("[setup] installing dependencies (npm ci)…");
  // --include=dev: the local stand-ins (S3 fake, mail fake) are devDependencies,
  // and npm would leave them out when the shell has NODE_ENV=production.
  const r = spawnSync("npm", ["ci", "--include=dev", "--no-audit", "--no-fund"], { cwd: root, stdio: "inherit" });
  if (r.status !== 0) throw new Error("npm ci failed; see the output above");
}

export function bin(name) {
  return path.join(root, "node_modules", ".bin", name);
}

export function run(cmd, args, env, label) {
  console.log(`[setup] ${label}`);
  const r = spawnSync(cmd, args, { cwd: root, env, stdio: "inherit" });
  if (r.status !== 0) throw new Error(`${label} failed (exit ${r.status})`);
}

const sourceDirs = ["app", "components", "db", "lib", "storage", "experiments", "public"];
const sourceFiles = ["next.config.ts", "tailwind.config.ts", "postcss.config.mjs", "package-lock.json", "tsconfig.json"];

function walk(dir, out) {
  if (!fs.existsSync(dir)) return;
  for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) walk(p, out);
    else out.push(p);
  }
}

/** Hash of the sources the Next build depends on, so we rebuild only when they changed. */
export function sourceHash() {
  const files = [];
  for (const d of sourceDirs) walk(path.join(root, d), files);
  for (const f of sourceFiles) if (fs.existsSync(path.join(root, f))) files.push(path.join(root, f));
  files.sort();
  const h = crypto.createHash("sha256");
  for (const f of files) h.update(f).update(fs.readFileSync(f));
  return h.digest("hex");
}

export function buildIfChanged(env) {
  const stampFile = path.join(root, ".next", "rustline-source-hash");
  const hash = sourceHash();
  const built = fs.existsSync(stampFile) && fs.readFileSync(stampFile, "utf8") === hash
    && fs.existsSync(path.join(root, ".next", "BUILD_ID"));
  if (built) {
    console.log("[setup] build is up to date");
    return;
  }
  run(bin("next"), ["build"], { ...env, NEXT_TELEMETRY_DISABLED: "1" }, "building the app (next build, about a minute)…");
  fs.writeFileSync(stampFile, hash);
}

export function ensureChromium() {
  if (fs.existsSync("/usr/bin/chromium")) return "/usr/bin/chromium";
  if (process.getuid?.() !== 0) {
    throw new Error("The browser tests need Debian's Chromium. Install it, then run again:\n  sudo apt-get install -y chromium");
  }
  console.log("[setup] installing Debian's chromium for the browser tests…");
  execFileSync("sh", ["-c", "apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null"], { stdio: "inherit" });
  return "/usr/bin/chromium";
}

export async function waitForHttp(url, ms = 60_000) {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    try {
      const res = await fetch(url, { redirect: "manual", signal: AbortSignal.timeout(2000) });
      if (res.status < 500) return;
    } catch {
      /* not yet */
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error(`${url} did not answer within ${ms / 1000} s`);
}

/** Refuse to start on a port something else already holds (a stale server would answer our checks). */
export async function assertPortFree(port, variable) {
  const net = await import("node:net");
  const busy = await new Promise((resolve) => {
    const s = net.connect({ host: "127.0.0.1", port: Number(port) }, () => {
      s.destroy();
      resolve(true);
    });
    s.on("error", () => resolve(false));
  });
  if (busy) throw new Error(`port ${port} is taken by another program (perhaps an earlier run still serving); stop it or set ${variable} to a free port`);
}
