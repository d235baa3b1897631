"use client";
import Link from "next/link";
import type { ColumnDef } from "@tanstack/react-table";
import { UrlTable } from "@/components/trials/url-table";
import { TREATMENT_KIND_LABELS, type TreatmentKind } from "@/lib/validation/treatments";

export type TreatmentRow = { id: string; name: string; kind: TreatmentKind; description: string; trials: number };

const columns: ColumnDef<TreatmentRow, unknown>[] = [
  { id: "name", header: "Name", enableSorting: false, cell: ({ row }) => <Link className="link font-medium" href={`/treatments/${row.original.id}`}>{row.original.name}</Link> },
  { id: "kind", header: "Kind", enableSorting: false, cell: ({ row }) => TREATMENT_KIND_LABELS[row.original.kind] },
  { id: "description", header: "Description", enableSorting: false, cell: ({ row }) => row.original.description || <span className="muted">—</span> },
  { id: "trials", header: "Trials", enableSorting: false, cell: ({ row }) => <span className="tabular-nums">{row.original.trials}</span> },
];

export function TreatmentTable(props: { data: TreatmentRow[]; total: number; page: number; pageSize: number }) {
  return <UrlTable caption="Treatments" columns={columns} getRowId={(r) => r.id} {...props} />;
}
