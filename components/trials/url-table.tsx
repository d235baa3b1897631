"use client";
// A TanStack table whose sort and page live in the URL search params; the server sorts and pages,
// so this only renders one page and rewrites the URL (filters are plain GET forms beside it).
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
};

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

export function UrlTable<T>({ caption, columns, data, total, page, pageSize, sort, dir = "asc", getRowId }: UrlTableProps<T>) {
  const href = useHref();
  const router = useRouter();
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
      <div className="panel overflow-x-auto">
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
                        <Link className="hover:underline" href={href({ sort: h.column.id, dir: active && dir === "asc" ? "desc" : "asc", page: 1 })}>
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
        <span className="muted" role="status">{first}–{last} of {total}</span>
        {page > 1 ? <Link className="btn-quiet" href={href({ page: page - 1 })}>Previous</Link> : <span className="btn-quiet opacity-50" aria-disabled="true">Previous</span>}
        <span>Page {page} of {pages}</span>
        {page < pages ? <Link className="btn-quiet" href={href({ page: page + 1 })}>Next</Link> : <span className="btn-quiet opacity-50" aria-disabled="true">Next</span>}
        <label className="inline-flex items-center gap-2">Rows per page
          <select className="field py-1" style={{ width: "5rem" }} value={pageSize} onChange={(e) => router.push(href({ pageSize: e.target.value, page: 1 }))}>
            {[25, 50, 100].map((n) => <option key={n} value={n}>{n}</option>)}
          </select>
        </label>
      </nav>
    </div>
  );
}
