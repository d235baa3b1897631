import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { listInspectionScoring } from "@/db/queries/scores-read";
import { trialPage } from "@/lib/auth/page";
import { EmptyState } from "@/components/ui/empty-state";
import { astmText } from "@/components/scoring/score-summary";
import { orNotFound } from "@/lib/auth/not-found";
import { isUuid } from "@/lib/ids";

export const metadata = { title: "Scoring at an inspection" };


export default async function InspectionScoringPage({ params }: { params: Promise<{ trialId: string; inspectionId: string }> }) {
  const { trialId, inspectionId } = await params;
  const { ctx, access } = await trialPage("/trials/[trialId]/inspections/[inspectionId]/score", trialId);
  if (!isUuid(inspectionId)) notFound();
  // Blind scorers must not see this list (it names specimens and arms); their way in is the shuffled queue.
  if (access.blind) redirect(`/trials/${trialId}/scoring`);
  const data = await listInspectionScoring({ labId: ctx.labId, userId: ctx.userId, trialId, inspectionId })
    .catch(orNotFound);
  const { inspection, rows } = data;
  const scored = rows.filter((r) => r.mine).length;
  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-sm muted flex flex-wrap gap-1">
        <Link className="link" href={`/trials/${trialId}/inspections/${inspectionId}`}>Inspection day {inspection.dayNumber}</Link> › <span>Scoring</span>
      </nav>
      <h1 className="text-2xl font-semibold">Scoring at day {inspection.dayNumber}</h1>
      <p className="text-sm muted">
        You have scored {scored} of {rows.length} specimens. Open a specimen to outline its face, mark spots and save the score.{" "}
        <Link className="link" href={`/trials/${trialId}/scoring`}>Your scoring queue</Link> ·{" "}
        <Link className="link" href={`/trials/${trialId}/agreement`}>Agreement between scorers</Link>
      </p>
      {rows.length === 0 ? (
        <EmptyState text="No specimen is placed in this trial yet. Allocate specimens on the trial page first." action={{ href: `/trials/${trialId}`, label: "Go to the trial" }} />
      ) : (
        <table className="data">
          <thead>
            <tr><th scope="col">Specimen</th><th scope="col">Treatment</th><th scope="col">Chamber</th><th scope="col">Photos</th><th scope="col">Your score</th><th scope="col">Score of record</th></tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.specimenId}>
                <td><Link className="link" href={`/trials/${trialId}/inspections/${inspectionId}/score/${r.specimenId}`}>{r.label}</Link></td>
                <td>{r.treatment}</td>
                <td>{r.chamber}</td>
                <td className="tabular-nums">{r.photos || <span className="muted">none yet</span>}</td>
                <td className="tabular-nums">{r.mine ? `${r.mine.areaPercent} % · ${astmText(r.mine)}` : <span className="muted">not scored</span>}</td>
                <td className="tabular-nums">{r.record ? `${r.record.areaPercent} % · ${astmText(r.record)}` : <span className="muted">—</span>}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
