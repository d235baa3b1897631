import "server-only";
import type { ClimateReading, RhBand } from "@/lib/climate/band-stats";
import { bandStats, chamberBand, downsample, settleTimeMinutes } from "@/lib/climate/band-stats";
import { condensationPointC } from "@/lib/humidity/psychrometrics";
import type { Period } from "@/lib/validation/chambers";
import type { ChartPoint } from "@/lib/climate/chart-pack";
import type { Chamber } from "./chambers";
import { getPool } from "../client";
import { loadAppliedChecks, loadBlocks, loadRows, withSnapshot, type RowRange, type Snapshot } from "./climate-sql";
import {
  blockFacts, BucketPicker, COARSE_MS, gapLimitMinutes, groupBlocks, HOUR_MS, noteBlockOffsets, RunFolder,
  type BlockFacts, type BlockRow, type Candidate, type Range, type Row,
} from "@/lib/climate/readings-reduce";
import { applyOffsets, OffsetsUsed, OffsetTimeline, type OffsetInUse } from "@/lib/climate/check-timeline";

/**
 * dewC is the dew point over water when computed at or above 0.01 °C, the frost point over ice when
 * computed below it, or the logger's own dew point column ("logged": its convention is the logger's).
 */
export type SeriesPoint = ChartPoint;
export type DewOver = NonNullable<ChartPoint["dewOver"]>;

const DAY_MS = 86_400_000;
/** The most points the chamber chart shows. */
export const CHART_MAX_POINTS = 1600;
/**
 * Up to this many readings in the period, every reading is loaded (a finer chart for short periods).
 * The chart shows at most CHART_MAX_POINTS, so beyond about that many it gains little from every reading,
 * and the block summaries give the same statistics (tests/integration/chambers-climate-sql.test.ts):
 * 30 days of 10-minute readings (4,320) are read as summaries plus the hours that cross the band.
 */
export const ALL_ROWS_LIMIT = Math.round(CHART_MAX_POINTS * 1.25);

const floorTo = (ms: number | null, width: number) => (ms == null ? null : Math.floor(ms / width) * width);

/** Merge block starts (ascending) into ranges of consecutive blocks. */
function stretches(starts: readonly number[], widthMs: number): { fromMs: number; toMs: number }[] {
  const out: { fromMs: number; toMs: number }[] = [];
  for (const s of starts) {
    const last = out[out.length - 1];
    if (last && last.toMs === s) last.toMs = s + widthMs;
    else out.push({ fromMs: s, toMs: s + widthMs });
  }
  return out;
}

type Unit = { block: readonly BlockRow[]; f: BlockFacts; rowsToChart: boolean };
type Reduced = { series: ClimateReading[]; count: number; points: Candidate[]; instruments: Set<string>; offsets: OffsetInUse[] };

/**
 * A range as lib/climate sees it without loading every reading. Blocks (6-hour, or hours when the
 * chart needs hourly buckets) on one side of the band become a few stand-in readings
 * (readings-reduce RunFolder); a 6-hour block that cannot is looked into hour by hour, and an hour
 * that cannot comes with its readings — one index range scan per stretch of such hours.
 */
