import Link from "next/link";
import { notFound } from "next/navigation";
import { getInspectionForPhotos, listInspectionPhotos, placedSpecimens, referenceTime } from "@/db/queries/photos";
import { moveTargets, photoWorkCounts } from "@/db/queries/photo-edits";
import { loadPhotoEvidence } from "@/db/queries/photo-evidence";
import { PhotoEvidenceForm } from "@/components/photos/photo-evidence-form";
import { ProtocolFlag, ScaleNote } from "@/components/photos/photo-evidence-note";
import { describeDeletion } from "@/lib/photos/photo-edits";
import { PhotoActions } from "@/components/photos/photo-actions";
import { PhotoNotices } from "@/components/photos/photo-notices";
import { trialPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatDateTime } from "@/lib/format";
import { readPhotoConfig } from "@/lib/photos/config";
import { photoInListForViewer } from "@/lib/trials/access";
import { EmptyState } from "@/components/ui/empty-state";
import { PhotoCard } from "@/components/photos/photo-card";
import { PhotoUploader } from "@/components/photos/photo-uploader";
import { ProtocolChecklist } from "@/components/photos/protocol-checklist";
import { ProtocolTicksProvider } from "@/components/photos/protocol-ticks";
import { RefreshWhilePending } from "@/components/photos/refresh-while-pending";
import { isUuid } from "@/lib/ids";

export const metadata = { title: "Inspection photos" };

