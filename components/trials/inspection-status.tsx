// Inspection status as a word with a small mark; rust colour only for "overdue", as a warning.
import type { InspectionStatus } from "@/lib/schedule/status";

const STYLE: Record<InspectionStatus, string> = {
  done: "text-iron-600",
  due: "text-verdigris-800 font-medium",
  overdue: "text-rust-700 font-semibold",
  upcoming: "muted",
};
const MARK: Record<InspectionStatus, string> = { done: "✓", due: "●", overdue: "!", upcoming: "○" };

export function InspectionStatusTag({ status }: { status: InspectionStatus }) {
  return <span className={`whitespace-nowrap text-sm ${STYLE[status]}`}><span aria-hidden="true">{MARK[status]} </span>{status}</span>;
}
