// Rough timing of the logger CSV importer on a 100,000-row file (one reading a minute for ~70 days).
// Run: npm run bench -- climate (or npx tsx bench/climate-parse-bench.ts)

import { bandStats, downsample } from "@/lib/climate/band-stats";
import { importCsv } from "@/lib/climate/csv-import";

const ROWS = 100_000;
const lines = ["Date Time;RH %;Temp °C"];
const startMs = Date.UTC(2025, 0, 1);
for (let i = 0; i < ROWS; i++) {
  const stamp = new Date(startMs + i * 60_000).toISOString().slice(0, 16).replace("T", " ");
  lines.push(`${stamp};${(40 + (i % 100) / 10).toFixed(1).replace(".", ",")};21,5`);
}
const text = lines.join("\n");

for (let run = 1; run <= 3; run++) {
  const t0 = performance.now();
  const result = importCsv(text, { timeZone: "Europe/Berlin", mapping: { time: 0, rhPercent: 1, tempC: 2 } });
  const t1 = performance.now();
  const stats = bandStats(result.rows, { minRh: 35, maxRh: 45 });
  const t2 = performance.now();
  const thin = downsample(result.rows, 2000);
  const t3 = performance.now();
  console.log(
    `run ${run}: import ${result.rows.length} rows ${(t1 - t0).toFixed(0)} ms, band stats ${(t2 - t1).toFixed(0)} ms ` +
      `(${stats.excursions.length} excursions), downsample to ${thin.length} ${(t3 - t2).toFixed(1)} ms`,
  );
}
