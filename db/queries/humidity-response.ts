import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { humidityResponse } from "@/lib/analysis/humidity-response";
import type { ResponseOptions, ResponseRow } from "@/lib/analysis/humidity-result";
import { db } from "../client";
import { chambers } from "../schema";
import { loadSpecimenOutcomes } from "./analysis";
import { getChamberWindowStats } from "./readings-series";
import { loadHistoryFactors } from "./specimen-history";
import { getTrial, type Trial } from "./trial-access";

const DAY_MS = 86_400_000;

export interface JarExposure {
  chamberId: string;
  chamberName: string;
  trialTitle: string;
  targetRhPercent: number;
  /** Mean over the jar's specimens of the time-weighted mean RH each one saw; null without readings. */
  measuredRhPercent: number | null;
  specimens: number;
  /** Specimens whose window had no readings (the target stands in for them). */
  withoutReadings: number;
}

/**
 * The humidity response of a trial, or of several trials of the lab pooled with a trial term: each
 * specimen's first-rust interval (from the one derivation, loadSpecimenOutcomes) in its first jar,
 * against the time-weighted mean RH that jar measured while the specimen was at risk there.
 */
export async function loadHumidityResponse({ labId, trial, poolTrialIds = [], options }: {
  labId: string; trial: Trial; poolTrialIds?: readonly string[]; options: ResponseOptions;
}) {
  const others = await Promise.all(
    [...new Set(poolTrialIds)].filter((id) => id !== trial.id).map((trialId) => getTrial({ labId, trialId })),
  );
  const trialsUsed = [trial, ...others];
  const rows: ResponseRow[] = [];
  const jars = new Map<string, JarExposure & { sum: number; measured: number }>();
  let movedLeftOut = 0;

  for (const t of trialsUsed) {
    const { startAt, outcomes } = await loadSpecimenOutcomes({ labId, trial: t });
    if (!startAt) continue;
    const chamberIds = [...new Set(outcomes.map((o) => o.chamberId))];
    const chamberRows = chamberIds.length
      ? await db.select({ id: chambers.id, setpointRhPercent: chambers.setpointRhPercent, toleranceRhPercent: chambers.toleranceRhPercent })
        .from(chambers).where(and(eq(chambers.labId, labId), inArray(chambers.id, chamberIds)))
      : [];
    const chamberById = new Map(chamberRows.map((c) => [c.id, c]));
    // Specimens at risk over the same window in the same jar share one climate read.
    const windows = new Map<string, Promise<{ meanRhPercent: number | null }>>();
    // History covariates as known before the trial started (tests and weighings dated before its first day).
    const history = options.covariates?.length
      ? await loadHistoryFactors({ labId, specimenIds: outcomes.map((o) => o.specimenId), before: startAt.toISOString().slice(0, 10) })
      : null;

    for (const o of outcomes) {
      if (!o.interval) continue;
      // A specimen moved during the trial counts in its first jar only, right-censored at the move.
      if (o.entry > 0) {
        movedLeftOut++;
        continue;
      }
      const lower = o.interval.lower;
      const upper = o.interval.upper ?? Infinity;
      // A first placement is at risk from day 0 (its entry), the trial's start.
      const from = startAt;
      const endDay = Number.isFinite(upper) ? upper : lower;
      const to = new Date(Math.max(from.getTime() + DAY_MS, startAt.getTime() + endDay * DAY_MS));
      const key = `${o.chamberId}|${from.getTime()}|${to.getTime()}`;
      const chamber = chamberById.get(o.chamberId)!;
      let w = windows.get(key);
      if (!w) windows.set(key, (w = getChamberWindowStats({ labId, chamber, from, to })));
      const measured = (await w).meanRhPercent;
      rows.push({
        placementId: o.placementId, specimenLabel: o.specimenLabel, trialId: t.id,
        chamberId: o.chamberId, chamberName: o.chamberName, targetRhPercent: o.chamberRhPercent,
        measuredRhPercent: measured ?? o.chamberRhPercent,
        materialClass: o.materialClass, treatmentId: o.treatmentId, treatmentName: o.treatmentName, treatmentKind: o.treatmentKind,
        lower, upper,
        chloridePresent: history?.get(o.specimenId)?.chlorideState === "present",
        initialMassG: history?.get(o.specimenId)?.initialMassG ?? null,
      });
      const jarKey = `${t.id}|${o.chamberId}`;
      const jar = jars.get(jarKey) ?? {
        chamberId: o.chamberId, chamberName: o.chamberName, trialTitle: t.title, targetRhPercent: o.chamberRhPercent,
        measuredRhPercent: null, specimens: 0, withoutReadings: 0, sum: 0, measured: 0,
      };
      jar.specimens++;
      if (measured === null) jar.withoutReadings++;
      else {
        jar.sum += measured;
        jar.measured++;
      }
      jars.set(jarKey, jar);
    }
  }
  const response = humidityResponse(rows, options, trial.id);
  const jarList: JarExposure[] = [...jars.values()]
    .map(({ sum, measured, ...j }) => ({ ...j, measuredRhPercent: measured ? sum / measured : null }))
    .sort((a, b) => a.targetRhPercent - b.targetRhPercent || a.chamberName.localeCompare(b.chamberName));
  return { response, jars: jarList, trials: trialsUsed.map((t) => ({ id: t.id, title: t.title })), movedLeftOut, rows };
}
export type LoadedHumidityResponse = Awaited<ReturnType<typeof loadHumidityResponse>>;
