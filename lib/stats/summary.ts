// Plain-language summary of a treatment comparison, for readers who will not open the numbers:
// it states the sample, the test, the effect and what limits the conclusion.

export interface ComparisonGroupSummary {
  name: string;
  n: number;
  /** Specimens seen to rust. */
  events: number;
  /** Median time to first rust; with lower/upper when it is only known to lie in (lower, upper]. */
  median: { time: number; lower?: number; upper?: number } | null;
}

export interface PairwiseSummary {
  groupA: string;
  groupB: string;
  adjustedPValue: number;
}

export interface ComparisonSummaryInput {
  groups: readonly ComparisonGroupSummary[];
  /** p of the k-group log-rank test; null when it could not be run. */
  logRankP: number | null;
  chiSquare?: number;
  df?: number;
  /** Holm-adjusted pairwise p-values. */
  pairwise?: readonly PairwiseSummary[];
  /** Rust is only seen at inspections, so times are intervals (the default for this product). */
  intervalCensored?: boolean;
  /** Scorer agreement (Cohen's kappa) on the rust / no-rust calls, when a blind second scorer re-scored a sample. */
  kappa?: number | null;
  /** The event timed, in words: "first rust" (default) or "first weeping". */
  eventLabel?: string;
  /** The log-rank tests were stratified by this ("chamber"). */
  stratifiedBy?: string;
  alpha?: number;
  timeUnit?: string;
}

const SMALL_GROUP = 5;

/** "p < 0.001", else two significant figures ("p = 0.074", "p = 0.41"). */
export function formatPValue(p: number): string {
  if (Number.isNaN(p)) return "p not available";
  if (p < 0.001) return "p < 0.001";
  return `p = ${Number(p.toPrecision(2))}`;
}

/** Landis & Koch (1977) descriptive bands for kappa. */
export function describeKappa(kappa: number): string {
  if (kappa < 0) return "poor (worse than chance)";
  if (kappa <= 0.2) return "slight";
  if (kappa <= 0.4) return "fair";
  if (kappa <= 0.6) return "moderate";
  if (kappa <= 0.8) return "substantial";
  return "almost perfect";
}

const fmt = (x: number) => String(Number(x.toFixed(1)));

function listNames(names: readonly string[]): string {
  if (names.length <= 1) return names.join("");
  return `${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}`;
}

function describeMedian(g: ComparisonGroupSummary, unit: string): string {
  if (!g.median) return `${g.name} not reached`;
  const { time, lower, upper } = g.median;
  if (lower !== undefined && upper !== undefined && lower < upper) {
    return `${g.name} between ${fmt(lower)} and ${fmt(upper)} ${unit}`;
  }
  return `${g.name} ${fmt(time)} ${unit}`;
}

/** Sentences, in reading order, describing a comparison of time to first rust. */
export function summarizeComparison(input: ComparisonSummaryInput): string[] {
  const { groups, logRankP } = input;
  const alpha = input.alpha ?? 0.05;
  const unit = input.timeUnit ?? "days";
  const intervalCensored = input.intervalCensored ?? true;
  const event = input.eventLabel ?? "first rust";
  const seen = event === "first rust" ? "seen to rust" : `seen ${event.replace(/^first /, "")}`;
  const test = input.stratifiedBy ? `log-rank test stratified by ${input.stratifiedBy}` : "log-rank test";
  const sentences: string[] = [];
  const total = groups.reduce((s, g) => s + g.n, 0);
  const rusted = groups.reduce((s, g) => s + g.events, 0);

  sentences.push(
    `${total} specimens in ${groups.length} groups, ${rusted} of them ${seen}: ` +
      `${groups.map((g) => `${g.name} ${g.events} of ${g.n}`).join(", ")}.`,
  );
  sentences.push(`Median time to ${event}: ${groups.map((g) => describeMedian(g, unit)).join("; ")}.`);

  if (logRankP === null || Number.isNaN(logRankP)) {
    sentences.push(`No log-rank test could be run (it needs at least two groups and at least one specimen ${seen}).`);
  } else {
    const stat =
      input.chiSquare !== undefined && input.df !== undefined
        ? `χ² = ${input.chiSquare.toFixed(2)} on ${input.df} df, `
        : "";
    sentences.push(`${test[0].toUpperCase()}${test.slice(1)} of time to ${event} across the ${groups.length} groups: ${stat}${formatPValue(logRankP)}.`);
    if (logRankP < alpha) {
      const withMedian = groups.filter((g) => g.median !== null);
      const soonest = withMedian.sort((a, b) => a.median!.time - b.median!.time)[0];
      sentences.push(
        `The groups differ in time to ${event} at the ${alpha} level` +
          (soonest ? `; ${soonest.name} ${event === "first rust" ? "rusted" : "reached it"} soonest (median ${fmt(soonest.median!.time)} ${unit}).` : "."),
      );
    } else {
      sentences.push(
        `These data show no clear difference in time to ${event} at the ${alpha} level; ` +
          "that is not evidence that the treatments perform the same.",
      );
    }
  }

  if (input.pairwise && input.pairwise.length > 0) {
    const parts = input.pairwise.map(
      (p) => `${p.groupA} vs ${p.groupB} ${formatPValue(p.adjustedPValue)}${p.adjustedPValue < alpha ? " (differ)" : ""}`,
    );
    const tests = input.stratifiedBy ? `log-rank tests stratified by ${input.stratifiedBy}` : "log-rank tests";
    sentences.push(`Pairwise ${tests}, Holm-adjusted for ${parts.length} comparisons: ${parts.join("; ")}.`);
  }

  // Caveats: what a reader must weigh before acting on the result.
  const small = groups.filter((g) => g.n < SMALL_GROUP).map((g) => g.name);
  if (small.length > 0) {
    sentences.push(
      `${listNames(small)} ${small.length === 1 ? "has" : "have"} fewer than ${SMALL_GROUP} specimens: ` +
        "tests have little power and a single specimen can change the result.",
    );
  }
  const noEvents = groups.filter((g) => g.events === 0).map((g) => g.name);
  if (noEvents.length > 0) {
    sentences.push(
      `No specimen in ${listNames(noEvents)} ${event === "first rust" ? "rusted" : `was ${seen}`} during follow-up, so ${noEvents.length === 1 ? "its" : "their"} ` +
        "median cannot be estimated; it is only known to be longer than the time observed.",
    );
  }
  if (intervalCensored) {
    sentences.push(
      event === "first rust"
        ? "Rust is only seen at inspections, so each time to first rust is known only to lie between the last " +
            "clean and the first rusted inspection; the log-rank test counts it at the first rusted inspection, " +
            "and medians are precise only to the inspection spacing."
        : `Weeping is only seen at inspections, so each time to ${event} is known only to lie between the last ` +
            "inspection without it and the first with it; the log-rank test counts it at the first inspection with weeping, " +
            "and medians are precise only to the inspection spacing.",
    );
  }
  if (input.kappa !== undefined && input.kappa !== null && !Number.isNaN(input.kappa)) {
    const k = input.kappa;
    sentences.push(
      `Agreement between the scorer of record and a blind second scorer on the rust / no-rust call: κ = ${k.toFixed(2)}, ${describeKappa(k)}` +
        (k <= 0.6 ? "; disagreement between scorers may blur real differences." : "."),
    );
  }
  return sentences;
}
