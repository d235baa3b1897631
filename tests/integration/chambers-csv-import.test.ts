// Logger CSV import: all or nothing, line-numbered errors, °F conversion, duplicates skipped.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, asc, eq, sql } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import { auditEvents, readingImports, readings } from "@/db/schema";
import { createChamber } from "@/db/queries/chambers";
import { importReadingsFromCsv, type ImportProgress } from "@/db/queries/readings";
import { chamberSchema, csvImportOptionsSchema } from "@/lib/validation/chambers";
import { createTestLab, type TestLab } from "../support/db";

let lab: TestLab;

async function newChamber(name: string) {
  return createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: chamberSchema.parse({ name, kind: "saturated-salt", saltId: "MgCl2", nominalTempC: "21" }) });
}
const opts = (o: Record<string, unknown> = {}) => csvImportOptionsSchema.parse({ instrument: "logger-1", mapping: { time: 0, rhPercent: 1, tempC: 2 }, ...o });
const run = (chamberId: string, text: string, options = opts(), onProgress?: (p: ImportProgress) => void) =>
  importReadingsFromCsv({ labId: lab.labId, userId: lab.users.technician.id, chamberId, filename: "logger.csv", text, options, onProgress });
const stored = (chamberId: string) => db.select().from(readings).where(eq(readings.chamberId, chamberId)).orderBy(asc(readings.takenAt));

beforeAll(async () => {
  lab = await createTestLab("Chambers CSV");
});
afterAll(async () => {
  await closeDb();
});

describe("logger CSV import", () => {
  it("reports malformed rows with their line numbers and stores nothing at all", async () => {
    const c = await newChamber("CSV errors");
    const text = [
      "Logger: TX-9 serial 0042", // line 1: metadata
      "Time,RH %,Temp °C", // line 2: header
      "2025-03-01 10:00,33.1,21.0",
      "2025-03-01 10:10,abc,21.0", // line 4: RH not a number
      "2025-03-01 10:20,33.4,21.1",
      "2025-02-30 10:30,33.2,21.1", // line 6: no such date
      "2025-03-01 10:40,133.2,21.1", // line 7: RH out of range
    ].join("\n");
    const r = await run(c.id, text, opts({ skipLines: 1 }));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.map((e) => e.line)).toEqual([4, 6, 7]);
    expect(r.errors[0].message).toMatch(/RH "abc" is not a number/);
    expect(r.totalErrors).toBe(3);
    expect(await stored(c.id)).toHaveLength(0);
    expect(await db.select().from(readingImports).where(eq(readingImports.chamberId, c.id))).toHaveLength(0);
  });

  it("converts °F to °C, reads decimal commas and the logger's time zone, and records the import with an audit event", async () => {
    const c = await newChamber("CSV fahrenheit");
    const text = ["Date Time;RH;Temp °F", "01.03.2025 10:00;33,5;71,6", "01.03.2025 10:10;33,7;32", "01.03.2025 10:20;33,6;50"].join("\n");
    const phases: string[] = [];
    const r = await run(c.id, text, opts({ temperatureUnit: "F", timeZone: "Europe/Berlin", dateFormat: "dmy", delimiter: ";" }), (p) => void phases.push(p.phase));
    expect(r.ok).toBe(true);
    const rows = await stored(c.id);
    // (°F − 32) × 5/9: 71.6 °F = 22 °C, 32 °F = 0 °C, 50 °F = 10 °C (definition of the Fahrenheit scale)
    expect(rows.map((x) => x.tempC)).toEqual([expect.closeTo(22, 9), expect.closeTo(0, 9), expect.closeTo(10, 9)]);
    expect(rows.map((x) => x.rhPercent)).toEqual([33.5, 33.7, 33.6]);
    // Berlin is UTC+1 on 1 March 2025 (CET), so 10:00 local is 09:00 UTC
    expect(rows[0].takenAt.toISOString()).toBe("2025-03-01T09:00:00.000Z");
    expect(rows.every((x) => x.source === "csv" && x.instrument === "logger-1")).toBe(true);
    expect(phases).toEqual(["parsing", "storing"]);
    const [imp] = await db.select().from(readingImports).where(eq(readingImports.chamberId, c.id));
    expect([imp.rowsImported, imp.duplicatesSkipped, imp.instrument]).toEqual([3, 0, "logger-1"]);
    const audit = await db.select().from(auditEvents).where(and(eq(auditEvents.entity, "reading-import"), eq(auditEvents.entityId, imp.id)));
    expect(audit).toHaveLength(1);
  });

  it("skips duplicate times within the file and readings already stored for the instrument", async () => {
    const c = await newChamber("CSV duplicates");
    const first = ["time,rh,t", "2025-04-01T00:00:00Z,40,20", "2025-04-01T00:10:00Z,41,20", "2025-04-01T00:10:00Z,41,20"].join("\n");
    const r1 = await run(c.id, first);
    expect(r1).toMatchObject({ ok: true, stored: 2, duplicatesInFile: 1, duplicatesExisting: 0 });
    const second = ["time,rh,t", "2025-04-01T00:10:00Z,41,20", "2025-04-01T00:20:00Z,42,20"].join("\n");
    const r2 = await run(c.id, second);
    expect(r2).toMatchObject({ ok: true, stored: 1, duplicatesInFile: 0, duplicatesExisting: 1 });
    // The same times from another instrument are separate readings (unique per chamber + time + instrument).
    const r3 = await run(c.id, second, opts({ instrument: "handheld" }));
    expect(r3).toMatchObject({ ok: true, stored: 2 });
    expect(await stored(c.id)).toHaveLength(5);
    const imports = await db.select().from(readingImports).where(eq(readingImports.chamberId, c.id));
    expect(imports.map((i) => i.duplicatesSkipped).sort()).toEqual([0, 1, 1]);
  });

  it("refuses a mapping to a column that is not in the header, storing nothing", async () => {
    const c = await newChamber("CSV bad mapping");
    const r = await run(c.id, "time,rh\n2025-04-01T00:00:00Z,40", opts({ mapping: { time: "time", rhPercent: "humidity" } }));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0].message).toMatch(/column "humidity" is not in the header/);
    expect(await stored(c.id)).toHaveLength(0);
  });

  it("imports 100,000 rows in one transaction with progress per batch", async () => {
    const c = await newChamber("CSV large");
    const start = Date.UTC(2024, 0, 1);
    const lines = ["time,rh,t"];
    for (let i = 0; i < 100_000; i++) lines.push(`${new Date(start + i * 60_000).toISOString()},${(33 + (i % 20) / 10).toFixed(1)},21.0`);
    const progress: number[] = [];
    const r = await run(c.id, lines.join("\n"), opts(), (p) => void (p.phase === "storing" && progress.push(p.done)));
    expect(r).toMatchObject({ ok: true, stored: 100_000 });
    expect(progress).toHaveLength(10);
    expect(progress.at(-1)).toBe(100_000);
    const [{ n }] = (await db.execute<{ n: string }>(sql`select count(*)::text as n from readings where chamber_id = ${c.id}`)).rows;
    expect(Number(n)).toBe(100_000);
  }, 60_000);
});
