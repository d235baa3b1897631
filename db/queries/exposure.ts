import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { chamberBand, type RhBand } from "@/lib/climate/band-stats";
import { OffsetTimeline } from "@/lib/climate/check-timeline";
import { placementExposure, type Exposure } from "@/lib/climate/exposure";
import { COARSE_MS, gapLimitMinutes, groupBlocks } from "@/lib/climate/readings-reduce";
import { db } from "../client";
import { chambers, placements, specimens } from "../schema";
import { loadAppliedChecks, loadBlockSpans, loadExposureRows, withSnapshot, type ChamberSpan, type Snapshot } from "./climate-sql";
import type { Trial } from "./trial-access";

/** One placement and what its jar measured over it (no arm or treatment: exposure is about the jar). */
export type PlacementExposureRow = {
  placementId: string; specimenId: string; specimenLabel: string; chamberId: string; chamberName: string;
  fromAt: Date; toAt: Date; open: boolean; band: RhBand; exposure: Exposure;
};

/** Applied checks of the chamber's instruments as timed corrections, per instrument, oldest first (the chart's OffsetTimeline). */
async function correctionsOf(snap: Snapshot, key: { labId: string; chamberId: string }) {
  return new OffsetTimeline(await loadAppliedChecks(snap, key)).timed();
}

async function correctionsPerChamber(snap: Snapshot, labId: string, chamberIds: readonly string[]) {
  const out = [];
  for (const chamberId of chamberIds) out.push(await correctionsOf(snap, { labId, chamberId }));
  return out;
}

/** First index of sorted values where pred (monotone: false … true) holds; values.length if none. */
function firstIndex(values: readonly number[], pred: (v: number) => boolean): number {
  let lo = 0;
  let hi = values.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (pred(values[mid])) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/**
 * Per placement of a trial, what the jar measured over it: every reading of the placement's time
 * (corrected: lib/climate/exposure), with the gap limit the chamber page uses for that window. A
 * placement still open runs to the trial's conclusion, else to now. Placements of one jar over the
 * same window are computed once. One snapshot for the trial: the checks per chamber, then one query
 * for the 6-hour blocks and one for the readings of all its chambers.
 */
export async function loadTrialExposure({ labId, trial, thresholdsRhPercent, now = new Date() }: {
  labId: string; trial: Pick<Trial, "id" | "startedAt" | "concludedAt">; thresholdsRhPercent: readonly number[]; now?: Date;
}): Promise<PlacementExposureRow[]> {
  const rows = await db
    .select({
      placementId: placements.id, specimenId: placements.specimenId, specimenLabel: specimens.label, chamberId: placements.chamberId,
      chamberName: chambers.name, setpointRhPercent: chambers.setpointRhPercent, toleranceRhPercent: chambers.toleranceRhPercent,
      fromAt: placements.fromAt, toAt: placements.toAt,
    })
    .from(placements)
    .innerJoin(specimens, eq(specimens.id, placements.specimenId))
    .innerJoin(chambers, eq(chambers.id, placements.chamberId))
    .where(and(eq(placements.labId, labId), eq(placements.trialId, trial.id)))
    .orderBy(asc(specimens.label), asc(placements.fromAt));
  const end = trial.concludedAt ?? now;
  const windows = rows.flatMap((r) => {
    const fromAt = r.fromAt ?? trial.startedAt;
    if (!fromAt) return [];
    const toAt = r.toAt ?? end;
    return toAt > fromAt ? [{ ...r, fromAt, toAt, open: r.toAt == null, band: chamberBand(r) }] : [];
  });
  const out: PlacementExposureRow[] = [];
  const chamberIds = [...new Set(windows.map((w) => w.chamberId))];
  // Each chamber's readings and 6-hour blocks over the span of all its placements, read once (one
  // query each for all chambers) and sliced per placement.
  const spans: ChamberSpan[] = chamberIds.map((chamberId) => {
    const mine = windows.filter((w) => w.chamberId === chamberId);
    return { chamberId, fromMs: Math.min(...mine.map((w) => w.fromAt.getTime())), toMs: Math.max(...mine.map((w) => w.toAt.getTime())) };
  });
  const loaded = await withSnapshot(async (snap) => ({
    checks: await correctionsPerChamber(snap, labId, chamberIds),
    blocks: await loadBlockSpans(snap, { labId, widthMs: COARSE_MS, spans: spans.map((s) => ({ ...s, fromMs: Math.floor(s.fromMs / COARSE_MS) * COARSE_MS })) }),
    readings: await loadExposureRows(snap, { labId, spans }),
  }));
  chamberIds.forEach((chamberId, c) => {
    const checks = loaded.checks[c];
    const blocks = loaded.blocks[c];
    const readings = loaded.readings[c];
    const times = readings.map((r) => r.takenAt.getTime());
    const done = new Map<string, Exposure>();
    for (const w of windows.filter((x) => x.chamberId === chamberId)) {
      const fromMs = w.fromAt.getTime();
      const toMs = w.toAt.getTime();
      const k = `${fromMs}|${toMs}`;
      let exposure = done.get(k);
      if (!exposure) {
        const firstBlockMs = Math.floor(fromMs / COARSE_MS) * COARSE_MS;
        exposure = placementExposure({
          rows: readings.slice(firstIndex(times, (t) => t >= fromMs), firstIndex(times, (t) => t > toMs)),
          checks, band: w.band, thresholdsRhPercent,
          maxGapMinutes: gapLimitMinutes(groupBlocks(blocks.filter((b) => b.blockStartMs >= firstBlockMs && b.blockStartMs <= toMs))),
        });
        done.set(k, exposure);
      }
      out.push({ placementId: w.placementId, specimenId: w.specimenId, specimenLabel: w.specimenLabel, chamberId, chamberName: w.chamberName, fromAt: w.fromAt, toAt: w.toAt, open: w.open, band: w.band, exposure });
    }
  });
  return out.sort((a, b) => a.specimenLabel.localeCompare(b.specimenLabel) || a.fromAt.getTime() - b.fromAt.getTime());
}
