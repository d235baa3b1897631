// Chamber evidence on real PostgreSQL: two-salt hygrometer checks through the action (bad input
// refused at the field, nothing saved), each placement's exposure equal to a direct computation
// over the raw readings written here, and the re-analysis without out-of-band jars.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { addHygrometerCheckAction } from "@/app/_actions/chamber-records";
import { getTrialAnalysis } from "@/db/queries/analysis";
import { loadTrialExposure } from "@/db/queries/exposure";
import { getTrial } from "@/db/queries/trial-access";
import { getChamberSeries } from "@/db/queries/readings-series";
import { readSessionIdentity } from "@/lib/auth/session";
import { dewPointC } from "@/lib/humidity/psychrometrics";
import { saltEquilibriumRh } from "@/lib/humidity/salts";
import { GET as getAnalysis } from "@/app/api/trials/[trialId]/analysis/route";
import { createTestLab, type TestLab } from "../support/db";
import { buildHandTrial, type HandTrial } from "./analysis-fixtures";

vi.mock("@/lib/auth/session", () => ({ readSessionIdentity: vi.fn() }));
const session = vi.mocked(readSessionIdentity);

const MIN = 60_000;
const HOUR = 60 * MIN;
let lab: TestLab;
let hand: HandTrial;
let jarA: string;
let jarB: string;
type Raw = { t: number; rh: number; tempC: number | null };
const rawA: Raw[] = [];
const rawB: Raw[] = [];

async function addJar(name: string) {
  const [c] = await db.insert(s.chambers).values({
    labId: lab.labId, name, kind: "saturated-salt", saltId: "NaCl", nominalTempC: 21, setpointRhPercent: 75.4, toleranceRhPercent: 2, volumeL: 2,
  }).returning();
  return c.id;
}

const berlin = (ms: number) => new Date(ms + HOUR).toISOString().slice(0, 16); // Europe/Berlin in January is UTC+1

beforeAll(async () => {
  lab = await createTestLab("Chamber exposure");
  hand = await buildHandTrial(lab);
  jarA = await addJar("Exposure jar A");
  jarB = await addJar("Exposure jar B");
  // neverRusts sits in jar B, everyone else in jar A.
  await db.update(s.placements).set({ chamberId: jarA }).where(eq(s.placements.trialId, hand.trialId));
  await db.update(s.placements).set({ chamberId: jarB }).where(and(eq(s.placements.trialId, hand.trialId), eq(s.placements.specimenId, hand.specimens.neverRusts)));
  // Invented readings every 30 min for three days from the start, with a 5-hour hole on day 2; jar A
  // near its band with a humid, warm spell, jar B mostly far above it.
  const t0 = hand.start.getTime();
  for (let i = 0, t = t0; i < 144; i++) {
    t += i === 70 ? 5 * HOUR : 30 * MIN;
    rawA.push({ t, rh: 75.4 + 4 * Math.sin(i / 9) + (i >= 100 && i < 110 ? 20 : 0), tempC: i % 13 === 0 ? null : 21 + Math.cos(i / 7) });
    rawB.push({ t, rh: 84 + 3 * Math.sin(i / 5), tempC: 21 });
  }
  const rows = (chamberId: string, raw: Raw[], instrument: string) =>
    raw.map((r) => ({ labId: lab.labId, chamberId, takenAt: new Date(r.t), rhPercent: Math.min(100, r.rh), tempC: r.tempC, source: "csv" as const, instrument }));
  await db.insert(s.readings).values([...rows(jarA, rawA, "probe-A"), ...rows(jarB, rawB, "probe-B")]);
});
afterAll(async () => {
  await closeDb();
});

const checkInput = (over: Record<string, unknown>) => ({
  chamberId: jarA, instrument: "probe-A", saltId: "NaCl", tempC: "25", readingRhPercent: "77.4", checkedAt: berlin(hand.start.getTime() + 12 * HOUR),
  timeZone: "Europe/Berlin", apply: "on", notes: "", ...over,
});

async function checkCount() {
  return (await db.select({ id: s.hygrometerChecks.id }).from(s.hygrometerChecks).where(eq(s.hygrometerChecks.labId, lab.labId))).length;
}

