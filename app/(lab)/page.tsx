import Link from "next/link";
import { listAuditEvents } from "@/db/queries/audit";
import { listDueInspections, listRunningTrials } from "@/db/queries/home";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { EmptyState } from "@/components/ui/empty-state";
import { formatDateTime } from "@/lib/format";

export const metadata = { title: "Lab home" };

export default async function HomePage() {
  const ctx = await labPage("/");
  const weekAhead = new Date(Date.now() + 7 * 86_400_000);
  const [running, due, activity] = await Promise.all([
    listRunningTrials({ labId: ctx.labId }),
    listDueInspections({ labId: ctx.labId, until: weekAhead, limit: 20 }),
    listAuditEvents({ labId: ctx.labId, viewerId: ctx.userId, limit: 12 }),
  ]);
  const now = Date.now();
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-semibold">{ctx.labName}</h1>
      <div className="grid gap-6 lg:grid-cols-3">
        <section className="panel p-4 space-y-3" aria-labelledby="running-h">
          <h2 id="running-h" className="font-semibold">Running trials</h2>
          {running.length === 0 ? (
            <EmptyState text="No trial is running." action={can(ctx.role, "trials.write") ? { href: "/trials/new", label: "Design a trial" } : undefined} />
          ) : (
            <ul className="space-y-2">
              {running.map((t) => (
                <li key={t.id}>
                  <Link className="link" href={`/trials/${t.id}`}>{t.title}</Link>
                  <p className="text-xs muted">{t.specimens} specimens · started {t.startedAt ? formatDateTime(t.startedAt) : "—"}</p>
                </li>
              ))}
            </ul>
          )}
        </section>
        <section className="panel p-4 space-y-3" aria-labelledby="due-h">
          <h2 id="due-h" className="font-semibold">Inspections due this week</h2>
          {due.length === 0 ? (
            <EmptyState text="Nothing is due in the next seven days." />
          ) : (
            <ul className="space-y-2">
              {due.map((i) => (
                <li key={i.id} className="flex items-baseline justify-between gap-2">
                  <Link className="link" href={`/trials/${i.trialId}/inspections/${i.id}`}>{i.trialTitle} · day {i.dayNumber}</Link>
                  <span className={`text-xs whitespace-nowrap ${i.plannedAt.getTime() < now ? "text-rust-600 font-medium" : "muted"}`}>
                    {i.plannedAt.getTime() < now ? "overdue · " : ""}{formatDateTime(i.plannedAt)}
                  </span>
                </li>
              ))}
            </ul>
          )}
          <Link className="link text-sm" href="/due">All due inspections</Link>
        </section>
        <section className="panel p-4 space-y-3" aria-labelledby="activity-h">
          <h2 id="activity-h" className="font-semibold">Recent activity</h2>
          {activity.length === 0 ? (
            <EmptyState text="No changes recorded yet." />
          ) : (
            <ul className="space-y-2 text-sm">
              {activity.map((a) => (
                <li key={a.id}>
                  <span className="font-medium">{a.userName ?? "System"}</span> {a.summary ?? `${a.action}d ${a.entity}`}
                  <p className="text-xs muted">{formatDateTime(a.at)}</p>
                </li>
              ))}
            </ul>
          )}
          <Link className="link text-sm" href="/audit">Full audit trail</Link>
        </section>
      </div>
      <p className="text-xs muted max-w-3xl">
        Trial results guide storage decisions; they do not replace a conservator&apos;s judgement of each object.
      </p>
    </div>
  );
}
