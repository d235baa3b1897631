import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { colourPatchForPage } from "@/db/queries/photo-colour";
import { getScorePage, nextUnscoredPhoto } from "@/db/queries/scores-read";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatDateTime } from "@/lib/format";
import { ConsensusForm } from "@/components/scoring/consensus-form";
import { ScoreWorkbenchFor } from "@/components/scoring/score-workbench";
import { EstimateNote, FirstRustNote, ScoreLine } from "@/components/scoring/score-summary";
import { EmptyState } from "@/components/ui/empty-state";
import { saveConsensusAction, saveScoreAction } from "@/app/_actions/scores";
import { orNotFound } from "@/lib/auth/not-found";
import { isUuid } from "@/lib/ids";
import { loadPhotoEvidence } from "@/db/queries/photo-evidence";
import { ProtocolFlag, ScaleNote } from "@/components/photos/photo-evidence-note";

export const metadata = { title: "Score a specimen" };

type Params = { trialId: string; inspectionId: string; specimenId: string };

export default async function ScorePage({ params, searchParams }: { params: Promise<Params>; searchParams: Promise<{ photo?: string }> }) {
  const ctx = await labPage("/trials/[trialId]/inspections/[inspectionId]/score/[specimenId]");
  const { trialId, inspectionId, specimenId } = await params;
  const { photo: photoParam } = await searchParams;
  if (![trialId, inspectionId, specimenId].every(isUuid)) notFound();
  const data = await getScorePage({ labId: ctx.labId, userId: ctx.userId, trialId, inspectionId, specimenId, photoId: photoParam && isUuid(photoParam) ? photoParam : undefined })
    .catch(orNotFound);
  // A blind scorer of this trial scores from the shuffled queue, where nothing names the specimen.
  if (data.access.blind) redirect(data.photo ? `/trials/${trialId}/scoring/${data.photo.id}` : `/trials/${trialId}/scoring`);

  const { trial, inspection, specimen, placement, mine, record, previous } = data;
  const concluded = data.access.locked;
  const canScore = can(ctx.role, "scores.write") && !concluded;
  const shown = canScore ? mine : record?.score ?? null;
  const base = `/trials/${trialId}/inspections/${inspectionId}/score`;
  const [initialPatch, next, evidence] = await Promise.all([
    data.photo ? colourPatchForPage({ labId: ctx.labId, photoId: data.photo.id, previous: canScore }) : null,
    canScore ? nextUnscoredPhoto({ labId: ctx.labId, userId: ctx.userId, trialId, inspectionId, specimenId }) : null,
    data.photo ? loadPhotoEvidence({ labId: ctx.labId, trialId, protocol: trial.photoProtocol, photoRows: [{ id: data.photo.id, specimenId }] }).then((m) => m.get(data.photo!.id)) : undefined,
  ]);
  const others = data.pairScores.filter((r) => r.score.scorerId !== null);
  const consensus = data.pairScores.find((r) => r.score.scorerId === null)?.score ?? null;

  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-sm muted flex flex-wrap gap-1">
        <Link className="link" href={`/trials/${trialId}`}>{trial.title}</Link> ›
        <Link className="link" href={`/trials/${trialId}/inspections/${inspectionId}`}>Inspection day {inspection.dayNumber}</Link> ›
        <Link className="link" href={base}>Scoring</Link> › <span>{specimen.label}</span>
      </nav>
      <div className="flex flex-wrap items-baseline gap-x-4 gap-y-1">
        <h1 className="text-2xl font-semibold">Score {specimen.label} · day {inspection.dayNumber}</h1>
        <p className="text-sm muted">{placement ? `${placement.treatment} · ${placement.chamber} · ` : ""}{specimen.materialClass.replace("-", " ")}
          {inspection.doneAt ? ` · inspected ${formatDateTime(inspection.doneAt)}` : ` · planned ${formatDateTime(inspection.plannedAt)}`}</p>
      </div>
      {data.firstRust && <FirstRustNote outcomes={data.firstRust} inspectionDone={!!inspection.doneAt} />}
      {concluded && <p role="note" className="rounded-md bg-iron-100 dark:bg-iron-800 px-3 py-2 text-sm">This trial is concluded: its scores are locked and shown read-only.</p>}

      {shown && (
        <section className="panel p-3 text-sm space-y-1" aria-labelledby="saved-h">
          <h2 id="saved-h" className="font-semibold">{canScore ? "Your saved score" : "Score of record"}</h2>
          <p data-testid="saved-score"><ScoreLine score={shown} /></p>
          <EstimateNote score={shown} />
          <p className="muted text-xs">
            Saved {formatDateTime(shown.updatedAt)}.{" "}
            {canScore && (record?.score.id === shown.id ? "This is the score of record." : record ? `The score of record is ${record.scorerName ?? "the consensus score"}'s.` : "")}
          </p>
        </section>
      )}

      {data.photos.length > 1 && (
        <nav aria-label="Photos of this specimen at this inspection" className="flex flex-wrap gap-2">
          {data.photos.map((p, i) => (
            <Link key={p.id} href={`${base}/${specimenId}?photo=${p.id}`} aria-current={p.id === data.photo?.id ? "true" : undefined}
              className={`btn-quiet text-sm ${p.id === data.photo?.id ? "!border-verdigris-600" : ""}`}>Photo {i + 1}: {p.filename}</Link>
          ))}
        </nav>
      )}
      {data.photo && trial.photoProtocol.length > 0 && <ProtocolFlag evidence={evidence} />}
      {data.photo && <ScaleNote evidence={evidence} />}
      {!data.photo && (
        <EmptyState text="No processed photo of this specimen for this inspection yet. Upload one on the inspection page to mark spots on it; you can still record a score by eye below."
          action={{ href: `/trials/${trialId}/inspections/${inspectionId}`, label: "Go to the inspection" }} />
      )}

      <ScoreWorkbenchFor
        action={saveScoreAction}
        hidden={{ trialId, inspectionId, specimenId }}
        photo={data.photo}
        initialFace={canScore ? data.myMarks.face : data.recordMarks.face}
        initialMarks={canScore ? data.myMarks.marks : data.recordMarks.marks}
        initialScore={shown}
        previous={canScore && previous ? { ...previous.score, dayNumber: previous.dayNumber } : null}
        ghost={canScore ? previous?.ghost ?? null : null}
        readOnly={!canScore}
        next={next ? { href: `${base}/${next.specimenId}?photo=${next.photoId}` } : null}
        canvasLabel={`Photo of ${specimen.label} at day ${inspection.dayNumber}`}
        initialPatch={initialPatch}
      />

      {trial.scoreRule === "consensus" && can(ctx.role, "scores.consensus") && (
        <section className="panel p-4 space-y-3" aria-labelledby="consensus-h">
          <h2 id="consensus-h" className="font-semibold">Consensus score</h2>
          <p className="text-sm muted">This trial takes the consensus score as the score of record. Until one is recorded, the primary scorer&apos;s score stands in.</p>
          {others.length === 0 ? <EmptyState text="No scorer has scored this specimen at this inspection yet." /> : (
            <table className="data">
              <thead><tr><th>Scorer</th><th>Blind</th><th>Score</th></tr></thead>
              <tbody>
                {others.map((r) => (
                  <tr key={r.score.id}><td>{r.scorerName ?? "—"}</td><td>{r.score.blind ? "yes" : "no"}</td><td><ScoreLine score={r.score} /></td></tr>
                ))}
              </tbody>
            </table>
          )}
          {!concluded && <ConsensusForm action={saveConsensusAction} ids={{ trialId, inspectionId, specimenId }} defaults={consensus ?? record?.score ?? null} />}
        </section>
      )}
    </div>
  );
}
