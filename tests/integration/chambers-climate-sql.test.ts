// The chamber chart over long periods is computed from the block summaries (reading_blocks) plus
// the hours that cross a band edge. lib/climate is the reference: on a generated series with gaps,
// excursions of every shape, two instruments logging at the same instants and applied hygrometer
// corrections (one instrument drifting between a check inside an hour and a two-salt check, the
// other held from its only check and clipped at 100 %RH), the reduced path must give what
// lib/climate bandStats / settleTimeMinutes give on every reading, and the chart must keep each
// time bucket's lowest and highest reading.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, asc, eq, gte, sql } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import { hygrometerChecks, readings } from "@/db/schema";
import { createChamber, type Chamber } from "@/db/queries/chambers";
import { insertReadings, type NewReading } from "@/db/queries/readings";
import { getChamberSeries } from "@/db/queries/readings-series";
import { bandStats, settleTimeMinutes, type ClimateReading } from "@/lib/climate/band-stats";
import { applyOffset } from "@/lib/climate/hygrometer-check";
import { chamberSchema } from "@/lib/validation/chambers";
import { createTestLab, type TestLab } from "../support/db";

const MIN = 60_000;
const HOUR = 60 * MIN;
const DAY = 24 * HOUR;
const t0 = Date.UTC(2025, 2, 3, 0, 2, 30); // not on an hour, so hours and 6-hour blocks are cut by readings
const at = (day: number, h: number, m = 0) => t0 + day * DAY + h * HOUR + m * MIN;

let lab: TestLab;
let chamber: Chamber;
type RefRow = ClimateReading & { instrument: string; rhRaw: number; tempC: number | null };
let all: RefRow[];

/** A deterministic wobble (no Math.random: failures must reproduce). */
const wobble = (i: number) => (((i * 7919) % 101) - 50) / 1000;

function series(setpoint: number): NewReading[] {
  const rows: NewReading[] = [];
  for (let i = 0; i < 2880; i++) {
    const t = t0 + i * 5 * MIN;
    const inRange = (a: number, b: number) => t >= a && t < b;
    // Logger off 5 h and 95 min (uncounted; the second inside a 6-hour block that is otherwise in band) and 50 min (counted).
    if (inRange(at(4, 16), at(4, 21)) || inRange(at(9, 7), at(9, 8, 30)) || inRange(at(5, 3), at(5, 3, 50))) continue;
    let rh = setpoint + 0.8 * Math.sin((2 * Math.PI * i) / 288) + wobble(i);
    if (inRange(at(1, 10, 17), at(1, 12, 43))) rh += 4; // above, across an hour edge
    if (inRange(at(2, 5), at(2, 14))) rh += 5; // above for 9 h: whole 6-hour blocks above the band
    if (inRange(at(3, 8, 10), at(3, 9, 20))) rh -= 6; // below, then straight above: one excursion
    if (inRange(at(3, 9, 20), at(3, 10, 5))) rh += 6;
    if (inRange(at(4, 15), at(4, 16))) rh += 6; // above until the logger stops: open-ended
    if (t === at(6, 12)) rh = 90; // a single-reading spike
    if (inRange(at(7, 8), at(7, 9))) rh += 6; // above for an hour in which probe-b's correction is clipped
    if (inRange(at(8, 1), at(8, 4))) rh -= 5; // below for 3 h: whole hours below the band
    rows.push({ takenAt: new Date(t), rhPercent: rh, tempC: 21 + 0.3 * Math.sin(i / 40), dewPointC: null, instrument: "probe-a" });
  }
  // A second hygrometer every 15 min on days 5–8, at the same instants as probe-a (ties in time,
  // also at each hour's last reading, where the instrument that sorts last comes last).
  for (let t = at(5, 0) + 10 * MIN; t < at(8, 0); t += 15 * MIN) {
    const rh = t >= at(7, 8) && t < at(7, 9) ? 98.5 : setpoint - 0.5 + wobble(t / MIN);
    rows.push({ takenAt: new Date(t), rhPercent: rh, tempC: null, dewPointC: 15, instrument: "probe-b" });
  }
  return rows;
}

/**
 * probe-a: offset 1.5 (gain 1, shift −1.5) at day 2 07:31, then the two-salt line true = 32.8 +
 * (reading − 34) / 1.08 at day 8 02:20 (gain 1/1.08, shift 32.8 − 34/1.08), each term mixed by the
 * share of time elapsed between them; probe-b: offset −3, its only check, held throughout. Kept
 * within 0–100 %RH; gain × reading + shift is the product's arithmetic order, so extremes compare exactly.
 */
