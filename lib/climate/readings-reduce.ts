// Pure helpers behind the chamber chart: the gap limit, and the reduction of block summaries (reading_blocks, 6-hour and 1-hour) plus the readings of the few
// hours that need them into a short series on which lib/climate gives the same band statistics and
// settle times as on every reading (a block is summarised only under one hygrometer correction,
// lib/climate/check-timeline); chart thinning by time buckets. No database access here.
import type { ClimateReading, RhBand } from "@/lib/climate/band-stats";
import { applyCorrection, type LinearCorrection } from "@/lib/climate/hygrometer-check";
import type { OffsetsUsed, OffsetTimeline } from "@/lib/climate/check-timeline";

export const HOUR_MS = 3_600_000;
/** The coarse block width of reading_blocks (the fine one is an hour). */
export const COARSE_MS = 6 * HOUR_MS;

/** One reading as the chart and analysis use it: rhPercent is corrected, rhRaw as logged. */
export type Row = { takenAt: Date; rhPercent: number; rhRaw: number; tempC: number | null; dewLogged: number | null; instrument: string };
const NONE: LinearCorrection = { gain: 1, shiftRhPercent: 0 };

/** A reading_blocks row (times as whole epoch ms). */
export type BlockRow = {
  blockStartMs: number; widthMs: number; instrument: string; n: number; firstMs: number; lastMs: number; lastRh: number;
  minRh: number; minMs: number; minTempC: number | null; minDewC: number | null;
  maxRh: number; maxMs: number; maxTempC: number | null; maxDewC: number | null;
  spanMs: number; spanRhMs: number; maxSpanMs: number;
};

/** Group reading_blocks rows (ordered by block) into blocks, one row per instrument. */
export function groupBlocks<T extends Pick<BlockRow, "blockStartMs">>(rows: readonly T[]): T[][] {
  const out: T[][] = [];
  for (const r of rows) {
    const last = out[out.length - 1];
    if (last && last[0].blockStartMs === r.blockStartMs) last.push(r);
    else out.push([r]);
  }
  return out;
}

/**
 * Gaps longer than this are not counted as time (the logger was off): 3 × the median interval
 * between consecutive readings, 1 h to 1 day. Inside a block (6-hour blocks, always) the
 * intervals are taken as its mean interval, between blocks exactly, so a year of minutes needs
 * no pass over every reading.
 */
export function gapLimitMinutes(blocks: readonly (readonly Pick<BlockRow, "n" | "firstMs" | "lastMs">[])[]): number {
  let total = 0;
  const items: { gapMs: number; weight: number }[] = [];
  let prevLast: number | null = null;
  for (const block of blocks) {
    let n = 0, first = Infinity, last = -Infinity;
    for (const b of block) {
      n += b.n;
      first = Math.min(first, b.firstMs);
      last = Math.max(last, b.lastMs);
    }
    total += n;
    if (n > 1) items.push({ gapMs: (last - first) / (n - 1), weight: n - 1 });
    if (prevLast !== null) items.push({ gapMs: first - prevLast, weight: 1 });
    prevLast = last;
  }
  if (total < 3) return 60;
  items.sort((a, b) => a.gapMs - b.gapMs);
  const target = Math.floor((total - 1) / 2); // the middle element had every interval been listed
  let seen = 0;
  for (const it of items) {
    seen += it.weight;
    if (seen > target) return Math.min(1440, Math.max(60, (3 * it.gapMs) / 60_000));
  }
  return Math.min(1440, Math.max(60, (3 * items[items.length - 1].gapMs) / 60_000));
}

export type Range = { fromMs: number | null; toMs: number | null };

/**
 * What a block contributes when all its corrected readings lie on one side of the band (side -1
 * below, 0 in, 1 above) and every interval inside it is counted: extremes, inner time-weighted sum,
 * last reading. side is null when the block must be looked into (its hours, or for an hour its
 * readings): it crosses a band edge, has an interval over maxGap, an correction varies inside it (OffsetTimeline.over), a
 * correction would be clipped at 0 or 100 %RH, or the range cuts it. chartRaw: its summary cannot
 * stand for its readings on the chart (varying correction or cut).
 */
