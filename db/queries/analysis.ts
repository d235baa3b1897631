import "server-only";
import { and, asc, desc, eq, gte, inArray, isNotNull, isNull, lte, or, sql } from "drizzle-orm";
import { compareGroups, scorerAgreement, type GradePair } from "@/lib/analysis/compare";
import type { ComparisonResult, CurveMethod, Endpoint } from "@/lib/analysis/result";
import { deriveSpecimenOutcomes, type SpecimenOutcome } from "@/lib/analysis/derive";
import type { Grouping } from "@/lib/analysis/groups";
import type { LeftOutScores } from "@/lib/analysis/sentences";
import { trialDataPackage } from "@/lib/export/trial-package";
import { DEFAULT_THRESHOLDS_RH_PERCENT, excludedByBand } from "@/lib/climate/exposure";
import type { ExposureQuery } from "@/lib/analysis/params";
import { loadHistoryRows } from "./specimen-history";
import { loadTrialExposure, type PlacementExposureRow } from "./exposure";
import { db } from "../client";
import { getTrial, type Trial } from "./trial-access";
import { scaleScoreRows } from "./photo-evidence";
import { areaKey, outcomeAreasMm2 } from "@/lib/scoring/scaled-areas";
import { chambers, inspections, photos, placements, readings, scores, specimens, storageRules, treatments, trialArms, trials } from "../schema";

const DAY_MS = 86_400_000;

/** Trials of the lab with what there is to analyse, newest first. */
export async function listTrialsForAnalysis({ labId }: { labId: string }) {
  // labId in each count lets them use the (lab, trial) indexes.
  const specimenCount = db.$count(placements, and(eq(placements.labId, labId), eq(placements.trialId, trials.id)));
  const doneCount = db.$count(inspections, and(eq(inspections.labId, labId), eq(inspections.trialId, trials.id), isNotNull(inspections.doneAt)));
  const scoreCount = db.$count(scores, and(eq(scores.labId, labId), eq(scores.trialId, trials.id), eq(scores.isRecord, true)));
  return db
    .select({
      id: trials.id, title: trials.title, status: trials.status, startedAt: trials.startedAt,
      specimens: specimenCount, doneInspections: doneCount, recordScores: scoreCount,
    })
    .from(trials)
    .where(eq(trials.labId, labId))
    .orderBy(desc(trials.createdAt));
}

export type AnalysisTrial = Trial;

/** Time zero: the recorded start, else the first inspection's planned time less its plan day. */
function startOf(trial: AnalysisTrial, done: readonly { dayNumber: number; plannedAt: Date }[]): Date | null {
  if (trial.startedAt) return trial.startedAt;
  const first = done[0];
  return first ? new Date(first.plannedAt.getTime() - first.dayNumber * DAY_MS) : null;
}

/**
 * Done inspections, placements and scores of record of one trial, turned into one outcome per
 * placement by lib/analysis/derive: the one time-to-first-rust derivation, used by the comparison,
 * the report, the exports and the score page (which passes one specimenId).
 */
