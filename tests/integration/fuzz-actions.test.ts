// Property-based fuzzing (fast-check) of every server action and JSON route handler with malformed,
// oversized and hostile values: never an exception / 500, always a message, and a refused change
// writes nothing (no audit event appears, since every write records one in its transaction).
import fc from "fast-check";
import crypto from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { count, eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import type { LabActionFn } from "@/lib/auth/action";
import { createTestLab, type TestLab } from "../support/db";
import { signedInClient, type Client } from "../support/http";
import { listActions, listRoutes, type ActionEntry, type RouteEntry } from "../support/registry";

const FIELDS = ["name", "label", "email", "role", "kind", "saltId", "desiccantKind", "nominalTempC", "volumeL", "setpointRhPercent", "toleranceRhPercent",
  "massG", "materialClass", "trialId", "specimenId", "inspectionId", "chamberId", "treatmentId", "photoId", "id", "userId", "areaPercent", "spotCount",
  "notes", "reason", "seed", "csv", "days", "count", "intervalDays", "title", "question", "takenAt", "rhPercent", "tempC", "password", "newPassword"];

const hostileString = fc.oneof(
  fc.string({ maxLength: 30 }),
  fc.constantFrom("NaN", "Infinity", "-Infinity", "1e309", "-1e309", "9007199254740993", "-0", "\u0000", "a\u0000b", "\u202e\u0007", "'; drop table labs; --",
    "\" or 1=1 --", "<img src=x onerror=alert(1)>", "../../etc/passwd", "2026-13-45T99:99", "00000000-0000-0000-0000-000000000000", "[]", "{}", "true"),
  fc.integer({ min: 1000, max: 200_000 }).map((n) => "x".repeat(n)),
  fc.double().map(String),
);
const hostileInput = fc.dictionary(fc.constantFrom(...FIELDS), fc.oneof(hostileString, fc.array(hostileString, { maxLength: 3 })), { maxKeys: 8 });

let lab: TestLab;
let actions: ActionEntry[];
let routes: RouteEntry[];
let lead: Client;

beforeAll(async () => {
  lab = await createTestLab("Fuzz");
  actions = (await listActions()).filter((a) => a.permission);
  routes = (await listRoutes()).filter((r) => r.permission && r.method !== "GET");
  lead = await signedInClient("lead@tarrow.example", "rustline-demo-1");
}, 60_000);
afterAll(() => closeDb());

async function auditCount() {
  const [{ n }] = await db.select({ n: count() }).from(s.auditEvents).where(eq(s.auditEvents.labId, lab.labId));
  return n;
}

describe("server actions under hostile input", () => {
  it("answer with a message and write nothing when they refuse", async () => {
    for (const a of actions) {
      const fn = a.fn as LabActionFn<unknown>;
      await fc.assert(
        fc.asyncProperty(hostileInput, async (input) => {
          const before = await auditCount();
          let r;
          try {
            r = await fn.withIdentity(lab.as("lead"), input);
          } catch (err) {
            const digest = (err as { digest?: string })?.digest ?? "";
            if (digest.startsWith("NEXT_REDIRECT")) return; // a successful action that redirects
            throw new Error(`${a.file}#${a.name} threw on ${JSON.stringify(input).slice(0, 200)}: ${err}`);
          }
          expect(typeof r.ok).toBe("boolean");
          if (!r.ok) {
            expect(r.message ?? "", `${a.name}: a refusal needs a message`).not.toBe("");
            expect(r.message).not.toMatch(/Something went wrong/);
            expect(await auditCount(), `${a.name} wrote an audit event while refusing`).toBe(before);
          }
        }),
        { numRuns: 12 },
      );
    }
  }, 600_000);
});

describe("JSON route handlers under hostile bodies", () => {
  const body = fc.oneof(
    fc.jsonValue({ maxDepth: 4 }).map((v) => JSON.stringify(v)),
    hostileInput.map((v) => JSON.stringify(v)),
    fc.constantFrom("", "{", "null", "[]", "\"str\"", "{\"a\":" + "[".repeat(5000) + "]".repeat(5000) + "}", JSON.stringify({ name: "x".repeat(2_000_000) })),
  );
  it("never answer 5xx and always say what is wrong", async () => {
    for (const r of routes) {
      const url = r.route.replace(/\[\.\.\.[^\]]+\]/g, "x").replace(/\[[^\]]+\]/g, () => crypto.randomUUID());
      await fc.assert(
        fc.asyncProperty(body, async (text) => {
          const res = await lead.fetch(url, { method: r.method, headers: { "content-type": "application/json" }, body: text });
          expect({ route: `${r.method} ${r.route}`, serverError: res.status >= 500 }).toEqual({ route: `${r.method} ${r.route}`, serverError: false });
          if (res.status >= 400) {
            const j = (await res.json().catch(() => null)) as { error?: { message?: string } } | null;
            expect(j?.error?.message, `${r.method} ${r.route} ${res.status}`).toBeTruthy();
          }
        }),
        { numRuns: 10 },
      );
    }
  }, 600_000);
});
