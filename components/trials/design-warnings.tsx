// The design warnings of lib/trials/design-checks as a list; used by the design form's Planning panel
// (live, as chambers, treatments and replicates change) and by the trial page while it is a draft.
import type { DesignWarning } from "@/lib/trials/design-checks";

export function DesignWarnings({ warnings, id }: { warnings: DesignWarning[]; id?: string }) {
  if (warnings.length === 0) return <p id={id} className="text-sm muted">No design problems found.</p>;
  return (
    <ul id={id} className="space-y-1 text-sm" aria-label="Design warnings">
      {warnings.map((w) => <li key={w.code} data-warning={w.code} className="rounded-md px-3 py-2 bg-rust-50 text-rust-800">{w.message}</li>)}
    </ul>
  );
}
