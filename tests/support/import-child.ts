// Runs one logger CSV import in its own process (the fault test kills it half way).
// argv: labId userId chamberId rows
import { importReadingsFromCsv } from "@/db/queries/readings";
import { closeDb } from "@/db/client";

const [labId, userId, chamberId, rowsArg] = process.argv.slice(2);
const rows = Number(rowsArg);
const lines = ["time,rh,temp"];
const start = Date.UTC(2025, 0, 1);
for (let i = 0; i < rows; i++) lines.push(`${new Date(start + i * 60_000).toISOString()},${(50 + (i % 20) / 10).toFixed(1)},21.0`);

importReadingsFromCsv({
  labId, userId, chamberId, filename: "kill-test.csv", text: lines.join("\n"),
  options: { instrument: "kill-logger", mapping: { time: 0, rhPercent: 1, tempC: 2 }, delimiter: "auto", skipLines: 0, hasHeader: true, timeZone: "UTC", temperatureUnit: "C", dateFormat: "auto" },
  onProgress: (p) => {
    if (p.phase === "storing") process.stdout.write(`storing ${p.done}/${p.total}\n`);
  },
})
  .then((r) => {
    process.stdout.write(`finished ${r.ok}\n`);
    return closeDb();
  })
  .catch((e) => {
    process.stderr.write(String(e));
    process.exit(1);
  });