export async function loadSpecimenOutcomes({ labId, trial, specimenId }: { labId: string; trial: AnalysisTrial; specimenId?: string }) {
  const trialId = trial.id;
  const [placementRows, doneRows, scoreRows] = await Promise.all([
    db
      .select({
        placementId: placements.id, specimenId: placements.specimenId, specimenLabel: specimens.label,
        materialClass: specimens.materialClass, chamberId: placements.chamberId, chamberName: chambers.name,
        chamberRhPercent: chambers.setpointRhPercent, treatmentId: placements.treatmentId, treatmentName: treatments.name,
        treatmentKind: treatments.kind, armLabel: trialArms.label, fromAt: placements.fromAt, toAt: placements.toAt,
      })
      .from(placements)
      .innerJoin(specimens, eq(specimens.id, placements.specimenId))
      .innerJoin(chambers, eq(chambers.id, placements.chamberId))
      .innerJoin(treatments, eq(treatments.id, placements.treatmentId))
      .leftJoin(trialArms, eq(trialArms.id, placements.armId))
      .where(and(eq(placements.labId, labId), eq(placements.trialId, trialId), specimenId ? eq(placements.specimenId, specimenId) : undefined))
      .orderBy(asc(specimens.label), asc(placements.fromAt)),
    db
      .select({ id: inspections.id, dayNumber: inspections.dayNumber, plannedAt: inspections.plannedAt, doneAt: inspections.doneAt })
      .from(inspections)
      .where(and(eq(inspections.labId, labId), eq(inspections.trialId, trialId), isNotNull(inspections.doneAt)))
      .orderBy(asc(inspections.doneAt)),
    db
      .select({
        inspectionId: scores.inspectionId, specimenId: scores.specimenId, spotCount: scores.spotCount,
        areaPercent: scores.areaPercent, weeping: scores.weeping, updatedAt: scores.updatedAt,
      })
      .from(scores)
      .where(and(eq(scores.labId, labId), eq(scores.trialId, trialId), eq(scores.isRecord, true), specimenId ? eq(scores.specimenId, specimenId) : undefined)),
  ]);
  const done = doneRows.map((r) => ({ ...r, doneAt: r.doneAt! }));
  const startAt = startOf(trial, done);
  const outcomes: SpecimenOutcome[] = startAt
    ? deriveSpecimenOutcomes({ startAt, placements: placementRows, inspections: done, scores: scoreRows })
    : [];
  return { startAt, outcomes, doneInspections: done.length, recordScores: scoreRows.length };
}

/**
 * Scores of record that loadSpecimenOutcomes does not analyse because their inspection is not marked
 * done, counted per inspection (the comparison and the report say so and link to the inspection).
 * Only counts: time to first rust still comes from loadSpecimenOutcomes alone.
 */
export async function loadLeftOutScores({ labId, trialId }: { labId: string; trialId: string }): Promise<LeftOutScores[]> {
  return db
    .select({ inspectionId: inspections.id, dayNumber: inspections.dayNumber, scores: sql<number>`count(*)::int` })
    .from(scores)
    .innerJoin(inspections, eq(inspections.id, scores.inspectionId))
    .where(and(eq(scores.labId, labId), eq(scores.trialId, trialId), eq(scores.isRecord, true), eq(inspections.labId, labId), isNull(inspections.doneAt)))
    .groupBy(inspections.id, inspections.dayNumber)
    .orderBy(asc(inspections.dayNumber));
}

/**
 * Score pairs (score of record, blind second score) on the same inspection and specimen: the rust
 * evidence of each (spot count, area, weeping: the rust call) and the ASTM grades where both gave
 * one. With several blind scorers, the one who scored most photos is taken: kappa compares exactly
 * two raters.
 */
export async function loadGradePairs({ labId, trialId }: { labId: string; trialId: string }): Promise<GradePair[]> {
  const rows = await db
    .select({
      inspectionId: scores.inspectionId, specimenId: scores.specimenId, scorerId: scores.scorerId, isRecord: scores.isRecord, blind: scores.blind,
      grade: scores.astmGrade, spotCount: scores.spotCount, areaPercent: scores.areaPercent, weeping: scores.weeping,
    })
    .from(scores)
    .innerJoin(inspections, eq(inspections.id, scores.inspectionId))
    .where(and(eq(scores.labId, labId), eq(scores.trialId, trialId), isNotNull(inspections.doneAt)));
  type Row = (typeof rows)[number];
  const evidence = (r: Row) => ({ spotCount: r.spotCount, areaPercent: r.areaPercent, weeping: r.weeping });
  const record = new Map<string, Row>();
  for (const r of rows) if (r.isRecord) record.set(`${r.inspectionId}|${r.specimenId}`, r);
  const byScorer = new Map<string, GradePair[]>();
  for (const r of rows) {
    if (r.isRecord || !r.blind || !r.scorerId) continue;
    const rec = record.get(`${r.inspectionId}|${r.specimenId}`);
    if (!rec || rec.scorerId === r.scorerId) continue;
    const list = byScorer.get(r.scorerId) ?? [];
    list.push({ recordGrade: rec.grade, blindGrade: r.grade, record: evidence(rec), blind: evidence(r) });
    byScorer.set(r.scorerId, list);
  }
  return [...byScorer.values()].sort((a, b) => b.length - a.length)[0] ?? [];
}

