import Link from "next/link";
import { analysisPage, type AnalysisPageProps } from "@/lib/auth/page";
import { formatDateTime } from "@/lib/format";
import { AreaSection } from "@/components/analysis/area-section";
import { ExportLinks, hrefFor } from "@/components/analysis/compare-controls";
import { FinalSection } from "@/components/analysis/final-section";
import { LeftOutScoresNote } from "@/components/analysis/left-out-scores";
import { MethodNotes } from "@/components/analysis/method-notes";
import { OutcomeTable } from "@/components/analysis/outcome-table";
import { PrintButton } from "@/components/analysis/print-button";
import { SummaryPanel } from "@/components/analysis/summary-panel";
import { SurvivalSection } from "@/components/analysis/survival-section";
import { TrialRules } from "@/components/analysis/trial-rules";
import { listStorageRules } from "@/db/queries/storage-rules";
import { loadScaledRecords } from "@/db/queries/photo-evidence";
import { ScaledAreaSection } from "@/components/analysis/scaled-area-section";
import { outcomeAreasMm2 } from "@/lib/scoring/scaled-areas";
import { loadTrialHistory } from "@/db/queries/specimen-history";
import { HISTORY_METHOD, HistoryTable } from "@/components/analysis/history-table";
import { EmptyState } from "@/components/ui/empty-state";
import { EXPOSURE_METHOD, ExposureExclusionNote, ExposureTable } from "@/components/analysis/exposure-section";
import { exposureKeep } from "@/lib/analysis/exposure-params";

export const metadata = { title: "Trial report" };

// A4 with room for a binding edge; the app's header and controls are left off the paper, and
// sections are kept whole where they fit.
const PRINT_CSS = `
@page { size: A4; margin: 14mm 12mm; }
@media print {
  body > div > header { display: none !important; }
  main { max-width: none !important; padding: 0 !important; }
  .report { font-size: 10.5pt; }
  .report .panel { border: 1px solid #ccc !important; break-inside: avoid; }
  .report table.data { font-size: 9pt; }
  .report details > summary { list-style: none; }
  a.link { color: inherit; text-decoration: none; }
}`;

export default async function ReportPage(props: AnalysisPageProps) {
  const { ctx, q, access, analysis, trial, c } = await analysisPage("/trials/[trialId]/report", props);
  const keep = analysis.exposure ? exposureKeep(analysis.exposure.query) : {};
  const generated = new Date();
  const [rules, scaled, history] = await Promise.all([
    listStorageRules({ labId: ctx.labId, userId: ctx.userId, trialId: trial.id }),
    loadScaledRecords({ labId: ctx.labId, trialId: trial.id, protocol: trial.photoProtocol }),
    loadTrialHistory({ labId: ctx.labId, trial }),
  ]);
  const areas = outcomeAreasMm2(analysis.outcomes, scaled.areaMm2);

  return (
    <article className="report space-y-5 max-w-4xl mx-auto">
      <style>{PRINT_CSS}</style>
      <div className="flex flex-wrap items-start gap-3 no-print">
        <Link className="link text-sm" href={hrefFor(`/trials/${trial.id}/compare`, q, {}, keep)}>Back to the comparison</Link>
        <div className="ml-auto"><PrintButton /></div>
      </div>
      <header className="space-y-1">
        <p className="text-xs muted">{ctx.labName} · trial report · generated {formatDateTime(generated)}</p>
        <h1 className="text-2xl font-semibold">{trial.title}</h1>
        <p>{trial.question}</p>
        {trial.hypothesis && <p className="text-sm muted">Hypothesis: {trial.hypothesis}</p>}
        <p className="text-sm muted">
          Status {trial.status}. {analysis.startAt ? `Day 0: ${formatDateTime(analysis.startAt)}.` : "Not started."}{" "}
          {analysis.doneInspections} inspections done; {analysis.recordScores} scores of record{analysis.leftOut.length > 0 ? `, ${analysis.recordScores - analysis.leftOut.reduce((s, r) => s + r.scores, 0)} of them at done inspections` : ""}. Grouped by {c?.groupByLabel.toLowerCase() ?? "treatment"}.
        </p>
        <p className="text-sm">
          {access.locked && trial.concludedAt
            ? `Scoring ended when the trial was concluded on ${formatDateTime(trial.concludedAt)}; the record was locked and unblinded for every scorer then.`
            : "The trial is still open: scores may change, and blind scorers do not see this report until it is concluded."}
        </p>
        <LeftOutScoresNote trialId={trial.id} leftOut={analysis.leftOut} recordScores={analysis.recordScores} />
        {analysis.exposure && <ExposureExclusionNote exposure={analysis.exposure} />}
      </header>

      {!c && analysis.exposure?.excluded.length ? (
        <EmptyState text="The re-analysis left out every scored specimen: raise the out-of-band share or clear it on the comparison page." />
      ) : !c ? (
        <EmptyState text="Nothing to report yet: this trial has no scores of record at done inspections." action={{ href: `/trials/${trial.id}`, label: "Open the trial" }} />
      ) : (
        <>
          <SummaryPanel c={c} />
          <SurvivalSection c={c} expand />
          <AreaSection c={c} />
          <FinalSection c={c} />
          <section className="panel p-4 space-y-2" aria-labelledby="specimens-h">
            <h2 id="specimens-h" className="font-semibold">Per-specimen outcomes</h2>
            <OutcomeTable outcomes={analysis.outcomes} areas={areas} />
          </section>
          <ScaledAreaSection outcomes={analysis.outcomes} areas={areas} records={scaled.records} protocol={trial.photoProtocol} />
          <section className="panel p-4 space-y-2" aria-labelledby="history-h">
            <h2 id="history-h" className="font-semibold">Specimen history</h2>
            <p className="text-sm muted">{HISTORY_METHOD}</p>
            <HistoryTable rows={history} />
          </section>
          <section className="panel p-4 space-y-2" aria-labelledby="rules-h">
            <h2 id="rules-h" className="font-semibold">Storage rules from this trial</h2>
            <TrialRules rules={rules} empty="No storage rule has been accepted from this trial." />
            <p className="text-xs muted no-print"><Link className="link" href={`/trials/${trial.id}/humidity`}>Humidity response and thresholds</Link></p>
          </section>
          {analysis.exposure && (
            <section className="panel p-4 space-y-2" aria-labelledby="exposure-h" data-testid="report-exposure">
              <h2 id="exposure-h" className="font-semibold">Chamber exposure</h2>
              <p className="text-sm muted">{EXPOSURE_METHOD}</p>
              <ExposureTable exposure={analysis.exposure} />
            </section>
          )}
          <MethodNotes />
          <ExportLinks trialId={trial.id} q={q} withReport={false} keep={keep} />
        </>
      )}
    </article>
  );
}
