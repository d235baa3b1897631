import Link from "next/link";
import { listTreatments } from "@/db/queries/treatments";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { TREATMENT_KIND_LABELS, TREATMENT_KINDS, treatmentListSchema } from "@/lib/validation/treatments";
import { TreatmentTable } from "@/components/treatments/treatment-table";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Treatments" };

export default async function TreatmentsPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const ctx = await labPage("/treatments");
  const params = treatmentListSchema.parse(await searchParams);
  const { rows, total } = await listTreatments({ labId: ctx.labId, ...params });
  const write = can(ctx.role, "treatments.write");
  const filtered = !!(params.q || params.kind);
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold mr-auto">Treatments</h1>
        {write && <Link className="btn" href="/treatments/new">Add treatment</Link>}
      </div>
      <p className="text-sm muted max-w-3xl">What is done to a specimen before exposure — including the untreated control every trial should have.</p>
      <form method="get" className="flex flex-wrap items-end gap-3" role="search" aria-label="Filter treatments">
        <label className="text-sm">Name<input name="q" defaultValue={params.q ?? ""} className="field" /></label>
        <label className="text-sm">Kind
          <select name="kind" defaultValue={params.kind ?? ""} className="field">
            <option value="">All kinds</option>
            {TREATMENT_KINDS.map((k) => <option key={k} value={k}>{TREATMENT_KIND_LABELS[k]}</option>)}
          </select>
        </label>
        <button className="btn-quiet">Filter</button>
        {filtered && <Link className="link text-sm" href="/treatments">Clear filter</Link>}
      </form>
      {total === 0 ? (
        <EmptyState text={filtered ? "No treatment matches this filter." : write ? "No treatments yet. Start with an untreated control, then the coatings or cleanings to compare." : "No treatments yet. A lead or researcher adds them."}
          action={filtered ? { href: "/treatments", label: "Show all" } : write ? { href: "/treatments/new", label: "Add a treatment" } : undefined} />
      ) : (
        <TreatmentTable data={rows} total={total} page={params.page} pageSize={params.pageSize} />
      )}
    </div>
  );
}
