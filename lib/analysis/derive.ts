// From database rows to one outcome per placement (a specimen in the trial under one chamber and
// treatment): its scored inspections, its first-rust and first-weeping intervals and its final state.
// Scores of record only; the caller passes done inspections only.
//
// A specimen moved to another jar has one placement per jar. Its first placement runs from the trial
// start (entry 0); a later one enters at its from-time (delayed entry: at risk only after the move).
// Clean at the move, the specimen is right-censored in the old placement at its last clean look
// before the move and enters the new one at the move. Rusted in an earlier placement, it stays
// rusted: its later placements are not at risk (rustedEarlier) and the survival analysis leaves them out.
import { firstRustInterval, isRusted } from "@/lib/stats/outcomes";

const MS_PER_DAY = 86_400_000;

export interface PlacementInput {
  placementId: string;
  specimenId: string;
  specimenLabel: string;
  materialClass: string;
  chamberId: string;
  chamberName: string;
  chamberRhPercent: number;
  treatmentId: string;
  treatmentName: string;
  treatmentKind: string;
  armLabel: string | null;
  fromAt: Date | null;
  toAt: Date | null;
}

export interface InspectionInput {
  id: string;
  dayNumber: number;
  doneAt: Date;
}

export interface RecordScoreInput {
  inspectionId: string;
  specimenId: string;
  spotCount: number;
  areaPercent: number;
  weeping: boolean;
  updatedAt: Date;
}

export interface ScoredInspection {
  inspectionId: string;
  /** Days since the trial start, from the time the inspection was done. */
  day: number;
  rusted: boolean;
  areaPercent: number;
  weeping: boolean;
}

export type OutcomeInterval = { lower: number; upper: number | null };

export interface SpecimenOutcome extends Omit<PlacementInput, "fromAt" | "toAt"> {
  observations: ScoredInspection[];
  /** Days since the trial start when this placement came under observation: 0 for a specimen's
   * first placement, the move's day for a later one (at risk only after it). */
  entry: number;
  /** (lower, upper] in days; upper null = right-censored at lower (never seen rusted). */
  interval: OutcomeInterval | null;
  /** The same for the first look with weeping (time to weeping). */
  weepingInterval: OutcomeInterval | null;
  /** Seen rusted in an earlier placement of the same specimen: not at risk here, left out of the
   * survival analysis (the per-specimen table still lists it). */
  rustedEarlier: boolean;
  /** Seen weeping in an earlier placement: left out of the time-to-weeping analysis. */
  weptEarlier: boolean;
  rusted: boolean;
  finalAreaPercent: number | null;
  finalDay: number | null;
  weepingSeen: boolean;
}

/** Days since start of an inspection's actual time, rounded to 0.1 day (2.4 h): finer than any
 * inspection spacing (a day or more), coarse enough that an inspection done an hour after its planned
 * time reads as its planned day, and it makes specimens seen at the same inspection tie exactly, as the
 * survival tallies expect. The score page and the comparison both use it. */
export function dayOf(at: Date, startAt: Date): number {
  return Math.round(Math.max(0, (at.getTime() - startAt.getTime()) / MS_PER_DAY) * 10) / 10;
}

/**
 * (last look without the event, first look with it] in days since the trial start, for a placement
 * under observation from `entry`: firstRustInterval (the one rule) on the looks after the entry, on
 * the entry's scale. A later placement's look at or before its entry (the move's own day) belongs
 * to the move, not to the time at risk.
 */
function eventInterval(observations: readonly ScoredInspection[], entry: number, isFirst: boolean, hit: (o: ScoredInspection) => boolean): OutcomeInterval | null {
  const looks = isFirst ? observations : observations.filter((o) => o.day > entry);
  const raw = firstRustInterval(looks.map((o) => ({ inspectedAt: o.day, rusted: hit(o), areaPercent: o.areaPercent })), isFirst ? 0 : entry);
  if (!raw) return null;
  const shift = isFirst ? 0 : entry;
  return { lower: raw.lower + shift, upper: Number.isFinite(raw.upper) ? raw.upper + shift : null };
}

export function deriveSpecimenOutcomes(input: {
  startAt: Date;
  placements: readonly PlacementInput[];
  inspections: readonly InspectionInput[];
  scores: readonly RecordScoreInput[];
}): SpecimenOutcome[] {
  const { startAt } = input;
  // One score of record per (inspection, specimen); if a rule change left two, the latest edit wins.
  const scoreByKey = new Map<string, RecordScoreInput>();
  for (const s of input.scores) {
    const key = `${s.inspectionId}|${s.specimenId}`;
    const prev = scoreByKey.get(key);
    if (!prev || prev.updatedAt < s.updatedAt) scoreByKey.set(key, s);
  }
  // A specimen's first placement also owns inspections done just before its from-time (a baseline
  // photo taken before the jar was sealed); later placements only own what happened during them.
  const firstFrom = new Map<string, number>();
  for (const p of input.placements) {
    const t = p.fromAt?.getTime() ?? -Infinity;
    firstFrom.set(p.specimenId, Math.min(firstFrom.get(p.specimenId) ?? Infinity, t));
  }

  const derived = input.placements.map((p) => {
    const from = p.fromAt?.getTime() ?? -Infinity;
    const isFirst = from === firstFrom.get(p.specimenId);
    const observations: ScoredInspection[] = [];
    for (const insp of input.inspections) {
      const t = insp.doneAt.getTime();
      if (p.toAt && t >= p.toAt.getTime()) continue;
      if (t < from && !isFirst) continue;
      const score = scoreByKey.get(`${insp.id}|${p.specimenId}`);
      if (!score) continue;
      observations.push({
        inspectionId: insp.id,
        day: dayOf(insp.doneAt, startAt),
        rusted: isRusted(score),
        areaPercent: score.areaPercent,
        weeping: score.weeping,
      });
    }
    observations.sort((a, b) => a.day - b.day);
    const entry = isFirst || !p.fromAt ? 0 : dayOf(p.fromAt, startAt);
    const interval = eventInterval(observations, entry, isFirst, (o) => o.rusted);
    const weepingInterval = eventInterval(observations, entry, isFirst, (o) => o.weeping);
    const last = observations[observations.length - 1];
    const { fromAt: _from, toAt: _to, ...rest } = p;
    const outcome: SpecimenOutcome = {
        ...rest,
        observations,
        entry,
        interval,
        weepingInterval,
        rustedEarlier: false,
        weptEarlier: false,
        rusted: interval?.upper != null,
        finalAreaPercent: last ? last.areaPercent : null,
        finalDay: last ? last.day : null,
        weepingSeen: observations.some((o) => o.weeping),
    };
    return { from, outcome };
  });

  // Rust and weeping carry over a move: a later placement of a specimen already seen rusted
  // (weeping) in an earlier one is not at risk of a first rust (weeping).
  const bySpecimen = new Map<string, typeof derived>();
  for (const d of derived) bySpecimen.set(d.outcome.specimenId, [...(bySpecimen.get(d.outcome.specimenId) ?? []), d]);
  for (const list of bySpecimen.values()) {
    if (list.length < 2) continue;
    let rusted = false;
    let wept = false;
    for (const d of [...list].sort((a, b) => a.from - b.from)) {
      d.outcome.rustedEarlier = rusted;
      d.outcome.weptEarlier = wept;
      rusted ||= d.outcome.observations.some((o) => o.rusted);
      wept ||= d.outcome.observations.some((o) => o.weeping);
    }
  }
  return derived.map((d) => d.outcome);
}
