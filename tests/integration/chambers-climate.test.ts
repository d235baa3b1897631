// The chamber's climate analysis: hygrometer offsets applied at analysis time (raw readings kept),
// time in band, worst excursion, settling after a disturbance; typed readings and their duplicates.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, asc, eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import { readings } from "@/db/schema";
import { addHygrometerCheck, createChamber, getChamber, setHygrometerCheckApplied } from "@/db/queries/chambers";
import { addManualReading, insertReadings } from "@/db/queries/readings";
import { getChamberSeries } from "@/db/queries/readings-series";
import { runLabAction } from "@/lib/auth/action";
import { chamberSchema, manualReadingSchema } from "@/lib/validation/chambers";
import { createTestLab, type TestLab } from "../support/db";

let lab: TestLab;
const H = 3_600_000;
const t0 = Date.UTC(2025, 5, 1, 8);
const raw = [75, 75, 79, 79, 75, 78, 78, 78, 78, 78];

beforeAll(async () => {
  lab = await createTestLab("Chambers climate");
});
afterAll(async () => {
  await closeDb();
});

describe("climate analysis", () => {
  it("applies an instrument's only check to all its readings (held before and after it), at analysis time only, and computes band statistics", async () => {
    const values = chamberSchema.parse({ name: "Analysed jar", kind: "saturated-salt", saltId: "NaCl", nominalTempC: "22" }); // 75.4 ± 2 → 73.4–77.4 %RH
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values });
    await insertReadings(db, { labId: lab.labId, chamberId: c.id, source: "csv", rows: raw.map((rh, i) => ({ takenAt: new Date(t0 + i * H), rhPercent: rh, tempC: 21, dewPointC: null, instrument: "probe" })) });

    const before = await getChamberSeries({ labId: lab.labId, chamber: c, period: "all" });
    expect(before.count).toBe(10);
    expect(before.stats.fractionInBand).toBeCloseTo(3 / 9, 9); // h0, h1, h4 of 9 counted hours

    // The probe read 77.4 %RH over NaCl at 25 °C, where the Greenspan 1977 fit gives 75.30 %RH: it reads ≈2.10 high.
    const check = await addHygrometerCheck({ labId: lab.labId, userId: lab.users.technician.id, chamberId: c.id, values: { instrument: "probe", saltId: "NaCl", tempC: 25, readingRhPercent: 77.4, checkedAt: new Date(t0 + 5 * H), apply: true, notes: "" } });
    expect(check.referenceRhPercent).toBeCloseTo(75.3, 2);
    expect(check.offsetRhPercent).toBeCloseTo(2.1, 2);

    const s = await getChamberSeries({ labId: lab.labId, chamber: c, period: "all", settleFrom: [{ label: "opening", at: new Date(t0 + 2 * H) }] });
    expect(s.offsets).toHaveLength(1);
    expect(s.points.map((p) => p.rhRaw)).toEqual(raw);
    // By hand: corrected 72.9, 72.9, 76.9, 76.9, 72.9, 75.9 … against 73.4–77.4: below over h0–h2 and h4–h5.
    s.points.forEach((p, i) => expect(p.rh).toBeCloseTo(raw[i] - check.offsetRhPercent, 9));
    expect(s.stats.fractionInBand).toBeCloseTo(6 / 9, 9);
    expect(s.stats.excursions.map((e) => [e.direction, e.durationMinutes])).toEqual([["below", 120], ["below", 60]]);
    expect(s.stats.worstExcursion).toMatchObject({ direction: "below", durationMinutes: 120 }); // equally deep: the longer
    expect(s.stats.worstExcursion!.worstRhPercent).toBeCloseTo(75 - check.offsetRhPercent, 9);
    expect(s.settle[0].minutes).toBe(0); // in band at h2 and held for two hours
    // Dew point from the corrected RH and T (over water); 21 °C at 72.9 %RH ≈ 15.96 °C (Magnus form,
    // a = 17.625, b = 243.04 °C, Alduchov & Eskridge 1996)
    expect(s.points[0].dewC!).toBeCloseTo(15.96, 1);
    expect(s.points[0].dewOver).toBe("water");

    // The stored readings are never rewritten.
    const rows = await db.select().from(readings).where(eq(readings.chamberId, c.id)).orderBy(asc(readings.takenAt));
    expect(rows.map((r) => r.rhPercent)).toEqual(raw);

    await setHygrometerCheckApplied({ labId: lab.labId, userId: lab.users.technician.id, checkId: check.id, applied: false });
    expect((await getChamberSeries({ labId: lab.labId, chamber: c, period: "all" })).stats.fractionInBand).toBeCloseTo(3 / 9, 9);
  });

  it("limits the period to the last 7 days", async () => {
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: chamberSchema.parse({ name: "Period jar", kind: "water", nominalTempC: "20" }) });
    const now = Date.now();
    await insertReadings(db, { labId: lab.labId, chamberId: c.id, source: "api", rows: [20, 10, 3, 1].map((d) => ({ takenAt: new Date(now - d * 86_400_000), rhPercent: 95, tempC: 20, dewPointC: null, instrument: "x" })) });
    expect((await getChamberSeries({ labId: lab.labId, chamber: c, period: "7d" })).count).toBe(2);
    expect((await getChamberSeries({ labId: lab.labId, chamber: c, period: "30d" })).count).toBe(4);
  });

  it("stores a typed reading once; the same time and instrument again is a field error", async () => {
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: chamberSchema.parse({ name: "Typed jar", kind: "water", nominalTempC: "20" }) });
    const input = { chamberId: c.id, takenAt: "2025-06-02T09:15", timeZone: "Europe/Berlin", rhPercent: "94,5", tempC: "20.4", instrument: "handheld" };
    const handler = async (ctx: { labId: string; userId: string }, d: { chamberId: string; takenAt: Date; rhPercent: number; tempC?: number; instrument: string }) => {
      await addManualReading({ labId: ctx.labId, userId: ctx.userId, chamberId: d.chamberId, reading: { takenAt: d.takenAt, rhPercent: d.rhPercent, tempC: d.tempC ?? null, instrument: d.instrument } });
    };
    expect((await runLabAction(lab.as("technician"), "readings.write", manualReadingSchema, input, handler)).ok).toBe(true);
    const again = await runLabAction(lab.as("technician"), "readings.write", manualReadingSchema, input, handler);
    expect(again.ok).toBe(false);
    expect(again.errors?.takenAt?.[0]).toMatch(/already has a reading/);
    expect((await runLabAction(lab.as("observer"), "readings.write", manualReadingSchema, { ...input, takenAt: "2025-06-02T10:00" }, handler)).ok).toBe(false);
    const rows = await db.select().from(readings).where(and(eq(readings.chamberId, c.id)));
    expect(rows).toHaveLength(1);
    // 09:15 in Berlin in June (CEST, UTC+2) is 07:15 UTC
    expect([rows[0].takenAt.toISOString(), rows[0].rhPercent, rows[0].source]).toEqual(["2025-06-02T07:15:00.000Z", 94.5, "manual"]);
  });

  it("does not show another lab's chamber", async () => {
    const other = await createTestLab("Chambers climate other");
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: chamberSchema.parse({ name: "Hidden jar", kind: "water", nominalTempC: "20" }) });
    await expect(getChamber({ labId: other.labId, chamberId: c.id })).rejects.toMatchObject({ code: "not-found" });
  });
});
