// What was recorded with a photo: a flag when protocol points are missing, and the scale in use.
// Shown on the photo page, in scoring and in the grid; names no treatment.

export type EvidenceNote = { missing: string[]; recorded: boolean; scale: { pxPerMm: number; from: "photo" | "series" } | null };

export function ProtocolFlag({ evidence, compact }: { evidence: EvidenceNote | undefined; compact?: boolean }) {
  if (!evidence || evidence.missing.length === 0) return null;
  const text = evidence.recorded
    ? `Protocol: ${evidence.missing.length} point${evidence.missing.length === 1 ? "" : "s"} not followed`
    : "Protocol not recorded for this photo";
  return (
    <p className="text-xs rounded px-2 py-1 bg-rust-50 text-rust-800 dark:bg-rust-900/40 dark:text-rust-100" data-protocol-flag={evidence.missing.length}
      title={evidence.missing.join("\n")}>
      <span aria-hidden="true">⚑ </span>{text}{!compact && evidence.recorded ? `: ${evidence.missing.join("; ")}` : ""}
    </p>
  );
}

/** `blind`: only whether a scale is recorded; its value (shared by a specimen's series) would tie photos together. */
export function ScaleNote({ evidence, blind }: { evidence: EvidenceNote | undefined; blind?: boolean }) {
  if (!evidence?.scale) return <p className="text-xs muted">No scale: areas stay in % only.</p>;
  if (blind) return <p className="text-xs muted">Scale recorded for this photo.</p>;
  return <p className="text-xs muted" data-px-per-mm={evidence.scale.pxPerMm}>Scale {evidence.scale.pxPerMm.toFixed(2)} px/mm{evidence.scale.from === "series" ? " (series scale)" : ""}</p>;
}
