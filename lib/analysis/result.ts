// What a comparison of groups answers: the shape the comparison page, the report and the analysis
// endpoint read, and the plain-language sentences are written from (lib/analysis/compare.ts fills it).
import type { AreaPoint } from "@/lib/stats/outcomes";
import type { KruskalWallisResult, PairwiseLogRank } from "@/lib/stats/tests";
import type { KmSummary, TurnbullSummary } from "./curves";
import type { Grouping } from "./groups";

export const CURVE_METHODS = ["turnbull", "km"] as const;
export type CurveMethod = (typeof CURVE_METHODS)[number];

export interface GroupResult {
  key: string;
  label: string;
  /** Specimens with at least one scored inspection (the ones analysed). */
  n: number;
  unscored: number;
  events: number;
  censored: number;
  turnbull: TurnbullSummary;
  km: KmSummary;
  area: AreaPoint[];
  final: { rusted: number; notRusted: number; medianAreaPercent: number | null };
}

export interface AgreementResult {
  pairs: number;
  /** Unweighted Cohen's kappa on ASTM D610 grades; null when undefined (one grade used by both). */
  kappa: number | null;
  kappaQuadratic: number | null;
}

export interface ComparisonResult {
  groupBy: Grouping;
  groupByLabel: string;
  method: CurveMethod;
  groups: GroupResult[];
  atRisk: { times: number[]; counts: number[][] };
  logRank: { chiSquare: number; df: number; pValue: number } | null;
  pairwise: (PairwiseLogRank & { events: number })[];
  /** Rusted vs not rusted by group: Fisher's exact test, or Pearson's χ² when the table is too large to enumerate. */
  finalStateTest: FinalStateTest | null;
  kruskal: KruskalWallisResult | null;
  agreement: AgreementResult | null;
  totals: { placements: number; scored: number; rusted: number; inspectionDays: number[] };
  /** Plain-language result, in reading order; `notes` are the caveats that follow it. */
  summary: string[];
  notes: string[];
}

export type FinalStateTest =
  | { method: "fisher"; pValue: number }
  | { method: "chi-square"; pValue: number; chiSquare: number; df: number };
