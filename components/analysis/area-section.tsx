// Rust growth: rusted area over time per group, median with the interquartile band, and its table.
import type { ComparisonResult } from "@/lib/analysis/result";
import { areaSpec, usesSmallMultiples } from "./chart-specs";
import { GROUPING_NOUNS } from "@/lib/analysis/groups";
import { dayHeader, fmtDay, fmtPercent } from "./format";
import { VegaChart } from "./vega-chart";

export function AreaSection({ c }: { c: ComparisonResult }) {
  const noun = GROUPING_NOUNS[c.groupBy];
  const panels = usesSmallMultiples(c.groups);
  const days = [...new Set(c.groups.flatMap((g) => g.area.map((p) => p.day)))].sort((a, b) => a - b);
  return (
    <section className="panel p-4 space-y-4 break-inside-avoid-page" aria-labelledby="area-h">
      <h2 id="area-h" className="font-semibold">Rusted area over time</h2>
      <figure className="space-y-2">
        <VegaChart
          testId="area-chart"
          spec={areaSpec(c.groups)}
          label={`Median rusted area in percent of the face against days since the start, one line per ${noun.one}${panels ? ` in its own panel, the other ${noun.many} faint behind it` : ", each in its own colour and dash pattern"}, with the interquartile range shaded.`}
        />
        <figcaption className="text-xs muted">
          Median rusted area per inspection day from scores of record; shaded: 25th to 75th percentile. Clean specimens count as 0 %.{panels ? ` With ${c.groups.length} ${noun.many}, each has its own panel; the other ${noun.many}' medians are drawn faint grey behind it.` : ""}
        </figcaption>
      </figure>
      <div className="overflow-x-auto">
        <table className="data">
          <caption className="text-left text-sm font-medium pb-1">Median rusted area, % of face (25th–75th percentile)</caption>
          <thead>
            <tr><th scope="col">{c.groupByLabel}</th>{days.map((d) => <th key={d} scope="col" className="text-right!" title={`day ${fmtDay(d)} since the start`}>{dayHeader(d)}</th>)}</tr>
          </thead>
          <tbody>
            {c.groups.map((g) => {
              const byDay = new Map(g.area.map((p) => [p.day, p]));
              return (
                <tr key={g.key}>
                  <th scope="row" className="font-medium! text-left text-(color:--ink)!">{g.label}</th>
                  {days.map((d) => {
                    const p = byDay.get(d);
                    return (
                      <td key={d} className="text-right tabular-nums whitespace-nowrap">
                        {p ? <>{fmtPercent(p.median)}{p.q1 !== p.q3 && <span className="block text-xs muted">{fmtPercent(p.q1)}–{fmtPercent(p.q3)}</span>}</> : "—"}
                      </td>
                    );
                  })}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </section>
  );
}
