// The water budget of a desiccant jar (lib/humidity/desiccant) with every assumption spelled out.
// No hooks: the form shows it live, the chamber page beside the projected exhaustion dates.
import type { DesiccantBudget } from "@/lib/humidity/desiccant";
import { formatNumber } from "@/lib/format";

export function DesiccantBudgetView({ budget, missing }: { budget: DesiccantBudget | null; missing: string[] }) {
  if (!budget) {
    return <p className="text-sm muted">Enter the {missing.join(", ")} to estimate how long a charge lasts.</p>;
  }
  const days = budget.daysUntilSpent;
  return (
    <div className="space-y-2 text-sm">
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
        <dt className="muted">Water coming in</dt><dd>{formatNumber(budget.waterInGPerDay * 1000, 1, "mg/day")}</dd>
        <dt className="muted">Usable capacity</dt><dd>{budget.capacityG == null ? "unknown" : formatNumber(budget.capacityG, 1, "g")}</dd>
        <dt className="muted">Expected life</dt><dd>{days == null ? "no projection" : days > 3650 ? "over 10 years" : `${formatNumber(days, 0)} days`}</dd>
      </dl>
      <details>
        <summary className="cursor-pointer">Assumptions behind this estimate</summary>
        <ul className="list-disc pl-5 mt-1 space-y-1">{budget.assumptions.map((a) => <li key={a}>{a}</li>)}</ul>
      </details>
    </div>
  );
}
