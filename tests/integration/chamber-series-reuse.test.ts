// The chamber page reuses a computed chart and its band statistics while nothing they come from has
// changed. The reference is the direct computation (getChamberSeries, itself checked against every
// reading in chambers-climate-sql.test.ts): after each kind of change, by the app or by plain SQL, the
// reused result must equal a fresh one, and while nothing changes it must be the very same result.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import { checkVersions, climateVersions, labs, readings } from "@/db/schema";
import { addHygrometerCheck, createChamber, getChamber, setHygrometerCheckApplied, updateChamber } from "@/db/queries/chambers";
import { insertReadings } from "@/db/queries/readings";
import { getChamberSeries, getChamberSeriesReused } from "@/db/queries/readings-series";
import { chamberSchema } from "@/lib/validation/chambers";
import { createTestLab, type TestLab } from "../support/db";

let lab: TestLab;
const H = 3_600_000;
const now = new Date(Math.floor(Date.now() / 60_000) * 60_000);
const t0 = now.getTime() - 48 * H;

beforeAll(async () => {
  lab = await createTestLab("Series reuse");
});
afterAll(async () => {
  await closeDb();
});

async function jar(name: string) {
  return createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: chamberSchema.parse({ name, kind: "saturated-salt", saltId: "NaCl", nominalTempC: "22" }) });
}
const rowsOf = (values: number[], instrument = "probe") => values.map((rh, i) => ({ takenAt: new Date(t0 + i * H), rhPercent: rh, tempC: 21, dewPointC: null, instrument }));

