import Link from "next/link";
import { OverviewTable } from "@/components/collection/overview-table";
import { EmptyState } from "@/components/ui/empty-state";
import { DEFAULT_OUT_OF_RULE_SHARE, listLocationStatuses, storedTraces } from "@/db/queries/location-status";
import { labPage } from "@/lib/auth/page";
import { traceGeometry } from "@/lib/collection/rh-trace";
import { NEED_LABELS, NEED_ORDER } from "@/lib/collection/rule-status";
import { overviewShare } from "@/lib/validation/collection";
import { formatDate, formatDateTime } from "@/lib/format";

export const metadata = { title: "Collection overview" };

const PAGE_SIZE = 50;
const pct = (f: number | null | undefined) => (f == null ? "—" : `${(f * 100).toFixed(1)} %`);

export default async function CollectionOverviewPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const ctx = await labPage("/collection/overview");
  const sp = await searchParams;
  const { share, problem } = overviewShare(sp.share, DEFAULT_OUT_OF_RULE_SHARE);
  const now = new Date();
  const rows = await listLocationStatuses({ labId: ctx.labId, userId: ctx.userId, outOfRuleShare: share, now, trace: false });
  const q = `share=${+(share * 100).toFixed(2)}`;
  // Most in need first, PAGE_SIZE at a time unless all are asked for (the CSV export always has all).
  const all = sp.all === "1";
  const pages = Math.max(1, Math.ceil(rows.length / PAGE_SIZE));
  const page = Math.min(pages, Math.max(1, Number.parseInt(sp.page ?? "1", 10) || 1));
  const shown = all ? rows : rows.slice((page - 1) * PAGE_SIZE, page * PAGE_SIZE);
  const traces = await storedTraces({ labId: ctx.labId, locationIds: shown.map((r) => r.location.id) });
  const needCounts = NEED_ORDER.filter((n) => n !== "no-rule").map((n) => [n, rows.filter((r) => r.needs.includes(n)).length] as const);
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
        <input id="share" name="share" type="number" min={0} max={100} step="0.5" defaultValue={+(share * 100).toFixed(2)} className="field w-24!"
          aria-invalid={problem ? true : undefined} aria-describedby={problem ? "share-err" : undefined} />
        <button className="btn-quiet" type="submit">Apply</button>
        {problem && <p id="share-err" role="alert" className="text-sm text-rust-600 w-full">{problem}</p>}
      </form>
      {rows.length === 0 ? (
        <EmptyState text="No storage locations yet. Add rooms, cabinets, drawers and boxes on the Collection page, then move objects into them." action={{ href: "/collection", label: "Open the collection" }} />
      ) : (
        <div className="panel p-4 overflow-x-auto">
          <p className="text-sm mb-3" data-testid="overview-counts">
            {rows.length} location(s): {needCounts.map(([n, count]) => `${NEED_LABELS[n].toLowerCase()} ${count}`).join(" · ")}.
          </p>
          <OverviewTable rows={shown.map((r) => ({
            id: r.location.id, path: r.path,
            needs: r.needs.length ? `${r.needs.map((n) => NEED_LABELS[n]).join("; ")}${r.desiccantDueAt && r.needs.includes("desiccant-due") ? ` (${formatDate(r.desiccantDueAt)})` : ""}` : "—",
            keepBelow: r.rule ? `${r.rule.thresholdRhPercent.toFixed(1)} %RH` : "—",
            inRule: [pct(r.windows[0]?.fractionInRule), pct(r.windows[1]?.fractionInRule), pct(r.windows[2]?.fractionInRule)],
            lastReading: r.lastReading ? `${r.lastReading.rhPercent.toFixed(1)} %RH, ${formatDateTime(r.lastReading.takenAt)}` : "none",
            trace: traceGeometry(traces.get(r.location.id) ?? r.trace, r.rule?.thresholdRhPercent ?? null, { now }), objects: r.objectCount, keeper: r.keeperName ?? "—",
          }))} />
          <nav className="flex flex-wrap items-center gap-3 text-sm mt-3" aria-label="Overview pages">
            <span>{all || pages === 1 ? `All ${rows.length} locations` : `Locations ${(page - 1) * PAGE_SIZE + 1}–${(page - 1) * PAGE_SIZE + shown.length} of ${rows.length}`}, most in need first.</span>
            {!all && page > 1 && <Link className="link" href={`/collection/overview?${q}&page=${page - 1}`}>Previous {PAGE_SIZE}</Link>}
            {!all && page < pages && <Link className="link" href={`/collection/overview?${q}&page=${page + 1}`}>Next {PAGE_SIZE}</Link>}
            {!all && pages > 1 && <Link className="link" href={`/collection/overview?${q}&all=1`}>Show all</Link>}
          </nav>
          <p className="text-xs muted mt-2">
            The trace is each day&apos;s highest logged RH; the dashed line is the location&apos;s rule. Time in rule as counted at{" "}
            {formatDateTime(new Date(Math.min(...rows.map((r) => r.computedAt.getTime()))))} or later (counted again every 10 minutes, and at
            once when a reading above the rule arrives or past readings, checks, upkeep, objects or rules change); the last reading is the latest logged.
          </p>
        </div>
      )}
    </div>
  );
}
