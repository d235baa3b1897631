// The comparison's choices as URL search parameters, shared by the pages and the JSON endpoint.
import { z } from "zod";
import { AppError } from "@/lib/auth/errors";
import { CURVE_METHODS } from "./result";
import { GROUPINGS } from "./groups";

export const OUTCOMES = ["first-rust", "area", "final"] as const;
export type OutcomeView = (typeof OUTCOMES)[number];

export const OUTCOME_LABELS: Record<OutcomeView, string> = {
  "first-rust": "Time to first rust",
  area: "Rusted area over time",
  final: "Final state",
};

const querySchema = z.object({
  groupBy: z.enum(GROUPINGS).default("treatment"),
  method: z.enum(CURVE_METHODS).default("turnbull"),
  outcome: z.enum(OUTCOMES).default("first-rust"),
});
export type AnalysisQuery = z.infer<typeof querySchema>;

function toObject(params: URLSearchParams | Record<string, string | string[] | undefined>) {
  const entries = params instanceof URLSearchParams ? [...params.entries()] : Object.entries(params);
  const out: Record<string, string> = {};
  for (const [k, v] of entries) if (typeof v === "string" && v !== "") out[k] = v;
  return out;
}

/** For the API: a bad value is a 422 with the field named. */
export function analysisQuery(params: URLSearchParams): AnalysisQuery {
  const parsed = querySchema.safeParse(toObject(params));
  if (!parsed.success) {
    throw new AppError("invalid", "Unknown grouping, method or outcome.", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  }
  return parsed.data;
}

/** For pages: a bad or missing value falls back to the default, so an old link still opens. */
export function pageQuery(params: Record<string, string | string[] | undefined>): AnalysisQuery {
  const raw = toObject(params);
  const out = querySchema.parse({});
  for (const key of Object.keys(out) as (keyof AnalysisQuery)[]) {
    const one = querySchema.shape[key].safeParse(raw[key]);
    if (one.success) (out as Record<string, string>)[key] = one.data;
  }
  return out;
}
