// What a comparison of groups answers: the shape the comparison page, the report and the analysis
// endpoint read, and the plain-language sentences are written from (lib/analysis/compare.ts fills it).
import type { AreaPoint } from "@/lib/stats/outcomes";
import type { KruskalWallisResult, PairwiseLogRank } from "@/lib/stats/tests";
import type { KmSummary, TurnbullSummary } from "./curves";
import type { Grouping } from "./groups";

export const CURVE_METHODS = ["turnbull", "km"] as const;
export type CurveMethod = (typeof CURVE_METHODS)[number];

/** The event whose first appearance the survival part times: rust (the default) or weeping. */
export const ENDPOINTS = ["rust", "weeping"] as const;
export type Endpoint = (typeof ENDPOINTS)[number];
export const ENDPOINT_EVENT: Record<Endpoint, string> = { rust: "first rust", weeping: "first weeping" };

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

export interface RustCallAgreement {
  /** Photos (specimen × inspection) with both a score of record and a blind second score. */
  pairs: number;
  /** Cohen's kappa on the rust / no-rust call (isRusted); null when undefined (one call used by both). */
  kappa: number | null;
  /** Calls both made the same. */
  agreed: number;
  recordRusted: number;
  blindRusted: number;
}

export interface AgreementResult {
  /** The headline: agreement on the call that defines the endpoint. */
  rustCall: RustCallAgreement;
  /** Pairs with an ASTM D610 grade on both scores. */
  pairs: number;
  /** Unweighted Cohen's kappa on ASTM D610 grades; null when undefined (one grade used by both) or no grades. */
  kappa: number | null;
  kappaQuadratic: number | null;
}

export interface ComparisonResult {
  groupBy: Grouping;
  groupByLabel: string;
  method: CurveMethod;
  /** What the survival part times: first rust or first weeping. */
  endpoint: Endpoint;
  /** The log-rank tests are stratified by this ("chamber"), or null when not stratified. */
  stratifiedBy: string | null;
  groups: GroupResult[];
  atRisk: { times: number[]; counts: number[][] };
  logRank: { chiSquare: number; df: number; pValue: number; stratifiedBy: string | null } | null;
  pairwise: (PairwiseLogRank & { events: number })[];
  /** Rusted vs not rusted by group: Fisher's exact test, or Pearson's χ² when the table is too large to enumerate. */
  finalStateTest: FinalStateTest | null;
  kruskal: KruskalWallisResult | null;
  agreement: AgreementResult | null;
  /**
   * placements: all of them; moved: placements that entered after the start (a specimen moved in);
   * notAtRisk: placements left out because the specimen had already shown the event in an earlier one.
   */
  totals: { placements: number; scored: number; rusted: number; inspectionDays: number[]; moved: number; notAtRisk: number };
  /** Plain-language result, in reading order; `notes` are the caveats that follow it. */
  summary: string[];
  notes: string[];
}

export type FinalStateTest =
  | { method: "fisher"; pValue: number }
  | { method: "chi-square"; pValue: number; chiSquare: number; df: number };
