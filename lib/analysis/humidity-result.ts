// What the humidity response answers: the rows it fits, the choices, and the result the page, the
// report and the storage-rule action read (lib/analysis/humidity-response.ts fills it).

/** One specimen's time at risk in one jar (first placements only; see the caller). */
export interface ResponseRow {
  placementId: string;
  specimenLabel: string;
  trialId: string;
  chamberId: string;
  chamberName: string;
  /** The jar's target RH (for naming levels only; the fit uses the measured value). */
  targetRhPercent: number;
  /** Time-weighted mean RH the jar measured over the placement. */
  measuredRhPercent: number;
  materialClass: string;
  treatmentId: string;
  treatmentName: string;
  treatmentKind: string;
  /** (lower, upper] in days; upper Infinity = never seen rusted; lower 0 = rusted at the first look. */
  lower: number;
  upper: number;
  /** Specimen history before the trial (db/queries/specimen-history.ts loadHistoryFactors), for covariates. */
  chloridePresent?: boolean;
  initialMassG?: number | null;
}

export interface ResponseOptions {
  /** Share of specimens rusted, 0 < p < 1 (default 0.1). */
  p: number;
  /** The storage horizon in days (default 10 years). */
  horizonDays: number;
  /** Specimen-history covariates added to the models (lib/analysis/humidity-covariates.ts); none by default. */
  covariates?: readonly ("chloride" | "initialMass")[];
}

export const DEFAULT_RESPONSE_OPTIONS: ResponseOptions = { p: 0.1, horizonDays: 3652.5 };

/** A storage rule needs a humidity response, and a response needs at least this many levels. */
export const MIN_HUMIDITY_LEVELS = 3;

export interface Coefficient {
  name: string;
  estimate: number;
  standardError: number;
}

export interface CurvePoint {
  rhPercent: number;
  days: number;
  lower95: number;
  upper95: number;
}

export interface Threshold {
  /** Highest RH (0–100) at which the predicted time to p % rusted still reaches the horizon; null = none. */
  rhPercent: number | null;
  /** 95 % limits from the pointwise band; null where the band does not cross the horizon within 0–100 %RH. */
  lower95: number | null;
  upper95: number | null;
  /** "found", or why not: rust does not come sooner at higher RH, or every RH / no RH reaches the horizon. */
  status: "found" | "no-trend" | "above-range" | "below-range";
}

export interface ComboResult {
  key: string;
  materialClass: string;
  materialLabel: string;
  treatmentId: string;
  treatmentName: string;
  /** Specimens of this material and treatment in the fit. */
  n: number;
  curve: CurvePoint[];
  threshold: Threshold;
  /** The same threshold from the lognormal fit: how much the answer leans on the Weibull shape. */
  lognormalThreshold: Threshold | null;
  sentence: string;
}

export interface LevelCheck {
  label: string;
  meanRhPercent: number;
  n: number;
  events: number;
  /** Turnbull estimate of the share rusted, as steps. */
  observed: { day: number; rustedShare: number }[];
  /** Weibull fit's share rusted, averaged over the level's specimens. */
  fitted: { day: number; rustedShare: number }[];
}

export interface HazardRatio {
  name: string;
  hazardRatio: number;
  lower95: number;
  upper95: number;
}

export interface HumidityResponse {
  options: ResponseOptions;
  levels: { label: string; targetRhPercent: number; measuredRhPercent: number; jars: number; n: number; events: number }[];
  /** Null with `reason` when the data cannot carry the model. */
  fit: {
    distribution: "weibull";
    n: number;
    events: number;
    coefficients: Coefficient[];
    scale: number;
    logLik: number;
    lognormalLogLik: number | null;
  } | null;
  reason: string | null;
  combos: ComboResult[];
  check: LevelCheck[];
  cox: { hazardRatios: HazardRatio[]; note: string } | null;
  coxError: string | null;
  longestObservationDays: number;
  warnings: string[];
}