export interface TrialAnalysis {
  trial: AnalysisTrial;
  startAt: Date | null;
  outcomes: SpecimenOutcome[];
  doneInspections: number;
  recordScores: number;
  /** Scores of record at inspections not marked done, per inspection: left out of the analysis. */
  leftOut: LeftOutScores[];
  /** Null when nothing is scored yet (the page shows its empty state). */
  comparison: ComparisonResult | null;
  /** What each jar measured per placement, and the specimens the re-analysis left out; null when not asked. */
  exposure: TrialExposure | null;
}

export interface TrialExposure {
  query: ExposureQuery;
  placements: PlacementExposureRow[];
  /** Specimens left out of the comparison: a placement's jar was out of band more than the share. */
  excluded: { specimenId: string; specimenLabel: string; chamberName: string; outOfBandPercent: number }[];
}

/** Everything the compare page, the report and the JSON endpoint show; another lab's trial is not found. */
export async function getTrialAnalysis({ labId, trialId, groupBy, method, endpoint, exposure: exposureQuery }: {
  labId: string; trialId: string; groupBy: Grouping; method?: CurveMethod; endpoint?: Endpoint; exposure?: ExposureQuery;
}): Promise<TrialAnalysis> {
  const trial = await getTrial({ labId, trialId });
  const [loaded, pairs, leftOut, exposureRows] = await Promise.all([
    loadSpecimenOutcomes({ labId, trial }), loadGradePairs({ labId, trialId }), loadLeftOutScores({ labId, trialId }),
    exposureQuery ? loadTrialExposure({ labId, trial, thresholdsRhPercent: exposureQuery.thresholdsRhPercent }) : null,
  ]);
  const exposure = exposureQuery && exposureRows ? trialExposure(exposureQuery, exposureRows) : null;
  const left = new Set(exposure?.excluded.map((e) => e.specimenId));
  const analysed = left.size ? loaded.outcomes.filter((o) => !left.has(o.specimenId)) : loaded.outcomes;
  const scored = analysed.some((o) => o.interval);
  const comparison = scored
    ? compareGroups(analysed, { groupBy, method, endpoint, agreement: scorerAgreement(pairs) })
    : null;
  return { trial, ...loaded, leftOut, comparison, exposure };
}

/** The re-analysis's exclusions: each specimen once, with its worst placement. */
function trialExposure(query: ExposureQuery, placements: PlacementExposureRow[]): TrialExposure {
  const worst = new Map<string, TrialExposure["excluded"][number]>();
  if (query.maxOutOfBandPercent != null) {
    for (const p of excludedByBand(placements, query.maxOutOfBandPercent)) {
      const outOfBandPercent = p.exposure.outOfBandShare! * 100;
      const seen = worst.get(p.specimenId);
      if (!seen || outOfBandPercent > seen.outOfBandPercent) worst.set(p.specimenId, { specimenId: p.specimenId, specimenLabel: p.specimenLabel, chamberName: p.chamberName, outOfBandPercent });
    }
  }
  return { query, placements, excluded: [...worst.values()].sort((a, b) => a.specimenLabel.localeCompare(b.specimenLabel)) };
}

