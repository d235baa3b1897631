import Link from "next/link";
import { listTrials } from "@/db/queries/trials";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { TRIAL_STATUSES, trialListSchema } from "@/lib/validation/trials";
import { TrialTable } from "@/components/trials/trial-table";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Trials" };

export default async function TrialsPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const ctx = await labPage("/trials");
  const params = trialListSchema.parse(await searchParams);
  const { rows, total } = await listTrials({ labId: ctx.labId, ...params });
  const write = can(ctx.role, "trials.write");
  const filtered = !!(params.q || params.status);
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold mr-auto">Trials</h1>
        {write && <Link className="btn" href="/trials/new">Design a trial</Link>}
      </div>
      <form method="get" className="flex flex-wrap items-end gap-3" role="search" aria-label="Filter trials">
        <label className="text-sm">Title<input name="q" defaultValue={params.q ?? ""} className="field" /></label>
        <label className="text-sm">Status
          <select name="status" defaultValue={params.status ?? ""} className="field">
            <option value="">Any status</option>
            {TRIAL_STATUSES.map((s) => <option key={s} value={s}>{s}</option>)}
          </select>
        </label>
        <button className="btn-quiet">Filter</button>
        {filtered && <Link className="link text-sm" href="/trials">Clear filter</Link>}
      </form>
      {total === 0 ? (
        <EmptyState text={filtered ? "No trial matches this filter." : write ? "No trials yet. Design one: pick chambers and treatments, then allocate specimens at random." : "No trials yet. A lead or researcher designs them."}
          action={filtered ? { href: "/trials", label: "Show all trials" } : write ? { href: "/trials/new", label: "Design a trial" } : undefined} />
      ) : (
        <TrialTable data={rows} total={total} page={params.page} pageSize={params.pageSize} />
      )}
    </div>
  );
}