function referenceRh(instrument: string, t: number, rh: number): number {
  if (instrument === "probe-b") return applyOffset(rh, -3);
  const c1 = at(2, 7, 31);
  const c2 = at(8, 2, 20);
  if (t <= c1) return applyOffset(rh, 1.5);
  const gain2 = 1 / 1.08;
  const shift2 = 32.8 - gain2 * 34;
  const w = t >= c2 ? 1 : (t - c1) / (c2 - c1);
  const gain = t >= c2 ? gain2 : 1 + w * (gain2 - 1);
  const shift = t >= c2 ? shift2 : -1.5 + w * (shift2 - -1.5);
  return Math.min(100, Math.max(0, gain * rh + shift));
}

beforeAll(async () => {
  lab = await createTestLab("Chambers climate SQL");
  chamber = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: chamberSchema.parse({ name: "Reduced jar", kind: "saturated-salt", saltId: "NaCl", nominalTempC: "22" }) });
  await insertReadings(db, { labId: lab.labId, chamberId: chamber.id, source: "csv", rows: series(chamber.setpointRhPercent) });
  const check = { labId: lab.labId, chamberId: chamber.id, saltId: "NaCl", tempC: 22, readingRhPercent: 0, referenceRhPercent: 0, notes: "" };
  await db.insert(hygrometerChecks).values([
    // probe-a read 1.5 high at 07:31 on day 2, inside an hour of the long excursion
    { ...check, instrument: "probe-a", offsetRhPercent: 1.5, applied: true, checkedAt: new Date(at(2, 7, 31)) },
    // not applied: must change nothing
    { ...check, instrument: "probe-a", offsetRhPercent: 10, applied: false, checkedAt: new Date(at(3, 0)) },
    // probe-b read 3 low on day 6, its only check, held before and after: 98.5 %RH becomes 101.5, clipped to 100
    { ...check, instrument: "probe-b", offsetRhPercent: -3, applied: true, checkedAt: new Date(at(6, 0)) },
    // a two-salt check of probe-a at 02:20 on day 8: slope 1.08 through (34 read, 32.8 reference); drift between the two
    { ...check, instrument: "probe-a", readingRhPercent: 34, referenceRhPercent: 32.8, offsetRhPercent: 1.2, slope: 1.08, applied: true, checkedAt: new Date(at(8, 2, 20)) },
  ]);
  // The reference: every reading, corrected as the product's one rule says (drift interpolated
  // linearly in time between two checks of an instrument, the nearest check held before the first
  // and after the last), written out here for these checks.
  const raw = await db.select().from(readings).where(eq(readings.chamberId, chamber.id)).orderBy(asc(readings.takenAt), asc(readings.instrument));
  all = raw.map((r) => ({ takenAt: r.takenAt, rhPercent: referenceRh(r.instrument, r.takenAt.getTime(), r.rhPercent), rhRaw: r.rhPercent, instrument: r.instrument, tempC: r.tempC }));
});
afterAll(async () => {
  await closeDb();
});

function expectSameStats(actual: ReturnType<typeof bandStats>, expected: ReturnType<typeof bandStats>) {
  expect(actual.fractionInBand!).toBeCloseTo(expected.fractionInBand!, 12);
  expect(actual.countedMinutes).toBe(expected.countedMinutes);
  expect(actual.inBandMinutes).toBe(expected.inBandMinutes);
  expect(actual.meanRhPercent!).toBeCloseTo(expected.meanRhPercent!, 9);
  expect(actual.minRhPercent).toBe(expected.minRhPercent);
  expect(actual.maxRhPercent).toBe(expected.maxRhPercent);
  // Every excursion: start, end, counted duration, worst value, direction, open end.
  expect(actual.excursions).toEqual(expected.excursions);
  expect(actual.worstExcursion).toEqual(expected.worstExcursion);
  expect(actual.longestExcursion).toEqual(expected.longestExcursion);
}

