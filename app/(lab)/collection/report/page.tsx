import Link from "next/link";
import { EmptyState } from "@/components/ui/empty-state";
import { DEFAULT_OUT_OF_RULE_SHARE, listLocationStatuses } from "@/db/queries/location-status";
import { labPage } from "@/lib/auth/page";
import { MATERIAL_LABELS } from "@/lib/analysis/groups";
import { NEED_LABELS } from "@/lib/collection/rule-status";
import { overviewShare } from "@/lib/validation/collection";
import { formatDate, formatDateTime } from "@/lib/format";

export const metadata = { title: "Collection condition report" };

const pct = (f: number | null | undefined) => (f == null ? "—" : `${(f * 100).toFixed(1)} %`);
const hours = (minutes: number) => (minutes >= 2880 ? `${(minutes / 1440).toFixed(1)} d` : `${(minutes / 60).toFixed(1)} h`);

export default async function CollectionReportPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const ctx = await labPage("/collection/report");
  const { share } = overviewShare((await searchParams).share, DEFAULT_OUT_OF_RULE_SHARE);
  const now = new Date();
  const rows = await listLocationStatuses({ labId: ctx.labId, userId: ctx.userId, outOfRuleShare: share, now, detail: true });
  const rules = [...new Map(rows.flatMap((r) => (r.rule ? [[r.rule.id, r.rule] as const] : []))).values()];
  return (
    <article className="space-y-5 max-w-5xl">
      <p className="text-sm no-print"><Link className="link" href="/collection/overview">Collection overview</Link> / Condition report</p>
      <header className="space-y-1">
        <h1 className="text-2xl font-semibold">Collection condition report</h1>
        <p className="text-sm">Made {formatDateTime(now)}. Time in rule is counted from the logged readings (each reading holds until the next;
          logger gaps are not counted), after hygrometer corrections. A location takes the strictest storage rule of the objects it holds.</p>
      </header>
      <section className="space-y-2" aria-labelledby="rules-h">
        <h2 id="rules-h" className="text-lg font-semibold">Storage rules used</h2>
        {rules.length === 0 ? <p className="text-sm">No location holds an object with a storage rule.</p> : (
          <table className="data" aria-label="Storage rules used">
            <thead><tr><th scope="col">material class</th><th scope="col">treatment</th><th scope="col" className="text-right!">keep below</th><th scope="col">source</th><th scope="col">version</th></tr></thead>
            <tbody>
              {rules.map((r) => (
                <tr key={r.id}>
                  <td>{MATERIAL_LABELS[r.materialClass] ?? r.materialClass}</td><td>{r.treatmentName}</td>
                  <td className="text-right tabular-nums">{r.thresholdRhPercent.toFixed(1)} %RH</td>
                  <td>{r.origin === "entered" ? `${r.source} (${r.sourceDate})` : `accepted from ${r.sourceTrialIds.length} trial(s): ${r.method}`}</td>
                  <td>v{r.version}, {formatDate(r.acceptedAt)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="space-y-2" aria-labelledby="locs-h">
        <h2 id="locs-h" className="text-lg font-semibold">Locations</h2>
        {rows.length === 0 ? <EmptyState text="No storage locations yet." action={{ href: "/collection", label: "Open the collection" }} /> : (
          <table className="data" aria-label="Locations and their time in rule">
            <thead>
              <tr><th scope="col">location</th><th scope="col" className="text-right!">keep below</th><th scope="col" className="text-right!">in rule 7 d</th><th scope="col" className="text-right!">30 d</th>
                <th scope="col" className="text-right!">365 d</th><th scope="col">exceedances (365 d)</th><th scope="col">needs</th><th scope="col">objects at risk</th></tr>
            </thead>
            <tbody>
              {rows.map((r) => {
                const longest = r.longestExceedance;
                return (
                  <tr key={r.location.id}>
                    <th scope="row" className="text-left font-medium!">{r.path}</th>
                    <td className="text-right tabular-nums">{r.rule ? `${r.rule.thresholdRhPercent.toFixed(1)} %RH` : "—"}</td>
                    {[0, 1, 2].map((i) => <td key={i} className="text-right tabular-nums">{pct(r.windows[i]?.fractionInRule)}</td>)}
                    <td>{r.exceedances.length}{longest ? `; longest ${hours(longest.durationMinutes)} from ${formatDate(longest.start)}, peak ${longest.worstRhPercent.toFixed(1)} %RH` : ""}</td>
                    <td>{r.needs.map((n) => NEED_LABELS[n]).join("; ") || "—"}</td>
                    <td>{r.atRisk.map((o) => o.label).join(", ") || "—"}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        )}
      </section>
      <p className="text-xs muted">Rules and their sources are the lab&apos;s; check them against current conservation guidance for the materials you hold.</p>
    </article>
  );
}
