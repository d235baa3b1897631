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
  /** What the groups are, in words ("treatment" / "treatments"); "group" / "groups" when not given. */
  groupNoun?: { one: string; many: string };
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

function medianText(m: NonNullable<ComparisonGroupSummary["median"]>, unit: string): string {
  const { time, lower, upper } = m;
  if (lower !== undefined && upper !== undefined && lower < upper) return `between ${fmt(lower)} and ${fmt(upper)} ${unit}`;
  return `${fmt(time)} ${unit}`;
}

function describeMedian(g: ComparisonGroupSummary, unit: string): string {
  return g.median ? `${g.name} ${medianText(g.median, unit)}` : `${g.name} not reached`;
}

/** Same median: the same time and, for an interval, the same interval (as printed). */
function sameMedian(a: ComparisonGroupSummary["median"], b: ComparisonGroupSummary["median"]): boolean {
  if (!a || !b) return false;
  return fmt(a.time) === fmt(b.time) && fmt(a.lower ?? a.time) === fmt(b.lower ?? b.time) && fmt(a.upper ?? a.time) === fmt(b.upper ?? b.time);
}

/**
 * The groups that reached the event soonest, judged by the median time to it. Groups whose medians
 * are the same are all named (a tie is not broken by list order).
 */
export function soonestGroups(groups: readonly ComparisonGroupSummary[]): ComparisonGroupSummary[] {
  const withMedian = groups.filter((g) => g.median !== null);
  if (withMedian.length === 0) return [];
  const first = withMedian.reduce((best, g) => (g.median!.time < best.median!.time ? g : best));
  return withMedian.filter((g) => sameMedian(g.median, first.median));
}

/** Sentences, in reading order, describing a comparison of time to first rust. */
export function summarizeComparison(input: ComparisonSummaryInput): string[] {
  const { groups, logRankP } = input;
  const alpha = input.alpha ?? 0.05;
  const unit = input.timeUnit ?? "days";
  const intervalCensored = input.intervalCensored ?? true;
  const event = input.eventLabel ?? "first rust";
  const seen = event === "first rust" ? "seen to rust" : `seen ${event.replace(/^first /, "")}`;
  const noun = input.groupNoun ?? { one: "group", many: "groups" };
  const nGroups = (k: number) => `${k} ${k === 1 ? noun.one : noun.many}`;
  const test = input.stratifiedBy ? `log-rank test stratified by ${input.stratifiedBy}` : "log-rank test";
  const sentences: string[] = [];
  const total = groups.reduce((s, g) => s + g.n, 0);
  const rusted = groups.reduce((s, g) => s + g.events, 0);

  sentences.push(
    `${total} specimens in ${nGroups(groups.length)}, ${rusted} of them ${seen}: ` +
      `${groups.map((g) => `${g.name} ${g.events} of ${g.n}`).join(", ")}.`,
  );
  sentences.push(`Median time to ${event}: ${groups.map((g) => describeMedian(g, unit)).join("; ")}.`);

  if (logRankP === null || Number.isNaN(logRankP)) {
    sentences.push(`No log-rank test could be run (it needs at least two ${noun.many} and at least one specimen ${seen}).`);
  } else {
    const stat =
      input.chiSquare !== undefined && input.df !== undefined
        ? `χ² = ${input.chiSquare.toFixed(2)} on ${input.df} df, `
        : "";
    sentences.push(`${test[0].toUpperCase()}${test.slice(1)} of time to ${event} across the ${nGroups(groups.length)}: ${stat}${formatPValue(logRankP)}.`);
    if (logRankP < alpha) {
      const soonest = soonestGroups(groups);
      const verb = event === "first rust" ? "rusted" : `showed ${event.replace(/^first /, "")}`;
      const rule = `Soonest is judged by the median time to ${event}`;
      let which = ".";
      if (soonest.length === 1) {
        which = `; ${soonest[0].name} ${verb} soonest (median ${medianText(soonest[0].median!, unit)}). ${rule}.`;
      } else if (soonest.length > 1) {
        const [head, ...rest] = soonest;
        which =
          `; ${listNames(soonest.map((g) => g.name))} ${verb} soonest, tied on the median (${medianText(head.median!, unit)} each). ` +
          `${rule}; tied ${noun.many} are all named, not ranked by list order. Of them, ${head.name} had ${head.events} of ${head.n} ${seen}` +
          `${rest.map((g, i) => `${i === rest.length - 1 ? " and" : ","} ${g.name} ${g.events} of ${g.n}`).join("")}.`;
      }
      sentences.push(`The ${noun.many} differ in time to ${event} at the ${alpha} level${which}`);
    } else {
      sentences.push(
        `These data show no clear difference in time to ${event} at the ${alpha} level; ` +
          `that is not evidence that the ${noun.many} perform the same.`,
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
