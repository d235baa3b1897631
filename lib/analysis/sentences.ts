// Caveats and secondary results that follow the plain-language summary of time to first rust.
import { describeKappa, formatPValue } from "@/lib/stats/summary";
import { GROUPING_NOUNS } from "./groups";
import type { AgreementResult, ComparisonResult } from "./result";

/** How a moved specimen is grouped and timed, in one plain sentence (compare page, report, method notes). */
export const MOVED_SPECIMEN_NOTE =
  "A specimen moved to another jar counts in the group of each jar it was in: it is counted as still clean in the old jar " +
  "up to its last inspection before the move and is at risk in the new jar only from the day of the move; once seen rusted, " +
  "its later placements are not counted again. Its final state (rusted or not, final area) counts once, in the group of its last jar.";

/** Scores of record at one inspection that is not marked done (db/queries/analysis loadLeftOutScores). */
export interface LeftOutScores {
  inspectionId: string;
  dayNumber: number;
  scores: number;
}

/**
 * What the comparison leaves out and why: scores count once their inspection is marked done. Null when
 * nothing is left out. `items` are one phrase per inspection, split around the inspection's name so a
 * page can make that a link ("2 scores at the " + "day-56 inspection" + ", which is not marked done").
 */
export function leftOutScoresText(leftOut: readonly LeftOutScores[], recordScores: number) {
  const total = leftOut.reduce((s, r) => s + r.scores, 0);
  if (total === 0) return null;
  const scoresOf = (n: number) => `${n} score${n === 1 ? "" : "s"}`;
  return {
    total,
    analysed: recordScores - total,
    lead:
      `${total} of the ${recordScores} scores of record ${total === 1 ? "is" : "are"} left out of this comparison, because an inspection ` +
      "counts only once it is marked done (until then its scores may still be incomplete):",
    items: leftOut.map((r) => ({
      inspectionId: r.inspectionId,
      before: `${scoresOf(r.scores)} at the `,
      name: `day-${r.dayNumber} inspection`,
      after: ", which is not marked done",
    })),
    close: "Mark the inspection done to bring its scores into the comparison.",
  };
}

/** The headline (kappa on the rust / no-rust call) and kappa on ASTM D610 grades, or why there is none. */
export function agreementSentences(a: AgreementResult | null): string[] {
  if (!a) {
    return ["No blind second scores exist for this trial, so agreement between scorers was not checked; every rust call rests on one scorer."];
  }
  const out: string[] = [];
  const call = a.rustCall;
  if (call.kappa === null) {
    out.push(
      `Scorer agreement on the rust / no-rust call could not be expressed as kappa: on the ${call.pairs} photos scored twice ` +
        `both scorers made the same single call every time (${call.agreed} of ${call.pairs} agree), so chance agreement is already complete.`,
    );
  } else {
    out.push(
      `Scorer agreement on the rust / no-rust call (the call that defines first rust) is Cohen's κ = ${call.kappa.toFixed(2)}, ` +
        `${describeKappa(call.kappa)}, over ${call.pairs} photos scored by the scorer of record and a blind second scorer ` +
        `(${call.agreed} of ${call.pairs} calls agree; rust called ${call.recordRusted} times by the scorer of record, ${call.blindRusted} by the second scorer).`,
    );
  }
  if (a.pairs === 0) out.push("No photo scored twice has an ASTM D610 grade from both scorers, so there is no kappa on ASTM D610 grades.");
  else if (a.kappa === null) {
    out.push(`Kappa on ASTM D610 grades is undefined: on the ${a.pairs} photos graded twice both scorers used a single grade.`);
  } else {
    out.push(
      `Kappa on ASTM D610 grades over ${a.pairs} photos: κ = ${a.kappa.toFixed(2)}, ${describeKappa(a.kappa)}` +
        (a.kappaQuadratic !== null ? `; quadratic-weighted κ = ${a.kappaQuadratic.toFixed(2)}` : "") + ".",
    );
  }
  return out;
}

export const STANDING_NOTE =
  "These results guide storage decisions; they do not replace a conservator's judgement of each specimen.";

const pct = (x: number) => `${Number(x.toFixed(x < 1 ? 2 : 1))} %`;

export function extraSentences(r: ComparisonResult, opts: { pairsInSummary: number }): string[] {
  const out: string[] = [];
  const tested = r.groups.filter((g) => g.n > 0);
  const noun = GROUPING_NOUNS[r.groupBy];

  if (r.pairwise.length > opts.pairsInSummary) {
    const differ = r.pairwise.filter((p) => p.adjustedPValue < 0.05);
    out.push(
      `${r.pairwise.length} pairwise log-rank comparisons${r.stratifiedBy ? ` stratified by ${r.stratifiedBy}` : ""}, Holm-adjusted, are listed in the table; ` +
        (differ.length === 0
          ? "none of them differs at the 0.05 level."
          : `${differ.length} differ at the 0.05 level: ${differ.map((p) => `${p.groupA} vs ${p.groupB}`).join("; ")}.`),
    );
  }

  if (tested.length >= 2) {
    out.push(
      `By each specimen's last scored inspection ${r.totals.rusted} of ${r.totals.scored} had rusted. ` +
        (r.finalStateTest?.method === "chi-square"
          ? `Rusted versus not rusted across the ${noun.many}, Pearson's χ² (the table is too large for Fisher's exact test): ` +
            `χ² = ${r.finalStateTest.chiSquare.toFixed(2)} on ${r.finalStateTest.df} df, ${formatPValue(r.finalStateTest.pValue)}.`
          : `Fisher's exact test of rusted versus not rusted across the ${noun.many}: ${formatPValue(r.finalStateTest!.pValue)}.`),
    );
  }
  if (r.kruskal) {
    const medians = tested
      .filter((g) => g.final.medianAreaPercent !== null)
      .map((g) => `${g.label} ${pct(g.final.medianAreaPercent!)}`);
    out.push(
      `Rusted area at the last inspection, median per ${noun.one}: ${medians.join("; ")}. Kruskal–Wallis test: ` +
        `H = ${r.kruskal.h.toFixed(2)} on ${r.kruskal.df} df, ${formatPValue(r.kruskal.pValue)}.`,
    );
  }

  out.push(...agreementSentences(r.agreement));

  if (r.totals.moved > 0) {
    out.push(
      `${r.totals.moved} placement${r.totals.moved === 1 ? " is" : "s are"} of specimens moved to another jar during the trial. ${MOVED_SPECIMEN_NOTE}` +
        (r.totals.notAtRisk > 0
          ? ` ${r.totals.notAtRisk} later placement${r.totals.notAtRisk === 1 ? " was" : "s were"} left out because the specimen had already ${r.endpoint === "rust" ? "rusted" : "wept"} before the move.`
          : ""),
    );
  }
  const unscored = r.groups.reduce((s, g) => s + g.unscored, 0);
  if (unscored > 0) {
    out.push(`${unscored} of ${r.totals.placements} specimens have no scored inspection yet and are left out.`);
  }
  out.push(
    r.method === "turnbull"
      ? "Curves are Turnbull's estimate for interval-censored times; it has no simple confidence band, so none is drawn. " +
          "The Kaplan–Meier view (right-endpoint times) shows Greenwood 95 % bands."
      : "Curves are Kaplan–Meier on right-endpoint times (rust counted at the inspection where it was first seen), " +
          "with Greenwood 95 % bands on the log scale; this places each first rust a little late.",
  );
  out.push(STANDING_NOTE);
  return out;
}
