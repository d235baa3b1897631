"use client";
// The lab-wide due list, fetched from /api/inspections so it stays current: refreshed every 60 s and
// whenever the tab comes back into view. Grouped by the legend's own words: overdue, due, upcoming
// (the API lists the coming week).
import { useCallback, useEffect, useRef, useState } from "react";
import Link from "next/link";
import { formatDateTime } from "@/lib/format";
import { DUE_PAGE_SIZE, STATUS_RULE_TEXT } from "@/lib/schedule/status";

type Item = { id: string; trialId: string; trialTitle: string; dayNumber: number; plannedAt: string; status: "due" | "overdue" | "upcoming" | "done"; rescheduleReason: string | null };
type Answer = { items: Item[]; total: number; totalCapped: boolean; now: string; graceHours: number };
const REFRESH_MS = 60_000;
const DUE_MAX = 500; // the API's largest page
const WEEK_MS = 7 * 86_400_000;

function Group({ id, title, scope, items, empty }: { id: string; title: string; scope: string; items: Item[]; empty: string }) {
  return (
    <section className="panel p-4 space-y-2" aria-labelledby={id}>
      <h2 id={id} className="font-semibold">{title} <span className="muted font-normal">({items.length})</span></h2>
      <p className="text-xs muted">{scope}</p>
      {items.length === 0 ? <p className="text-sm muted">{empty}</p> : (
        <ul className="divide-y divide-[var(--line)]">
          {items.map((i) => (
            <li key={i.id} className="py-2 flex flex-wrap items-baseline justify-between gap-2">
              <span>
                <Link className="link" prefetch={false} href={`/trials/${i.trialId}/inspections/${i.id}`}>{i.trialTitle} · day {i.dayNumber}</Link>
                {i.rescheduleReason && <span className="text-xs muted"> (rescheduled)</span>}
              </span>
              <span className={`text-sm whitespace-nowrap ${i.status === "overdue" ? "text-rust-700 font-medium" : "muted"}`}>{i.status === "overdue" ? "overdue since " : ""}{formatDateTime(i.plannedAt)}</span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

export function DueList() {
  const [data, setData] = useState<Answer | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [loading, setLoading] = useState(false);
  const [limit, setLimit] = useState(DUE_PAGE_SIZE);

  // Only the newest request may update the list (a minute's refresh must not overwrite "show more").
  const latest = useRef(0);
  const load = useCallback(async () => {
    const id = ++latest.current;
    setLoading(true);
    try {
      const before = new Date(Date.now() + WEEK_MS).toISOString();
      const res = await fetch(`/api/inspections?status=open&pageSize=${limit}&before=${encodeURIComponent(before)}`, { cache: "no-store" });
      if (!res.ok) {
        const body = (await res.json().catch(() => null)) as { error?: { message?: string } } | null;
        throw new Error(body?.error?.message ?? `The server answered ${res.status}.`);
      }
      const answer = (await res.json()) as Answer;
      if (id !== latest.current) return;
      setData(answer);
      setError(null);
    } catch (e) {
      if (id !== latest.current) return;
      setError(`Could not refresh the list: ${e instanceof Error ? e.message : "network error"}. Showing the last copy; retrying in a minute.`);
    } finally {
      if (id === latest.current) setLoading(false);
    }
  }, [limit]);

  useEffect(() => {
    void load();
    const timer = setInterval(() => void load(), REFRESH_MS);
    const onVisible = () => document.visibilityState === "visible" && void load();
    document.addEventListener("visibilitychange", onVisible);
    return () => {
      clearInterval(timer);
      document.removeEventListener("visibilitychange", onVisible);
    };
  }, [load]);

  const items = data?.items ?? [];
  const overdue = items.filter((i) => i.status === "overdue");
  const due = items.filter((i) => i.status === "due");
  const upcoming = items.filter((i) => i.status === "upcoming");

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <span role="status" aria-live="polite" className="muted">
          {loading && !data ? "Loading…" : data ? `Updated ${formatDateTime(data.now)}; refreshes every minute.` : ""}
        </span>
        <button type="button" className="btn-quiet" onClick={() => void load()} disabled={loading}>Refresh now</button>
      </div>
      {error && <p role="alert" className="text-sm rounded-md px-3 py-2 bg-rust-50 text-rust-800">{error}</p>}
      {data && (
        <>
          <Group id="overdue-h" title="Overdue" scope={`Past the planned time by more than the grace period (${data.graceHours} h).`} items={overdue} empty="Nothing overdue." />
          <Group id="due-h" title="Due" scope="Planned for today or tomorrow (UTC), or past but still within the grace period." items={due} empty="Nothing due." />
          <Group id="upcoming-h" title="Upcoming" scope="Planned after tomorrow, within the coming seven days." items={upcoming} empty="Nothing upcoming in the coming week. Running trials list their full schedule on their Schedule tab." />
          {data.total > items.length && (
            <p className="text-sm muted flex flex-wrap items-center gap-3">
              <span>Showing the first {items.length} of {data.totalCapped ? `${data.total.toLocaleString("en-GB")} or more` : data.total}.</span>
              {limit < DUE_MAX
                ? <button type="button" className="btn-quiet" aria-disabled={loading} onClick={() => !loading && setLimit((l) => Math.min(DUE_MAX, l + DUE_PAGE_SIZE))}>Show {DUE_PAGE_SIZE} more</button>
                : <span>Each trial&apos;s Schedule tab lists all of its inspections.</span>}
            </p>
          )}
          <p className="text-xs muted max-w-3xl">{STATUS_RULE_TEXT} Grace period: {data.graceHours} h. Only running trials are listed.</p>
        </>
      )}
    </div>
  );
}
