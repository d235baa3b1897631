import Link from "next/link";
import { listAuditEntities, listAuditEvents } from "@/db/queries/audit";
import { listMembers } from "@/db/queries/memberships";
import { labPage } from "@/lib/auth/page";
import { formatDateTime } from "@/lib/format";
import { AuditChanges } from "@/components/audit/audit-changes";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Audit trail" };

export default async function AuditPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const ctx = await labPage("/audit");
  const sp = await searchParams;
  const entity = sp.entity || undefined;
  const userId = sp.user && /^[0-9a-f-]{36}$/.test(sp.user) ? sp.user : undefined;
  const before = sp.before && /^\d+$/.test(sp.before) ? Number(sp.before) : undefined;
  const [events, entities, members] = await Promise.all([
    listAuditEvents({ labId: ctx.labId, viewerId: ctx.userId, entity, userId, before, limit: 50 }),
    listAuditEntities({ labId: ctx.labId }),
    listMembers({ labId: ctx.labId }),
  ]);
  const next = events.length === 50 ? events[events.length - 1].id : null;
  const qs = (extra: Record<string, string | number | undefined>) => {
    const p = new URLSearchParams();
    for (const [k, v] of Object.entries({ entity, user: userId, ...extra })) if (v != null && v !== "") p.set(k, String(v));
    return `?${p.toString()}`;
  };
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Audit trail</h1>
      <p className="text-sm muted">Every create, update and delete in this lab, with who did it, when, and the record before and after.</p>
      <form className="flex flex-wrap gap-3 items-end" method="get">
        <label className="text-sm">Entity
          <select name="entity" defaultValue={entity ?? ""} className="field">
            <option value="">All</option>
            {entities.map((e) => <option key={e} value={e}>{e}</option>)}
          </select>
        </label>
        <label className="text-sm">Person
          <select name="user" defaultValue={userId ?? ""} className="field">
            <option value="">Everyone</option>
            {members.map((m) => <option key={m.userId} value={m.userId}>{m.name}</option>)}
          </select>
        </label>
        <button className="btn-quiet">Filter</button>
      </form>
      {events.length === 0 ? <EmptyState text="No events match this filter." /> : (
        <div className="panel overflow-x-auto">
          <table className="data">
            <thead><tr><th>When</th><th>Who</th><th>What</th><th>Entity</th><th>Changes</th></tr></thead>
            <tbody>
              {events.map((e) => (
                <tr key={e.id}>
                  <td className="whitespace-nowrap">{formatDateTime(e.at)}</td>
                  <td>{e.userName ?? "System"}</td>
                  <td>{e.summary ?? e.action}</td>
                  <td><span className="font-mono text-xs">{e.entity}</span><br /><span className="text-xs muted">{e.action}</span></td>
                  <td className="min-w-[18rem]"><AuditChanges before={e.before} after={e.after} hidden={e.hidden} /></td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {next && <Link className="link text-sm" href={qs({ before: next })}>Older events</Link>}
    </div>
  );
}
