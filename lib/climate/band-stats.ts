// How well a chamber held its target band, from logged readings.
//
// Each reading is taken to hold until the next one (step interpolation: loggers record a value,
// not a trend). An interval longer than maxGapMinutes is not counted at all — the logger was off
// or the file has a hole, and we would rather report less coverage than invent data. The last
// reading has no following interval, so it adds no time.

export interface ClimateReading {
  takenAt: Date;
  rhPercent: number;
}

export interface RhBand {
  minRh: number;
  maxRh: number;
}

export interface Excursion {
  start: Date;
  /** When RH was back in band, or the end of the last counted interval if it never came back. */
  end: Date;
  /** Counted out-of-band time (gaps excluded). */
  durationMinutes: number;
  /** The reading farthest outside the band. */
  worstRhPercent: number;
  direction: "above" | "below";
  /** True if the data ended, or a gap began, before RH returned to band. */
  openEnded: boolean;
}

export interface BandStats {
  /** Counted in-band time / counted time; null if no interval could be counted. */
  fractionInBand: number | null;
  countedMinutes: number;
  inBandMinutes: number;
  /** Time-weighted mean RH over counted intervals; null if none. */
  meanRhPercent: number | null;
  minRhPercent: number | null;
  maxRhPercent: number | null;
  excursions: Excursion[];
  /** The excursion that went farthest outside the band (ties: the longer one). */
  worstExcursion: Excursion | null;
  longestExcursion: Excursion | null;
}

const MS_PER_MIN = 60_000;

/** A chamber's target band: setpoint ± tolerance, kept within 0–100 %RH. */
export function chamberBand(chamber: { setpointRhPercent: number; toleranceRhPercent: number }): RhBand {
  return { minRh: Math.max(0, chamber.setpointRhPercent - chamber.toleranceRhPercent), maxRh: Math.min(100, chamber.setpointRhPercent + chamber.toleranceRhPercent) };
}

function checkBand(band: RhBand): void {
  if (!(band.minRh <= band.maxRh) || !Number.isFinite(band.minRh) || !Number.isFinite(band.maxRh)) {
    throw new RangeError(`Band must have minRh ≤ maxRh; got ${band.minRh}…${band.maxRh}`);
  }
}

export function inBand(rhPercent: number, band: RhBand): boolean {
  return rhPercent >= band.minRh && rhPercent <= band.maxRh;
}

/** Distance outside the band (0 inside). */
function deviation(rhPercent: number, band: RhBand): number {
  if (rhPercent > band.maxRh) return rhPercent - band.maxRh;
  if (rhPercent < band.minRh) return band.minRh - rhPercent;
  return 0;
}

export function bandStats(readings: readonly ClimateReading[], band: RhBand, options: { maxGapMinutes?: number } = {}): BandStats {
  checkBand(band);
  const maxGapMs = (options.maxGapMinutes ?? 60) * MS_PER_MIN;
  let countedMs = 0;
  let inBandMs = 0;
  let weightedRh = 0;
  let minRh = Infinity;
  let maxRh = -Infinity;
  const excursions: Excursion[] = [];
  let open: { start: number; lastEnd: number; durationMs: number; worst: number; worstDev: number } | null = null;

  const close = (endMs: number, openEnded: boolean) => {
    if (!open) return;
    excursions.push({
      start: new Date(open.start),
      end: new Date(endMs),
      durationMinutes: open.durationMs / MS_PER_MIN,
      worstRhPercent: open.worst,
      direction: open.worst > band.maxRh ? "above" : "below",
      openEnded,
    });
    open = null;
  };

  for (let i = 0; i < readings.length; i++) {
    const r = readings[i];
    const t = r.takenAt.getTime();
    if (i > 0 && t < readings[i - 1].takenAt.getTime()) throw new RangeError("Readings must be sorted by time");
    minRh = Math.min(minRh, r.rhPercent);
    maxRh = Math.max(maxRh, r.rhPercent);
    const next = readings[i + 1];
    const spanMs = next ? next.takenAt.getTime() - t : 0;
    const counted = next !== undefined && spanMs <= maxGapMs;
    const dev = deviation(r.rhPercent, band);

    if (dev === 0) {
      close(t, false);
    } else {
      if (!open) open = { start: t, lastEnd: t, durationMs: 0, worst: r.rhPercent, worstDev: dev };
      if (dev > open.worstDev) {
        open.worst = r.rhPercent;
        open.worstDev = dev;
      }
      if (counted) {
        open.durationMs += spanMs;
        open.lastEnd = t + spanMs;
      } else {
        close(open.lastEnd, true);
      }
    }
    if (counted) {
      countedMs += spanMs;
      weightedRh += r.rhPercent * spanMs;
      if (dev === 0) inBandMs += spanMs;
    }
  }
  if (open) close((open as { lastEnd: number }).lastEnd, true);

  let worstExcursion: Excursion | null = null;
  let longestExcursion: Excursion | null = null;
  for (const e of excursions) {
    const d = deviation(e.worstRhPercent, band);
    const worstD = worstExcursion ? deviation(worstExcursion.worstRhPercent, band) : -1;
    if (!worstExcursion || d > worstD || (d === worstD && e.durationMinutes > worstExcursion.durationMinutes)) worstExcursion = e;
    if (!longestExcursion || e.durationMinutes > longestExcursion.durationMinutes) longestExcursion = e;
  }
  return {
    fractionInBand: countedMs > 0 ? inBandMs / countedMs : null,
    countedMinutes: countedMs / MS_PER_MIN,
    inBandMinutes: inBandMs / MS_PER_MIN,
    meanRhPercent: countedMs > 0 ? weightedRh / countedMs : null,
    minRhPercent: readings.length > 0 ? minRh : null,
    maxRhPercent: readings.length > 0 ? maxRh : null,
    excursions,
    worstExcursion,
    longestExcursion,
  };
}

