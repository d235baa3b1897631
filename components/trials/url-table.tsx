"use client";
// A TanStack table whose sort and page live in the URL search params; the server sorts and pages,
// so this only renders one page and rewrites the URL (filters are plain GET forms beside it). Row links
// in long tables use prefetch={false}: otherwise every page view asks the server for one prefetch per row.
// With `endpoint` (a JSON list route answering { items, total, page, pageSize }), sorting and paging
// fetch just the rows from it and push the URL with history.pushState (which Next's router follows),
// instead of rendering the page again on the server; links still work without JavaScript.
import { useEffect, useState, type MouseEvent } from "react";
import Link from "next/link";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef, type SortingState } from "@tanstack/react-table";

export type UrlTableProps<T> = {
  caption: string;
  columns: ColumnDef<T, unknown>[];
  data: T[];
  total: number;
  page: number;
  pageSize: number;
  sort?: string;
  dir?: "asc" | "desc";
  getRowId: (row: T) => string;
  /** JSON list route for client-side sorting and paging (same query parameters as the page). */
  endpoint?: string;
  /** The query string the server rendered these rows for (with `endpoint`). */
  renderedQuery?: string;
};

/** A query string with its parameters in a fixed order, so two spellings of one URL compare equal. */
export function queryKey(qs: string) {
  const p = new URLSearchParams(qs);
  p.sort();
  return p.toString();
}

type View<T> = { data: T[]; total: number; page: number; pageSize: number; sort?: string; dir: "asc" | "desc"; key: string };

export function useHref() {
  const path = usePathname();
  const params = useSearchParams();
  return (patch: Record<string, string | number | undefined>) => {
    const p = new URLSearchParams(params.toString());
    for (const [k, v] of Object.entries(patch)) {
      if (v === undefined || v === "") p.delete(k);
      else p.set(k, String(v));
    }
    const qs = p.toString();
    return qs ? `${path}?${qs}` : path;
  };
}

