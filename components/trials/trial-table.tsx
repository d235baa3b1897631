"use client";
import Link from "next/link";
import type { ColumnDef } from "@tanstack/react-table";
import { formatDate } from "@/lib/format";
import { StatusBadge } from "./status-badge";
import { UrlTable } from "./url-table";

export type TrialRow = { id: string; title: string; status: "draft" | "running" | "concluded"; arms: number; specimens: number; replicatesPerArm: number; startedAt: Date | null; concludedAt: Date | null; createdAt: Date };

const columns: ColumnDef<TrialRow, unknown>[] = [
  { id: "title", header: "Trial", enableSorting: false, cell: ({ row }) => <Link className="link font-medium" href={`/trials/${row.original.id}`}>{row.original.title}</Link> },
  { id: "status", header: "Status", enableSorting: false, cell: ({ row }) => <StatusBadge status={row.original.status} /> },
  { id: "arms", header: "Arms × replicates", enableSorting: false, cell: ({ row }) => <span className="tabular-nums">{row.original.arms} × {row.original.replicatesPerArm}</span> },
  { id: "specimens", header: "Specimens allocated", enableSorting: false, cell: ({ row }) => <span className="tabular-nums">{row.original.specimens}</span> },
  { id: "dates", header: "Dates", enableSorting: false, cell: ({ row }) => {
    const t = row.original;
    return t.concludedAt ? `${formatDate(t.startedAt!)} – ${formatDate(t.concludedAt)}` : t.startedAt ? `since ${formatDate(t.startedAt)}` : `drafted ${formatDate(t.createdAt)}`;
  } },
];

export function TrialTable(props: { data: TrialRow[]; total: number; page: number; pageSize: number }) {
  return <UrlTable caption="Trials" columns={columns} getRowId={(r) => r.id} {...props} />;
}
