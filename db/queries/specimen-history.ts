import "server-only";
// A specimen's history: chloride tests, akaganeite checks, prior treatments and weighings. Rules
// (exact masses, mass change, chloride state) come from lib/specimens/history.ts; what a blind
// scorer may see from lib/trials/access.ts.
import { and, asc, eq, inArray, lte } from "drizzle-orm";
import type { PgColumn } from "drizzle-orm/pg-core";
import { AppError } from "@/lib/auth/errors";
import { isUuid } from "@/lib/ids";
import { akaganeiteSeenOf, chlorideStateOf, datedBeforeStart, historyBeforeTrial, massChanges, weighedByStart, type ChlorideState } from "@/lib/specimens/history";
import { historyForViewer, trialOfHistoryDate } from "@/lib/trials/access";
import { historyPermission, type HistoryEntryInput } from "@/lib/validation/specimen-history";
import { recordAudit } from "../audit";
import { db } from "../client";
import { akaganeiteChecks, chlorideTests, massMeasurements, placements, priorTreatments, specimens } from "../schema";
import { HISTORY_TABLES, historyOutcome, historyValues, type HistoryRow } from "./specimen-history-kinds";
import { assertAllowed, type Actor } from "./specimens";

const notFound = () => new AppError("not-found", "No such specimen in this lab.");

/** Record one dated history entry of a specimen of the actor's lab, with its audit event. */
export async function addHistoryEntry({ actor, input }: { actor: Actor; input: HistoryEntryInput }) {
  assertAllowed(actor, historyPermission(input.kind));
  if (!isUuid(input.specimenId)) throw notFound();
  return db.transaction(async (tx) => {
    const [specimen] = await tx.select({ id: specimens.id, label: specimens.label }).from(specimens)
      .where(and(eq(specimens.labId, actor.labId), eq(specimens.id, input.specimenId))).for("share");
    if (!specimen) throw notFound();
    const spans = await tx.select({ trialId: placements.trialId, fromAt: placements.fromAt }).from(placements)
      .where(and(eq(placements.labId, actor.labId), eq(placements.specimenId, specimen.id)));
    const { table, entity, name, on } = HISTORY_TABLES[input.kind];
    const values = historyValues(input);
    const [row] = (await tx.insert(table).values({ ...values, labId: actor.labId, specimenId: specimen.id, createdBy: actor.userId } as never).returning()) as HistoryRow[];
    const day = on(values as never);
    const summary = `${name} of ${specimen.label} on ${day}${historyOutcome(values)}`;
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity, entityId: row.id, trialId: trialOfHistoryDate(day, spans), action: "create", summary, after: row });
    return { id: row.id, specimenLabel: specimen.label, name };
  });
}

/** Everything recorded about one specimen, oldest first, as the viewer may see it (blind scorers: see historyForViewer). */
export async function loadSpecimenHistory({ labId, specimenId, blindTrialIds }: { labId: string; specimenId: string; blindTrialIds: ReadonlySet<string> }) {
  if (!isUuid(specimenId)) throw notFound();
  const mine = (t: { labId: PgColumn; specimenId: PgColumn }) => and(eq(t.labId, labId), eq(t.specimenId, specimenId));
  const [chloride, akaganeite, treatments, weighings, spans] = await Promise.all([
    db.select().from(chlorideTests).where(mine(chlorideTests)).orderBy(asc(chlorideTests.testedOn), asc(chlorideTests.createdAt)),
    db.select().from(akaganeiteChecks).where(mine(akaganeiteChecks)).orderBy(asc(akaganeiteChecks.checkedOn), asc(akaganeiteChecks.createdAt)),
    db.select().from(priorTreatments).where(mine(priorTreatments)).orderBy(asc(priorTreatments.treatedOn), asc(priorTreatments.createdAt)),
    db.select().from(massMeasurements).where(mine(massMeasurements)).orderBy(asc(massMeasurements.measuredOn), asc(massMeasurements.createdAt)),
    db.select({ trialId: placements.trialId, fromAt: placements.fromAt }).from(placements).where(and(eq(placements.labId, labId), eq(placements.specimenId, specimenId))),
  ]);
  const view = <T,>(rows: T[], on: (r: T) => string) => historyForViewer(rows.map((x) => ({ ...x, on: on(x) })), spans, blindTrialIds);
  const c = view(chloride, (r) => r.testedOn);
  const a = view(akaganeite, (r) => r.checkedOn);
  const t = view(treatments, (r) => r.treatedOn);
  const m = view(weighings, (r) => r.measuredOn);
  return {
    chlorideTests: c.shown, akaganeiteChecks: a.shown, priorTreatments: t.shown,
    weighings: massChanges(m.shown),
    chlorideState: chlorideStateOf(c.shown), akaganeiteSeen: akaganeiteSeenOf(a.shown),
    hidden: c.hidden + a.hidden + t.hidden + m.hidden,
  };
}

