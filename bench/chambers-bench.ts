// Chambers: import of a 100,000-row logger CSV through the real import path (parse, all-or-nothing
// check, one transaction; the reading_blocks triggers included) and the chamber chart query
// (getChamberSeries: block summaries, hygrometer offsets, band statistics, settle time after an
// event, chart thinning) over a chamber with 500,000 readings (about a year of minute readings),
// for the periods "all", 30 days and 7 days.
// Creates its own lab and chambers in DATABASE_URL and removes them afterwards.
// Run: node --conditions=react-server --import tsx bench/chambers-bench.ts
import crypto from "node:crypto";
import { pathToFileURL } from "node:url";
import { eq, sql } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { percentiles } from "./support";
import { createChamber, getChamber } from "@/db/queries/chambers";
import { importReadingsFromCsv, insertReadings, type NewReading } from "@/db/queries/readings";
import { getChamberSeries } from "@/db/queries/readings-series";
import { chamberSchema, csvImportOptionsSchema, type Period } from "@/lib/validation/chambers";

export type ChartFigures = { period: Period; runsMs: number[]; p50Ms: number; p95Ms: number; readings: number; points: number; excursions: number };
export type ChambersBenchResult = {
  importRows: number;
  importRunsMs: number[];
  importRowsPerSecond: number;
  chartReadings: number;
  charts: ChartFigures[];
};

const MINUTE = 60_000;

function loggerCsv(rows: number, startMs: number): string {
  const lines = ["Logger TX-9 · bench", "Date Time;RH %;Temp °C"];
  for (let i = 0; i < rows; i++) {
    const stamp = new Date(startMs + i * MINUTE).toISOString().slice(0, 16).replace("T", " ");
    lines.push(`${stamp};${(33 + ((i * 7) % 40) / 20).toFixed(1).replace(".", ",")};21,${i % 10}`);
  }
  return lines.join("\n");
}