/** Raw rows of one trial for the data package; readings only for its chambers while it ran. */
export async function loadExportRows({ labId, trial }: { labId: string; trial: AnalysisTrial }) {
  const trialId = trial.id;
  const none = sql`false`;
  const until = trial.concludedAt ?? new Date();
  const [placementRows, inspectionRows, scoreRows, photoRows] = await Promise.all([
    db.select().from(placements).where(and(eq(placements.labId, labId), eq(placements.trialId, trialId))).orderBy(asc(placements.createdAt)),
    db.select().from(inspections).where(and(eq(inspections.labId, labId), eq(inspections.trialId, trialId))).orderBy(asc(inspections.plannedAt)),
    db.select().from(scores).where(and(eq(scores.labId, labId), eq(scores.trialId, trialId))).orderBy(asc(scores.inspectionId), asc(scores.specimenId), asc(scores.createdAt)),
    // Photos of the trial, and any photo a score of the trial points at (so every foreign key resolves).
    db.select().from(photos).where(and(eq(photos.labId, labId), or(eq(photos.trialId, trialId), inArray(photos.id,
      db.select({ id: scores.photoId }).from(scores).where(and(eq(scores.trialId, trialId), isNotNull(scores.photoId)))))))
      .orderBy(asc(photos.createdAt)),
  ]);
  // Every specimen a row of the package names: placed ones, and any a photo or score names (a
  // specimen taken out of the allocation keeps its photos), so every foreign key resolves.
  const specimenIds = [...new Set([...placementRows, ...photoRows, ...scoreRows].map((r) => r.specimenId))];
  const chamberIds = [...new Set(placementRows.map((p) => p.chamberId))];
  const treatmentIds = [...new Set(placementRows.map((p) => p.treatmentId))];
  const [specimenRows, chamberRows, treatmentRows, readingRows, storageRuleRows, historyRows] = await Promise.all([
    db.select().from(specimens).where(and(eq(specimens.labId, labId), specimenIds.length ? inArray(specimens.id, specimenIds) : none)).orderBy(asc(specimens.label)),
    db.select().from(chambers).where(and(eq(chambers.labId, labId), chamberIds.length ? inArray(chambers.id, chamberIds) : none)).orderBy(asc(chambers.name)),
    db.select().from(treatments).where(and(eq(treatments.labId, labId), treatmentIds.length ? inArray(treatments.id, treatmentIds) : none)).orderBy(asc(treatments.name)),
    trial.startedAt && chamberIds.length
      ? db.select().from(readings).where(and(eq(readings.labId, labId), inArray(readings.chamberId, chamberIds),
        gte(readings.takenAt, trial.startedAt), lte(readings.takenAt, until))).orderBy(asc(readings.chamberId), asc(readings.takenAt))
      : Promise.resolve([] as (typeof readings.$inferSelect)[]),
    db.select().from(storageRules).where(and(eq(storageRules.labId, labId), sql`${trialId}::uuid = any(${storageRules.sourceTrialIds})`))
      .orderBy(asc(storageRules.materialClass), asc(storageRules.treatmentName), asc(storageRules.version)),
    loadHistoryRows({ labId, specimenIds, untilDay: until.toISOString().slice(0, 10) }),
  ]);
  // A photo's series scale is its own specimen's (as loadScaledRecords reads it).
  const photoSpecimen = new Map(photoRows.map((p) => [p.id, p.specimenId]));
  const scaled = await scaleScoreRows({ labId, trialId, rows: scoreRows.map((r) => ({ ...r, photoSpecimenId: r.photoId ? photoSpecimen.get(r.photoId) ?? null : null })) });
  const scoreRowsMm2 = scoreRows.map((r, i) => ({ ...r, areaMm2: scaled[i].areaMm2 }));
  return { placementRows, specimenRows, chamberRows, treatmentRows, inspectionRows, scoreRows: scoreRowsMm2, photoRows, readingRows, storageRuleRows, ...historyRows };
}
export type ExportRows = Awaited<ReturnType<typeof loadExportRows>>;

/** The trial's data package as a zip (buffered: a trial's tables are a few MB at most). */
export async function buildTrialDataPackage({ labId, trial, now = new Date() }: { labId: string; trial: AnalysisTrial; now?: Date }) {
  const [rows, loaded, exposure] = await Promise.all([
    loadExportRows({ labId, trial }), loadSpecimenOutcomes({ labId, trial }), loadTrialExposure({ labId, trial, thresholdsRhPercent: DEFAULT_THRESHOLDS_RH_PERCENT, now }),
  ]);
  // The scores of record already carry their mm² (loadExportRows): the outcomes' areas come from those.
  const areas = outcomeAreasMm2(loaded.outcomes, new Map(rows.scoreRows.filter((r) => r.isRecord).map((r) => [areaKey(r.inspectionId, r.specimenId), r.areaMm2])));
  return trialDataPackage({ trial, rows, outcomes: loaded.outcomes, exposure, areas, now });
}