export type HistoryFactors = { chlorideState: ChlorideState; akaganeiteSeen: boolean | null; initialMassG: number | null };

/**
 * Per specimen, what its history says before a given day (a trial's allocation or start): the
 * chloride state of the latest test, whether akaganeite was ever seen (both dated before the day), and
 * the first weighing (made on or before the day, as the report's baseline).
 * Used as blocking factors in allocation and as covariates in the humidity-response models.
 */
export async function loadHistoryFactors({ labId, specimenIds, before }: { labId: string; specimenIds: readonly string[]; before?: string }): Promise<Map<string, HistoryFactors>> {
  const ids = [...new Set(specimenIds)].filter(isUuid);
  const out = new Map<string, HistoryFactors>(ids.map((id) => [id, { chlorideState: "untested", akaganeiteSeen: null, initialMassG: null }]));
  if (ids.length === 0) return out;
  const [chloride, akaganeite, weighings] = await Promise.all([
    db.select({ specimenId: chlorideTests.specimenId, testedOn: chlorideTests.testedOn, result: chlorideTests.result, createdAt: chlorideTests.createdAt }).from(chlorideTests)
      .where(and(eq(chlorideTests.labId, labId), inArray(chlorideTests.specimenId, ids))),
    db.select({ specimenId: akaganeiteChecks.specimenId, checkedOn: akaganeiteChecks.checkedOn, seen: akaganeiteChecks.seen }).from(akaganeiteChecks)
      .where(and(eq(akaganeiteChecks.labId, labId), inArray(akaganeiteChecks.specimenId, ids))),
    db.select({ specimenId: massMeasurements.specimenId, measuredOn: massMeasurements.measuredOn, massG: massMeasurements.massG }).from(massMeasurements)
      .where(and(eq(massMeasurements.labId, labId), inArray(massMeasurements.specimenId, ids))).orderBy(asc(massMeasurements.measuredOn), asc(massMeasurements.createdAt)),
  ]);
  // As the trial report reads the history (historyBeforeTrial): states dated before the start, weighings up to it.
  const inTime = (on: string) => before === undefined || datedBeforeStart(on, before);
  const weighedInTime = (on: string) => before === undefined || weighedByStart(on, before);
  const group = <T extends { specimenId: string }>(rows: T[]) => {
    const m = new Map<string, T[]>();
    for (const r of rows) m.set(r.specimenId, [...(m.get(r.specimenId) ?? []), r]);
    return m;
  };
  const cBy = group(chloride.filter((r) => inTime(r.testedOn)));
  const aBy = group(akaganeite.filter((r) => inTime(r.checkedOn)));
  const wBy = group(weighings.filter((r) => weighedInTime(r.measuredOn)));
  for (const id of ids) {
    const first = wBy.get(id)?.[0];
    out.set(id, {
      chlorideState: chlorideStateOf(cBy.get(id) ?? []),
      akaganeiteSeen: akaganeiteSeenOf(aBy.get(id) ?? []),
      initialMassG: first ? Number(first.massG) : null,
    });
  }
  return out;
}

