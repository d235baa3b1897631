// From database rows to one outcome per placement (a specimen in the trial under one chamber and
// treatment): its scored inspections, its first-rust interval and its final state. Scores of record
// only; the caller passes done inspections only.
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

export interface SpecimenOutcome extends Omit<PlacementInput, "fromAt" | "toAt"> {
  observations: ScoredInspection[];
  /** (lower, upper] in days; upper null = right-censored at lower (never seen rusted). */
  interval: { lower: number; upper: number | null } | null;
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

  return input.placements.map((p) => {
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
    const raw = firstRustInterval(
      observations.map((o) => ({ inspectedAt: o.day, rusted: o.rusted, areaPercent: o.areaPercent })),
      0,
    );
    const interval = raw ? { lower: raw.lower, upper: Number.isFinite(raw.upper) ? raw.upper : null } : null;
    const last = observations[observations.length - 1];
    const { fromAt: _from, toAt: _to, ...rest } = p;
    return {
      ...rest,
      observations,
      interval,
      rusted: interval?.upper != null,
      finalAreaPercent: last ? last.areaPercent : null,
      finalDay: last ? last.day : null,
      weepingSeen: observations.some((o) => o.weeping),
    };
  });
}
