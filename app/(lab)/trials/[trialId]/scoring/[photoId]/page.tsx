import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { colourPatchForPage } from "@/db/queries/photo-colour";
import { getLabPhoto } from "@/db/queries/scores-read";
import { getBlindPhoto } from "@/db/queries/scores-queue";
import { trialPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { ScoreWorkbenchFor } from "@/components/scoring/score-workbench";
import { EstimateNote, ScoreLine } from "@/components/scoring/score-summary";
import { saveScoreAction } from "@/app/_actions/scores";
import { orNotFound } from "@/lib/auth/not-found";
import { isUuid } from "@/lib/ids";

export const metadata = { title: "Blind scoring" };


import { loadPhotoEvidence } from "@/db/queries/photo-evidence";
import { ProtocolFlag, ScaleNote } from "@/components/photos/photo-evidence-note";

export default async function BlindScorePage({ params }: { params: Promise<{ trialId: string; photoId: string }> }) {
  const { trialId, photoId } = await params;
  const { ctx, trial, access } = await trialPage("/trials/[trialId]/scoring/[photoId]", trialId);
  if (!isUuid(photoId)) notFound();
  if (access.scorerRole !== "blind") {
    // An open scorer gets the labelled score page for the same photo.
    const photo = await getLabPhoto({ labId: ctx.labId, photoId }).catch(orNotFound);
    if (!photo.inspectionId) notFound();
    redirect(`/trials/${trialId}/inspections/${photo.inspectionId}/score/${photo.specimenId}?photo=${photo.id}`);
  }
  const view = await getBlindPhoto({ labId: ctx.labId, userId: ctx.userId, trialId, photoId }).catch(orNotFound);
  const canScore = can(ctx.role, "scores.write") && !access.locked;
  // This photo's own patch only: one carried over from an earlier photo would tie it to its specimen.
  // Protocol points are the trial's and the photo's own; the scale's value is not shown here, since a
  // series scale is shared by every photo of a specimen and would tie them together.
  const [initialPatch, evidence] = await Promise.all([
    colourPatchForPage({ labId: ctx.labId, photoId: view.photo.id, previous: false }),
    getLabPhoto({ labId: ctx.labId, photoId }).catch(orNotFound)
      .then((lab) => loadPhotoEvidence({ labId: ctx.labId, trialId: trial.id, protocol: trial.photoProtocol, photoRows: [{ id: photoId, specimenId: lab.specimenId }] }))
      .then((m) => m.get(photoId)),
  ]);

  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-sm muted flex flex-wrap gap-1">
        <Link className="link" href={`/trials/${trialId}/scoring`}>Scoring queue</Link> › <span>Photo {view.position} of {view.total}</span>
      </nav>
      <div className="flex flex-wrap items-baseline gap-4">
        <h1 className="text-2xl font-semibold">Blind scoring · photo {view.position} of {view.total}</h1>
        {view.nextPhotoId && <Link className="link text-sm" href={`/trials/${trialId}/scoring/${view.nextPhotoId}`}>Next photo to score</Link>}
      </div>
      <p className="text-sm muted">Specimen, treatment, chamber, day and earlier scores are hidden on purpose. Score only what the photo shows.</p>
      {access.locked && <p role="note" className="text-sm">This trial is concluded: scores are locked.</p>}
      {trial.photoProtocol.length > 0 && <ProtocolFlag evidence={evidence} />}
      <ScaleNote evidence={evidence} blind />
      {view.mine && (
        <section className="panel p-3 text-sm" aria-labelledby="saved-h">
          <h2 id="saved-h" className="font-semibold">Your saved score</h2>
          <p data-testid="saved-score"><ScoreLine score={view.mine} /></p>
          <EstimateNote score={view.mine} />
        </section>
      )}
      <ScoreWorkbenchFor
        action={saveScoreAction}
        hidden={{ trialId }}
        photo={view.photo}
        initialFace={view.myMarks.face}
        initialMarks={view.myMarks.marks}
        initialScore={view.mine}
        previous={null}
        ghost={null}
        readOnly={!canScore}
        next={view.nextPhotoId ? { href: `/trials/${trialId}/scoring/${view.nextPhotoId}` } : null}
        canvasLabel={`Photo ${view.position} of ${view.total}`}
        initialPatch={initialPatch}
      />
    </div>
  );
}
