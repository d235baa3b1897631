// Rusted area in mm² for scores of record, from the score's percentage, the face outline drawn on
// its photo and the photo's scale; spot counts by size class from the scorer's spot marks; and growth
// in mm² per day per specimen. Pure: the rows come from db/queries/photo-evidence.ts.
import { polygonArea, type Mark, type Point } from "./geometry";
import { areaMm2FromPx2, countBySizeClass, growthMm2PerDay, rustedAreaMm2, spotAreasPx2, type SpotSizeClass } from "./scale";

export type ScaledScoreInput = { areaPercent: number; face: Point[] | null; spots: Mark[]; pxPerMm: number | null };
export type ScaledScore = {
  /** null: no scale for the photo, or no face outline to take the percentage of. */
  areaMm2: number | null;
  faceAreaMm2: number | null;
  /** Counts per size class, from the spot marks; null without a scale or marks. */
  sizeClasses: Record<SpotSizeClass, number> | null;
  /** Why there is no mm² figure, for the page. */
  missing: "scale" | "face" | null;
};

export function scaleScore({ areaPercent, face, spots, pxPerMm }: ScaledScoreInput): ScaledScore {
  if (pxPerMm == null) return { areaMm2: null, faceAreaMm2: null, sizeClasses: null, missing: "scale" };
  if (!face || face.length < 3 || !(polygonArea(face) > 0)) return { areaMm2: null, faceAreaMm2: null, sizeClasses: null, missing: "face" };
  const faceAreaPx2 = polygonArea(face);
  const spotMm2 = spotAreasPx2(face, spots).map((a) => areaMm2FromPx2(a, pxPerMm));
  return {
    areaMm2: rustedAreaMm2({ areaPercent, faceAreaPx2, pxPerMm }),
    faceAreaMm2: areaMm2FromPx2(faceAreaPx2, pxPerMm),
    sizeClasses: spotMm2.length ? countBySizeClass(spotMm2) : null,
    missing: null,
  };
}

export const areaKey = (inspectionId: string, specimenId: string) => `${inspectionId}|${specimenId}`;

export type OutcomeAreas = { finalAreaMm2: number | null; growthMm2PerDay: number | null };

/**
 * Per placement: rusted area in mm² at its last scored inspection, and growth in mm² per day as the
 * least-squares slope over its scored inspections that have a scale (days since the trial start, as
 * in the outcome table). areaMm2 is keyed by areaKey(inspection, specimen).
 */
export function outcomeAreasMm2(
  outcomes: readonly { placementId: string; specimenId: string; observations: readonly { inspectionId: string; day: number }[] }[],
  areaMm2: ReadonlyMap<string, number | null>,
): Map<string, OutcomeAreas> {
  return new Map(outcomes.map((o) => {
    const pts = o.observations.flatMap((ob) => {
      const a = areaMm2.get(areaKey(ob.inspectionId, o.specimenId));
      return a == null ? [] : [{ day: ob.day, areaMm2: a }];
    });
    const last = o.observations[o.observations.length - 1];
    return [o.placementId, { finalAreaMm2: last ? areaMm2.get(areaKey(last.inspectionId, o.specimenId)) ?? null : null, growthMm2PerDay: growthMm2PerDay(pts) }];
  }));
}