export default async function InspectionPhotosPage({ params }: { params: Promise<{ trialId: string; inspectionId: string }> }) {
  const { trialId, inspectionId } = await params;
  const { ctx, access } = await trialPage("/trials/[trialId]/inspections/[inspectionId]/photos", trialId);
  const target = isUuid(inspectionId) ? await getInspectionForPhotos({ labId: ctx.labId, inspectionId, trialId }) : null;
  if (!target) notFound();
  const { inspection, trial } = target;
  const ref = referenceTime(inspection);
  const cfg = readPhotoConfig();
  const [specimens, recorded] = await Promise.all([
    placedSpecimens({ labId: ctx.labId, trialId: trial.id, at: ref.at }),
    listInspectionPhotos({ labId: ctx.labId, inspectionId: inspection.id, role: ctx.role, reference: ref }).then((rows) => rows.map((p) => photoInListForViewer(p, access))),
  ]);
  const mayUpload = can(ctx.role, "photos.upload");
  const locked = access.locked;
  const mayEdit = mayUpload && !locked;
  const [targets, work] = mayEdit
    ? await Promise.all([moveTargets({ labId: ctx.labId, trialId: trial.id }), photoWorkCounts({ labId: ctx.labId, photoIds: recorded.map((p) => p.id) })])
    : [null, null];
  const evidence = await loadPhotoEvidence({ labId: ctx.labId, trialId: trial.id, protocol: trial.photoProtocol, photoRows: recorded });
  const withPhoto = new Set(recorded.map((p) => p.specimenId));
  const missing = specimens.filter((s) => !withPhoto.has(s.id));
  const base = `/trials/${trial.id}`;

  return (
    <div className="space-y-6">
      <nav aria-label="Breadcrumb" className="text-sm muted">
        <Link className="link" href={base}>{trial.title}</Link> › <Link className="link" href={`${base}/schedule`}>Schedule</Link> › <Link className="link" href={`${base}/inspections/${inspection.id}`}>Inspection day {inspection.dayNumber}</Link> › <span aria-current="page">Photos</span>
      </nav>
      <header className="space-y-1">
        <h1 className="text-2xl font-semibold">Photos · day {inspection.dayNumber}</h1>
        <p className="text-sm muted">
          Planned {formatDateTime(inspection.plannedAt)}{inspection.doneAt ? ` · done ${formatDateTime(inspection.doneAt)}` : " · not yet recorded as done"}.
          Capture times are checked against the {ref.kind} time, ±{cfg.toleranceH} h.
        </p>
        <p className="text-sm"><Link className="link" href={`${base}/grid?inspection=${inspection.id}`}>All specimens at this inspection, side by side</Link></p>
      </header>

      <ProtocolTicksProvider steps={trial.photoProtocol}>
      <div className="grid gap-6 lg:grid-cols-[1fr_20rem]">
        <div className="space-y-4">
          {locked ? (
            <p className="panel p-4 text-sm" role="note">This trial is concluded and its record is locked; no photos can be added.</p>
          ) : mayUpload ? (
            <PhotoUploader inspectionId={inspection.id} specimens={specimens.map((s) => ({ id: s.id, label: s.label }))} maxBytes={cfg.maxBytes} toleranceH={cfg.toleranceH} />
          ) : (
            <p className="panel p-4 text-sm" role="note">Your role can look at photos but not upload them.</p>
          )}
        </div>
        <aside className="panel p-4 space-y-3 h-fit">
          {trial.photoProtocol.length ? <ProtocolChecklist steps={trial.photoProtocol} /> : (
            <EmptyState text="This trial has no photo protocol yet. A researcher can add one to the trial design; common practice is the same camera, lens, distance and diffuse light every time, with a scale bar and a colour card in frame." />
          )}
        </aside>
      </div>
      </ProtocolTicksProvider>

      <section className="space-y-3" aria-labelledby="recorded-h">
        <div className="flex flex-wrap items-baseline gap-3">
          <h2 id="recorded-h" className="font-semibold">Recorded for this inspection ({recorded.length})</h2>
          {specimens.length > 0 && <p className="text-sm muted">{specimens.length - missing.length} of {specimens.length} specimens have a photo{missing.length ? `; still missing: ${missing.slice(0, 12).map((s) => s.label).join(", ")}${missing.length > 12 ? "…" : ""}` : ""}.</p>}
        </div>
        <RefreshWhilePending pending={recorded.filter((p) => p.status === "pending").length} />
        <PhotoNotices>
        {recorded.length === 0 ? (
          <EmptyState text={mayUpload && !locked ? "No photos yet. Choose or drop the photos of this inspection above." : "No photos have been uploaded for this inspection."} />
        ) : (
          <ul className="grid gap-3 grid-cols-[repeat(auto-fill,minmax(14rem,1fr))]">
            {recorded.map((p) => (
              <li key={p.id}>
                <PhotoCard photo={p} alt={`${p.specimenLabel}, day ${inspection.dayNumber}`}
                  title={p.specimenLabel}>
                  <ProtocolFlag evidence={evidence.get(p.id)} />
                  <ScaleNote evidence={evidence.get(p.id)} />
                  {mayEdit && (
                    <details className="text-sm">
                      <summary className="cursor-pointer text-xs underline underline-offset-2">Protocol and scale</summary>
                      <div className="pt-2">
                        <PhotoEvidenceForm photoId={p.id} name={access.blind ? `the photo of ${p.specimenLabel}` : `${p.specimenLabel} (${p.filename})`}
                          protocol={trial.photoProtocol} confirmed={evidence.get(p.id)?.confirmed ?? []} hasOwnScale={evidence.get(p.id)?.ownPxPerMm != null}
                          picker={p.displayUrl && p.width && p.height ? { src: p.displayUrl, width: p.width, height: p.height } : null} />
                      </div>
                    </details>
                  )}
                  {targets && work && (
                    <PhotoActions
                      photo={{ id: p.id, specimenId: p.specimenId, inspectionId: p.inspectionId, ackNote: p.checkAck?.note ?? null,
                        // A blind scorer sees that a warning was acknowledged but not the note, so cannot edit it.
                        warn: (p.check?.status === "far" || p.check?.status === "no-time") && !(access.blind && p.checkAck) }}
                      name={access.blind ? `the photo of ${p.specimenLabel}` : `${p.specimenLabel} (${p.filename})`}
                      targets={targets}
                      deletionImpact={describeDeletion({ ...(work.get(p.id) ?? { scores: 0, marks: 0 }), specimenLabel: p.specimenLabel, dayNumber: inspection.dayNumber })} />
                  )}
                </PhotoCard>
                <Link className="link text-xs" href={`/specimens/${p.specimenId}/timeline`}>Timeline of {p.specimenLabel}</Link>
              </li>
            ))}
          </ul>
        )}
        </PhotoNotices>
      </section>
    </div>
  );
}
