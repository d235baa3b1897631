import Link from "next/link";
import { getAlignPage } from "@/db/queries/photo-align";
import { trialPage } from "@/lib/auth/page";
import { orNotFound } from "@/lib/auth/not-found";
import { describeAffine } from "@/lib/photos/align";
import { ControlPointEditor, PhotoWithPoints } from "@/components/photos/control-point-editor";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Align a photo" };

export default async function AlignPhotoPage({ params }: { params: Promise<{ trialId: string; photoId: string }> }) {
  const { trialId, photoId } = await params;
  const { ctx, trial, access } = await trialPage("/trials/[trialId]/align/[photoId]", trialId);
  const data = await getAlignPage({ labId: ctx.labId, trialId, photoId }).catch(orNotFound);
  const { photo, reference, specimen, state } = data;
  const isReference = state.status === "reference";
  const ready = photo.status === "ready" && photo.width && photo.height;
  const timeline = `/specimens/${specimen.id}/timeline`;

  return (
    <div className="space-y-5">
      <nav aria-label="Breadcrumb" className="text-sm muted">
        <Link className="link" href={`/trials/${trial.id}`}>{trial.title}</Link> › <Link className="link" href={timeline}>{specimen.label} timeline</Link> › Align day {data.dayNumber}
      </nav>
      <header className="space-y-1">
        <h1 className="text-2xl font-semibold">{specimen.label} · day {data.dayNumber} · control points</h1>
        <p className="text-sm muted">
          {isReference
            ? "This is the first photo of the specimen in this trial: every later photo is lined up with it."
            : `Lined up with the first photo${reference?.dayNumber != null ? ` (day ${reference.dayNumber})` : ""}.`}
          {state.status === "aligned" && (() => {
            const d = describeAffine(state.transform);
            return ` Current fit (${state.kind}): scale ${d.scale.toFixed(3)}, rotation ${d.rotationDeg.toFixed(1)}°, shift ${d.dx.toFixed(0)}, ${d.dy.toFixed(0)} px.`;
          })()}
          {(state.status === "not-aligned" || state.status === "stale") && ` ${state.reason}`}
        </p>
      </header>
      {access.locked && <p role="note" className="text-sm">This trial is concluded: its record, control points included, is locked.</p>}
      {!ready ? (
        <EmptyState text="This photo has not been processed yet, so its size is unknown. Place points once its preview shows on the timeline." />
      ) : !isReference && reference && reference.points.length === 0 ? (
        <EmptyState text="Place control points on the first photo of this specimen first; later photos are matched to them." action={{ href: `/trials/${trial.id}/align/${reference.id}`, label: "Place points on the first photo" }} />
      ) : (
        <div className="grid gap-4 lg:grid-cols-2">
          <section className="panel p-3 space-y-2" aria-labelledby="this-photo">
            <h2 id="this-photo" className="font-semibold">This photo (day {data.dayNumber})</h2>
            {access.locked ? (
              <PhotoWithPoints photo={{ ...photo, width: photo.width!, height: photo.height! }} points={data.points} label={`${specimen.label}, day ${data.dayNumber}, with its control points`} />
            ) : (
              <ControlPointEditor trialId={trial.id} photo={{ ...photo, width: photo.width!, height: photo.height! }} initial={data.points}
                needed={isReference ? null : reference?.points.length ?? null} label={`${specimen.label}, day ${data.dayNumber}`} />
            )}
          </section>
          {!isReference && reference?.width && reference.height && (
            <section className="panel p-3 space-y-2" aria-labelledby="first-photo">
              <h2 id="first-photo" className="font-semibold">First photo{reference.dayNumber != null ? ` (day ${reference.dayNumber})` : ""}</h2>
              <PhotoWithPoints photo={{ ...reference, width: reference.width, height: reference.height }} points={reference.points} label={`${specimen.label}, first photo, with its control points`} />
              <p className="text-xs muted">Find the same features here, in the same order.</p>
            </section>
          )}
        </div>
      )}
      <p><Link className="link text-sm" href={timeline}>Back to the timeline</Link></p>
    </div>
  );
}
