// Caveats and secondary results that follow the plain-language summary of time to first rust.
import { describeKappa, formatPValue } from "@/lib/stats/summary";
import type { ComparisonResult } from "./result";

export const STANDING_NOTE =
  "These results guide storage decisions; they do not replace a conservator's judgement of each specimen.";

const pct = (x: number) => `${Number(x.toFixed(x < 1 ? 2 : 1))} %`;

export function extraSentences(r: ComparisonResult, opts: { pairsInSummary: number }): string[] {
  const out: string[] = [];
  const tested = r.groups.filter((g) => g.n > 0);

  if (r.pairwise.length > opts.pairsInSummary) {
    const differ = r.pairwise.filter((p) => p.adjustedPValue < 0.05);
    out.push(
      `${r.pairwise.length} pairwise log-rank comparisons, Holm-adjusted, are listed in the table; ` +
        (differ.length === 0
          ? "none of them differs at the 0.05 level."
          : `${differ.length} differ at the 0.05 level: ${differ.map((p) => `${p.groupA} vs ${p.groupB}`).join("; ")}.`),
    );
  }

  if (tested.length >= 2) {
    out.push(
      `By each specimen's last scored inspection ${r.totals.rusted} of ${r.totals.scored} had rusted. ` +
        (r.finalStateTest?.method === "chi-square"
          ? `Rusted versus not rusted across the groups, Pearson's χ² (the table is too large for Fisher's exact test): ` +
            `χ² = ${r.finalStateTest.chiSquare.toFixed(2)} on ${r.finalStateTest.df} df, ${formatPValue(r.finalStateTest.pValue)}.`
          : `Fisher's exact test of rusted versus not rusted across the groups: ${formatPValue(r.finalStateTest!.pValue)}.`),
    );
  }
  if (r.kruskal) {
    const medians = tested
      .filter((g) => g.final.medianAreaPercent !== null)
      .map((g) => `${g.label} ${pct(g.final.medianAreaPercent!)}`);
    out.push(
      `Rusted area at the last inspection, median per group: ${medians.join("; ")}. Kruskal–Wallis test: ` +
        `H = ${r.kruskal.h.toFixed(2)} on ${r.kruskal.df} df, ${formatPValue(r.kruskal.pValue)}.`,
    );
  }

  if (!r.agreement) {
    out.push("No blind second scores exist for this trial, so agreement between scorers was not checked; every rust call rests on one scorer.");
  } else if (r.agreement.kappa === null) {
    out.push(
      `Scorer agreement could not be expressed as kappa: on the ${r.agreement.pairs} photos scored twice both scorers used ` +
        "a single ASTM grade, so chance agreement is already complete.",
    );
  } else {
    out.push(
      `Scorer agreement is Cohen's κ on ASTM D610 grades over ${r.agreement.pairs} photos scored by the scorer of record ` +
        `and a blind second scorer (κ = ${r.agreement.kappa.toFixed(2)}, ${describeKappa(r.agreement.kappa)}` +
        (r.agreement.kappaQuadratic !== null ? `; quadratic-weighted κ = ${r.agreement.kappaQuadratic.toFixed(2)}` : "") +
        ").",
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
