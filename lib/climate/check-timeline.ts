// Applied hygrometer checks of a chamber's instruments on a time line, for the chamber chart and
// band statistics: each reading corrected by the one rule of hygrometer-check correctionAt (drift
// interpolated between checks, the nearest held outside them; the rule exposure uses), whether a
// block summary has one correction over its span, and which checks a series used.
import { applyCorrection, correctionAt, correctionOf, type LinearCorrection, type TimedCorrection } from "@/lib/climate/hygrometer-check";
import type { Row } from "@/lib/climate/readings-reduce";

export type OffsetInUse = { instrument: string; offsetPercent: number; slope: number | null; from: Date; saltId: string };
/** A stored check; with a slope (two salts) it corrects along a line, else by its offset (hygrometer-check correctionOf). */
export type OffsetCheck = {
  id: string; instrument: string; offsetRhPercent: number; checkedAt: Date; saltId: string; applied: boolean; readingRhPercent: number; referenceRhPercent: number; slope: number | null;
};

/**
 * Applied hygrometer checks per instrument, corrected by the one rule of hygrometer-check
 * correctionAt (drift interpolated linearly between checks, the nearest check held before the first
 * and after the last), as exposure corrects them.
 */
export class OffsetTimeline {
  private readonly byInstrument = new Map<string, { checks: OffsetCheck[]; timed: TimedCorrection[] }>();

  constructor(checks: readonly OffsetCheck[]) {
    const lists = new Map<string, OffsetCheck[]>();
    for (const c of checks) if (c.applied) lists.set(c.instrument, [...(lists.get(c.instrument) ?? []), c]);
    for (const [instrument, list] of lists) {
      list.sort((a, b) => a.checkedAt.getTime() - b.checkedAt.getTime());
      this.byInstrument.set(instrument, { checks: list, timed: list.map((c) => ({ atMs: c.checkedAt.getTime(), ...correctionOf(c) })) });
    }
  }

  /** Each instrument's applied checks as timed corrections, oldest first (what exposure corrects by). */
  timed(): ReadonlyMap<string, readonly TimedCorrection[]> {
    return new Map([...this.byInstrument].map(([instrument, e]) => [instrument, e.timed]));
  }

  get empty(): boolean {
    return this.byInstrument.size === 0;
  }

  /** The correction of a reading at tMs; null when the instrument has no applied check. */
  at(instrument: string, tMs: number): LinearCorrection | null {
    const e = this.byInstrument.get(instrument);
    return e ? correctionAt(e.timed, tMs) : null;
  }

  /**
   * Indexes [lo, hi] of the checks that decide correctionAt for every time t with fromMs <= t < toMs
   * (or t <= toMs): lo the last check before fromMs (else the first; the last alone from its time on), hi
   * the first at or after toMs (else the last). correctionAt at such a t reads only checks between them.
   */
  private span(timed: readonly TimedCorrection[], fromMs: number, toMs: number): [number, number] {
    const last = timed.length - 1;
    if (fromMs >= timed[last].atMs) return [last, last]; // from the last check on it is held
    let lo = 0;
    while (lo + 1 < timed.length && timed[lo + 1].atMs < fromMs) lo++;
    let hi = lo;
    while (hi + 1 < timed.length && timed[hi].atMs < toMs) hi++;
    return [lo, hi];
  }

  /**
   * The one correction of every reading in [fromMs, toMs), null when there is no check, "varies"
   * when it changes there (a check inside, or drift between two checks with different corrections).
   */
  over(instrument: string, fromMs: number, toMs: number): LinearCorrection | null | "varies" {
    const e = this.byInstrument.get(instrument);
    if (!e) return null;
    const [lo, hi] = this.span(e.timed, fromMs, toMs);
    const c = e.timed[lo];
    for (let i = lo + 1; i <= hi; i++) if (e.timed[i].gain !== c.gain || e.timed[i].shiftRhPercent !== c.shiftRhPercent) return "varies";
    return { gain: c.gain, shiftRhPercent: c.shiftRhPercent };
  }

  /** over(), for a block already known to have one correction. */
  constantOver(instrument: string, fromMs: number, toMs: number): LinearCorrection | null {
    const c = this.over(instrument, fromMs, toMs);
    if (c === "varies") throw new Error("The correction varies within this block; its readings must be read.");
    return c;
  }

  /** The checks that decide the correction of any reading of the instrument from firstMs to lastMs. */
  checksOver(instrument: string, firstMs: number, lastMs: number): OffsetCheck[] {
    const e = this.byInstrument.get(instrument);
    if (!e) return [];
    const [lo, hi] = this.span(e.timed, firstMs, lastMs);
    return e.checks.slice(lo, hi + 1);
  }
}

/**
 * The checks used by a series: each instrument's first and last reading time is noted (blocks and
 * readings alike), and the checks are those that decide a correction between them, so the list does
 * not depend on how the series was read.
 */
export class OffsetsUsed {
  private readonly spans = new Map<string, { firstMs: number; lastMs: number }>();
  note(instrument: string, firstMs: number, lastMs = firstMs): void {
    const s = this.spans.get(instrument);
    if (!s) this.spans.set(instrument, { firstMs, lastMs });
    else {
      s.firstMs = Math.min(s.firstMs, firstMs);
      s.lastMs = Math.max(s.lastMs, lastMs);
    }
  }
  list(timeline: OffsetTimeline): OffsetInUse[] {
    const out: OffsetInUse[] = [];
    for (const [instrument, s] of this.spans) {
      for (const c of timeline.checksOver(instrument, s.firstMs, s.lastMs)) out.push({ instrument, offsetPercent: c.offsetRhPercent, slope: c.slope, from: c.checkedAt, saltId: c.saltId });
    }
    return out.sort((a, b) => a.from.getTime() - b.from.getTime() || a.instrument.localeCompare(b.instrument));
  }
}

/** Apply the checks' corrections (raw values are kept in rhRaw); returns the checks used. */
export function applyOffsets(rows: Row[], timeline: OffsetTimeline, used = new OffsetsUsed()): OffsetInUse[] {
  if (timeline.empty) return [];
  for (const r of rows) {
    r.rhPercent = applyCorrection(r.rhRaw, timeline.at(r.instrument, r.takenAt.getTime()));
    used.note(r.instrument, r.takenAt.getTime());
  }
  return used.list(timeline);
}
