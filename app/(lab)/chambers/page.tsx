import Link from "next/link";
import { CHAMBER_SORTS, listChambers, type ChamberSort } from "@/db/queries/chambers";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { DESICCANTS, type DesiccantKind } from "@/lib/humidity/desiccant";
import { CHAMBER_KINDS } from "@/lib/humidity/hazards";
import { isSaltId, SALTS } from "@/lib/humidity/salts";
import { CHAMBER_KIND_LABELS } from "@/lib/validation/chambers";
import { ChamberTable } from "@/components/chambers/chamber-table";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Chambers" };
const PAGE_SIZE = 20;

export default async function ChambersPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const ctx = await labPage("/chambers");
  const sp = await searchParams;
  const sort: ChamberSort = (CHAMBER_SORTS as readonly string[]).includes(sp.sort ?? "") ? (sp.sort as ChamberSort) : "name";
  const dir = sp.dir === "desc" ? "desc" : "asc";
  const page = Math.max(1, Math.min(10_000, Number.parseInt(sp.page ?? "1", 10) || 1));
  const q = (sp.q ?? "").trim().slice(0, 100) || undefined;
  const kind = (CHAMBER_KINDS as readonly string[]).includes(sp.kind ?? "") ? sp.kind : undefined;
  const archived = sp.archived === "1";
  const { rows, total } = await listChambers({ labId: ctx.labId, q, kind, archived, sort, dir, page, pageSize: PAGE_SIZE });
  const canWrite = can(ctx.role, "chambers.write");
  const filtered = !!(q || kind || archived);
  const tableRows = rows.map((r) => ({
    id: r.id, name: r.name, kind: r.kind, nominalTempC: r.nominalTempC, setpointRhPercent: r.setpointRhPercent, toleranceRhPercent: r.toleranceRhPercent,
    lastReadingAt: r.lastReadingAt ? r.lastReadingAt.toISOString() : null, lastRh: r.lastRh,
    detail: r.saltId && isSaltId(r.saltId) ? r.saltId : r.desiccantKind && r.desiccantKind in DESICCANTS ? DESICCANTS[r.desiccantKind as DesiccantKind].displayName : "",
  }));
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold">Chambers</h1>
        {canWrite && <Link className="btn ml-auto" href="/chambers/new">New chamber</Link>}
      </div>
      <p className="text-sm muted max-w-3xl">Each chamber holds its air at a target humidity — over a saturated salt, a desiccant, water, or otherwise — and keeps its climate record: typed readings, logger files and logger posts.</p>
      <form method="get" className="flex flex-wrap items-end gap-3" role="search" aria-label="Filter chambers">
        <label className="text-sm">Name contains
          <input name="q" defaultValue={q ?? ""} className="field" />
        </label>
        <label className="text-sm">Kind
          <select name="kind" defaultValue={kind ?? ""} className="field">
            <option value="">All kinds</option>
            {CHAMBER_KINDS.map((k) => <option key={k} value={k}>{CHAMBER_KIND_LABELS[k]}</option>)}
          </select>
        </label>
        <label className="text-sm flex items-center gap-2 pb-2">
          <input type="checkbox" name="archived" value="1" defaultChecked={archived} /> Archived only
        </label>
        {sp.sort && <input type="hidden" name="sort" value={sort} />}
        {sp.dir && <input type="hidden" name="dir" value={dir} />}
        <button className="btn-quiet">Filter</button>
        {filtered && <Link className="link text-sm pb-2" href="/chambers">Clear</Link>}
      </form>
      {total === 0 ? (
        filtered ? (
          <EmptyState text="No chamber matches this filter." action={{ href: "/chambers", label: "Show all chambers" }} />
        ) : (
          <EmptyState
            text={canWrite ? "No chambers yet. Define one: say how its humidity is held (salt, desiccant, water…) and its target band; readings and hazard notes follow." : "No chambers yet. A lead or researcher defines them."}
            action={canWrite ? { href: "/chambers/new", label: "Define a chamber" } : undefined}
          />
        )
      ) : (
        <ChamberTable rows={tableRows} total={total} page={page} pageSize={PAGE_SIZE} sort={sort} dir={dir} />
      )}
      {!archived && <p className="text-xs muted">Salt fixed points from Greenspan 1977 ({Object.keys(SALTS).length} salts). <Link className="link" href="/chambers?archived=1">Archived chambers</Link></p>}
    </div>
  );
}