async function reduce(snap: Snapshot, { labId, chamberId, coarse, range, band, timeline, maxGapMinutes, maxPoints }: {
  labId: string; chamberId: string; coarse: readonly (readonly BlockRow[])[]; range: Range; band: RhBand; timeline: OffsetTimeline; maxGapMinutes: number; maxPoints: number;
}): Promise<Reduced> {
  const maxGapMs = maxGapMinutes * 60_000;
  const key = { labId, chamberId };
  const span = coarse.length ? (coarse[coarse.length - 1][0].blockStartMs - coarse[0][0].blockStartMs) / COARSE_MS + 1 : 0;
  // Hourly buckets unless 6-hour blocks alone give the chart enough of them.
  const hourly = span < Math.floor(maxPoints / 2);
  const top = hourly ? groupBlocks(await loadBlocks(snap, { ...key, widthMs: HOUR_MS, ranges: [{ fromMs: floorTo(range.fromMs, HOUR_MS), toMs: range.toMs }] })) : coarse;
  const topFacts = top.map((b) => blockFacts(b, band, timeline, range, maxGapMs));
  const picker = top.length ? new BucketPicker(top[0][0].blockStartMs, top[top.length - 1][0].blockStartMs, hourly ? HOUR_MS : COARSE_MS, maxPoints) : null;

  // The hours of the 6-hour blocks that cannot stand as a whole.
  const opened = hourly ? [] : top.filter((_, i) => topFacts[i].side === null).map((b) => b[0].blockStartMs);
  const hours = groupBlocks(await loadBlocks(snap, { ...key, widthMs: HOUR_MS, ranges: stretches(opened, COARSE_MS).map((r) => ({ fromMs: r.fromMs, toMs: r.toMs - HOUR_MS })) }));
  const units: Unit[] = [];
  let h = 0;
  top.forEach((block, i) => {
    const f = topFacts[i];
    if (!f.chartRaw) picker!.offerBlock(block, timeline);
    if (f.side !== null || hourly) {
      units.push({ block, f, rowsToChart: f.chartRaw });
      return;
    }
    const end = block[0].blockStartMs + COARSE_MS;
    for (; h < hours.length && hours[h][0].blockStartMs < end; h++) {
      const hf = blockFacts(hours[h], band, timeline, range, maxGapMs);
      if (f.chartRaw && !hf.chartRaw) picker!.offerBlock(hours[h], timeline);
      units.push({ block: hours[h], f: hf, rowsToChart: f.chartRaw && hf.chartRaw });
    }
  });

  const ranges: RowRange[] = stretches(units.filter((u) => u.f.side === null).map((u) => u.block[0].blockStartMs), HOUR_MS).map((r) => ({ ...r, toInclusive: false }));
  if (ranges.length && range.fromMs != null) ranges[0].fromMs = Math.max(ranges[0].fromMs!, range.fromMs);
  const lastRange = ranges[ranges.length - 1];
  if (lastRange && range.toMs != null && lastRange.toMs! > range.toMs) Object.assign(lastRange, { toMs: range.toMs, toInclusive: true });
  const rows = await loadRows(snap, { ...key, ranges });

  const series: ClimateReading[] = [];
  const runs = new RunFolder(series, maxGapMs);
  const used = new OffsetsUsed();
  const instruments = new Set<string>();
  let count = 0;
  let r = 0;
  for (const u of units) {
    if (u.f.side !== null) {
      runs.add(u.f);
      noteBlockOffsets(u.block, used);
      for (const b of u.block) instruments.add(b.instrument);
      count += u.f.n;
      continue;
    }
    runs.flush();
    const from = r;
    while (r < rows.length && rows[r].takenAt.getTime() < u.block[0].blockStartMs + HOUR_MS) r++;
    const part = rows.slice(from, r);
    applyOffsets(part, timeline, used);
    for (const row of part) {
      series.push(row);
      instruments.add(row.instrument);
      if (u.rowsToChart) picker!.offer(toCandidate(row));
    }
    count += part.length;
  }
  runs.flush();
  return { series, count, points: picker?.points() ?? [], instruments, offsets: used.list(timeline) };
}

function dewOf(c: Candidate): { dewC: number | null; dewOver: DewOver | null } {
  if (c.tempC != null && c.rh > 0) {
    try {
      const point = condensationPointC(c.tempC, c.rh);
      return { dewC: point.tempC, dewOver: point.over };
    } catch {
      return { dewC: null, dewOver: null };
    }
  }
  return c.dewLogged == null ? { dewC: null, dewOver: null } : { dewC: c.dewLogged, dewOver: "logged" };
}

const toCandidate = (r: Row): Candidate => ({ t: r.takenAt.getTime(), rh: r.rhPercent, rhRaw: r.rhRaw, tempC: r.tempC, dewLogged: r.dewLogged, instrument: r.instrument });

/**
 * A chamber's readings over [fromMs, toMs] as lib/climate sees them, with applied hygrometer offsets:
 * every reading when there are few, else the block summaries plus the hours that cross a band edge.
 */
