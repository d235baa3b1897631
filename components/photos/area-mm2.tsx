// Rusted area in mm² beside the percentage, or why there is none (no scale, no face outline).
import type { ScaledRecord } from "@/db/queries/photo-evidence";

export function formatMm2(v: number): string {
  return v < 10 ? v.toFixed(2) : v < 100 ? v.toFixed(1) : Math.round(v).toString();
}

export function AreaMm2({ record }: { record: Pick<ScaledRecord, "areaMm2" | "missing"> | undefined }) {
  if (!record) return null;
  if (record.areaMm2 == null) {
    return <p className="text-xs muted" data-area-mm2="">{record.missing === "face" ? "mm²: outline the face when scoring" : "mm²: no scale for this photo"}</p>;
  }
  return <p className="text-xs" data-area-mm2={record.areaMm2}>{formatMm2(record.areaMm2)} mm² rusted</p>;
}
