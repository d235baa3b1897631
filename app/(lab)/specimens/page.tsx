import Link from "next/link";
import { listSpecimens } from "@/db/queries/specimens";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { MATERIAL_CLASS_LABELS, MATERIAL_CLASSES, specimenListSchema } from "@/lib/validation/specimens";
import { SpecimenTable } from "@/components/specimens/specimen-table";
import { UrlHiddenInputs } from "@/components/trials/url-hidden-inputs";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Specimens" };

export default async function SpecimensPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const ctx = await labPage("/specimens");
  const raw = await searchParams;
  const params = specimenListSchema.parse(raw);
  const renderedQuery = new URLSearchParams(Object.entries(raw).filter((e): e is [string, string] => typeof e[1] === "string")).toString();
  const { rows, total } = await listSpecimens({ labId: ctx.labId, ...params });
  const write = can(ctx.role, "specimens.write");
  const filtered = !!(params.q || params.materialClass);
  const exportQs = new URLSearchParams(Object.entries({ q: params.q, materialClass: params.materialClass }).filter(([, v]) => v) as [string, string][]).toString();
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold mr-auto">Specimens</h1>
        {write && <Link className="btn" href="/specimens/new">Add specimen</Link>}
        {write && <Link className="btn-quiet" href="/specimens/import">Import CSV</Link>}
        <a className="btn-quiet" href={`/api/specimens/export${exportQs ? `?${exportQs}` : ""}`} download>Export CSV</a>
      </div>
      <form method="get" className="flex flex-wrap items-end gap-3" role="search" aria-label="Filter specimens">
        <label className="text-sm">Label or find name
          <input name="q" defaultValue={params.q ?? ""} className="field" placeholder="e.g. TV-M or Corvenlow" />
        </label>
        <label className="text-sm">Material class
          <select name="materialClass" defaultValue={params.materialClass ?? ""} className="field">
            <option value="">All classes</option>
            {MATERIAL_CLASSES.map((c) => <option key={c} value={c}>{MATERIAL_CLASS_LABELS[c]}</option>)}
          </select>
        </label>
        <UrlHiddenInputs defaults={{ sort: params.sort, dir: params.dir, pageSize: params.pageSize }} />
        <button className="btn-quiet">Filter</button>
        {filtered && <Link className="link text-sm" href="/specimens">Clear filter</Link>}
      </form>
      {total === 0 ? (
        filtered
          ? <EmptyState text="No specimen matches this filter. Clear it or try part of a label." action={{ href: "/specimens", label: "Show all specimens" }} />
          : <EmptyState text={write ? "No specimens yet. Add one, or import a CSV list of slices." : "No specimens yet. A lead or researcher adds them."} action={write ? { href: "/specimens/new", label: "Add the first specimen" } : undefined} />
      ) : (
        <SpecimenTable data={rows} total={total} page={params.page} pageSize={params.pageSize} sort={params.sort} dir={params.dir} renderedQuery={renderedQuery} />
      )}
    </div>
  );
}