export function UrlTable<T>({ caption, columns, data, total, page, pageSize, sort, dir = "asc", getRowId, endpoint, renderedQuery }: UrlTableProps<T>) {
  const href = useHref();
  const router = useRouter();
  const params = useSearchParams();
  const key = queryKey(params.toString());
  // What the server rendered (for renderedQuery — after Back the URL may say another page than the rows
  // the router kept), replaced by fetched rows when the URL changes on the client; a new server render
  // (a filter form, a refresh) wins again (React's "adjust state when a prop changes" pattern).
  const servedKey = renderedQuery === undefined ? key : queryKey(renderedQuery);
  const [view, setView] = useState<View<T>>({ data, total, page, pageSize, sort, dir, key: servedKey });
  const [served, setServed] = useState(data);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [attempt, setAttempt] = useState(0);
  if (served !== data) {
    setServed(data);
    setView({ data, total, page, pageSize, sort, dir, key: servedKey });
    setError(null);
  }

  useEffect(() => {
    if (!endpoint || key === view.key) {
      setBusy(false);
      return;
    }
    const ctl = new AbortController();
    setBusy(true);
    fetch(`${endpoint}?${key}`, { signal: ctl.signal, cache: "no-store" })
      .then(async (res) => {
        const body = (await res.json().catch(() => null)) as { items?: T[]; total?: number; page?: number; pageSize?: number; error?: { message?: string } } | null;
        if (!res.ok || !body?.items) throw new Error(body?.error?.message ?? `The server answered ${res.status}.`);
        setView({ data: body.items, total: body.total ?? 0, page: body.page ?? 1, pageSize: body.pageSize ?? pageSize, sort: params.get("sort") ?? sort, dir: params.get("dir") === "desc" ? "desc" : params.get("dir") === "asc" ? "asc" : dir, key });
        setError(null);
      })
      .catch((e: unknown) => {
        if (ctl.signal.aborted) return;
        setError(`Could not load these rows (${e instanceof Error ? e.message : "network error"}). The rows below are still the previous ones.`);
      })
      .finally(() => !ctl.signal.aborted && setBusy(false));
    return () => ctl.abort();
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [endpoint, key, attempt]);

  /** Follow a sort/page link on the client when an endpoint is given (plain clicks only). */
  const go = (url: string) => (e?: MouseEvent) => {
    if (!endpoint) return;
    if (e && (e.metaKey || e.ctrlKey || e.shiftKey || e.altKey || e.button !== 0)) return;
    e?.preventDefault();
    window.history.pushState(null, "", url);
  };

  return <TableView caption={caption} columns={columns} getRowId={getRowId} view={view} busy={busy} error={error} href={href} retry={() => setAttempt((n) => n + 1)}
    go={go} onPageSize={(n) => (endpoint ? go(href({ pageSize: n, page: 1 }))() : router.push(href({ pageSize: n, page: 1 })))} />;
}

function TableView<T>({ caption, columns, getRowId, view, busy, error, href, retry, go, onPageSize }: {
  caption: string; columns: ColumnDef<T, unknown>[]; getRowId: (row: T) => string; view: View<T>; busy: boolean; error: string | null; retry: () => void;
  href: ReturnType<typeof useHref>; go: (url: string) => (e?: MouseEvent) => void; onPageSize: (n: string) => void;
}) {
  const { data, total, page, pageSize, sort, dir } = view;
  const sorting: SortingState = sort ? [{ id: sort, desc: dir === "desc" }] : [];
  const table = useReactTable({
    data, columns, getRowId, state: { sorting }, manualSorting: true, manualPagination: true, manualFiltering: true,
    pageCount: Math.max(1, Math.ceil(total / pageSize)), getCoreRowModel: getCoreRowModel(),
  });
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);
  return (
    <div className="space-y-2">
      {error && (
        <p role="alert" className="text-sm rounded-md px-3 py-2 bg-rust-50 text-rust-800 flex flex-wrap items-center gap-3">
          <span>{error}</span>
          <button type="button" className="btn-quiet" onClick={retry}>Try again</button>
        </p>
      )}
      <div className="panel overflow-x-auto" aria-busy={busy}>
        <table className="data">
          <caption className="sr-only">{caption}</caption>
          <thead>
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  // Display columns have no accessor, so TanStack would say "not sortable"; the server sorts by id.
                  const canSort = h.column.columnDef.enableSorting !== false;
                  const active = sort === h.column.id;
                  const label = flexRender(h.column.columnDef.header, h.getContext());
                  return (
                    <th key={h.id} scope="col" aria-sort={active ? (dir === "asc" ? "ascending" : "descending") : undefined}>
                      {canSort ? (
                        <Link className="hover:underline" href={href({ sort: h.column.id, dir: active && dir === "asc" ? "desc" : "asc", page: 1 })} onClick={go(href({ sort: h.column.id, dir: active && dir === "asc" ? "desc" : "asc", page: 1 }))}>
                          {label} <span aria-hidden="true">{active ? (dir === "asc" ? "▲" : "▼") : "↕"}</span>
                        </Link>
                      ) : label}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id}>
                {row.getVisibleCells().map((cell) => <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <nav aria-label={`${caption} pages`} className="flex flex-wrap items-center gap-3 text-sm">
        <span className="muted" role="status">{busy ? "Loading…" : `${first}–${last} of ${total}`}</span>
        {page > 1 ? <Link className="btn-quiet" href={href({ page: page - 1 })} onClick={go(href({ page: page - 1 }))}>Previous</Link> : <span className="btn-quiet opacity-50" aria-disabled="true">Previous</span>}
        <span>Page {page} of {pages}</span>
        {page < pages ? <Link className="btn-quiet" href={href({ page: page + 1 })} onClick={go(href({ page: page + 1 }))}>Next</Link> : <span className="btn-quiet opacity-50" aria-disabled="true">Next</span>}
        <label className="inline-flex items-center gap-2">Rows per page
          <select className="field py-1" style={{ width: "5rem" }} value={pageSize} onChange={(e) => onPageSize(e.target.value)}>
            {[...new Set([25, 50, 100, pageSize])].sort((a, b) => a - b).map((n) => <option key={n} value={n}>{n}</option>)}
          </select>
        </label>
      </nav>
    </div>
  );
}
