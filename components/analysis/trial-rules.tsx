// The storage rules accepted from one trial, every version: on the humidity response and in the report.
import Link from "next/link";
import type { StorageRuleView } from "@/db/queries/storage-rules";
import { formatDateTime } from "@/lib/format";

export function TrialRules({ rules, empty }: { rules: readonly StorageRuleView[]; empty: string }) {
  if (rules.length === 0) return <p className="text-sm muted">{empty}</p>;
  return (
    <ul className="text-sm space-y-1" data-testid="trial-rules">
      {rules.map((rule) => (
        <li key={rule.id}>
          <span className="font-medium">{rule.statement}</span>{" "}
          <span className="muted">
            Version {rule.version}{rule.current ? " (in force)" : " (superseded)"}, accepted {formatDateTime(rule.acceptedAt)} by {rule.acceptedByName ?? "a former member"}.
            {rule.note && ` Note: ${rule.note}`}
          </span>
        </li>
      ))}
      <li className="no-print"><Link href="/storage-rules" className="link">All storage rules of the lab</Link></li>
    </ul>
  );
}
