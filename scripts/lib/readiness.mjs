// Readiness gate in front of the app (scripts/serve.mjs): while PostgreSQL is unreachable (restarting,
// say) pages get a clear 503 page and API routes a JSON 503 instead of half-rendered errors, and the app
// recovers by itself once the database answers. One `select 1` per second at most (concurrent requests
// share it). It sits in the server, not in a Next.js proxy, because a proxy costs every request about a
// sixth of the app's capacity under load (README, Benchmarks).
import pg from "pg";

const EXEMPT = ["/_next/static/", "/_next/image", "/favicon.svg", "/fonts/"];

export const UNAVAILABLE_PAGE = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Temporarily unavailable · Rustline</title>
<meta name="viewport" content="width=device-width, initial-scale=1"><meta http-equiv="refresh" content="10"></head>
<body style="font-family:system-ui,sans-serif;max-width:36rem;margin:4rem auto;padding:0 1rem;color:#1a1d21">
<h1>Rustline is temporarily unavailable</h1>
<p>The database is not reachable right now, so nothing can be shown or saved. Nothing you saved earlier is lost.</p>
<p>This page tries again every 10 seconds.</p></body></html>`;

export const UNAVAILABLE_JSON = JSON.stringify({
  error: { code: "unavailable", message: "The database is not reachable right now. Nothing was saved; try again in a moment." },
});

const HEADERS = {
  "Retry-After": "10",
  "Cache-Control": "no-store",
  "X-Content-Type-Options": "nosniff",
  "Referrer-Policy": "strict-origin-when-cross-origin",
  "Content-Security-Policy": "default-src 'none'; style-src 'unsafe-inline'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'",
};

export function readinessGate({ databaseUrl, cacheMs = 1000, timeoutMs = 1500 }) {
  const pool = new pg.Pool({ connectionString: databaseUrl, max: 1, connectionTimeoutMillis: timeoutMs, idleTimeoutMillis: 30_000 });
  pool.on("error", () => {}); // a lost idle connection is simply reopened by the next check
  let lastOkAt = 0;
  let pending = null;

  /** True when the database answered within the last second (or answers now). */
  function databaseReachable() {
    if (Date.now() - lastOkAt < cacheMs) return true;
    pending ??= pool
      .query({ text: "select 1", query_timeout: timeoutMs })
      .then(() => {
        lastOkAt = Date.now();
        return true;
      })
      .catch(() => false)
      .finally(() => {
        pending = null;
      });
    return pending;
  }

  /** Answer the request with a 503 when the database is down; returns true when it did. */
  async function refuse(req, res) {
    const url = req.url ?? "/";
    if (EXEMPT.some((p) => url.startsWith(p))) return false;
    if (await databaseReachable()) return false;
    const api = url.startsWith("/api/");
    res.writeHead(503, { ...HEADERS, "Content-Type": api ? "application/json" : "text/html; charset=utf-8" });
    res.end(req.method === "HEAD" ? undefined : api ? UNAVAILABLE_JSON : UNAVAILABLE_PAGE);
    return true;
  }

  return { refuse, databaseReachable, close: () => pool.end() };
}
