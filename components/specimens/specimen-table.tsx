"use client";
import Link from "next/link";
import type { ColumnDef } from "@tanstack/react-table";
import { UrlTable } from "@/components/trials/url-table";
import { MATERIAL_CLASS_LABELS, type MaterialClass } from "@/lib/validation/specimens";

export type SpecimenRow = { id: string; label: string; materialClass: MaterialClass; findName: string; face: string; surfacePrep: string; massG: number | null; contaminationNotes: string };

const columns: ColumnDef<SpecimenRow, unknown>[] = [
  { id: "label", header: "Label", cell: ({ row }) => <Link className="link font-medium" prefetch={false} href={`/specimens/${row.original.id}`}>{row.original.label}</Link> },
  { id: "materialClass", header: "Material class", cell: ({ row }) => MATERIAL_CLASS_LABELS[row.original.materialClass] },
  { id: "findName", header: "Find name", cell: ({ row }) => row.original.findName || <span className="muted">—</span> },
  { id: "face", header: "Face", enableSorting: false, cell: ({ row }) => row.original.face || <span className="muted">—</span> },
  { id: "surfacePrep", header: "Surface preparation", enableSorting: false, cell: ({ row }) => row.original.surfacePrep || <span className="muted">—</span> },
  { id: "massG", header: "Mass (g)", cell: ({ row }) => (row.original.massG == null ? <span className="muted">—</span> : <span className="tabular-nums">{row.original.massG.toFixed(1)}</span>) },
  { id: "contamination", header: "Contamination", enableSorting: false, cell: ({ row }) => (row.original.contaminationNotes ? <span title={row.original.contaminationNotes}>noted</span> : "") },
];

export function SpecimenTable(props: { data: SpecimenRow[]; total: number; page: number; pageSize: number; sort: string; dir: "asc" | "desc"; renderedQuery: string }) {
  return <UrlTable caption="Specimens" columns={columns} getRowId={(r) => r.id} endpoint="/api/specimens" {...props} />;
}
