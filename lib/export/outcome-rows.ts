// Per-specimen outcomes as flat rows for CSV (see OUTCOME_TABLE for the columns).
import type { SpecimenOutcome } from "@/lib/analysis/derive";
import type { OutcomeAreas } from "@/lib/scoring/scaled-areas";

/** areas: mm² figures per placement (db/queries/photo-evidence.ts loadOutcomeAreas); empty cells without. */
export function outcomeRows(outcomes: readonly SpecimenOutcome[], areas?: ReadonlyMap<string, OutcomeAreas>) {
  return outcomes.map((o) => ({
    placementId: o.placementId,
    specimenId: o.specimenId,
    specimenLabel: o.specimenLabel,
    materialClass: o.materialClass,
    chamberName: o.chamberName,
    treatmentName: o.treatmentName,
    armLabel: o.armLabel,
    inspectionsScored: o.observations.length,
    intervalLowerDay: o.interval?.lower ?? null,
    intervalUpperDay: o.interval?.upper ?? null,
    rusted: o.rusted,
    // Unscored specimens are neither: their cells stay empty rather than claiming censoring.
    rightCensored: o.interval ? o.interval.upper === null : null,
    finalAreaPercent: o.finalAreaPercent,
    finalAreaMm2: areas?.get(o.placementId)?.finalAreaMm2 ?? null,
    growthMm2PerDay: areas?.get(o.placementId)?.growthMm2PerDay ?? null,
    finalDay: o.finalDay,
    weepingSeen: o.weepingSeen,
    entryDay: o.entry,
    rustedEarlier: o.rustedEarlier,
    weepingLowerDay: o.weepingInterval?.lower ?? null,
    weepingUpperDay: o.weepingInterval?.upper ?? null,
  }));
}
