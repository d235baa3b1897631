// What a specimen actually saw while placed in a jar: the jar's readings over the placement,
// corrected by the instrument's hygrometer checks (linear drift between checks, the nearest check
// held outside them), reduced by the step rule and gap limit of band-stats: time-weighted mean RH,
// the share of time out of the jar's band, time above chosen RH thresholds, and time with the dew
// point within a margin of the air temperature (condensation risk on anything a little cooler).
import { bandStats, countedMinutesWhere, type RhBand } from "@/lib/climate/band-stats";
import { applyCorrection, correctionAt, type TimedCorrection } from "@/lib/climate/hygrometer-check";
import { condensationPointC } from "@/lib/humidity/psychrometrics";

/** Dew point within this many °C of the air temperature counts as condensation risk. */
export const CONDENSATION_MARGIN_C = 2;

/**
 * Default thresholds: corrosion of chloride-bearing iron appreciable from 25 %RH (Watkinson &
 * Lewis 2005, Studies in Conservation 50(4)) and rapid from 60–70 %RH (Watkinson, Rimmer &
 * Emmerson 2019, Studies in Conservation 64(8)).
 */
export const DEFAULT_THRESHOLDS_RH_PERCENT: readonly number[] = [25, 60];

export type ExposureReading = { takenAt: Date; rhRaw: number; tempC: number | null; instrument: string };
export type CorrectedReading = { takenAt: Date; rhPercent: number; tempC: number | null };

export interface Exposure {
  readings: number;
  /** Counted time (intervals longer than the gap limit left out). */
  countedMinutes: number;
  meanRhPercent: number | null;
  /** Share of counted time out of the jar's band, 0–1; null with no counted time. */
  outOfBandShare: number | null;
  above: { thresholdRhPercent: number; minutes: number }[];
  /** Counted time with a temperature, over which condensation risk could be judged. */
  minutesWithTemp: number;
  condensationMinutes: number;
  /** True when some reading was corrected by a check (drift-interpolated). */
  corrected: boolean;
}

/** Corrected readings: each instrument's checks (sorted by time) interpolated at the reading's time. */
export function correctReadings(rows: readonly ExposureReading[], checks: ReadonlyMap<string, readonly TimedCorrection[]>): CorrectedReading[] {
  return rows.map((r) => {
    const c = correctionAt(checks.get(r.instrument) ?? [], r.takenAt.getTime());
    return { takenAt: r.takenAt, rhPercent: applyCorrection(r.rhRaw, c), tempC: r.tempC };
  });
}

/** Dew point within marginC of the air temperature; null without a temperature. */
export function condensationRisk(r: CorrectedReading, marginC = CONDENSATION_MARGIN_C): boolean | null {
  if (r.tempC == null) return null;
  if (r.rhPercent <= 0) return false;
  try {
    return r.tempC - condensationPointC(r.tempC, r.rhPercent).tempC <= marginC;
  } catch {
    return null;
  }
}

/** rows sorted by time (then instrument), all within the placement. */
export function placementExposure({ rows, checks, band, thresholdsRhPercent = DEFAULT_THRESHOLDS_RH_PERCENT, maxGapMinutes }: {
  rows: readonly ExposureReading[]; checks: ReadonlyMap<string, readonly TimedCorrection[]>; band: RhBand;
  thresholdsRhPercent?: readonly number[]; maxGapMinutes: number;
}): Exposure {
  const series = correctReadings(rows, checks);
  const stats = bandStats(series, band, { maxGapMinutes });
  const condensation = countedMinutesWhere(series, (r) => condensationRisk(r), { maxGapMinutes });
  return {
    readings: rows.length,
    countedMinutes: stats.countedMinutes,
    meanRhPercent: stats.meanRhPercent,
    outOfBandShare: stats.fractionInBand == null ? null : 1 - stats.fractionInBand,
    above: thresholdsRhPercent.map((t) => ({ thresholdRhPercent: t, minutes: countedMinutesWhere(series, (r) => r.rhPercent > t, { maxGapMinutes }).minutes })),
    minutesWithTemp: condensation.judgedMinutes,
    condensationMinutes: condensation.minutes,
    corrected: rows.some((r) => (checks.get(r.instrument)?.length ?? 0) > 0),
  };
}

/**
 * The re-analysis rule: a specimen is left out when any of its placements spent more than
 * maxOutOfBandPercent of its counted time out of band. A placement with no counted time cannot be
 * judged and does not exclude.
 */
export function excludedByBand<T extends { specimenId: string; exposure: Exposure }>(placements: readonly T[], maxOutOfBandPercent: number): T[] {
  return placements.filter((p) => p.exposure.outOfBandShare != null && p.exposure.outOfBandShare * 100 > maxOutOfBandPercent);
}
