import type { CaptureCheck } from "@/lib/photos/capture-check";

/** The capture-time check as a sentence; a warning style when it looks like the wrong card or day. */
export function TimeCheckNote({ check, compact = false }: { check: CaptureCheck | null; compact?: boolean }) {
  if (!check) return null;
  const warn = check.status === "far" || check.status === "no-time";
  if (compact && !warn) return null;
  return (
    <p className={`text-xs rounded px-2 py-1 ${warn ? "bg-rust-50 text-rust-800 dark:bg-rust-900/40 dark:text-rust-100" : "muted"}`} data-check={check.status}>
      {warn && <span aria-hidden="true">⚠ </span>}
      {warn && <span className="sr-only">Warning: </span>}
      {check.message}
    </p>
  );
}