/** Every history entry of the given specimens of the lab, by specimen and date (the data package's history tables). */
/**
 * Every history entry of the specimens, oldest first; with `untilDay` (YYYY-MM-DD) only those dated up to
 * that day: a trial's data package stops at the trial's end, so entries made while a specimen sat in a
 * later trial (which the downloader may score blind) are not in it.
 */
export async function loadHistoryRows({ labId, specimenIds, untilDay }: { labId: string; specimenIds: readonly string[]; untilDay?: string }) {
  const ids = [...new Set(specimenIds)].filter(isUuid);
  const none = { chlorideTestRows: [], akaganeiteCheckRows: [], priorTreatmentRows: [], massMeasurementRows: [] };
  if (ids.length === 0) return none;
  const theirs = (t: { labId: PgColumn; specimenId: PgColumn }, on: PgColumn) => and(eq(t.labId, labId), inArray(t.specimenId, ids), untilDay ? lte(on, untilDay) : undefined);
  const [chlorideTestRows, akaganeiteCheckRows, priorTreatmentRows, massMeasurementRows] = await Promise.all([
    db.select().from(chlorideTests).where(theirs(chlorideTests, chlorideTests.testedOn)).orderBy(asc(chlorideTests.specimenId), asc(chlorideTests.testedOn), asc(chlorideTests.createdAt)),
    db.select().from(akaganeiteChecks).where(theirs(akaganeiteChecks, akaganeiteChecks.checkedOn)).orderBy(asc(akaganeiteChecks.specimenId), asc(akaganeiteChecks.checkedOn), asc(akaganeiteChecks.createdAt)),
    db.select().from(priorTreatments).where(theirs(priorTreatments, priorTreatments.treatedOn)).orderBy(asc(priorTreatments.specimenId), asc(priorTreatments.treatedOn), asc(priorTreatments.createdAt)),
    db.select().from(massMeasurements).where(theirs(massMeasurements, massMeasurements.measuredOn)).orderBy(asc(massMeasurements.specimenId), asc(massMeasurements.measuredOn), asc(massMeasurements.createdAt)),
  ]);
  return { chlorideTestRows, akaganeiteCheckRows, priorTreatmentRows, massMeasurementRows };
}

/**
 * Per specimen placed in a trial, its origin and what its history says at the trial
 * (historyBeforeTrial): the trial report's history table. Results-gated like the report.
 */
export async function loadTrialHistory({ labId, trial }: { labId: string; trial: { id: string; startedAt: Date | null; concludedAt: Date | null } }) {
  const placed = await db.selectDistinct({ specimenId: placements.specimenId }).from(placements)
    .where(and(eq(placements.labId, labId), eq(placements.trialId, trial.id)));
  const ids = placed.map((p) => p.specimenId);
  if (ids.length === 0) return [];
  const day = (d: Date) => d.toISOString().slice(0, 10);
  const startOn = trial.startedAt ? day(trial.startedAt) : null;
  const endOn = day(trial.concludedAt ?? new Date());
  const [rows, history] = await Promise.all([
    db.select({ id: specimens.id, label: specimens.label, parentPiece: specimens.parentPiece, slice: specimens.slice, provenance: specimens.provenance })
      .from(specimens).where(and(eq(specimens.labId, labId), inArray(specimens.id, ids))).orderBy(asc(specimens.label)),
    // Entries made after the trial (perhaps during a later, blind one) stay out, as in the data package.
    loadHistoryRows({ labId, specimenIds: ids, untilDay: endOn }),
  ]);
  const of = <T extends { specimenId: string }>(list: readonly T[], id: string) => list.filter((r) => r.specimenId === id);
  return rows.map((sp) => ({
    ...sp,
    ...historyBeforeTrial({
      chlorideTests: of(history.chlorideTestRows, sp.id), akaganeiteChecks: of(history.akaganeiteCheckRows, sp.id),
      priorTreatments: of(history.priorTreatmentRows, sp.id), weighings: of(history.massMeasurementRows, sp.id),
    }, startOn, endOn),
  }));
}
export type TrialHistoryRow = Awaited<ReturnType<typeof loadTrialHistory>>[number];
