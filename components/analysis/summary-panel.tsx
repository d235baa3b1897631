// The result in plain words, then the caveats a reader must weigh before acting on it.
import type { ComparisonResult } from "@/lib/analysis/result";

export function SummaryPanel({ c }: { c: ComparisonResult }) {
  return (
    <section className="panel p-4 space-y-3 break-inside-avoid-page" aria-labelledby="summary-h" data-testid="plain-summary">
      <h2 id="summary-h" className="font-semibold">Result in plain words</h2>
      <div className="space-y-2 text-[0.95rem] leading-relaxed">
        {c.summary.map((s, i) => <p key={i}>{s}</p>)}
      </div>
      <h3 className="text-sm font-medium pt-1">Also note</h3>
      <ul className="list-disc pl-5 space-y-1 text-sm">
        {c.notes.map((s, i) => <li key={i}>{s}</li>)}
      </ul>
    </section>
  );
}
