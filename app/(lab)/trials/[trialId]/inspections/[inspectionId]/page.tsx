import Link from "next/link";
import { notFound } from "next/navigation";
import { getInspection, listSpecimensAt } from "@/db/queries/inspections";
import { trialPage } from "@/lib/auth/page";
import { hideArms } from "@/lib/trials/access";
import { can } from "@/lib/auth/permissions";
import { formatDate, formatDateTime } from "@/lib/format";
import { MATERIAL_CLASS_LABELS, type MaterialClass } from "@/lib/validation/specimens";
import { RecordInspectionForm, RescheduleForm } from "@/components/trials/inspection-forms";
import { InspectionStatusTag } from "@/components/trials/inspection-status";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Inspection" };

export default async function InspectionPage({ params }: { params: Promise<{ trialId: string; inspectionId: string }> }) {
  const { trialId, inspectionId } = await params;
  const { ctx, trial, access } = await trialPage("/trials/[trialId]/inspections/[inspectionId]", trialId);
  const insp = await getInspection({ labId: ctx.labId, inspectionId });
  if (!insp || insp.trialId !== trial.id) notFound();
  const at = insp.doneAt ?? insp.plannedAt;
  const blind = access.blind;
  const shown = hideArms(await listSpecimensAt({ labId: ctx.labId, trialId, at }), blind);
  const base = `/trials/${trial.id}/inspections/${insp.id}`;
  const running = trial.status === "running";

  return (
    <div className="space-y-6">
      <nav aria-label="Breadcrumb" className="text-sm muted">
        <Link className="link" href={`/trials/${trial.id}`}>{trial.title}</Link> › <Link className="link" href={`/trials/${trial.id}/schedule`}>Schedule</Link> ›{" "}
        <span aria-current="page">Inspection day {insp.dayNumber} (planned {formatDate(insp.plannedAt)})</span>
      </nav>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold mr-auto">Inspection day {insp.dayNumber}</h1>
        <Link className="btn" href={`${base}/photos`}>Photos for this inspection</Link>
      </div>
      <dl className="panel p-4 grid gap-4 md:grid-cols-4">
        <div><dt className="text-xs muted">Planned</dt><dd>{formatDateTime(insp.plannedAt)}</dd></div>
        <div><dt className="text-xs muted">Status</dt><dd><InspectionStatusTag status={insp.status} /></dd></div>
        <div><dt className="text-xs muted">Done</dt><dd>{insp.doneAt ? `${formatDateTime(insp.doneAt)}${insp.doneBy ? ` by ${insp.doneBy}` : ""}` : "not yet"}</dd></div>
        <div><dt className="text-xs muted">Rescheduled</dt><dd>{insp.rescheduleReason ?? "—"}</dd></div>
        {insp.notes && <div className="md:col-span-4"><dt className="text-xs muted">Notes</dt><dd className="whitespace-pre-wrap">{insp.notes}</dd></div>}
      </dl>

      {trial.photoProtocol.length > 0 && (
        <details className="panel p-4"><summary className="cursor-pointer font-semibold">Photo protocol ({trial.photoProtocol.length} points)</summary>
          <ol className="list-decimal pl-5 text-sm space-y-1 pt-2">{trial.photoProtocol.map((l, i) => <li key={i}>{l}</li>)}</ol>
        </details>
      )}

      <section className="space-y-2" aria-labelledby="spec-h">
        <h2 id="spec-h" className="text-lg font-semibold">Specimens in the trial at {insp.doneAt ? "the inspection" : "the planned time"} ({shown.length})</h2>
        {blind && <p className="text-sm muted">You score this trial blind: chambers and treatments are hidden.</p>}
        {shown.length === 0 ? <EmptyState text="No specimen was placed in this trial at that time." /> : (
          <div className="panel overflow-x-auto">
            <table className="data">
              <caption className="sr-only">Specimens at this inspection</caption>
              <thead><tr><th scope="col">Specimen</th><th scope="col">Material</th><th scope="col">Face</th>{!blind && <><th scope="col">Chamber</th><th scope="col">Treatment</th></>}<th scope="col">Photos</th><th scope="col">Score</th></tr></thead>
              <tbody>
                {shown.map((s) => (
                  <tr key={s.specimenId}>
                    <td><Link className="link" href={`/specimens/${s.specimenId}`}>{s.label}</Link></td>
                    <td>{MATERIAL_CLASS_LABELS[s.materialClass as MaterialClass]}</td>
                    <td>{s.face}</td>
                    {!blind && <><td>{s.chamberName}</td><td>{s.treatmentName}</td></>}
                    <td><Link className="link" href={`${base}/photos?specimen=${s.specimenId}`}>Photos</Link></td>
                    <td><Link className="link" href={`${base}/score/${s.specimenId}`}>Score</Link></td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>

      {running && !insp.doneAt && (
        <div className="grid gap-6 md:grid-cols-2">
          {can(ctx.role, "inspections.record") && <section className="panel p-4 space-y-3" aria-labelledby="rec-h"><h2 id="rec-h" className="font-semibold">Mark done</h2><RecordInspectionForm inspectionId={insp.id} /></section>}
          {can(ctx.role, "inspections.reschedule") && <section className="panel p-4 space-y-3" aria-labelledby="res-h"><h2 id="res-h" className="font-semibold">Reschedule</h2><RescheduleForm inspectionId={insp.id} plannedAt={insp.plannedAt.toISOString()} /></section>}
        </div>
      )}
      {access.locked && <p className="text-sm muted">The trial is concluded; this inspection can no longer change.</p>}
    </div>
  );
}
