"use client";
// The chamber list: TanStack Table for columns and sorting, with sort, filter and page kept in the
// URL and the paging done by the server (the table only ever holds one page).
import Link from "next/link";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { CHAMBER_KIND_LABELS } from "@/lib/validation/chambers";
import type { ChamberKind } from "@/lib/humidity/hazards";

export type ChamberRow = {
  id: string; name: string; kind: ChamberKind; nominalTempC: number; setpointRhPercent: number; toleranceRhPercent: number;
  lastReadingAt: string | null; lastRh: number | null; detail: string;
};

const col = createColumnHelper<ChamberRow>();
const columns = [
  col.accessor("name", { id: "name", header: "Name", cell: (c) => <Link className="link" href={`/chambers/${c.row.original.id}`}>{c.getValue()}</Link> }),
  col.accessor("kind", { id: "kind", header: "Kind", cell: (c) => <>{CHAMBER_KIND_LABELS[c.getValue()]}{c.row.original.detail ? <span className="muted"> · {c.row.original.detail}</span> : null}</> }),
  col.accessor("setpointRhPercent", { id: "setpoint", header: "Target (%RH)", cell: (c) => `${c.getValue()} ± ${c.row.original.toleranceRhPercent}` }),
  col.accessor("nominalTempC", { id: "temperature", header: "Temperature (°C)", cell: (c) => c.getValue() }),
  col.accessor("lastReadingAt", {
    id: "lastReading", header: "Last reading",
    cell: (c) => (c.getValue() ? <>{c.row.original.lastRh?.toFixed(1)} %RH <span className="muted text-xs">{c.getValue()!.slice(0, 16).replace("T", " ")} UTC</span></> : <span className="muted">none yet</span>),
  }),
];

export function ChamberTable({ rows, total, page, pageSize, sort, dir }: { rows: ChamberRow[]; total: number; page: number; pageSize: number; sort: string; dir: "asc" | "desc" }) {
  const router = useRouter();
  const pathname = usePathname();
  const params = useSearchParams();
  const go = (changes: Record<string, string | null>) => {
    const next = new URLSearchParams(params.toString());
    for (const [k, v] of Object.entries(changes)) (v === null ? next.delete(k) : next.set(k, v));
    router.push(`${pathname}?${next.toString()}`);
  };
  const sorting: SortingState = [{ id: sort, desc: dir === "desc" }];
  const pageCount = Math.max(1, Math.ceil(total / pageSize));
  const table = useReactTable({
    data: rows, columns, getCoreRowModel: getCoreRowModel(), manualSorting: true, manualPagination: true, pageCount,
    state: { sorting, pagination: { pageIndex: page - 1, pageSize } },
    onSortingChange: (updater) => {
      const s = typeof updater === "function" ? updater(sorting) : updater;
      go({ sort: s[0]?.id ?? null, dir: s[0] ? (s[0].desc ? "desc" : "asc") : null, page: null });
    },
  });
  return (
    <div className="space-y-2">
      <div className="panel overflow-x-auto">
        <table className="data">
          <thead>
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const s = h.column.getIsSorted();
                  return (
                    <th key={h.id} aria-sort={s === "asc" ? "ascending" : s === "desc" ? "descending" : "none"}>
                      <button type="button" className="inline-flex items-center gap-1 hover:underline" onClick={h.column.getToggleSortingHandler()}>
                        {flexRender(h.column.columnDef.header, h.getContext())}
                        <span aria-hidden="true">{s === "asc" ? "▲" : s === "desc" ? "▼" : "↕"}</span>
                      </button>
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((r) => (
              <tr key={r.id}>{r.getVisibleCells().map((c) => <td key={c.id}>{flexRender(c.column.columnDef.cell, c.getContext())}</td>)}</tr>
            ))}
          </tbody>
        </table>
      </div>
      <nav aria-label="Pages" className="flex items-center gap-3 text-sm">
        <button type="button" className="btn-quiet" disabled={page <= 1} onClick={() => go({ page: String(page - 1) })}>Previous</button>
        <span>Page {page} of {pageCount} · {total} chamber{total === 1 ? "" : "s"}</span>
        <button type="button" className="btn-quiet" disabled={page >= pageCount} onClick={() => go({ page: String(page + 1) })}>Next</button>
      </nav>
    </div>
  );
}