describe("hygrometer checks over two salts", () => {
  it("refuses the same salt twice, readings outside 0–100 %RH and a falling response, saving nothing", async () => {
    const before = await checkCount();
    const same = await addHygrometerCheckAction.withIdentity(lab.as("technician"), checkInput({ salt2Id: "NaCl", reading2RhPercent: "78" }));
    expect(same.ok).toBe(false);
    expect(same.errors?.salt2Id?.[0]).toMatch(/two different salts/);
    const high = await addHygrometerCheckAction.withIdentity(lab.as("technician"), checkInput({ readingRhPercent: "120" }));
    expect(high.errors?.readingRhPercent?.[0]).toMatch(/100/);
    const low2 = await addHygrometerCheckAction.withIdentity(lab.as("technician"), checkInput({ saltId: "MgCl2", readingRhPercent: "34", salt2Id: "NaCl", reading2RhPercent: "-3" }));
    expect(low2.errors?.reading2RhPercent?.[0]).toMatch(/0/);
    const falling = await addHygrometerCheckAction.withIdentity(lab.as("technician"), checkInput({ saltId: "MgCl2", readingRhPercent: "80", salt2Id: "NaCl", reading2RhPercent: "30" }));
    expect(falling.errors?.reading2RhPercent?.[0]).toMatch(/wetter salt/);
    const half = await addHygrometerCheckAction.withIdentity(lab.as("technician"), checkInput({ reading2RhPercent: "80" }));
    expect(half.errors?.salt2Id?.[0]).toMatch(/second salt/);
    expect(await checkCount()).toBe(before);
  });

  it("stores the slope of a two-salt check against the Greenspan 1977 references", async () => {
    // One-salt check half a day in: reads 77.4 over NaCl at 25 °C.
    expect((await addHygrometerCheckAction.withIdentity(lab.as("technician"), checkInput({}))).ok).toBe(true);
    // Two-salt check at 60 h: 34.0 over MgCl2 and 77.0 over NaCl at 25 °C.
    const r = await addHygrometerCheckAction.withIdentity(lab.as("technician"), checkInput({
      saltId: "MgCl2", readingRhPercent: "34", salt2Id: "NaCl", reading2RhPercent: "77", checkedAt: berlin(hand.start.getTime() + 60 * HOUR),
    }));
    expect(r.ok).toBe(true);
    expect(r.message).toMatch(/slope|responds/);
    const [row] = await db.select().from(s.hygrometerChecks).where(and(eq(s.hygrometerChecks.labId, lab.labId), eq(s.hygrometerChecks.saltId, "MgCl2")));
    // Greenspan 1977 fits in lib/humidity/salts.ts: MgCl2 32.78, NaCl 75.29 %RH at 25 °C (Table 1, from memory).
    const mg = saltEquilibriumRh("MgCl2", 25).rhPercent;
    const na = saltEquilibriumRh("NaCl", 25).rhPercent;
    expect(mg).toBeCloseTo(32.78, 1);
    expect(na).toBeCloseTo(75.29, 1);
    expect(row.slope!).toBeCloseTo((77 - 34) / (na - mg), 12);
    expect(row.reference2RhPercent!).toBeCloseTo(na, 12);
    expect(row.offsetRhPercent).toBeCloseTo(34 - mg, 12);
  });
});