async function windowSeries(snap: Snapshot, { labId, chamberId, band, fromMs, toMs, maxPoints, allRowsLimit }: {
  labId: string; chamberId: string; band: RhBand; fromMs: number | null; toMs: number | null; maxPoints: number; allRowsLimit: number;
}) {
  const key = { labId, chamberId };
  const timeline = new OffsetTimeline(await loadAppliedChecks(snap, key));
  const coarse = groupBlocks(await loadBlocks(snap, { ...key, widthMs: COARSE_MS, ranges: [{ fromMs: floorTo(fromMs, COARSE_MS), toMs }] }));
  const maxGapMinutes = gapLimitMinutes(coarse);
  let total = 0;
  for (const block of coarse) for (const b of block) total += b.n;

  let series: readonly ClimateReading[], count: number, instruments: string[], offsets: OffsetInUse[], picked: Candidate[];
  if (total <= allRowsLimit) {
    const rows = await loadRows(snap, { ...key, ranges: [{ fromMs, toMs, toInclusive: true }] });
    offsets = applyOffsets(rows, timeline);
    series = rows;
    count = rows.length;
    instruments = [...new Set(rows.map((r) => r.instrument))];
    picked = downsample(rows, maxPoints).map(toCandidate);
  } else {
    const red = await reduce(snap, { ...key, coarse, range: { fromMs, toMs }, band, timeline, maxGapMinutes, maxPoints });
    ({ series, count, offsets, points: picked } = red);
    instruments = [...red.instruments];
  }
  return { timeline, maxGapMinutes, series, count, instruments, offsets, picked };
}

/**
 * What a chamber measured over one window (a specimen's placement): the same band statistics as the
 * chamber page (time-weighted mean RH, time in band), from the same readings and offsets.
 */
export async function getChamberWindowStats({ labId, chamber, from, to }: { labId: string; chamber: Pick<Chamber, "id" | "setpointRhPercent" | "toleranceRhPercent">; from: Date; to: Date }) {
  const band = chamberBand(chamber);
  return getBandWindowStats({ labId, chamberId: chamber.id, band, from, to });
}

/**
 * Band statistics of a chamber or storage location over a window against any band (a storage rule's
 * band runs from 0 to its threshold), counted as the chamber page counts them.
 */
export async function getBandWindowStats({ labId, chamberId, band, from, to }: { labId: string; chamberId: string; band: RhBand; from: Date; to: Date }) {
  return withSnapshot(async (snap) => {
    const w = await windowSeries(snap, { labId, chamberId, band, fromMs: from.getTime(), toMs: to.getTime(), maxPoints: 200, allRowsLimit: ALL_ROWS_LIMIT });
    return { ...bandStats(w.series, band, { maxGapMinutes: w.maxGapMinutes }), readings: w.count, maxGapMinutes: w.maxGapMinutes };
  });
}

/**
 * The chamber chart and its band statistics for a period, corrected by the applied hygrometer
 * checks (lib/climate/check-timeline: drift interpolated between checks, the nearest held outside). Long periods are read from the block summaries plus the hours that cross a band
 * edge; the results equal lib/climate on every reading (tests/integration/chambers-climate-sql.test.ts).
 * Periods of up to allRowsLimit readings load every reading (a finer chart).
 */
export async function getChamberSeries(args: SeriesArgs) {
  return withSnapshot((snap) => computeSeries(snap, args));
}

type SeriesArgs = {
  labId: string; chamber: Pick<Chamber, "id" | "setpointRhPercent" | "toleranceRhPercent">; period: Period; maxPoints?: number; now?: Date;
  settleFrom?: { label: string; at: Date }[]; allRowsLimit?: number;
};

