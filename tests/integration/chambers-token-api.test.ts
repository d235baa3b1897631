// Logger API: POST /api/chambers/[chamberId]/readings with a per-chamber bearer token.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import { auditEvents, chamberTokens, readings } from "@/db/schema";
import { createChamber, createChamberToken, revokeChamberToken } from "@/db/queries/chambers";
import { chamberSchema } from "@/lib/validation/chambers";
import { POST } from "@/app/api/chambers/[chamberId]/readings/route";
import { createTestLab, type TestLab } from "../support/db";

let lab: TestLab;
let chamberId: string;
let otherChamberId: string;
let token: string;

function post(id: string, body: string, auth: string | null = `Bearer ${token}`) {
  const headers: Record<string, string> = { "content-type": "application/json" };
  if (auth) headers.authorization = auth;
  return POST(new Request(`http://localhost/api/chambers/${id}/readings`, { method: "POST", headers, body }), { params: Promise.resolve({ chamberId: id }) });
}
const stored = async (id: string) => db.select().from(readings).where(eq(readings.chamberId, id));

beforeAll(async () => {
  lab = await createTestLab("Chambers API");
  const values = chamberSchema.parse({ name: "Logger jar", kind: "saturated-salt", saltId: "NaCl", nominalTempC: "21" });
  chamberId = (await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values })).id;
  otherChamberId = (await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: { ...values, name: "Other jar" } })).id;
  token = (await createChamberToken({ labId: lab.labId, userId: lab.users.researcher.id, chamberId, label: "TX-9" })).token;
});
afterAll(async () => {
  await closeDb();
});

describe("logger token API", () => {
  it("keeps only a SHA-256 of the token", async () => {
    const rows = await db.select().from(chamberTokens).where(eq(chamberTokens.chamberId, chamberId));
    expect(rows).toHaveLength(1);
    expect(rows[0].tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(rows[0].tokenHash).not.toContain(token);
  });

  it("stores one reading or an array with a valid token, skips repeats, and audits the post", async () => {
    const one = await post(chamberId, JSON.stringify({ takenAt: "2025-05-01T10:00:00Z", rhPercent: 75.2, tempC: 21.1 }));
    expect(one.status).toBe(201);
    expect(await one.json()).toEqual({ received: 1, stored: 1, duplicatesSkipped: 0 });
    const many = await post(chamberId, JSON.stringify([
      { takenAt: "2025-05-01T10:00:00Z", rhPercent: 75.2, tempC: 21.1 },
      { takenAt: "2025-05-01T12:10:00+02:00", rhPercent: 75.4, instrument: "probe-2" },
    ]));
    expect(many.status).toBe(201);
    expect(await many.json()).toEqual({ received: 2, stored: 1, duplicatesSkipped: 1 });
    const rows = await stored(chamberId);
    expect(rows).toHaveLength(2);
    expect(rows.find((r) => r.instrument === "probe-2")!.takenAt.toISOString()).toBe("2025-05-01T10:10:00.000Z");
    expect(rows.every((r) => r.source === "api")).toBe(true);
    const audit = await db.select().from(auditEvents).where(eq(auditEvents.entity, "reading-batch"));
    expect(audit.filter((a) => a.labId === lab.labId)).toHaveLength(2);
    const [t] = await db.select().from(chamberTokens).where(eq(chamberTokens.chamberId, chamberId));
    expect(t.lastUsedAt).not.toBeNull();
  });

  it("answers 401 without a token or with an unknown one", async () => {
    const none = await post(chamberId, "{}", null);
    expect(none.status).toBe(401);
    expect(none.headers.get("www-authenticate")).toMatch(/^Bearer/);
    const wrong = await post(chamberId, JSON.stringify({ takenAt: "2025-05-02T10:00:00Z", rhPercent: 50 }), "Bearer rlc_not-a-real-token");
    expect(wrong.status).toBe(401);
  });

  it("answers 404 when the token belongs to another chamber, storing nothing there", async () => {
    const r = await post(otherChamberId, JSON.stringify({ takenAt: "2025-05-02T10:00:00Z", rhPercent: 50 }));
    expect(r.status).toBe(404);
    expect((await r.json()).error.message).toMatch(/No such chamber/);
    expect(await stored(otherChamberId)).toHaveLength(0);
  });

  it("answers 400 for malformed JSON and 422 with the offending field for invalid readings", async () => {
    const bad = await post(chamberId, "{ takenAt: 2025-05-02 }");
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.message).toMatch(/not valid JSON/);
    const invalid = await post(chamberId, JSON.stringify([{ takenAt: "2025-05-02T10:00:00Z", rhPercent: 50 }, { takenAt: "2025-05-02T10:10:00Z", rhPercent: 140 }]));
    expect(invalid.status).toBe(422);
    const body = await invalid.json();
    expect(body.error.message).toMatch(/\[1\]\.rhPercent: rhPercent must be 0–100/);
    const noZone = await post(chamberId, JSON.stringify({ takenAt: "2025-05-02 10:00", rhPercent: 50 }));
    expect(noZone.status).toBe(422);
    expect((await noZone.json()).error.message).toMatch(/takenAt must be an ISO 8601 time with a zone/);
    const tooMany = await post(chamberId, JSON.stringify(Array.from({ length: 5001 }, (_, i) => ({ takenAt: new Date(Date.UTC(2025, 6, 1) + i * 60_000).toISOString(), rhPercent: 50 }))));
    expect(tooMany.status).toBe(422);
    expect((await tooMany.json()).error.message).toMatch(/at most 5000/);
    expect((await stored(chamberId)).filter((r) => r.takenAt.toISOString().startsWith("2025-05-02") || r.takenAt.getUTCMonth() === 6)).toHaveLength(0);
  });

  it("refuses a revoked token with 401", async () => {
    const { token: t2, row } = await createChamberToken({ labId: lab.labId, userId: lab.users.lead.id, chamberId, label: "spare" });
    expect((await post(chamberId, JSON.stringify({ takenAt: "2025-05-03T10:00:00Z", rhPercent: 75 }), `Bearer ${t2}`)).status).toBe(201);
    await revokeChamberToken({ labId: lab.labId, userId: lab.users.lead.id, chamberId, tokenId: row.id });
    const r = await post(chamberId, JSON.stringify({ takenAt: "2025-05-03T10:10:00Z", rhPercent: 75 }), `Bearer ${t2}`);
    expect(r.status).toBe(401);
    expect((await r.json()).error.message).toMatch(/revoked/);
  });
});
