import Link from "next/link";
import { RhTrace } from "@/components/collection/rh-trace";
import { EmptyState } from "@/components/ui/empty-state";
import { DEFAULT_OUT_OF_RULE_SHARE, listLocationStatuses } from "@/db/queries/location-status";
import { labPage } from "@/lib/auth/page";
import { NEED_LABELS } from "@/lib/collection/rule-status";
import { overviewShare } from "@/lib/validation/collection";
import { formatDate, formatDateTime } from "@/lib/format";

export const metadata = { title: "Collection overview" };

const pct = (f: number | null | undefined) => (f == null ? "—" : `${(f * 100).toFixed(1)} %`);

export default async function CollectionOverviewPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const ctx = await labPage("/collection/overview");
  const { share, problem } = overviewShare((await searchParams).share, DEFAULT_OUT_OF_RULE_SHARE);
  const rows = await listLocationStatuses({ labId: ctx.labId, userId: ctx.userId, outOfRuleShare: share });
  const q = `share=${+(share * 100).toFixed(2)}`;
  return (
    <div className="space-y-5">
      <p className="text-sm"><Link className="link" href="/collection">Collection</Link> / Overview</p>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold">Collection overview</h1>
        <a className="btn-quiet ml-auto" href={`/api/collection/overview?${q}`}>Export (CSV)</a>
        <Link className="btn-quiet" href={`/collection/report?${q}`}>Condition report</Link>
      </div>
      <p className="text-sm muted max-w-3xl">
        Every storage location, those that need attention first: out of rule now, out of rule for more than the chosen share of the last
        30 days, no readings for over 2 days, desiccant due. Each location takes the strictest storage rule of the objects it holds.
      </p>
      <form method="get" className="flex flex-wrap items-end gap-2 text-sm" aria-label="Overview choices">
        <label htmlFor="share" className="block">Flag locations out of rule for more than (% of the last 30 days)</label>
        <input id="share" name="share" type="number" min={0} max={100} step="0.5" defaultValue={+(share * 100).toFixed(2)} className="field w-24"
          aria-invalid={problem ? true : undefined} aria-describedby={problem ? "share-err" : undefined} />
        <button className="btn-quiet" type="submit">Apply</button>
        {problem && <p id="share-err" role="alert" className="text-sm text-rust-600 w-full">{problem}</p>}
      </form>
      {rows.length === 0 ? (
        <EmptyState text="No storage locations yet. Add rooms, cabinets, drawers and boxes on the Collection page, then move objects into them." action={{ href: "/collection", label: "Open the collection" }} />
      ) : (
        <div className="panel p-4 overflow-x-auto">
          <table className="data" aria-label="Storage locations by need">
            <thead>
              <tr>
                <th scope="col">Location</th><th scope="col">Needs</th><th scope="col" className="text-right!">keep below</th>
                <th scope="col" className="text-right!">in rule 7 d</th><th scope="col" className="text-right!">30 d</th><th scope="col" className="text-right!">365 d</th>
                <th scope="col">last reading</th><th scope="col">last 30 days</th><th scope="col" className="text-right!">objects</th><th scope="col">keeper</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.location.id}>
                  <th scope="row" className="text-left font-medium!"><Link className="link" href={`/chambers/${r.location.id}`}>{r.path}</Link></th>
                  <td>{r.needs.length ? r.needs.map((n) => NEED_LABELS[n]).join("; ") : "—"}{r.desiccantDueAt && r.needs.includes("desiccant-due") ? ` (${formatDate(r.desiccantDueAt)})` : ""}</td>
                  <td className="text-right tabular-nums">{r.rule ? `${r.rule.thresholdRhPercent.toFixed(1)} %RH` : "—"}</td>
                  {[0, 1, 2].map((i) => <td key={i} className="text-right tabular-nums">{pct(r.windows[i]?.fractionInRule)}</td>)}
                  <td className="tabular-nums">{r.lastReading ? `${r.lastReading.rhPercent.toFixed(1)} %RH, ${formatDateTime(r.lastReading.takenAt)}` : "none"}</td>
                  <td><RhTrace points={r.trace} thresholdRhPercent={r.rule?.thresholdRhPercent ?? null} /></td>
                  <td className="text-right tabular-nums">{r.objectCount}</td>
                  <td>{r.keeperName ?? "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="text-xs muted mt-2">The trace is each day&apos;s highest logged RH; the dashed line is the location&apos;s rule.</p>
        </div>
      )}
    </div>
  );
}