export async function runChambersBench(opts: { importRows?: number; importRuns?: number; chartReadings?: number; chartRuns?: number } = {}): Promise<ChambersBenchResult> {
  const importRows = opts.importRows ?? 100_000;
  const importRuns = opts.importRuns ?? 2;
  const chartReadings = opts.chartReadings ?? 500_000;
  const chartRuns = opts.chartRuns ?? 40;
  const tag = crypto.randomBytes(4).toString("hex");
  const [lab] = await db.insert(s.labs).values({ name: `Chambers bench ${tag}` }).returning();
  const [user] = await db.insert(s.users).values({ name: `bench ${tag}`, email: `bench-${tag}@bench.example`, passwordHash: "x" }).returning();
  try {
    await db.insert(s.memberships).values({ userId: user.id, labId: lab.id, role: "lead" });
    const values = (name: string) => chamberSchema.parse({ name, kind: "saturated-salt", saltId: "MgCl2", nominalTempC: "21" });

    // 1. Logger CSV import, rows per second including parsing and the single transaction.
    const startMs = Date.UTC(2024, 0, 1);
    const text = loggerCsv(importRows, startMs);
    const options = csvImportOptionsSchema.parse({ instrument: "tx-9", mapping: { time: 0, rhPercent: 1, tempC: 2 }, delimiter: ";", skipLines: 1, timeZone: "Europe/Berlin" });
    const importRunsMs: number[] = [];
    for (let run = 0; run < importRuns; run++) {
      const chamber = await createChamber({ labId: lab.id, userId: user.id, values: values(`Import ${run + 1}`) });
      const t0 = performance.now();
      const r = await importReadingsFromCsv({ labId: lab.id, userId: user.id, chamberId: chamber.id, filename: "bench.csv", text, options });
      importRunsMs.push(performance.now() - t0);
      if (!r.ok || r.stored !== importRows) throw new Error(`import stored ${r.ok ? r.stored : `nothing (${r.errors[0]?.message})`} of ${importRows}`);
    }

    // 2. Chart query over a year of minute readings.
    const chartChamber = await createChamber({ labId: lab.id, userId: user.id, values: values("Chart") });
    const endMs = Date.now();
    const from = endMs - chartReadings * MINUTE;
    for (let i = 0; i < chartReadings; i += 50_000) {
      const part: NewReading[] = [];
      for (let j = i; j < Math.min(chartReadings, i + 50_000); j++) {
        // A steady 33 %RH with a daily swing and an excursion every ten days.
        const day = j / 1440;
        const rh = 33 + 0.6 * Math.sin(2 * Math.PI * day) + (Math.floor(day) % 10 === 0 && j % 1440 < 180 ? 8 : 0);
        part.push({ takenAt: new Date(from + j * MINUTE), rhPercent: rh, tempC: 21 + 0.5 * Math.sin(2 * Math.PI * day), dewPointC: null, instrument: "tx-9" });
      }
      await insertReadings(db, { labId: lab.id, chamberId: chartChamber.id, source: "api", rows: part });
    }
    await db.execute(sql`analyze readings`);
    const chamber = await getChamber({ labId: lab.id, chamberId: chartChamber.id });
    // As the page asks: with a settle time after an opening 200 days in (before the 30- and
    // 7-day periods, so those also read the opening's own window).
    const settleFrom = [{ label: "opening", at: new Date(from + 200 * 1440 * MINUTE) }];
    const charts: ChartFigures[] = [];
    for (const period of ["all", "30d", "7d"] as const) {
      const runsMs: number[] = [];
      let last: Awaited<ReturnType<typeof getChamberSeries>> | null = null;
      for (let run = 0; run < chartRuns + 2; run++) {
        const t0 = performance.now();
        last = await getChamberSeries({ labId: lab.id, chamber, period, settleFrom });
        const ms = performance.now() - t0;
        if (run >= 2) runsMs.push(ms); // the first runs warm the connection pool and JIT
      }
      if (period === "all" && last!.count !== chartReadings) throw new Error(`chart saw ${last!.count} readings`);
      const { p50, p95 } = percentiles([...runsMs]);
      charts.push({ period, runsMs, p50Ms: p50, p95Ms: p95, readings: last!.count, points: last!.points.length, excursions: last!.stats.excursions.length });
    }
    const totalImportMs = importRunsMs.reduce((a, b) => a + b, 0);
    return { importRows, importRunsMs, importRowsPerSecond: (importRows * importRuns) / (totalImportMs / 1000), chartReadings, charts };
  } finally {
    // Readings block chamber deletion (restrict), so they go first; the lab cascade takes the rest.
    await db.delete(s.readings).where(eq(s.readings.labId, lab.id));
    await db.delete(s.readingImports).where(eq(s.readingImports.labId, lab.id));
    await db.delete(s.labs).where(eq(s.labs.id, lab.id));
    await db.delete(s.users).where(eq(s.users.id, user.id));
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  runChambersBench()
    .then((r) => {
      console.log(`logger CSV import, ${r.importRows.toLocaleString("en")} rows: ${r.importRunsMs.map((ms) => ms.toFixed(0)).join(", ")} ms → ${Math.round(r.importRowsPerSecond).toLocaleString("en")} rows/s`);
      console.log(`chamber chart query, chamber with ${r.chartReadings.toLocaleString("en")} readings:`);
      for (const c of r.charts) {
        console.log(`  period ${JSON.stringify(c.period).padEnd(5)} (${c.readings.toLocaleString("en")} readings, ${c.points} points, ${c.excursions} excursions): p50 ${c.p50Ms.toFixed(0)} ms, p95 ${c.p95Ms.toFixed(0)} ms (${c.runsMs.length} runs)`);
      }
    })
    .catch((err) => {
      console.error(err);
      process.exitCode = 1;
    })
    .finally(() => closeDb());
}
