import { formatDateTime } from "@/lib/format";
import type { CaptureCheck } from "@/lib/photos/capture-check";

type Ack = { note: string; by: string | null; at: string } | null | undefined;

/**
 * The capture-time check as a sentence; a warning style when it looks like the wrong card or day,
 * unless someone acknowledged it with a note (then the note, who and when).
 */
export function TimeCheckNote({ check, ack, compact = false }: { check: CaptureCheck | null; ack?: Ack; compact?: boolean }) {
  if (!check) return null;
  const warn = check.status === "far" || check.status === "no-time";
  const acked = warn && !!ack;
  if (compact && (!warn || acked)) return null;
  return (
    <div className={`text-xs rounded px-2 py-1 ${warn && !acked ? "bg-rust-50 text-rust-800 dark:bg-rust-900/40 dark:text-rust-100" : acked ? "border border-[var(--line)]" : "muted"}`}
      data-check={check.status} data-acknowledged={acked ? "true" : undefined}>
      <p>
        {warn && !acked && <span aria-hidden="true">⚠ </span>}
        {warn && !acked && <span className="sr-only">Warning: </span>}
        {acked && <span className="font-medium">Acknowledged warning: </span>}
        {check.message}
      </p>
      {acked && ack && (
        <p className="mt-1">
          <span className="muted">Acknowledged{ack.by ? ` by ${ack.by}` : ""} on {formatDateTime(ack.at)}:</span>{" "}
          <q className="whitespace-pre-wrap">{ack.note}</q>
        </p>
      )}
    </div>
  );
}