/**
 * Minutes from `fromTime` (e.g. the jar was opened for an inspection) until RH entered the band
 * and then stayed in it for at least `holdMinutes` without a gap. null if that never happened in
 * the data. The reading in force at `fromTime` counts, so an undisturbed chamber settles at 0.
 */
export function settleTimeMinutes(
  readings: readonly ClimateReading[],
  band: RhBand,
  fromTime: Date,
  options: { holdMinutes?: number; maxGapMinutes?: number } = {},
): number | null {
  checkBand(band);
  const holdMs = (options.holdMinutes ?? 60) * MS_PER_MIN;
  const maxGapMs = (options.maxGapMinutes ?? 60) * MS_PER_MIN;
  const from = fromTime.getTime();
  // Start at the reading in force at fromTime (the last one at or before it).
  let i = 0;
  while (i + 1 < readings.length && readings[i + 1].takenAt.getTime() <= from) i++;

  let runStart: number | null = null;
  for (; i < readings.length; i++) {
    const t = readings[i].takenAt.getTime();
    const next = readings[i + 1];
    const nextT = next ? next.takenAt.getTime() : t;
    const gapAfter = next !== undefined && nextT - t > maxGapMs;
    // This reading's value is known until the next reading, unless a gap follows or the data ends.
    const knownUntil = next && !gapAfter ? nextT : t;
    if (inBand(readings[i].rhPercent, band)) {
      if (runStart === null) runStart = Math.max(from, t);
      if (knownUntil - runStart >= holdMs) return (runStart - from) / MS_PER_MIN;
    } else {
      runStart = null;
    }
    if (gapAfter) runStart = null;
  }
  return null;
}

/**
 * Thin a long series for a chart while keeping its spikes: readings are split into buckets and
 * each bucket contributes its lowest and highest reading, in time order.
 */
export function downsample<T extends ClimateReading>(readings: readonly T[], maxPoints: number): T[] {
  if (!Number.isInteger(maxPoints) || maxPoints < 2) throw new RangeError("maxPoints must be a whole number ≥ 2");
  if (readings.length <= maxPoints) return readings.slice();
  const buckets = Math.floor(maxPoints / 2);
  const size = readings.length / buckets;
  const out: T[] = [];
  for (let b = 0; b < buckets; b++) {
    const from = Math.floor(b * size);
    const to = Math.floor((b + 1) * size);
    let lo = from;
    let hi = from;
    for (let i = from + 1; i < to; i++) {
      if (readings[i].rhPercent < readings[lo].rhPercent) lo = i;
      if (readings[i].rhPercent > readings[hi].rhPercent) hi = i;
    }
    if (lo === hi) out.push(readings[lo]);
    else if (lo < hi) out.push(readings[lo], readings[hi]);
    else out.push(readings[hi], readings[lo]);
  }
  return out;
}

/**
 * Counted time (the step rule and gap limit of bandStats) during which `holds` is true of the
 * reading in force. holds may answer null when a reading cannot be judged (e.g. no temperature):
 * its interval then counts in neither figure.
 */
export function countedMinutesWhere<T extends ClimateReading>(
  readings: readonly T[], holds: (r: T) => boolean | null, options: { maxGapMinutes?: number } = {},
): { minutes: number; judgedMinutes: number } {
  const maxGapMs = (options.maxGapMinutes ?? 60) * MS_PER_MIN;
  let ms = 0;
  let judgedMs = 0;
  for (let i = 0; i + 1 < readings.length; i++) {
    const spanMs = readings[i + 1].takenAt.getTime() - readings[i].takenAt.getTime();
    if (spanMs < 0) throw new RangeError("Readings must be sorted by time");
    if (spanMs > maxGapMs) continue;
    const h = holds(readings[i]);
    if (h === null) continue;
    judgedMs += spanMs;
    if (h) ms += spanMs;
  }
  return { minutes: ms / MS_PER_MIN, judgedMinutes: judgedMs / MS_PER_MIN };
}
