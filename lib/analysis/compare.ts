// A full comparison of groups of specimens: curves, medians, tests, growth and final state, plus
// the plain-language summary. Pure: the caller loads outcomes (db/queries/analysis.ts).
import { cohensKappa } from "@/lib/stats/agreement";
import { areaOverTime, quantileType7 } from "@/lib/stats/outcomes";
import { summarizeComparison } from "@/lib/stats/summary";
import { chiSquareUpperTail } from "@/lib/stats/distributions";
import { logRank } from "@/lib/stats/survival";
import { rightEndpointKm, type IntervalObservation } from "@/lib/stats/turnbull";
import { fisherExact, kruskalWallis, pairwiseLogRank } from "@/lib/stats/tests";
import { kmSummary, numbersAtRisk, turnbullSummary } from "./curves";
import type { SpecimenOutcome } from "./derive";
import { GROUPING_LABELS, groupOutcomes, type Grouping } from "./groups";
import { extraSentences } from "./sentences";
import { type AgreementResult, type ComparisonResult, type CurveMethod, type FinalStateTest, type GroupResult } from "./result";

export function intervalsOf(members: readonly SpecimenOutcome[]): IntervalObservation[] {
  return members
    .filter((m) => m.interval)
    .map((m) => ({ lower: m.interval!.lower, upper: m.interval!.upper ?? Infinity }));
}

/** ASTM D610 grades (0…10) of the score of record and the blind second score of one photo. */
export interface GradePair {
  recordGrade: number;
  blindGrade: number;
}

export function scorerAgreement(pairs: readonly GradePair[]): AgreementResult | null {
  const usable = pairs.filter((p) => Number.isInteger(p.recordGrade) && Number.isInteger(p.blindGrade)
    && p.recordGrade >= 0 && p.recordGrade <= 10 && p.blindGrade >= 0 && p.blindGrade <= 10);
  if (usable.length === 0) return null;
  const a = usable.map((p) => p.recordGrade);
  const b = usable.map((p) => p.blindGrade);
  const finite = (x: number) => (Number.isFinite(x) ? x : null);
  return {
    pairs: usable.length,
    kappa: finite(cohensKappa(a, b, { categories: 11 })),
    kappaQuadratic: finite(cohensKappa(a, b, { categories: 11, weights: "quadratic" })),
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
  options: { groupBy: Grouping; method?: CurveMethod; agreement?: AgreementResult | null },
): ComparisonResult {
  const method = options.method ?? "turnbull";
  const grouped = groupOutcomes(outcomes, options.groupBy);
  const inspectionDays = [...new Set(outcomes.flatMap((o) => o.observations.map((x) => x.day)))].sort((a, b) => a - b);

  const perGroup = grouped.map((g) => {
    const intervals = intervalsOf(g.members);
    const scored = g.members.filter((m) => m.interval);
    const events = scored.filter((m) => m.rusted).length;
    const finalAreas = scored.map((m) => m.finalAreaPercent).filter((x): x is number => x !== null).sort((a, b) => a - b);
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
        rusted: events,
        notRusted: scored.length - events,
        medianAreaPercent: finalAreas.length ? quantileType7(finalAreas, 0.5) : null,
      },
    };
    return { result, intervals, finalAreas };
  });
  const groups = perGroup.map((g) => g.result);

  // Groups with nothing scored yet take no part in the tests.
  const tested = perGroup.filter((g) => g.result.n > 0);
  const right = tested.map((g) => rightEndpointKm(g.intervals));
  const totalEvents = groups.reduce((s, g) => s + g.events, 0);
  const lr = tested.length >= 2 && totalEvents > 0 ? logRank(right) : null;
  const order = pairOrder(tested.length);
  const pairwise = tested.length >= 2
    ? pairwiseLogRank(right, tested.map((g) => g.result.label))
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
    kappa: options.agreement?.kappa ?? null,
  });

  const result: ComparisonResult = {
    groupBy: options.groupBy,
    groupByLabel: GROUPING_LABELS[options.groupBy],
    method,
    groups,
    atRisk: { times: [], counts: [] },
    logRank: lr && lr.df > 0 ? { chiSquare: lr.chiSquare, df: lr.df, pValue: lr.pValue } : null,
    pairwise,
    finalStateTest,
    kruskal,
    agreement: options.agreement ?? null,
    totals: {
      placements: outcomes.length,
      scored: groups.reduce((s, g) => s + g.n, 0),
      rusted: totalEvents,
      inspectionDays,
    },
    summary,
    notes: [],
  };
  const times = riskTimes(inspectionDays);
  result.atRisk = { times, counts: numbersAtRisk(perGroup.map((g) => g.intervals), times) };
  result.notes = extraSentences(result, { pairsInSummary: MAX_PAIRS_IN_SUMMARY });
  return result;
}