export type BlockFacts = { side: -1 | 0 | 1 | null; chartRaw: boolean; n: number; firstMs: number; lastMs: number; vMin: number; vMax: number; innerWeighted: number; vLast: number };

export function blockFacts(block: readonly BlockRow[], band: RhBand, timeline: OffsetTimeline, range: Range, maxGapMs: number): BlockFacts {
  const start = block[0].blockStartMs;
  const end = start + block[0].widthMs;
  const cut = (range.fromMs != null && start < range.fromMs) || (range.toMs != null && end > range.toMs);
  const f: BlockFacts = { side: null, chartRaw: cut, n: 0, firstMs: Infinity, lastMs: -Infinity, vMin: Infinity, vMax: -Infinity, innerWeighted: 0, vLast: NaN };
  let irregular = cut;
  let lastInstrument = "";
  for (const b of block) {
    const over = timeline.over(b.instrument, start, end);
    if (over === "varies") irregular = f.chartRaw = true;
    if (b.maxSpanMs > maxGapMs) irregular = true;
    const check = over === "varies" ? null : over; // a varying block is read as readings: its facts are not used
    const c = check ?? NONE;
    if (check && (c.gain * b.minRh + c.shiftRhPercent < 0 || c.gain * b.maxRh + c.shiftRhPercent > 100)) irregular = true;
    f.n += b.n;
    f.firstMs = Math.min(f.firstMs, b.firstMs);
    // The block's last reading: latest time, then the instrument that sorts last.
    if (b.lastMs > f.lastMs || (b.lastMs === f.lastMs && b.instrument > lastInstrument)) {
      f.lastMs = b.lastMs;
      lastInstrument = b.instrument;
      f.vLast = applyCorrection(b.lastRh, check);
    }
    f.vMin = Math.min(f.vMin, applyCorrection(b.minRh, check));
    f.vMax = Math.max(f.vMax, applyCorrection(b.maxRh, check));
    f.innerWeighted += c.gain * b.spanRhMs + c.shiftRhPercent * b.spanMs;
  }
  if (!irregular) {
    if (f.vMin >= band.minRh && f.vMax <= band.maxRh) f.side = 0;
    else if (f.vMin > band.maxRh) f.side = 1;
    else if (f.vMax < band.minRh) f.side = -1;
  }
  return f;
}

/** A summarised block's readings, per instrument, for the checks used. */
export function noteBlockOffsets(block: readonly BlockRow[], used: OffsetsUsed): void {
  for (const b of block) used.note(b.instrument, b.firstMs, b.lastMs);
}

/**
 * Consecutive blocks on the same side of the band with no uncounted interval between them, folded
 * into readings that give lib/climate bandStats and settleTimeMinutes the same results as the
 * real readings: the lowest and highest value at the first reading's time, the run's time-weighted
 * mean repeated from that time every maxGap (so every interval is still counted), and the last
 * reading, which carries the interval to what follows. An excursion so opens or closes at the first
 * reading's time and keeps its worst value, counted time and mean; a settling run keeps when it
 * started and where it ends.
 */
export class RunFolder {
  private run: (BlockFacts & { weighted: number }) | null = null;
  /** Whole milliseconds, so that no stand-in interval is longer than maxGap. */
  private readonly stepMs: number;

  constructor(private readonly out: ClimateReading[], private readonly maxGapMs: number) {
    this.stepMs = Math.max(1, Math.floor(maxGapMs));
  }

  add(f: BlockFacts): void {
    const r = this.run;
    if (r && r.side === f.side && f.firstMs - r.lastMs <= this.maxGapMs) {
      r.weighted += r.vLast * (f.firstMs - r.lastMs) + f.innerWeighted;
      r.n += f.n;
      r.lastMs = f.lastMs;
      r.vLast = f.vLast;
      r.vMin = Math.min(r.vMin, f.vMin);
      r.vMax = Math.max(r.vMax, f.vMax);
      return;
    }
    this.flush();
    this.run = { ...f, weighted: f.innerWeighted };
  }