describe("reusing the chamber chart", () => {
  it("gives the same result while nothing changes, and a fresh one after readings are added, corrected or removed by any writer", async () => {
    const c = await jar("Reused jar");
    await insertReadings(db, { labId: lab.labId, chamberId: c.id, source: "csv", rows: rowsOf([75, 76, 79, 74, 75, 78]) });
    const args = { labId: lab.labId, chamber: c, period: "7d" as const, now };
    const first = await getChamberSeriesReused(args);
    expect(first).toEqual(await getChamberSeries(args));
    expect(first.count).toBe(6);
    expect(await getChamberSeriesReused(args)).toBe(first);
    // Within the same minute: the same result.
    expect(await getChamberSeriesReused({ ...args, now: new Date(now.getTime() + 59_000) })).toBe(first);

    await insertReadings(db, { labId: lab.labId, chamberId: c.id, source: "api", rows: [{ takenAt: new Date(t0 + 6 * H), rhPercent: 90, tempC: 21, dewPointC: null, instrument: "probe" }] });
    const added = await getChamberSeriesReused(args);
    expect(added).not.toBe(first);
    expect(added.count).toBe(7);
    expect(added).toEqual(await getChamberSeries(args));

    await db.update(readings).set({ rhPercent: 50 }).where(and(eq(readings.chamberId, c.id), eq(readings.takenAt, new Date(t0 + 2 * H))));
    const corrected = await getChamberSeriesReused(args);
    expect(corrected).not.toBe(added);
    expect(corrected.stats.minRhPercent).toBe(50);
    expect(corrected).toEqual(await getChamberSeries(args));

    await db.delete(readings).where(and(eq(readings.chamberId, c.id), eq(readings.takenAt, new Date(t0 + 6 * H))));
    const removed = await getChamberSeriesReused(args);
    expect(removed.count).toBe(6);
    expect(removed).toEqual(await getChamberSeries(args));
  });

  it("gives a fresh result after a hygrometer check of the instrument is recorded elsewhere in the lab or withdrawn, and for another band, period or settling event", async () => {
    const c = await jar("Checked jar");
    const other = await jar("Check jar");
    await insertReadings(db, { labId: lab.labId, chamberId: c.id, source: "csv", rows: rowsOf([77, 77, 78, 77], "handheld") });
    await insertReadings(db, { labId: lab.labId, chamberId: other.id, source: "csv", rows: rowsOf([75], "handheld") });
    const args = { labId: lab.labId, chamber: c, period: "30d" as const, now };
    const before = await getChamberSeriesReused(args);
    expect(before.offsets).toHaveLength(0);
    const tokens = async () => ({
      chamber: (await db.select().from(climateVersions).where(eq(climateVersions.chamberId, c.id)))[0]?.version,
      lab: (await db.select().from(checkVersions).where(eq(checkVersions.labId, lab.labId)))[0]?.version,
    });
    const tokensBefore = await tokens();

    // Recorded in the other chamber; the offset follows the instrument into this one (the lab's check token).
    const check = await addHygrometerCheck({ labId: lab.labId, userId: lab.users.technician.id, chamberId: other.id, values: { instrument: "handheld", saltId: "NaCl", tempC: 25, readingRhPercent: 77.4, checkedAt: new Date(t0), apply: true, notes: "" } });
    const checked = await getChamberSeriesReused(args);
    expect(checked.offsets).toHaveLength(1);
    // A check renews the lab's check token only: no other chamber's row is written (or locked).
    const tokensAfter = await tokens();
    expect(tokensAfter.chamber).toBe(tokensBefore.chamber);
    expect(tokensAfter.lab).toBeDefined();
    expect(tokensAfter.lab).not.toBe(tokensBefore.lab);
    expect(checked).toEqual(await getChamberSeries(args));

    await setHygrometerCheckApplied({ labId: lab.labId, userId: lab.users.technician.id, checkId: check.id, applied: false });
    const withdrawn = await getChamberSeriesReused(args);
    expect(withdrawn.offsets).toHaveLength(0);
    expect(withdrawn).toEqual(await getChamberSeries(args));

    // The band comes from the chamber's settings, which the caller passes in.
    await updateChamber({ labId: lab.labId, userId: lab.users.researcher.id, chamberId: c.id, values: chamberSchema.parse({ name: "Checked jar", kind: "water", nominalTempC: "22" }) });
    const changed = await getChamber({ labId: lab.labId, chamberId: c.id });
    const rebanded = await getChamberSeriesReused({ ...args, chamber: changed });
    expect(rebanded.band).not.toEqual(withdrawn.band);
    expect(rebanded).toEqual(await getChamberSeries({ ...args, chamber: changed }));

    const all = await getChamberSeriesReused({ ...args, chamber: changed, period: "all" });
    expect(all.period).toBe("all");
    const settleFrom = [{ label: "the last inspection opening", at: new Date(t0 + H) }];
    const settled = await getChamberSeriesReused({ ...args, chamber: changed, settleFrom });
    expect(settled.settle).toHaveLength(1);
    expect(settled).toEqual(await getChamberSeries({ ...args, chamber: changed, settleFrom }));
  });

  it("computes once for concurrent requests, and every time for a chamber that has never had a reading", async () => {
    const c = await jar("Busy jar");
    await insertReadings(db, { labId: lab.labId, chamberId: c.id, source: "csv", rows: rowsOf([75, 75, 75]) });
    const args = { labId: lab.labId, chamber: c, period: "7d" as const, now };
    const results = await Promise.all(Array.from({ length: 6 }, () => getChamberSeriesReused(args)));
    for (const r of results) expect(r).toBe(results[0]);
    // The whole record does not depend on the time of asking; the last 7 days do, to the minute.
    const all = await getChamberSeriesReused({ ...args, period: "all" });
    expect(await getChamberSeriesReused({ ...args, period: "all", now: new Date(now.getTime() + 3 * 60_000) })).toBe(all);
    const later = await getChamberSeriesReused({ ...args, now: new Date(now.getTime() + 3 * 60_000) });
    expect(later).not.toBe(results[0]);
    expect(later).toEqual(await getChamberSeries({ ...args, now: new Date(now.getTime() + 3 * 60_000) }));

    const empty = await jar("Empty jar");
    expect(await db.select().from(climateVersions).where(eq(climateVersions.chamberId, empty.id))).toHaveLength(0);
    const a = await getChamberSeriesReused({ ...args, chamber: empty });
    const b = await getChamberSeriesReused({ ...args, chamber: empty });
    expect(a.count).toBe(0);
    expect(b).not.toBe(a);
    expect(b).toEqual(a);
  });

  it("lets a lab with readings be deleted: its chambers, readings and tokens go with it", async () => {
    const gone = await createTestLab("Series reuse, deleted");
    const c = await createChamber({ labId: gone.labId, userId: gone.users.researcher.id, values: chamberSchema.parse({ name: "Short-lived jar", kind: "water", nominalTempC: "20" }) });
    await insertReadings(db, { labId: gone.labId, chamberId: c.id, source: "csv", rows: rowsOf([95, 96]) });
    expect(await db.select().from(climateVersions).where(eq(climateVersions.chamberId, c.id))).toHaveLength(1);
    await db.delete(labs).where(eq(labs.id, gone.labId));
    expect(await db.select().from(readings).where(eq(readings.chamberId, c.id))).toHaveLength(0);
    expect(await db.select().from(climateVersions).where(eq(climateVersions.chamberId, c.id))).toHaveLength(0);
  });
});
