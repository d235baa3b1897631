// One audit event's changes as "field: before → after" lines, with the stored records as they are
// behind a toggle. Gets the event after lib/trials/access.ts has decided what this viewer may see.
import { auditChanges } from "@/lib/audit/changes";

function Json({ value, label }: { value: unknown; label: string }) {
  if (value == null) return null;
  return (
    <div>
      <p className="text-xs muted">{label}</p>
      {/* Focusable so keyboard users can scroll a long record. */}
      <pre tabIndex={0} aria-label={label} className="text-xs font-mono whitespace-pre-wrap break-all max-h-40 overflow-auto">{JSON.stringify(value, null, 1)}</pre>
    </div>
  );
}

export function AuditChanges({ before, after, hidden }: { before: unknown; after: unknown; hidden: boolean }) {
  if (hidden) return <span className="muted">—</span>;
  const changes = auditChanges(before, after);
  return (
    <div className="space-y-1" data-testid="audit-changes">
      {changes.length === 0 ? <p className="text-sm muted">No field changed.</p> : (
        <ul className="text-sm space-y-0.5">
          {changes.map((c) => (
            <li key={c.field}>
              <span className="font-medium">{c.label}:</span>{" "}
              {c.before !== null && <><span>{c.before}</span> → </>}
              {c.after ?? <span className="muted">removed</span>}
            </li>
          ))}
        </ul>
      )}
      {(before != null || after != null) && (
        <details className="text-xs">
          <summary className="cursor-pointer muted">Raw record</summary>
          <div className="mt-1 space-y-2">
            <Json value={before} label="Record before" />
            <Json value={after} label="Record after" />
          </div>
        </details>
      )}
    </div>
  );
}
