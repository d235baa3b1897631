// Time to first rust (or first weeping): event-free curves with censoring marks, numbers at risk,
// medians and log-rank tests.
import { ENDPOINT_EVENT, type ComparisonResult } from "@/lib/analysis/result";
import { GROUPING_NOUNS } from "@/lib/analysis/groups";
import { survivalSpec, usesSmallMultiples } from "./chart-specs";
import { formatPValue } from "@/lib/stats/summary";
import { dayHeader, fmtDay, fmtStat, pCell } from "./format";
import { VegaChart } from "./vega-chart";

export function SurvivalSection({ c, expand = false }: { c: ComparisonResult; expand?: boolean }) {
  const km = c.method === "km";
  const event = ENDPOINT_EVENT[c.endpoint];
  const rust = c.endpoint === "rust";
  const free = rust ? "Rust-free" : "Weeping-free";
  const seenAt = rust ? "rust counted at the inspection where it was first seen" : "weeping counted at the inspection where it was first seen";
  const clean = rust ? "never seen rusted" : "never seen weeping";
  const noun = GROUPING_NOUNS[c.groupBy];
  const panels = usesSmallMultiples(c.groups);
  const test = c.stratifiedBy ? `Log-rank tests stratified by ${c.stratifiedBy}` : "Log-rank tests";
  return (
    <section className="panel p-4 space-y-4 break-inside-avoid-page" aria-labelledby="survival-h">
      <h2 id="survival-h" className="font-semibold">Time to {event}</h2>
      <figure className="space-y-2">
        <VegaChart
          testId="survival-chart"
          spec={survivalSpec(c.groups, c.method)}
          label={`${free} fraction against days since the start, one ${km ? "Kaplan–Meier" : "Turnbull"} curve per ${noun.one}${panels ? `, each in its own panel with the other ${noun.many} faint behind it` : ", each in its own colour and dash pattern"}; crosses mark specimens ${clean} at their last inspection.`}
        />
        <figcaption className="text-xs muted">
          {km
            ? `Kaplan–Meier on right-endpoint times (${seenAt}); shaded: Greenwood 95 % limits, log scale.`
            : `Turnbull's estimate for interval-censored times; each drop is drawn at the end of the interval in which ${rust ? "rust" : "weeping"} appeared. No confidence band is drawn: this estimator has no simple one (switch to Kaplan–Meier for Greenwood limits).`}
          {" "}Crosses: specimens {clean}, at their last inspection without it.
          {panels ? ` With ${c.groups.length} ${noun.many}, each has its own panel; the other ${noun.many}' curves are drawn faint grey behind it for comparison.` : ""}
        </figcaption>
      </figure>

      <div className="overflow-x-auto">
        <table className="data" aria-describedby="risk-note">
          <caption className="text-left text-sm font-medium pb-1">Numbers at risk (not yet seen {rust ? "rusted" : "weeping"}, in the jar and still observed)</caption>
          <thead>
            <tr><th scope="col">{c.groupByLabel}</th>{c.atRisk.times.map((t) => <th key={t} scope="col" className="text-right!" title={`day ${fmtDay(t)} since the start`}>{dayHeader(t)}</th>)}</tr>
          </thead>
          <tbody>
            {c.groups.map((g, i) => (
              <tr key={g.key}>
                <th scope="row" className="font-medium! text-left text-(color:--ink)!">{g.label}</th>
                {c.atRisk.counts[i].map((n, j) => <td key={j} className="text-right tabular-nums">{n}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
        <p id="risk-note" className="text-xs muted mt-1">Columns are the days of done inspections.</p>
      </div>

      <div className="overflow-x-auto">
        <table className="data">
          <caption className="text-left text-sm font-medium pb-1">Median time to {event} (days since start)</caption>
          <thead>
            <tr>
              <th scope="col">{c.groupByLabel}</th><th scope="col" className="text-right!">n</th><th scope="col" className="text-right!">{rust ? "rusted" : "weeping"}</th>
              <th scope="col">Turnbull: median lies in</th><th scope="col">Kaplan–Meier median (95 % CI)</th>
            </tr>
          </thead>
          <tbody>
            {c.groups.map((g) => (
              <tr key={g.key}>
                <th scope="row" className="font-medium! text-left text-(color:--ink)!">{g.label}</th>
                <td className="text-right tabular-nums">{g.n}</td>
                <td className="text-right tabular-nums">{g.events}</td>
                <td>{g.turnbull.median
                  ? <abbr className="cursor-help" title={`The median time to ${event} lies between day ${fmtDay(g.turnbull.median.lower)} and day ${fmtDay(g.turnbull.median.upper)} (Turnbull's estimate)`}>({fmtDay(g.turnbull.median.lower)}, {fmtDay(g.turnbull.median.upper)}]</abbr>
                  : g.events === 0 ? (rust ? "no rust seen" : "no weeping seen") : "not reached"}</td>
                <td>
                  {g.km.median === null ? (g.events === 0 ? (rust ? "no rust seen" : "no weeping seen") : "not reached")
                    : `${fmtDay(g.km.median)} (${g.km.medianLower === null ? "—" : fmtDay(g.km.medianLower)} to ${g.km.medianUpper === null ? "not reached" : fmtDay(g.km.medianUpper)})`}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>

      <div className="space-y-2">
        <h3 className="text-sm font-medium">{test} (right-endpoint times)</h3>
        <p className="text-sm">
          {c.logRank
            ? <>Across all {c.groups.filter((g) => g.n > 0).length} {noun.many}: χ² = {fmtStat(c.logRank.chiSquare)} on {c.logRank.df} df, {formatPValue(c.logRank.pValue)}.</>
            : `Not run: it needs at least two groups and at least one specimen ${rust ? "seen rusted" : "seen weeping"}.`}
          {c.stratifiedBy && <> Groups are compared within each {c.stratifiedBy} and the results combined, so jars at different humidities are not pooled.</>}
        </p>
        {c.pairwise.length > 0 && (
          <details open={expand || c.pairwise.length <= 6}>
            <summary className="text-sm cursor-pointer">Pairwise comparisons, Holm-adjusted ({c.pairwise.length})</summary>
            <div className="overflow-x-auto">
              <table className="data mt-2">
                <thead><tr><th scope="col">Groups</th><th scope="col" className="text-right!">χ²</th><th scope="col" className="text-right!">p</th><th scope="col" className="text-right!">Holm-adjusted p</th></tr></thead>
                <tbody>
                  {c.pairwise.map((p) => (
                    <tr key={`${p.groupA}|${p.groupB}`}>
                      <td>{p.groupA} vs {p.groupB}</td>
                      <td className="text-right tabular-nums">{p.events === 0 ? "—" : fmtStat(p.chiSquare)}</td>
                      <td className="text-right tabular-nums">{p.events === 0 ? (rust ? "no rust in either" : "no weeping in either") : pCell(p.pValue)}</td>
                      <td className={`text-right tabular-nums ${p.adjustedPValue < 0.05 ? "font-semibold" : ""}`}>{p.events === 0 ? "—" : pCell(p.adjustedPValue)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </details>
        )}
      </div>
    </section>
  );
}
