// Serve the built app: WEB_CONCURRENCY Next.js server processes (default: one per CPU core, at most 4)
// sharing PORT through node:cluster, each a Next.js custom server (next({ dev: false })) behind the
// database readiness gate (scripts/lib/readiness.mjs). One Node process renders on one core; on a 2-core
// machine a second one adds about a quarter to what the app answers under load (README, Benchmarks).
// A worker that dies is replaced; SIGTERM/SIGINT stop all.
import cluster from "node:cluster";
import http from "node:http";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { dataDir } from "./lib/env.mjs";
import { readinessGate } from "./lib/readiness.mjs";
import { resolveSecret } from "./lib/secret.mjs";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const port = Number(process.env.PORT ?? 3000);
const cores = os.availableParallelism?.() ?? os.cpus().length;
const requested = Number.parseInt(process.env.WEB_CONCURRENCY ?? "", 10);
const workers = Number.isFinite(requested) && requested > 0 ? requested : Math.min(4, cores);
process.env.NODE_ENV ??= "production";

function clientAddress(req) {
  const forwarded = process.env.TRUST_PROXY === "1" ? String(req.headers["x-forwarded-for"] ?? "").split(",").map((s) => s.trim()).filter(Boolean).pop() : undefined;
  return forwarded ?? req.socket.remoteAddress ?? "unknown";
}

if (cluster.isPrimary) {
  // The workers inherit the secret: refused unless DEMO_MODE=1 when missing or weak, made once in demo mode.
  try {
    process.env.NEXTAUTH_SECRET = resolveSecret(process.env, dataDir);
  } catch (err) {
    console.error(`[serve] ${err instanceof Error ? err.message : err}`);
    process.exit(1);
  }
  let stopping = false;
  const recentDeaths = [];
  const stop = (signal) => {
    stopping = true;
    for (const w of Object.values(cluster.workers ?? {})) w?.process.kill(signal);
    setTimeout(() => process.exit(process.exitCode ?? 0), 5000).unref();
  };
  process.on("SIGTERM", () => stop("SIGTERM"));
  process.on("SIGINT", () => stop("SIGTERM"));
  cluster.on("exit", (worker, code, signal) => {
    if (stopping) {
      if (!Object.keys(cluster.workers ?? {}).length) process.exit(process.exitCode ?? 0);
      return;
    }
    const now = Date.now();
    recentDeaths.push(now);
    while (recentDeaths.length && now - recentDeaths[0] > 30_000) recentDeaths.shift();
    if (recentDeaths.length > 3) {
      console.error(`[serve] app workers keep exiting (last: code ${code}, signal ${signal}); stopping.`);
      stop("SIGTERM");
      process.exitCode = 1;
      return;
    }
    console.error(`[serve] an app worker exited (code ${code}, signal ${signal}); starting another.`);
    cluster.fork();
  });
  for (let i = 0; i < workers; i++) cluster.fork();
  console.log(`[serve] ${workers} app process${workers === 1 ? "" : "es"} on port ${port}`);
} else {
  const { default: next } = await import("next");
  const app = next({ dev: false, dir: root, hostname: "localhost", port });
  await app.prepare();
  const handle = app.getRequestHandler();
  const gate = readinessGate({ databaseUrl: process.env.DATABASE_URL });
  const server = http.createServer(async (req, res) => {
    if (await gate.refuse(req, res)) return;
    // The 403 page (app/(lab)/forbidden.tsx) names the roles a page needs; it learns the page from this.
    req.headers["x-rustline-path"] = (req.url ?? "/").split("?")[0];
    // Sign-in throttling counts failures per client address (lib/auth/throttle.ts CLIENT_ADDRESS_HEADER);
    // a value the client sent is replaced. Behind a reverse proxy (TRUST_PROXY=1) the proxy's last
    // X-Forwarded-For entry is the client; otherwise the connection's own address.
    req.headers["x-rustline-client"] = clientAddress(req);
    await handle(req, res);
  });
  server.listen(port);
  process.on("SIGTERM", () => server.close(() => process.exit(0)));
}
