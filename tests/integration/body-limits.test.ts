// Oversized request bodies against the running app, as a client that keeps sending: every route that
// reads a body answers 413 once the limit is passed, without reading the rest, also when a burst of
// such bodies arrives at once, and the app keeps answering afterwards. A large import past the
// per-process cap is refused with 503 while the others run.
// Sources: RFC 9110 §15.5.14 (413 Content Too Large), §15.6.4 (503 Service Unavailable);
// OWASP Denial of Service cheat sheet ("limit request size", "limit concurrent expensive operations").
import http from "node:http";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { createChamberToken } from "@/db/queries/chambers";
import { LARGE_IMPORT_SLOTS, largeImports } from "@/lib/auth/body";
import { readSessionIdentity } from "@/lib/auth/session";
import { POST as importSpecimens } from "@/app/api/specimens/import/route";
import { POST as importLoggerFile } from "@/app/api/chambers/[chamberId]/imports/route";
import { createTestLab, TEST_PASSWORD, type TestLab } from "../support/db";
import { APP_URL, signedInClient, type Client } from "../support/http";

vi.mock("@/lib/auth/session", () => ({ readSessionIdentity: vi.fn() }));
const session = vi.mocked(readSessionIdentity);

const MB = 1024 * 1024;
const SENT_AT_MOST = 64 * MB; // what a client offers; far more than any limit
// What may pass the limit before the answer arrives: the server's read-ahead and both sockets' buffers.
const SLACK = 16 * MB;

let lab: TestLab;
let client: Client;
let chamberId: string;
let token: string;

beforeAll(async () => {
  lab = await createTestLab("Body limits");
  client = await signedInClient(lab.users.researcher.email, TEST_PASSWORD);
  const [chamber] = await db.insert(s.chambers).values({ labId: lab.labId, name: "Limit jar", kind: "saturated-salt", saltId: "NaCl", nominalTempC: 21, setpointRhPercent: 75.4, toleranceRhPercent: 2 }).returning();
  chamberId = chamber.id;
  token = (await createChamberToken({ labId: lab.labId, userId: lab.users.researcher.id, chamberId, label: "limits" })).token;
});
afterAll(() => closeDb());

/** POST `path` with a body that streams filler until the answer arrives; how much was written by then. */
function sendUntilAnswered(path: string, headers: Record<string, string>, declaredLength?: number) {
  const url = new URL(path, APP_URL);
  return new Promise<{ status: number; written: number; body: string }>((resolve, reject) => {
    let written = 0;
    let answered = false;
    const req = http.request({
      host: url.hostname, port: url.port, path: url.pathname, method: "POST",
      headers: { ...headers, ...(declaredLength !== undefined ? { "content-length": String(declaredLength) } : { "transfer-encoding": "chunked" }) },
    }, (res) => {
      answered = true;
      let body = "";
      res.setEncoding("utf8");
      res.on("data", (d: string) => { body += d; });
      res.on("end", () => { resolve({ status: res.statusCode ?? 0, written, body }); req.destroy(); });
    });
    req.on("error", (err) => { if (!answered) reject(err); });
    const chunk = Buffer.alloc(64 * 1024, "1");
    // At most 1 MB per turn of the event loop, so that an answer is noticed while the server still
    // reads (a tight loop whose writes never fill the socket would not let the response in).
    const pump = () => {
      for (let n = 0; n < 16 && !answered && written < SENT_AT_MOST && !req.destroyed; n++) {
        written += chunk.length;
        if (!req.write(chunk)) return void req.once("drain", pump);
      }
      if (answered || req.destroyed) return;
      if (written >= SENT_AT_MOST) req.end();
      else setImmediate(pump);
    };
    pump();
  });
}

const routes = (): { name: string; path: string; limit: number; headers: Record<string, string> }[] => [
  { name: "JSON route (POST /api/specimens)", path: "/api/specimens", limit: 1 * MB, headers: { cookie: client.cookie, "content-type": "application/json" } },
  { name: "logger API (POST …/readings)", path: `/api/chambers/${chamberId}/readings`, limit: 2 * MB, headers: { authorization: `Bearer ${token}`, "content-type": "application/json" } },
  { name: "specimen import (POST /api/specimens/import)", path: "/api/specimens/import", limit: 1.5 * MB, headers: { cookie: client.cookie, "content-type": "text/csv" } },
  { name: "logger CSV import (POST …/imports)", path: `/api/chambers/${chamberId}/imports`, limit: 9.5 * MB, headers: { cookie: client.cookie, "content-type": "multipart/form-data; boundary=x" } },
];

