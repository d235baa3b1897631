// A full comparison of groups of specimens: curves, medians, tests, growth and final state, plus
// the plain-language summary. Pure: the caller loads outcomes (db/queries/analysis.ts).
import { cohensKappa } from "@/lib/stats/agreement";
import { areaOverTime, isRusted, quantileType7, type RustEvidence } from "@/lib/stats/outcomes";
import { summarizeComparison } from "@/lib/stats/summary";
import { chiSquareUpperTail } from "@/lib/stats/distributions";
import { logRank, stratifiedLogRank } from "@/lib/stats/survival";
import { rightEndpointKm, type IntervalObservation } from "@/lib/stats/turnbull";
import { fisherExact, kruskalWallis, pairwiseLogRank, pairwiseStratifiedLogRank } from "@/lib/stats/tests";
import { kmSummary, numbersAtRisk, turnbullSummary } from "./curves";
import type { SpecimenOutcome } from "./derive";
import { GROUPING_LABELS, GROUPING_NOUNS, GROUPING_STRATA, groupOutcomes, type Grouping } from "./groups";
import { extraSentences } from "./sentences";
import { ENDPOINT_EVENT, type AgreementResult, type ComparisonResult, type CurveMethod, type Endpoint, type FinalStateTest, type GroupResult } from "./result";

/** Whether a placement is at risk of the endpoint's first event (not already shown in an earlier placement). */
export function atRiskOf(o: SpecimenOutcome, endpoint: Endpoint = "rust"): boolean {
  return endpoint === "rust" ? !o.rustedEarlier : !o.weptEarlier;
}

/** The endpoint's interval of one placement. */
export function endpointInterval(o: SpecimenOutcome, endpoint: Endpoint = "rust") {
  return endpoint === "rust" ? o.interval : o.weepingInterval;
}

/** Interval observations of the placements at risk; a moved specimen's placement carries its entry. */
export function intervalsOf(members: readonly SpecimenOutcome[], endpoint: Endpoint = "rust"): IntervalObservation[] {
  const out: IntervalObservation[] = [];
  for (const m of members) {
    const iv = endpointInterval(m, endpoint);
    if (!iv || !atRiskOf(m, endpoint)) continue;
    const row: IntervalObservation = { lower: iv.lower, upper: iv.upper ?? Infinity };
    if (m.entry > 0) row.entry = m.entry;
    out.push(row);
  }
  return out;
}

/** One photo scored twice: the score of record and the blind second score (ASTM grade when given). */
export interface GradePair {
  recordGrade: number | null;
  blindGrade: number | null;
  record: RustEvidence;
  blind: RustEvidence;
}

const isGrade = (g: number | null): g is number => g !== null && Number.isInteger(g) && g >= 0 && g <= 10;

/**
 * Agreement between the score of record and the blind second score: the headline is Cohen's kappa on
 * the rust / no-rust call (isRusted, the call that defines the endpoint); kappa on ASTM D610 grades
 * (unweighted and quadratic) follows on the pairs graded by both.
 */
export function scorerAgreement(pairs: readonly GradePair[]): AgreementResult | null {
  if (pairs.length === 0) return null;
  const finite = (x: number) => (Number.isFinite(x) ? x : null);
  const recordCall = pairs.map((p) => (isRusted(p.record) ? 1 : 0));
  const blindCall = pairs.map((p) => (isRusted(p.blind) ? 1 : 0));
  const graded = pairs.filter((p) => isGrade(p.recordGrade) && isGrade(p.blindGrade));
  const a = graded.map((p) => p.recordGrade!);
  const b = graded.map((p) => p.blindGrade!);
  return {
    rustCall: {
      pairs: pairs.length,
      kappa: finite(cohensKappa(recordCall, blindCall, { categories: 2 })),
      agreed: recordCall.filter((x, i) => x === blindCall[i]).length,
      recordRusted: recordCall.filter((x) => x === 1).length,
      blindRusted: blindCall.filter((x) => x === 1).length,
    },
    pairs: graded.length,
    kappa: graded.length ? finite(cohensKappa(a, b, { categories: 11 })) : null,
    kappaQuadratic: graded.length ? finite(cohensKappa(a, b, { categories: 11, weights: "quadratic" })) : null,
  };
}

// Every table of a bench-top trial enumerates well within this (~20 ms); a large trial split into
// many arms would not, and there Pearson's χ² approximation is sound anyway (large counts).
const FISHER_PAGE_BUDGET = 250_000;

