// Final state: rusted / not rusted per group by the last scored inspection, with Fisher's exact test,
// and the final rusted area with Kruskal–Wallis.
import type { ComparisonResult } from "@/lib/analysis/result";
import { formatPValue } from "@/lib/stats/summary";
import { fmtPercent, fmtStat } from "./format";

export function FinalSection({ c }: { c: ComparisonResult }) {
  const t = c.finalStateTest;
  return (
    <section className="panel p-4 space-y-3 break-inside-avoid-page" aria-labelledby="final-h">
      <h2 id="final-h" className="font-semibold">Final state</h2>
      <div className="overflow-x-auto">
        <table className="data">
          <caption className="text-left text-sm font-medium pb-1">Rusted by the last scored inspection</caption>
          <thead>
            <tr>
              <th scope="col">{c.groupByLabel}</th><th scope="col" className="text-right!">rusted</th><th scope="col" className="text-right!">not rusted</th>
              <th scope="col" className="text-right!">share rusted</th><th scope="col" className="text-right!">median final area</th>
            </tr>
          </thead>
          <tbody>
            {c.groups.map((g) => (
              <tr key={g.key}>
                <th scope="row" className="font-medium! text-left text-(color:--ink)!">{g.label}</th>
                <td className="text-right tabular-nums">{g.final.rusted}</td>
                <td className="text-right tabular-nums">{g.final.notRusted}</td>
                <td className="text-right tabular-nums">{g.n ? `${Math.round((100 * g.final.rusted) / g.n)}\u202f%` : "—"}</td>
                <td className="text-right tabular-nums">{fmtPercent(g.final.medianAreaPercent)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <ul className="text-sm space-y-1 list-disc pl-5">
        <li>
          {!t ? <>Rusted vs not rusted by {c.groupByLabel.toLowerCase()}: a test needs two groups with scores.</>
            : t.method === "fisher" ? <>Fisher&apos;s exact test, rusted vs not rusted by {c.groupByLabel.toLowerCase()}: {formatPValue(t.pValue)}.</>
            : <>Pearson&apos;s χ², rusted vs not rusted by {c.groupByLabel.toLowerCase()} (too many tables for Fisher&apos;s exact test): χ² = {fmtStat(t.chiSquare)} on {t.df} df, {formatPValue(t.pValue)}.</>}
        </li>
        <li>
          Kruskal–Wallis test of the final rusted area:{" "}
          {c.kruskal ? <>H = {fmtStat(c.kruskal.h)} on {c.kruskal.df} df, {formatPValue(c.kruskal.pValue)}</> : "needs two groups with scores"}.
        </li>
      </ul>
    </section>
  );
}