describe("oversized bodies over HTTP", () => {
  it("each route answers 413 soon after its limit, with a body that never stops and one that declares its size", async () => {
    for (const r of routes()) {
      const streamed = await sendUntilAnswered(r.path, r.headers);
      expect(streamed.status, r.name).toBe(413);
      expect(JSON.parse(streamed.body).error.code, r.name).toBe("too-large");
      expect(streamed.written, r.name).toBeLessThan(r.limit + SLACK);
      const declared = await sendUntilAnswered(r.path, r.headers, SENT_AT_MOST);
      expect(declared.status, r.name).toBe(413);
      expect(declared.written, r.name).toBeLessThan(SLACK);
    }
  });

  it("a burst of oversized bodies to every route is refused and the app keeps answering", async () => {
    for (let round = 0; round < 2; round++) {
      const burst = await Promise.all(routes().flatMap((r) => [sendUntilAnswered(r.path, r.headers), sendUntilAnswered(r.path, r.headers, SENT_AT_MOST)]));
      // 413, or 503 where the import cap was already taken by another request of the burst.
      for (const b of burst) expect([413, 503]).toContain(b.status);
      expect(burst.filter((b) => b.status === 413).length).toBeGreaterThanOrEqual(4);
    }
    const after = await client.fetch("/api/specimens");
    expect(after.status).toBe(200);
    const posted = await fetch(`${APP_URL}/api/chambers/${chamberId}/readings`, {
      method: "POST", headers: { authorization: `Bearer ${token}`, "content-type": "application/json" },
      body: JSON.stringify({ takenAt: "2026-01-05T09:00:00Z", rhPercent: 75.2, tempC: 21 }),
    });
    expect(posted.status).toBe(201);
  });
});

describe("concurrent large imports", () => {
  it(`holds at most ${LARGE_IMPORT_SLOTS} imports at once in a process; the next is refused with 503 and may retry once one ends`, async () => {
    session.mockResolvedValue(lab.as("researcher") as never);
    // Uploads that have started but not finished sending hold their slots.
    const open: ReadableStreamDefaultController<Uint8Array>[] = [];
    const slowBody = () => new ReadableStream<Uint8Array>({ start(c) { open.push(c); c.enqueue(new TextEncoder().encode("label,material_class\n")); } });
    const importReq = (body: BodyInit | ReadableStream<Uint8Array>) =>
      new Request("http://localhost/api/specimens/import", { method: "POST", headers: { "content-type": "text/csv" }, body, duplex: "half" } as RequestInit);
    const fileReq = () => {
      const form = new FormData();
      form.set("file", new File(["time,rh\n"], "log.csv"));
      form.set("options", "{}");
      return new Request(`http://localhost/api/chambers/${chamberId}/imports`, { method: "POST", body: form });
    };
    const params = { params: Promise.resolve({}) };
    const holding = Array.from({ length: LARGE_IMPORT_SLOTS }, () => importSpecimens(importReq(slowBody()), params));
    await vi.waitFor(() => expect(largeImports.busy).toBe(LARGE_IMPORT_SLOTS));

    const refused = await importSpecimens(importReq("label,material_class\nBL-1,other\n"), params);
    expect(refused.status).toBe(503);
    expect((await refused.json()).error.code).toBe("unavailable");
    const refusedFile = await importLoggerFile(fileReq(), { params: Promise.resolve({ chamberId }) });
    expect(refusedFile.status).toBe(503);

    const label = `BL-${Date.now().toString(36)}`;
    for (const [i, c] of open.entries()) {
      c.enqueue(new TextEncoder().encode(`${label}-${i},other\n`));
      c.close();
    }
    expect((await Promise.all(holding)).map((r) => r.status)).toEqual(Array(LARGE_IMPORT_SLOTS).fill(201));
    const retried = await importSpecimens(importReq(`label,material_class\n${label}-retry,other\n`), params);
    expect(retried.status).toBe(201);
  });
});