describe("exposure per placement", () => {
  it("equals a direct computation over the raw readings, the checks interpolated by hand", async () => {
    const trial = await getTrial({ labId: lab.labId, trialId: hand.trialId });
    const rows = await loadTrialExposure({ labId: lab.labId, trial, thresholdsRhPercent: [60, 80] });
    expect(rows).toHaveLength(4);

    const mg = saltEquilibriumRh("MgCl2", 25).rhPercent;
    const na = saltEquilibriumRh("NaCl", 25).rhPercent;
    const c1 = { at: hand.start.getTime() + 12 * HOUR, gain: 1, shift: na - 77.4 };
    const gain2 = (na - mg) / (77 - 34);
    const c2 = { at: hand.start.getTime() + 60 * HOUR, gain: gain2, shift: mg - gain2 * 34 };
    // Gap limit as on the chamber page: 3 × the median interval (30 min) = 90 min, at least 60.
    const direct = (raw: Raw[], correct: boolean) => {
      const fix = (r: Raw) => {
        const rh = Math.min(100, r.rh);
        if (!correct) return rh;
        const w = Math.min(1, Math.max(0, (r.t - c1.at) / (c2.at - c1.at)));
        return Math.min(100, Math.max(0, (c1.gain + w * (c2.gain - c1.gain)) * rh + c1.shift + w * (c2.shift - c1.shift)));
      };
      let counted = 0, weighted = 0, out = 0, above60 = 0, above80 = 0, withTemp = 0, wet = 0;
      for (let i = 0; i + 1 < raw.length; i++) {
        const dt = (raw[i + 1].t - raw[i].t) / MIN;
        if (dt > 90) continue;
        const rh = fix(raw[i]);
        counted += dt;
        weighted += rh * dt;
        if (rh < 73.4 || rh > 77.4) out += dt;
        if (rh > 60) above60 += dt;
        if (rh > 80) above80 += dt;
        const tc = raw[i].tempC;
        if (tc != null) {
          withTemp += dt;
          if (tc - dewPointC(tc, rh) <= 2) wet += dt;
        }
      }
      return { counted, mean: weighted / counted, outShare: out / counted, above60, above80, withTemp, wet };
    };
    expect(rows.filter((r) => r.chamberId === jarA)).toHaveLength(3);
    expect(rows.filter((r) => r.chamberId === jarB)).toHaveLength(1);
    for (const [jar, raw, corrected] of [[jarA, rawA, true], [jarB, rawB, false]] as const) {
      const d = direct(raw, corrected);
      for (const row of rows.filter((r) => r.chamberId === jar)) {
        const e = row.exposure;
        expect(e.readings).toBe(raw.length);
        expect(e.countedMinutes).toBeCloseTo(d.counted, 6);
        expect(e.meanRhPercent!).toBeCloseTo(d.mean, 9);
        expect(e.outOfBandShare!).toBeCloseTo(d.outShare, 9);
        expect(e.above.map((a) => a.minutes)).toEqual([expect.closeTo(d.above60, 6), expect.closeTo(d.above80, 6)]);
        expect(e.minutesWithTemp).toBeCloseTo(d.withTemp, 6);
        expect(e.condensationMinutes).toBeCloseTo(d.wet, 6);
        expect(e.corrected).toBe(corrected);
      }
    }
    expect(direct(rawA, true).wet).toBeGreaterThan(0);
  });

  it("the chamber chart's band statistics correct by the same rule: equal to the exposure of a placement over every reading of the jar", async () => {
    const trial = await getTrial({ labId: lab.labId, trialId: hand.trialId });
    const [row] = (await loadTrialExposure({ labId: lab.labId, trial, thresholdsRhPercent: [60] })).filter((r) => r.chamberId === jarA);
    expect(row.exposure.readings).toBe(rawA.length);
    const [chamber] = await db.select().from(s.chambers).where(eq(s.chambers.id, jarA));
    // Every reading, and the block summaries plus the hours that need their readings (allRowsLimit 0).
    for (const allRowsLimit of [100_000, 0]) {
      const chart = await getChamberSeries({ labId: lab.labId, chamber, period: "all", allRowsLimit });
      expect(chart.count).toBe(rawA.length);
      expect(chart.stats.countedMinutes).toBeCloseTo(row.exposure.countedMinutes, 9);
      expect(chart.stats.meanRhPercent!).toBeCloseTo(row.exposure.meanRhPercent!, 9);
      expect(1 - chart.stats.fractionInBand!).toBeCloseTo(row.exposure.outOfBandShare!, 9);
      expect(chart.offsets.map((o) => o.slope != null)).toEqual([false, true]); // the one-salt check, then the two-salt one
    }
  });

  it("the re-analysis leaves out the specimen whose jar was out of band more than the share, and says which", async () => {
    const all = await getTrialAnalysis({ labId: lab.labId, trialId: hand.trialId, groupBy: "treatment", exposure: { thresholdsRhPercent: [60], maxOutOfBandPercent: null } });
    const cut = await getTrialAnalysis({ labId: lab.labId, trialId: hand.trialId, groupBy: "treatment", exposure: { thresholdsRhPercent: [60], maxOutOfBandPercent: 50 } });
    expect(all.exposure!.excluded).toEqual([]);
    expect(cut.exposure!.excluded.map((e) => e.specimenLabel)).toEqual([hand.labels.neverRusts]);
    expect(cut.exposure!.excluded[0].outOfBandPercent).toBeGreaterThan(50);
    const n = (a: typeof all) => a.comparison!.groups.reduce((sum, g) => sum + g.n, 0);
    expect(n(cut)).toBe(n(all) - 1);
    // The per-specimen list still holds every placement.
    expect(cut.outcomes).toHaveLength(all.outcomes.length);
  });

  it("the analysis endpoint names a bad share or threshold (422) and returns exposure otherwise", async () => {
    session.mockResolvedValue(lab.as("researcher") as never);
    const call = (qs: string) => getAnalysis(new Request(`http://localhost/api/trials/${hand.trialId}/analysis?${qs}`), { params: Promise.resolve({ trialId: hand.trialId }) });
    const bad = await call("outOfBandMax=150");
    expect(bad.status).toBe(422);
    expect(JSON.stringify(await bad.json())).toMatch(/0 to 100/);
    expect((await call("above=20,abc")).status).toBe(422);
    const ok = await call("above=60&outOfBandMax=50");
    expect(ok.status).toBe(200);
    const body = await ok.json();
    expect(body.exposure.excluded).toHaveLength(1);
    expect(body.exposure.placements).toHaveLength(4);
    // Exposure is about jars: no arm or treatment in it.
    expect(JSON.stringify(body.exposure)).not.toMatch(/treatment|arm/i);
  });
});