/** Pearson's χ² test of independence for an r × c table of counts (empty rows/columns dropped). */
export function pearsonChiSquare(table: readonly (readonly number[])[]): { chiSquare: number; df: number; pValue: number } {
  const rows = table.filter((r) => r.some((x) => x > 0));
  const colSums = rows[0]?.map((_, j) => rows.reduce((sum, r) => sum + r[j], 0)) ?? [];
  const cols = colSums.map((c, j) => (c > 0 ? j : -1)).filter((j) => j >= 0);
  const n = colSums.reduce((a, b) => a + b, 0);
  let chiSquare = 0;
  for (const r of rows) {
    const rowSum = r.reduce((a, b) => a + b, 0);
    for (const j of cols) {
      const expected = (rowSum * colSums[j]) / n;
      chiSquare += (r[j] - expected) ** 2 / expected;
    }
  }
  const df = Math.max(0, (rows.length - 1) * (cols.length - 1));
  return { chiSquare, df, pValue: df > 0 ? chiSquareUpperTail(chiSquare, df) : 1 };
}

function testFinalState(table: number[][]): FinalStateTest {
  try {
    return { method: "fisher", pValue: fisherExact(table, { maxTables: FISHER_PAGE_BUDGET }).pValue };
  } catch {
    return { method: "chi-square", ...pearsonChiSquare(table) };
  }
}

// A numbers-at-risk table wider than this stops fitting under the chart on a page.
const MAX_RISK_COLUMNS = 10;

/** Inspection days (plus the start when the first inspection came later than a baseline would). */
function riskTimes(days: readonly number[]): number[] {
  const all = days.length > 0 && days[0] < 1 ? [...days] : [0, ...days];
  if (all.length <= MAX_RISK_COLUMNS) return all;
  const step = (all.length - 1) / (MAX_RISK_COLUMNS - 1);
  return [...new Set(Array.from({ length: MAX_RISK_COLUMNS }, (_, i) => all[Math.round(i * step)]))];
}

/** Index pairs (a < b) in the order pairwiseLogRank enumerates them. */
function pairOrder(k: number): [number, number][] {
  const out: [number, number][] = [];
  for (let a = 0; a < k; a++) for (let b = a + 1; b < k; b++) out.push([a, b]);
  return out;
}

// The summary names every pair only while that stays readable; the full list is in the table.
const MAX_PAIRS_IN_SUMMARY = 6;

