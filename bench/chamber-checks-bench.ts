// The chamber chart ("all", getChamberSeries) over a chamber of 100,000 minute readings (about 70
// days) with no hygrometer check, with two equal checks 20 days apart, and with two checks that
// differ (drift between them: those 20 days are read as readings, since a block summary cannot
// stand for readings under a correction that changes inside it). Creates its own lab and removes it.
// Run: node --conditions=react-server --import tsx bench/chamber-checks-bench.ts
import crypto from "node:crypto";
import { pathToFileURL } from "node:url";
import { eq, sql } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { createChamber, getChamber } from "@/db/queries/chambers";
import { insertReadings, type NewReading } from "@/db/queries/readings";
import { getChamberSeries } from "@/db/queries/readings-series";
import { chamberSchema } from "@/lib/validation/chambers";
import { percentiles } from "./support";

const MINUTE = 60_000;
const DAY = 1440 * MINUTE;

export async function runChamberChecksBench(opts: { readings?: number; runs?: number } = {}) {
  const n = opts.readings ?? 100_000;
  const runs = opts.runs ?? 10;
  const tag = crypto.randomBytes(4).toString("hex");
  const [lab] = await db.insert(s.labs).values({ name: `Checks bench ${tag}` }).returning();
  const [user] = await db.insert(s.users).values({ name: `bench ${tag}`, email: `bench-${tag}@bench.example`, passwordHash: "x" }).returning();
  try {
    await db.insert(s.memberships).values({ userId: user.id, labId: lab.id, role: "lead" });
    const created = await createChamber({ labId: lab.id, userId: user.id, values: chamberSchema.parse({ name: "Checked jar", kind: "saturated-salt", saltId: "MgCl2", nominalTempC: "21" }) });
    const from = Date.now() - n * MINUTE;
    for (let i = 0; i < n; i += 50_000) {
      const part: NewReading[] = [];
      for (let j = i; j < Math.min(n, i + 50_000); j++) {
        const day = j / 1440;
        part.push({ takenAt: new Date(from + j * MINUTE), rhPercent: 33 + 0.6 * Math.sin(2 * Math.PI * day), tempC: 21, dewPointC: null, instrument: "tx-9" });
      }
      await insertReadings(db, { labId: lab.id, chamberId: created.id, source: "api", rows: part });
    }
    await db.execute(sql`analyze readings`);
    const chamber = await getChamber({ labId: lab.id, chamberId: created.id });
    const check = { labId: lab.id, chamberId: created.id, instrument: "tx-9", saltId: "MgCl2", tempC: 21, readingRhPercent: 34, referenceRhPercent: 33, notes: "", applied: true };
    const out: { checks: string; p50Ms: number; p95Ms: number; count: number }[] = [];
    const time = async (label: string) => {
      const ms: number[] = [];
      let count = 0;
      for (let run = 0; run < runs + 2; run++) {
        const t0 = performance.now();
        count = (await getChamberSeries({ labId: lab.id, chamber, period: "all" })).count;
        if (run >= 2) ms.push(performance.now() - t0);
      }
      const p = percentiles(ms);
      out.push({ checks: label, p50Ms: p.p50, p95Ms: p.p95, count });
    };
    await time("none");
    await db.insert(s.hygrometerChecks).values([{ ...check, offsetRhPercent: 1, checkedAt: new Date(from + 20 * DAY) }, { ...check, offsetRhPercent: 1, checkedAt: new Date(from + 40 * DAY) }]);
    await time("two equal, 20 days apart");
    await db.delete(s.hygrometerChecks).where(eq(s.hygrometerChecks.labId, lab.id));
    await db.insert(s.hygrometerChecks).values([{ ...check, offsetRhPercent: 1, checkedAt: new Date(from + 20 * DAY) }, { ...check, offsetRhPercent: 2, checkedAt: new Date(from + 40 * DAY) }]);
    await time("two different, 20 days apart (drift)");
    return out;
  } finally {
    await db.delete(s.hygrometerChecks).where(eq(s.hygrometerChecks.labId, lab.id));
    await db.delete(s.readings).where(eq(s.readings.labId, lab.id));
    await db.delete(s.labs).where(eq(s.labs.id, lab.id));
    await db.delete(s.users).where(eq(s.users.id, user.id));
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  runChamberChecksBench()
    .then((rows) => {
      for (const r of rows) console.log(`chamber chart "all", ${r.count.toLocaleString("en")} readings, checks ${r.checks}: p50 ${r.p50Ms.toFixed(0)} ms, p95 ${r.p95Ms.toFixed(0)} ms`);
    })
    .catch((err) => {
      console.error(err);
      process.exitCode = 1;
    })
    .finally(() => closeDb());
}
