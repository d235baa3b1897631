import Link from "next/link";
import { humidityLevelCount } from "@/lib/analysis/humidity-response";
import { MIN_HUMIDITY_LEVELS } from "@/lib/analysis/humidity-result";
import { analysisPage, type AnalysisPageProps } from "@/lib/auth/page";
import { formatDateTime } from "@/lib/format";
import { defaultOutcomeView, OUTCOME_LABELS } from "@/lib/analysis/params";
import { MOVED_SPECIMEN_NOTE } from "@/lib/analysis/sentences";
import { AreaSection } from "@/components/analysis/area-section";
import { CompareControls, ExportLinks } from "@/components/analysis/compare-controls";
import { FinalSection } from "@/components/analysis/final-section";
import { LeftOutScoresNote } from "@/components/analysis/left-out-scores";
import { OutcomeTable } from "@/components/analysis/outcome-table";
import { SummaryPanel } from "@/components/analysis/summary-panel";
import { SurvivalSection } from "@/components/analysis/survival-section";
import { EmptyState } from "@/components/ui/empty-state";
import { ExposureExclusionNote, ExposureSection } from "@/components/analysis/exposure-section";
import { exposureKeep } from "@/lib/analysis/exposure-params";

export const metadata = { title: "Compare outcomes" };

export default async function ComparePage(props: AnalysisPageProps) {
  const { q, analysis, trial, c, exposureErrors } = await analysisPage("/trials/[trialId]/compare", props);
  const keep = analysis.exposure ? exposureKeep(analysis.exposure.query) : {};
  const base = `/trials/${trial.id}/compare`;
  const levels = humidityLevelCount(analysis.outcomes.map((o) => o.chamberRhPercent));

  return (
    <div className="space-y-5">
      <div className="space-y-1">
        <h1 className="text-2xl font-semibold">Compare outcomes</h1>
        <p className="text-sm muted">
          {trial.question} {analysis.startAt ? `Day 0 is ${formatDateTime(analysis.startAt)}.` : ""} {analysis.doneInspections} inspections done,
          {" "}{analysis.recordScores} scores of record{analysis.leftOut.length > 0 ? `, ${analysis.recordScores - analysis.leftOut.reduce((s, r) => s + r.scores, 0)} of them at done inspections` : ""}.
        </p>
        <LeftOutScoresNote trialId={trial.id} leftOut={analysis.leftOut} recordScores={analysis.recordScores} />
        <p className="text-sm" data-testid="primary-outcome">
          This trial&apos;s primary outcome is {OUTCOME_LABELS[defaultOutcomeView(trial.primaryOutcome)].toLowerCase()}
          {q.outcome === defaultOutcomeView(trial.primaryOutcome) ? "; it is the view shown." : "; the comparison opens on it."}
        </p>
        <p className="text-sm muted" data-testid="moved-note">{MOVED_SPECIMEN_NOTE}</p>
      </div>

      {analysis.exposure && <ExposureExclusionNote exposure={analysis.exposure} />}
      {!c && analysis.exposure?.excluded.length ? (
        <EmptyState text="The re-analysis left out every scored specimen: raise the out-of-band share or clear it in the chamber exposure section below." />
      ) : !c ? (
        <EmptyState
          text="Nothing to compare yet: this trial has no scores of record at done inspections. Record an inspection and score its photos; the comparison appears here as soon as the first scores are saved."
          action={{ href: `/trials/${trial.id}`, label: "Open the trial" }}
        />
      ) : (
        <>
          {levels >= MIN_HUMIDITY_LEVELS && (
            <p className="text-sm panel p-3">
              This trial spans {levels} humidity levels: the <Link className="link" href={`/trials/${trial.id}/humidity`}>humidity response</Link> fits
              time to first rust against the humidity each jar measured and gives the storage threshold.
            </p>
          )}
          <CompareControls base={base} q={q} keep={keep} />
          <ExportLinks trialId={trial.id} q={q} keep={keep} />
          <SummaryPanel c={c} />
          {(q.outcome === "first-rust" || q.outcome === "weeping") && <SurvivalSection c={c} />}
          {q.outcome === "area" && <AreaSection c={c} />}
          {q.outcome === "final" && <FinalSection c={c} />}
          <details className="panel p-4">
            <summary className="font-semibold cursor-pointer">Per-specimen outcomes ({analysis.outcomes.length})</summary>
            <div className="mt-3"><OutcomeTable outcomes={analysis.outcomes} /></div>
          </details>
        </>
      )}
      {analysis.exposure && <ExposureSection base={base} q={q} exposure={analysis.exposure} errors={exposureErrors} />}
    </div>
  );
}