export function compareGroups(
  outcomes: readonly SpecimenOutcome[],
  options: { groupBy: Grouping; method?: CurveMethod; agreement?: AgreementResult | null; endpoint?: Endpoint },
): ComparisonResult {
  const method = options.method ?? "turnbull";
  const endpoint = options.endpoint ?? "rust";
  const stratifiedBy = GROUPING_STRATA[options.groupBy];
  // A placement of a specimen that already showed the event in an earlier placement is not at risk:
  // it is left out here (and listed in the per-specimen table), so each specimen counts once.
  const atRisk = outcomes.filter((o) => atRiskOf(o, endpoint));
  const grouped = groupOutcomes(atRisk, options.groupBy);
  const inspectionDays = [...new Set(outcomes.flatMap((o) => o.observations.map((x) => x.day)))].sort((a, b) => a - b);
  // The final state is a specimen's, not a placement's: a specimen moved while clean counts once, in
  // the group of its last scored placement under observation (its earlier placement ended clean at the move).
  const lastPlacement = new Map<string, SpecimenOutcome>();
  for (const o of atRisk) {
    if (!endpointInterval(o, endpoint)) continue;
    const seen = lastPlacement.get(o.specimenId);
    if (!seen || o.entry > seen.entry) lastPlacement.set(o.specimenId, o);
  }

  const perGroup = grouped.map((g) => {
    const intervals = intervalsOf(g.members, endpoint);
    const scored = g.members.filter((m) => endpointInterval(m, endpoint));
    const events = scored.filter((m) => endpointInterval(m, endpoint)!.upper !== null).length;
    const finalScored = scored.filter((m) => lastPlacement.get(m.specimenId) === m);
    const finalRusted = finalScored.filter((m) => m.rusted).length;
    const finalAreas = finalScored.map((m) => m.finalAreaPercent).filter((x): x is number => x !== null).sort((a, b) => a - b);
    const result: GroupResult = {
      key: g.key,
      label: g.label,
      n: scored.length,
      unscored: g.members.length - scored.length,
      events,
      censored: scored.length - events,
      turnbull: turnbullSummary(intervals),
      km: kmSummary(intervals),
      area: areaOverTime([{
        label: g.label,
        specimens: scored.map((m) => ({
          startDay: 0,
          inspections: m.observations.map((o) => ({ inspectedAt: o.day, rusted: o.rusted, areaPercent: o.areaPercent })),
        })),
      }])[0].points,
      final: {
        rusted: finalRusted,
        notRusted: finalScored.length - finalRusted,
        medianAreaPercent: finalAreas.length ? quantileType7(finalAreas, 0.5) : null,
      },
    };
    // Stratified tests take each placement's chamber as its stratum.
    const right = rightEndpointKm(intervals);
    const strata = scored.filter((m) => atRiskOf(m, endpoint)).map((m) => m.chamberId);
    return { result, intervals, finalAreas, right, strata };
  });
  const groups = perGroup.map((g) => g.result);

  // Groups with nothing scored yet take no part in the tests.
  const tested = perGroup.filter((g) => g.result.n > 0);
  const right = tested.map((g) => g.right);
  const withStrata = tested.map((g) => g.right.map((r, i) => ({ ...r, stratum: g.strata[i] })));
  const totalEvents = groups.reduce((s, g) => s + g.events, 0);
  const lr = tested.length < 2 || totalEvents === 0 ? null
    : stratifiedBy
      ? stratifiedLogRank(withStrata.flatMap((rows, j) => rows.map((r) => ({ ...r, group: String(j).padStart(4, "0") }))))
      : logRank(right);
  const order = pairOrder(tested.length);
  const labels = tested.map((g) => g.result.label);
  const pairwise = tested.length >= 2
    ? (stratifiedBy ? pairwiseStratifiedLogRank(withStrata, labels) : pairwiseLogRank(right, labels))
      .map((p, i) => ({ ...p, events: tested[order[i][0]].result.events + tested[order[i][1]].result.events }))
    : [];

  const finalStateTest = tested.length >= 2 ? testFinalState(tested.map((g) => [g.result.final.rusted, g.result.final.notRusted])) : null;
  const withAreas = tested.filter((g) => g.finalAreas.length > 0);
  const kruskal = withAreas.length >= 2 ? kruskalWallis(withAreas.map((g) => g.finalAreas)) : null;

  const useKm = method === "km";
  const summary = summarizeComparison({
    groups: groups.map((g) => ({
      name: g.label,
      n: g.n,
      events: g.events,
      median: useKm
        ? (g.km.median === null ? null : { time: g.km.median })
        : g.turnbull.median,
    })),
    logRankP: lr && lr.df > 0 ? lr.pValue : null,
    chiSquare: lr?.chiSquare,
    df: lr?.df,
    // With two groups the pairwise test is the overall one; with many, the table lists them.
    pairwise: tested.length > 2 && pairwise.length <= MAX_PAIRS_IN_SUMMARY ? pairwise : undefined,
    intervalCensored: true,
    kappa: options.agreement?.rustCall.kappa ?? null,
    eventLabel: ENDPOINT_EVENT[endpoint],
    stratifiedBy: stratifiedBy ?? undefined,
    groupNoun: GROUPING_NOUNS[options.groupBy],
  });

  const result: ComparisonResult = {
    groupBy: options.groupBy,
    groupByLabel: GROUPING_LABELS[options.groupBy],
    method,
    endpoint,
    stratifiedBy,
    groups,
    atRisk: { times: [], counts: [] },
    logRank: lr && lr.df > 0 ? { chiSquare: lr.chiSquare, df: lr.df, pValue: lr.pValue, stratifiedBy } : null,
    pairwise,
    finalStateTest,
    kruskal,
    agreement: options.agreement ?? null,
    totals: {
      placements: outcomes.length,
      scored: groups.reduce((s, g) => s + g.n, 0),
      rusted: totalEvents,
      inspectionDays,
      moved: outcomes.filter((o) => o.entry > 0).length,
      notAtRisk: outcomes.length - atRisk.length,
    },
    summary,
    notes: [],
  };
  const times = riskTimes(inspectionDays);
  result.atRisk = { times, counts: numbersAtRisk(perGroup.map((g) => g.intervals), times) };
  result.notes = extraSentences(result, { pairsInSummary: MAX_PAIRS_IN_SUMMARY });
  return result;
}