async function computeSeries(snap: Snapshot, { labId, chamber, period, maxPoints = CHART_MAX_POINTS, now = new Date(), settleFrom = [], allRowsLimit = ALL_ROWS_LIMIT }: SeriesArgs) {
  const from = period === "all" ? null : new Date(now.getTime() - (period === "7d" ? 7 : 30) * DAY_MS);
  const fromMs = from?.getTime() ?? null;
  const band: RhBand = chamberBand(chamber);
  const key = { labId, chamberId: chamber.id };
  const { timeline, maxGapMinutes, series, count, instruments, offsets, picked } =
    await windowSeries(snap, { ...key, band, fromMs, toMs: null, maxPoints, allRowsLimit });
  const points: SeriesPoint[] = picked.map((c) => ({ t: c.t, rh: c.rh, rhRaw: c.rhRaw, tempC: c.tempC, ...dewOf(c), instrument: c.instrument }));
  const stats = bandStats(series, band, { maxGapMinutes });

  const settle = [];
  for (const ev of settleFrom) {
    let data = series;
    if (fromMs !== null && ev.at.getTime() < fromMs) {
      // Settling is judged on the data after the event, whether or not the chosen period covers it.
      const range = { fromMs: ev.at.getTime() - DAY_MS, toMs: ev.at.getTime() + 30 * DAY_MS };
      const windowBlocks = groupBlocks(await loadBlocks(snap, { ...key, widthMs: COARSE_MS, ranges: [{ fromMs: floorTo(range.fromMs, COARSE_MS), toMs: range.toMs }] }));
      data = (await reduce(snap, { ...key, coarse: windowBlocks, range, band, timeline, maxGapMinutes, maxPoints })).series;
    }
    const hasAfter = data.length > 0 && data[data.length - 1].takenAt > ev.at;
    settle.push({ ...ev, minutes: hasAfter ? settleTimeMinutes(data, band, ev.at, { maxGapMinutes }) : null, hasData: hasAfter });
  }
  return {
    period, from, count, firstAt: series[0]?.takenAt ?? null, lastAt: series[series.length - 1]?.takenAt ?? null,
    points, band, stats, maxGapMinutes, offsets /* in time order (OffsetsUsed.list) */, settle, instruments,
  };
}
export type ChamberSeries = Awaited<ReturnType<typeof getChamberSeries>>;

/** How many computed charts a process keeps for reuse (about 0.3 MB each at the chart's 1,600 points). */
export const SERIES_KEPT = 64;
const kept = new Map<string, ChamberSeries>();
const computing = new Map<string, Promise<ChamberSeries>>();

/**
 * The chamber's climate token (climate_versions) with its lab's hygrometer-check token (check_versions),
 * both kept by triggers; null until the chamber's first reading. A lab without a check token has had no
 * check since tokens began (migration 0029 gave every lab one).
 */
async function climateVersion(q: Pick<Snapshot["client"], "query">, labId: string, chamberId: string): Promise<string | null> {
  const res = await q.query<{ readings: string | null; checks: string | null }>({
    text: `select (select version from climate_versions where chamber_id = $1 and lab_id = $2) as readings,
                  (select version from check_versions where lab_id = $2) as checks`,
    values: [chamberId, labId],
  });
  const { readings, checks } = res.rows[0];
  return readings === null ? null : `${readings}/${checks ?? "no checks"}`;
}

/**
 * getChamberSeries for the chamber page, reused while nothing it is read or computed from changes:
 * the chamber's climate tokens (renewed by triggers whenever its readings or the lab's hygrometer checks
 * change, by any writer), its band, the period, the settling events and, for the 7- and 30-day periods,
 * `now`, which is taken down to the whole minute (so the period starts up to a minute earlier than at
 * the exact time) so that the requests of one minute share one result. Concurrent requests for the same
 * result wait for one computation. The result is shared: read it, never change it.
 */
export async function getChamberSeriesReused(args: SeriesArgs): Promise<ChamberSeries> {
  const now = new Date(Math.floor((args.now ?? new Date()).getTime() / 60_000) * 60_000);
  const band = chamberBand(args.chamber);
  const keyOf = (version: string) => JSON.stringify([
    args.labId, args.chamber.id, version, band.minRh, band.maxRh, args.period, args.maxPoints ?? CHART_MAX_POINTS, args.allRowsLimit ?? ALL_ROWS_LIMIT,
    args.period === "all" ? null : now.getTime(), (args.settleFrom ?? []).map((e) => [e.label, e.at.getTime()]),
  ]);
  const current = await climateVersion(getPool(), args.labId, args.chamber.id);
  const key = current === null ? null : keyOf(current);
  if (key !== null) {
    const hit = kept.get(key);
    if (hit) {
      kept.delete(key); // most recently used last
      kept.set(key, hit);
      return hit;
    }
    const running = computing.get(key);
    if (running) return running;
  }
  const work = withSnapshot(async (snap) => {
    // The token as this snapshot sees it names exactly the data the result is computed from.
    const version = await climateVersion(snap.client, args.labId, args.chamber.id);
    const value = await computeSeries(snap, { ...args, now });
    if (version !== null) {
      kept.set(keyOf(version), value);
      while (kept.size > SERIES_KEPT) kept.delete(kept.keys().next().value!);
    }
    return value;
  });
  if (key !== null) {
    computing.set(key, work);
    work.then(() => computing.delete(key), () => computing.delete(key));
  }
  return work;
}
