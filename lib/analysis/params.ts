// The comparison's choices as URL search parameters, shared by the pages and the JSON endpoint.
// The outcome view a trial opens on comes from its primary outcome when the URL does not name one.
import { z } from "zod";
import { AppError } from "@/lib/auth/errors";
import { DEFAULT_THRESHOLDS_RH_PERCENT } from "@/lib/climate/exposure";
import type { PrimaryOutcome } from "@/lib/validation/trials";
import { CURVE_METHODS, type Endpoint } from "./result";
import { GROUPINGS } from "./groups";

export const OUTCOMES = ["first-rust", "weeping", "area", "final"] as const;
export type OutcomeView = (typeof OUTCOMES)[number];

export const OUTCOME_LABELS: Record<OutcomeView, string> = {
  "first-rust": "Time to first rust",
  weeping: "Time to first weeping",
  area: "Rusted area over time",
  final: "Final state",
};

/** The view that shows each primary outcome of a trial (lib/validation/trials.ts PRIMARY_OUTCOMES). */
export const PRIMARY_OUTCOME_VIEWS: Record<PrimaryOutcome, OutcomeView> = {
  "time-to-first-rust": "first-rust",
  "rusted-area-growth": "area",
  "final-rust-grade": "final",
  "time-to-weeping": "weeping",
};

/** The default view for a trial's primary outcome; an unknown value opens on time to first rust. */
export function defaultOutcomeView(primaryOutcome: string | null | undefined): OutcomeView {
  return PRIMARY_OUTCOME_VIEWS[primaryOutcome as PrimaryOutcome] ?? "first-rust";
}

/** The survival part of a view times first weeping on the weeping view, first rust otherwise. */
export function endpointOf(outcome: OutcomeView): Endpoint {
  return outcome === "weeping" ? "weeping" : "rust";
}

const querySchema = z.object({
  groupBy: z.enum(GROUPINGS).default("treatment"),
  method: z.enum(CURVE_METHODS).default("turnbull"),
  outcome: z.enum(OUTCOMES).optional(),
});
export type AnalysisQuery = { groupBy: (typeof GROUPINGS)[number]; method: (typeof CURVE_METHODS)[number]; outcome: OutcomeView };

function toObject(params: URLSearchParams | Record<string, string | string[] | undefined>) {
  const entries = params instanceof URLSearchParams ? [...params.entries()] : Object.entries(params);
  const out: Record<string, string> = {};
  for (const [k, v] of entries) if (typeof v === "string" && v !== "") out[k] = v;
  return out;
}

/** For the API: a bad value is a 422 with the field named; no outcome → the trial's primary one. */
export function analysisQuery(params: URLSearchParams, primaryOutcome?: string | null): AnalysisQuery {
  const parsed = querySchema.safeParse(toObject(params));
  if (!parsed.success) {
    throw new AppError("invalid", "Unknown grouping, method or outcome.", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  }
  return { ...parsed.data, outcome: parsed.data.outcome ?? defaultOutcomeView(primaryOutcome) };
}

/** For pages: a bad or missing value falls back to the default, so an old link still opens. */
export function pageQuery(params: Record<string, string | string[] | undefined>, primaryOutcome?: string | null): AnalysisQuery {
  const raw = toObject(params);
  const out: AnalysisQuery = { groupBy: "treatment", method: "turnbull", outcome: defaultOutcomeView(primaryOutcome) };
  const groupBy = querySchema.shape.groupBy.safeParse(raw.groupBy);
  if (groupBy.success) out.groupBy = groupBy.data;
  const method = querySchema.shape.method.safeParse(raw.method);
  if (method.success) out.method = method.data;
  const outcome = z.enum(OUTCOMES).safeParse(raw.outcome);
  if (outcome.success) out.outcome = outcome.data;
  return out;
}

// ——— Chamber exposure and the re-analysis without out-of-band jars ———

export const MAX_THRESHOLDS = 5;

export type ExposureQuery = {
  /** RH thresholds (%RH, 0–100) for "time above"; defaults in lib/climate/exposure. URL: above=25,60 */
  thresholdsRhPercent: number[];
  /** Leave out specimens whose jar was out of band more than this share (%) of a placement; null = keep all. URL: outOfBandMax=10 */
  maxOutOfBandPercent: number | null;
};

const parseNumber = (text: string) => (/^\s*-?\d+(\.\d+)?\s*$/.test(text) ? Number(text) : NaN);

/** The exposure choices from the URL, and a message per bad parameter (which then takes its default). */
export function exposureQuery(params: URLSearchParams | Record<string, string | string[] | undefined>): { value: ExposureQuery; errors: Record<string, string[]> } {
  const raw = toObject(params);
  const errors: Record<string, string[]> = {};
  const value: ExposureQuery = { thresholdsRhPercent: [...DEFAULT_THRESHOLDS_RH_PERCENT], maxOutOfBandPercent: null };
  if (raw.above !== undefined) {
    const list = raw.above.split(",").map(parseNumber);
    if (list.length > MAX_THRESHOLDS || list.some((t) => !(t >= 0 && t <= 100))) {
      errors.above = [`RH thresholds must be up to ${MAX_THRESHOLDS} numbers from 0 to 100 %RH, separated by commas (got "${raw.above}").`];
    } else value.thresholdsRhPercent = [...new Set(list)].sort((a, b) => a - b);
  }
  if (raw.outOfBandMax !== undefined) {
    const share = parseNumber(raw.outOfBandMax);
    if (!(share >= 0 && share <= 100)) errors.outOfBandMax = [`The out-of-band share must be a number from 0 to 100 % (got "${raw.outOfBandMax}").`];
    else value.maxOutOfBandPercent = share;
  }
  return { value, errors };
}

/** For the API: a bad exposure parameter is a 422 naming it. */
export function exposureApiQuery(params: URLSearchParams): ExposureQuery {
  const { value, errors } = exposureQuery(params);
  if (Object.keys(errors).length) throw new AppError("invalid", Object.values(errors)[0][0], errors);
  return value;
}
