// Fault: PostgreSQL stops and restarts while requests run. Pages answer a clear 503 page, the API a
// JSON 503, a write attempted during the outage stores nothing, and the app recovers without a restart.
// Runs against the app that npm test starts (APP_URL) and the project's own PostgreSQL cluster.
import { afterAll, beforeAll, expect, it } from "vitest";
import { count, eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { signedInClient, type Client } from "../support/http";
import { startDatabase, stopDatabase } from "../support/services";

let lead: Client;

beforeAll(async () => {
  lead = await signedInClient("lead@tarrow.example", "rustline-demo-1");
});
afterAll(async () => {
  await closeDb();
});

async function until(what: string, fn: () => Promise<boolean>, ms = 60_000) {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    if (await fn().catch(() => false)) return;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`timed out waiting for ${what}`);
}

it("answers 503 during a database outage, writes nothing, and recovers by itself", async () => {
  expect((await lead.fetch("/")).status).toBe(200);
  const [{ n: before }] = await db.select({ n: count() }).from(s.auditEvents);
  await closeDb(); // our own pool must not hold broken connections across the restart

  stopDatabase();
  try {
    // The readiness check is cached for a second, so the first requests may still pass the gate (and
    // fail on error.tsx); within a few seconds pages answer the 503 page.
    let pageRes = await lead.fetch("/");
    for (let i = 0; i < 20 && pageRes.status !== 503; i++) {
      await new Promise((r) => setTimeout(r, 250));
      pageRes = await lead.fetch("/");
    }
    expect(pageRes.status).toBe(503);
    expect(await pageRes.text()).toMatch(/database is not reachable/);
    const apiRes = await lead.fetch("/api/inspections?status=open");
    expect(apiRes.status).toBe(503);
    expect(((await apiRes.json()) as { error: { code: string; message: string } }).error).toMatchObject({ code: "unavailable" });
    const write = await lead.fetch("/api/treatments", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ name: "Written during outage", kind: "coating", description: "", protocol: "" }),
    });
    expect(write.status).toBe(503);
  } finally {
    await startDatabase();
  }

  await until("the app to serve pages again", async () => (await lead.fetch("/")).status === 200);
  expect((await lead.fetch("/api/inspections?status=open")).status).toBe(200);
  const [{ n: after }] = await db.select({ n: count() }).from(s.auditEvents);
  expect(after).toBe(before);
  expect(await db.select().from(s.treatments).where(eq(s.treatments.name, "Written during outage"))).toHaveLength(0);
}, 120_000);
