// Server-side time of the comparison: the demo trial through getTrialAnalysis (database load +
// computation) for each grouping, and the computation alone on a synthetic 1,200-specimen trial.
// Run with `node --conditions=react-server --import tsx bench/analysis-bench.ts`; `npm run bench` runs it too.
import { like } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { getTrialAnalysis } from "@/db/queries/analysis";
import { compareGroups } from "@/lib/analysis/compare";
import type { SpecimenOutcome } from "@/lib/analysis/derive";
import { GROUPINGS, type Grouping } from "@/lib/analysis/groups";

const TARGET_MS = 200;

function stats(times: number[]) {
  const sorted = [...times].sort((a, b) => a - b);
  return { medianMs: sorted[Math.floor(sorted.length / 2)], minMs: sorted[0], maxMs: sorted[sorted.length - 1] };
}

async function time(runs: number, fn: () => unknown | Promise<unknown>) {
  for (let i = 0; i < 3; i++) await fn(); // warm-up
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await fn();
    times.push(performance.now() - t0);
  }
  return stats(times);
}

/** 1,200 specimens in 4 chambers × 3 treatments, 10 inspections, rust onset faster in wetter jars. */
function syntheticOutcomes(): SpecimenOutcome[] {
  let seed = 42;
  const rand = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
  const days = [0, 1, 2, 4, 7, 14, 28, 56, 112, 224];
  const out: SpecimenOutcome[] = [];
  for (let i = 0; i < 1200; i++) {
    const chamber = i % 4;
    const treatment = Math.floor(i / 4) % 3;
    const onset = -Math.log(1 - rand()) * (20 + chamber * 60 + treatment * 40);
    const observations = days.map((day, k) => ({
      inspectionId: `i${k}`, day, rusted: day >= onset, areaPercent: day >= onset ? Math.min(60, 0.02 * (day - onset + 1)) : 0, weeping: false,
    }));
    const first = observations.findIndex((o) => o.rusted);
    out.push({
      placementId: `p${i}`, specimenId: `s${i}`, specimenLabel: `SY-${i}`, materialClass: i % 3 ? "iron-meteorite" : "stony-iron",
      chamberId: `c${chamber}`, chamberName: `Jar ${chamber}`, chamberRhPercent: 10 + chamber * 25, treatmentId: `t${treatment}`,
      treatmentName: `Treatment ${treatment}`, treatmentKind: treatment === 0 ? "control" : "coating", armLabel: null,
      observations,
      interval: first < 0 ? { lower: days[days.length - 1], upper: null } : { lower: first === 0 ? 0 : days[first - 1], upper: days[first] },
      rusted: first >= 0, finalAreaPercent: observations[observations.length - 1].areaPercent, finalDay: 224, weepingSeen: false,
      entry: 0, weepingInterval: { lower: 224, upper: null }, rustedEarlier: false, weptEarlier: false,
    });
  }
  return out;
}

export async function runAnalysisBench(runs = 21) {
  const [trial] = await db.select().from(s.trials).where(like(s.trials.title, "Storage humidity%")).limit(1);
  if (!trial) throw new Error("analysis bench: the demo trial is not in this database (seed it first)");
  const rows: { name: string; medianMs: number; minMs: number; maxMs: number }[] = [];
  for (const groupBy of GROUPINGS) {
    const r = await time(runs, () => getTrialAnalysis({ labId: trial.labId, trialId: trial.id, groupBy: groupBy as Grouping }));
    rows.push({ name: `demo trial, load + compute, by ${groupBy}`, ...r });
  }
  const synthetic = syntheticOutcomes();
  for (const groupBy of ["treatment", "arm"] as const) {
    const r = await time(runs, () => compareGroups(synthetic, { groupBy }));
    rows.push({ name: `1,200 synthetic specimens, compute only, by ${groupBy}`, ...r });
  }
  return { rows, targetMs: TARGET_MS, withinTarget: rows.every((r) => r.medianMs < TARGET_MS) };
}

if (/analysis-bench\.[cm]?[jt]s$/.test(process.argv[1] ?? "")) {
  runAnalysisBench()
    .then((r) => {
      for (const row of r.rows) {
        console.log(`${row.name}: median ${row.medianMs.toFixed(1)} ms (min ${row.minMs.toFixed(1)}, max ${row.maxMs.toFixed(1)})`);
      }
      console.log(`target: every median < ${r.targetMs} ms — ${r.withinTarget ? "met" : "NOT met"}`);
    })
    .then(() => closeDb())
    .catch(async (err) => {
      console.error(err);
      await closeDb();
      process.exit(1);
    });
}
