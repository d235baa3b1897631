// The comparison's choices as plain links: each view has its own URL, works without script, and can
// be bookmarked or sent to a colleague.
import Link from "next/link";
import { CURVE_METHODS, type CurveMethod } from "@/lib/analysis/result";
import { GROUPING_LABELS, GROUPINGS } from "@/lib/analysis/groups";
import { OUTCOME_LABELS, OUTCOMES, type AnalysisQuery } from "@/lib/analysis/params";

const METHOD_LABELS: Record<CurveMethod, string> = { turnbull: "Turnbull (interval data)", km: "Kaplan–Meier (right endpoint)" };

/** keep: further parameters carried along unchanged (the exposure choices). */
export function hrefFor(base: string, q: AnalysisQuery, change: Partial<AnalysisQuery>, keep: Record<string, string> = {}): string {
  const next = { ...q, ...change };
  return `${base}?${new URLSearchParams({ groupBy: next.groupBy, outcome: next.outcome, method: next.method, ...keep })}`;
}

function Choice<T extends string>({ id, label, options, labels, current, href }: {
  id: string; label: string; options: readonly T[]; labels: Record<T, string>; current: T; href: (v: T) => string;
}) {
  return (
    <div role="group" aria-labelledby={id} className="space-y-1">
      <p id={id} className="text-xs font-medium muted uppercase tracking-wide">{label}</p>
      <ul className="flex flex-wrap gap-1">
        {options.map((o) => (
          <li key={o}>
            <Link
              href={href(o)}
              aria-current={o === current ? "true" : undefined}
              className={`block rounded-md border px-3 py-1 text-sm ${o === current ? "bg-verdigris-600 text-white border-verdigris-600" : "border-[var(--line)] hover:bg-iron-200/60"}`}
            >
              {labels[o]}
            </Link>
          </li>
        ))}
      </ul>
    </div>
  );
}

export function CompareControls({ base, q, keep = {} }: { base: string; q: AnalysisQuery; keep?: Record<string, string> }) {
  return (
    <nav aria-label="Comparison options" className="panel p-3 flex flex-wrap gap-6 no-print">
      <Choice id="groupby-l" label="Group by" options={GROUPINGS} labels={GROUPING_LABELS} current={q.groupBy} href={(v) => hrefFor(base, q, { groupBy: v }, keep)} />
      <Choice id="outcome-l" label="Outcome" options={OUTCOMES} labels={OUTCOME_LABELS} current={q.outcome} href={(v) => hrefFor(base, q, { outcome: v }, keep)} />
      {(q.outcome === "first-rust" || q.outcome === "weeping") && (
        <Choice id="method-l" label="Curves" options={CURVE_METHODS} labels={METHOD_LABELS} current={q.method} href={(v) => hrefFor(base, q, { method: v }, keep)} />
      )}
    </nav>
  );
}

export function ExportLinks({ trialId, q, withReport = true, keep = {} }: { trialId: string; q: AnalysisQuery; withReport?: boolean; keep?: Record<string, string> }) {
  return (
    <ul className="flex flex-wrap gap-2 text-sm no-print" aria-label="Exports">
      {withReport && <li><Link className="btn-quiet" href={hrefFor(`/trials/${trialId}/report`, q, {}, keep)}>Printable report</Link></li>}
      <li><a className="btn-quiet" href={`/api/trials/${trialId}/export/outcomes.csv`} download>Outcomes (CSV)</a></li>
      <li><a className="btn-quiet" href={`/api/trials/${trialId}/export/datapackage.zip`} download>Data package (zip)</a></li>
    </ul>
  );
}