  flush(): void {
    const r = this.run;
    if (!r) return;
    this.run = null;
    const first = new Date(r.firstMs);
    this.out.push({ takenAt: first, rhPercent: r.vMin }, { takenAt: first, rhPercent: r.vMax });
    if (r.lastMs > r.firstMs) {
      // Clamped so that rounding cannot move the mean across a band edge the run does not cross.
      const mean = Math.min(r.vMax, Math.max(r.vMin, r.weighted / (r.lastMs - r.firstMs)));
      for (let t = r.firstMs; t < r.lastMs; t += this.stepMs) this.out.push({ takenAt: t === r.firstMs ? first : new Date(t), rhPercent: mean });
    }
    this.out.push({ takenAt: new Date(r.lastMs), rhPercent: r.vLast });
  }
}

/** A chart candidate: a real reading (corrected) that may be a bucket's lowest or highest. */
export type Candidate = { t: number; rh: number; rhRaw: number; tempC: number | null; dewLogged: number | null; instrument: string };

/**
 * Chart thinning by time: whole blocks grouped into at most maxPoints/2 buckets, each keeping its
 * lowest and highest reading (the earliest on ties), in time order — the rule of lib/climate
 * downsample, with buckets of equal time instead of equal reading count. Offers may come in any order.
 */
export class BucketPicker {
  private readonly originMs: number;
  private readonly bucketMs: number;
  private readonly buckets = new Map<number, { lo: Candidate; hi: Candidate }>();

  constructor(firstBlockMs: number, lastBlockMs: number, widthMs: number, maxPoints: number) {
    this.originMs = firstBlockMs;
    const blocks = (lastBlockMs - firstBlockMs) / widthMs + 1;
    this.bucketMs = Math.max(1, Math.ceil(blocks / Math.max(1, Math.floor(maxPoints / 2)))) * widthMs;
  }

  offer(c: Candidate): void {
    const k = Math.floor((c.t - this.originMs) / this.bucketMs);
    const b = this.buckets.get(k);
    if (!b) this.buckets.set(k, { lo: c, hi: c });
    else {
      if (c.rh < b.lo.rh || (c.rh === b.lo.rh && earlier(c, b.lo))) b.lo = c;
      if (c.rh > b.hi.rh || (c.rh === b.hi.rh && earlier(c, b.hi))) b.hi = c;
    }
  }

  /** A block's lowest and highest reading per instrument, corrected (one correction over the block). */
  offerBlock(block: readonly BlockRow[], timeline: OffsetTimeline): void {
    for (const b of block) {
      const check = timeline.constantOver(b.instrument, b.blockStartMs, b.blockStartMs + b.widthMs);
      this.offer({ t: b.minMs, rh: applyCorrection(b.minRh, check), rhRaw: b.minRh, tempC: b.minTempC, dewLogged: b.minDewC, instrument: b.instrument });
      this.offer({ t: b.maxMs, rh: applyCorrection(b.maxRh, check), rhRaw: b.maxRh, tempC: b.maxTempC, dewLogged: b.maxDewC, instrument: b.instrument });
    }
  }

  points(): Candidate[] {
    const out: Candidate[] = [];
    for (const k of [...this.buckets.keys()].sort((x, y) => x - y)) {
      const { lo, hi } = this.buckets.get(k)!;
      if (lo === hi || (lo.t === hi.t && lo.instrument === hi.instrument)) out.push(lo);
      else if (earlier(lo, hi)) out.push(lo, hi);
      else out.push(hi, lo);
    }
    return out;
  }
}

const earlier = (a: Candidate, b: Candidate) => a.t < b.t || (a.t === b.t && a.instrument < b.instrument);