/** Each time bucket's lowest and highest reading (earliest on ties), by brute force over every reading. */
function bucketExtremes(rows: readonly RefRow[], widthMs: number, maxPoints: number) {
  const first = Math.floor(rows[0].takenAt.getTime() / widthMs) * widthMs;
  const last = Math.floor(rows[rows.length - 1].takenAt.getTime() / widthMs) * widthMs;
  const bucketMs = Math.ceil(((last - first) / widthMs + 1) / Math.floor(maxPoints / 2)) * widthMs;
  const buckets = new Map<number, { lo: RefRow; hi: RefRow }>();
  for (const r of rows) {
    const k = Math.floor((r.takenAt.getTime() - first) / bucketMs);
    const b = buckets.get(k);
    if (!b) buckets.set(k, { lo: r, hi: r });
    else {
      if (r.rhPercent < b.lo.rhPercent) b.lo = r;
      if (r.rhPercent > b.hi.rhPercent) b.hi = r;
    }
  }
  const out: RefRow[] = [];
  for (const k of [...buckets.keys()].sort((a, b) => a - b)) {
    const { lo, hi } = buckets.get(k)!;
    out.push(...(lo === hi ? [lo] : lo.takenAt <= hi.takenAt ? [lo, hi] : [hi, lo]));
  }
  return out.map((r) => ({ t: r.takenAt.getTime(), rh: r.rhPercent, rhRaw: r.rhRaw, instrument: r.instrument }));
}

describe("chamber chart from block summaries (reference: lib/climate on every reading)", () => {
  it("equals bandStats, settle times and bucket extremes over the whole record, hourly and 6-hourly buckets", async () => {
    for (const maxPoints of [1600, 24]) {
      const events = [{ label: "opening", at: new Date(at(2, 13, 30)) }, { label: "charge", at: new Date(at(4, 15, 30)) }];
      const s = await getChamberSeries({ labId: lab.labId, chamber, period: "all", maxPoints, settleFrom: events, allRowsLimit: 0 });
      // 5-minute readings: 3 × 5 min is under the 1 h floor of the gap limit.
      expect(s.maxGapMinutes).toBe(60);
      expect(s.count).toBe(all.length);
      expect([s.firstAt, s.lastAt]).toEqual([all[0].takenAt, all[all.length - 1].takenAt]);
      const ref = bandStats(all, s.band, { maxGapMinutes: s.maxGapMinutes });
      expectSameStats(s.stats, ref);
      expect(ref.excursions.length).toBeGreaterThanOrEqual(5);
      expect(ref.excursions.some((e) => e.openEnded)).toBe(true);
      for (const [i, ev] of events.entries()) {
        expect(s.settle[i].minutes).toBe(settleTimeMinutes(all, s.band, ev.at, { maxGapMinutes: s.maxGapMinutes }));
      }
      expect(s.offsets.map((o) => [o.instrument, o.offsetPercent, o.slope])).toEqual([["probe-a", 1.5, null], ["probe-b", -3, null], ["probe-a", 1.2, 1.08]]);
      expect(s.instruments.sort()).toEqual(["probe-a", "probe-b"]);

      const width = maxPoints === 24 ? 6 * HOUR : HOUR;
      expect(s.points.map(({ t, rh, rhRaw, instrument }) => ({ t, rh, rhRaw, instrument }))).toEqual(bucketExtremes(all, width, maxPoints));
      expect(s.points.length).toBeLessThanOrEqual(maxPoints);
      // Spikes survive thinning, and the clipped correction shows as 100 %RH.
      expect(s.points.some((p) => p.rhRaw === 90 && p.rh === referenceRh("probe-a", at(6, 12), 90))).toBe(true);
      expect(s.points.some((p) => p.rh === 100 && p.rhRaw === 98.5)).toBe(true);
    }
  });

  it("cuts the period mid-hour and judges settling before the period on its own window", async () => {
    const now = new Date(at(9, 12, 7));
    const events = [{ label: "inside", at: new Date(at(4, 14)) }, { label: "before", at: new Date(at(1, 9)) }];
    const s = await getChamberSeries({ labId: lab.labId, chamber, period: "7d", now, settleFrom: events, allRowsLimit: 0 });
    const fromMs = now.getTime() - 7 * DAY;
    const inPeriod = all.filter((r) => r.takenAt.getTime() >= fromMs);
    expect(s.count).toBe(inPeriod.length);
    expect(s.firstAt).toEqual(inPeriod[0].takenAt);
    expectSameStats(s.stats, bandStats(inPeriod, s.band, { maxGapMinutes: s.maxGapMinutes }));
    expect(s.settle[0].minutes).toBe(settleTimeMinutes(inPeriod, s.band, events[0].at, { maxGapMinutes: s.maxGapMinutes }));
    const window = all.filter((r) => r.takenAt.getTime() >= at(0, 9) && r.takenAt.getTime() <= at(31, 9));
    expect(s.settle[1].minutes).toBe(settleTimeMinutes(window, s.band, events[1].at, { maxGapMinutes: s.maxGapMinutes }));
    expect(s.settle[1].minutes).not.toBeNull();
  });

  it("gives the same statistics whether it loads every reading or the summaries", async () => {
    const everyRow = await getChamberSeries({ labId: lab.labId, chamber, period: "all" });
    const reduced = await getChamberSeries({ labId: lab.labId, chamber, period: "all", allRowsLimit: 0 });
    expect(everyRow.count).toBe(reduced.count);
    expect(everyRow.maxGapMinutes).toBe(reduced.maxGapMinutes);
    expectSameStats(reduced.stats, everyRow.stats);
    expect(everyRow.offsets).toEqual(reduced.offsets);
  });
});

