// Readiness gate in front of pages and API routes: when PostgreSQL is unreachable (restarting, say),
// answer 503 with a clear page or JSON error instead of half-rendered pages, and recover by itself
// as soon as the database answers again. The check is cached for a second, so it costs one round trip
// per second at most.
import { NextResponse, type NextRequest } from "next/server";
import { getPool } from "@/db/client";

let lastOkAt = 0;

async function databaseReachable(): Promise<boolean> {
  if (Date.now() - lastOkAt < 1000) return true;
  try {
    const client = await getPool().connect();
    try {
      await client.query({ text: "select 1", query_timeout: 1500 } as never);
    } finally {
      client.release();
    }
    lastOkAt = Date.now();
    return true;
  } catch {
    return false;
  }
}

const page = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Temporarily unavailable · Rustline</title>
<meta name="viewport" content="width=device-width, initial-scale=1"><meta http-equiv="refresh" content="10"></head>
<body style="font-family:system-ui,sans-serif;max-width:36rem;margin:4rem auto;padding:0 1rem;color:#1a1d21">
<h1>Rustline is temporarily unavailable</h1>
<p>The database is not reachable right now, so nothing can be shown or saved. Nothing you saved earlier is lost.</p>
<p>This page tries again every 10 seconds.</p></body></html>`;

export async function proxy(req: NextRequest) {
  if (await databaseReachable()) return NextResponse.next();
  if (req.nextUrl.pathname.startsWith("/api/")) {
    return NextResponse.json(
      { error: { code: "unavailable", message: "The database is not reachable right now. Nothing was saved; try again in a moment." } },
      { status: 503, headers: { "Retry-After": "10" } },
    );
  }
  return new NextResponse(page, { status: 503, headers: { "content-type": "text/html; charset=utf-8", "Retry-After": "10" } });
}

export const config = {
  // Not for static files, images, or the sign-in page's own assets.
  matcher: ["/((?!_next/static|_next/image|favicon.svg|fonts/).*)"],
};