describe("reading_blocks upkeep (triggers on readings)", () => {
  /** The summaries recomputed from the readings, per width, block and instrument. */
  async function expected(chamberId: string, widthHours: number) {
    const rows = await db.select().from(readings).where(eq(readings.chamberId, chamberId)).orderBy(asc(readings.takenAt), asc(readings.instrument));
    const out = new Map<string, { n: number; min: number; max: number; spanMs: number }>();
    rows.forEach((r, i) => {
      const start = Math.floor(r.takenAt.getTime() / (widthHours * HOUR)) * widthHours * HOUR;
      const next = rows[i + 1];
      const span = next && next.takenAt.getTime() < start + widthHours * HOUR ? next.takenAt.getTime() - r.takenAt.getTime() : 0;
      const k = `${start}|${r.instrument}`;
      const e = out.get(k) ?? { n: 0, min: Infinity, max: -Infinity, spanMs: 0 };
      out.set(k, { n: e.n + 1, min: Math.min(e.min, r.rhPercent), max: Math.max(e.max, r.rhPercent), spanMs: e.spanMs + span });
    });
    return out;
  }
  async function stored(chamberId: string, widthHours: number) {
    const rows = await db.execute<{ start: string; instrument: string; n: number; min: number; max: number; span: number }>(sql`
      select (extract(epoch from block_start) * 1000)::bigint::text as start, instrument, n, min_rh_percent as min, max_rh_percent as max, span_ms as span
      from reading_blocks where chamber_id = ${chamberId} and width_hours = ${widthHours}`);
    return new Map(rows.rows.map((r) => [`${r.start}|${r.instrument}`, { n: r.n, min: r.min, max: r.max, spanMs: r.span }]));
  }
  const sameAs = async (chamberId: string) => {
    for (const w of [1, 6]) expect(await stored(chamberId, w)).toEqual(await expected(chamberId, w));
  };

  it("follows inserts, updates and deletes of readings, including two writers in the same hour", async () => {
    const c = await createChamber({ labId: lab.labId, userId: lab.users.researcher.id, values: chamberSchema.parse({ name: "Upkeep jar", kind: "water", nominalTempC: "20" }) });
    const base = Date.UTC(2025, 5, 1, 10);
    await insertReadings(db, { labId: lab.labId, chamberId: c.id, source: "api", rows: Array.from({ length: 200 }, (_, i) => ({ takenAt: new Date(base + i * 7 * MIN), rhPercent: 90 + (i % 9), tempC: 20, dewPointC: null, instrument: i % 3 ? "x" : "y" })) });
    await sameAs(c.id);
    await db.update(readings).set({ rhPercent: 50 }).where(and(eq(readings.chamberId, c.id), gte(readings.takenAt, new Date(base + 5 * HOUR))));
    await db.update(readings).set({ takenAt: new Date(base - DAY) }).where(and(eq(readings.chamberId, c.id), eq(readings.takenAt, new Date(base))));
    await sameAs(c.id);
    await db.delete(readings).where(and(eq(readings.chamberId, c.id), gte(readings.takenAt, new Date(base + 10 * HOUR))));
    await sameAs(c.id);

    // Two transactions add readings to the same hour at once; the summary must hold both.
    const hour = base + 30 * HOUR;
    const write = (instrument: string, offsetMin: number) =>
      db.transaction(async (tx) => {
        await insertReadings(tx, { labId: lab.labId, chamberId: c.id, source: "api", rows: Array.from({ length: 20 }, (_, i) => ({ takenAt: new Date(hour + (i * 3 + offsetMin) * MIN), rhPercent: 95, tempC: null, dewPointC: null, instrument })) });
        await new Promise((r) => setTimeout(r, 50)); // keep both transactions open together
      });
    await Promise.all([write("x", 0), write("y", 1)]);
    await sameAs(c.id);

    await db.delete(readings).where(eq(readings.chamberId, c.id));
    expect((await stored(c.id, 1)).size + (await stored(c.id, 6)).size).toBe(0);
  });
});
