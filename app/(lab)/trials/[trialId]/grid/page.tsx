import Link from "next/link";
import { notFound } from "next/navigation";
import { getTrialGrid, representativePhoto, type GridCell } from "@/db/queries/photo-timeline";
import { loadPhotoEvidence, loadScaledRecords } from "@/db/queries/photo-evidence";
import { ProtocolFlag } from "@/components/photos/photo-evidence-note";
import { AreaMm2 } from "@/components/photos/area-mm2";
import { trialPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatDate } from "@/lib/format";
import { EmptyState } from "@/components/ui/empty-state";
import { PhotoThumb } from "@/components/photos/photo-card";
import { ScoreSummary } from "@/components/photos/score-summary";
import { TimeCheckNote } from "@/components/photos/time-check-note";

export const metadata = { title: "Trial photo grid" };

function groupCells(cells: GridCell[], byArm: boolean): [string, GridCell[]][] {
  if (!byArm) return [["All specimens", cells]];
  const groups = new Map<string, GridCell[]>();
  for (const c of cells) groups.set(c.armLabel ?? "No arm", [...(groups.get(c.armLabel ?? "No arm") ?? []), c]);
  return [...groups.entries()].sort(([x], [y]) => x.localeCompare(y));
}

export default async function TrialGridPage({ params, searchParams }: { params: Promise<{ trialId: string }>; searchParams: Promise<Record<string, string | undefined>> }) {
  const { trialId } = await params;
  const sp = await searchParams;
  const { ctx, access, trial: trialRow } = await trialPage("/trials/[trialId]/grid", trialId);
  const grid = await getTrialGrid({ labId: ctx.labId, trialId, inspectionId: sp.inspection, userId: ctx.userId, role: ctx.role });
  if (!grid) notFound();
  const { trial, inspection, cells } = grid;
  const protocol = trialRow.photoProtocol;
  const [evidence, scaled] = await Promise.all([
    loadPhotoEvidence({ labId: ctx.labId, trialId: trial.id, protocol, photoRows: cells.flatMap((c) => {
      // Only the photo each cell shows is flagged.
      const shown = representativePhoto(c.photos, c.score);
      return shown ? [{ id: shown.id, specimenId: c.specimen.id }] : [];
    }) }),
    // mm² comes from the score of record, which a blind scorer does not see.
    grid.blind || !inspection ? null : loadScaledRecords({ labId: ctx.labId, trialId: trial.id, inspectionId: inspection.id, protocol }),
  ]);
  const scaledBy = new Map((scaled?.records ?? []).map((r) => [r.specimenId, r]));
  const idx = inspection ? grid.inspections.findIndex((i) => i.id === inspection.id) : -1;
  const prev = idx > 0 ? grid.inspections[idx - 1] : null;
  const next = idx >= 0 && idx < grid.inspections.length - 1 ? grid.inspections[idx + 1] : null;
  const mayUpload = can(ctx.role, "photos.upload") && !access.locked;
  const day = (i: { dayNumber: number; plannedAt: string; doneAt: string | null }) => `Day ${i.dayNumber} · ${formatDate(i.doneAt ?? i.plannedAt)}${i.doneAt ? "" : " (not done)"}`;

  return (
    <div className="space-y-5">
      <h1 className="text-2xl font-semibold">Photo grid{inspection ? ` · day ${inspection.dayNumber}` : ""}</h1>
      {!inspection ? <EmptyState text="This trial has no inspections yet. Plan the inspection schedule first." action={{ href: `/trials/${trial.id}`, label: "Open the trial" }} /> : (
        <>
          <div className="flex flex-wrap items-end gap-3">
            <form method="get" className="flex items-end gap-2">
              <div>
                <label htmlFor="grid-inspection" className="block text-sm font-medium">Inspection</label>
                <select id="grid-inspection" name="inspection" defaultValue={inspection.id} className="field">
                  {grid.inspections.map((i) => <option key={i.id} value={i.id}>{day(i)}</option>)}
                </select>
              </div>
              <button className="btn-quiet">Show</button>
            </form>
            {prev && <Link className="btn-quiet" href={`?inspection=${prev.id}`} aria-label={`Previous inspection: ${day(prev)}`}>← Day {prev.dayNumber}</Link>}
            {next && <Link className="btn-quiet" href={`?inspection=${next.id}`} aria-label={`Next inspection: ${day(next)}`}>Day {next.dayNumber} →</Link>}
            <Link className="link text-sm" href={`/trials/${trial.id}/inspections/${inspection.id}/photos`}>{mayUpload ? "Upload photos for this inspection" : "This inspection's photos"}</Link>
          </div>
          {grid.blind && <p className="text-sm muted">You score this trial blind: specimens are listed by label, without treatments or scores of record.</p>}
          {cells.length === 0 ? <EmptyState text="No specimens were placed in this trial at this inspection." /> : groupCells(cells, !grid.blind).map(([group, list]) => (
            <section key={group} aria-labelledby={`g-${group}`} className="space-y-2">
              <h2 id={`g-${group}`} className="font-semibold">{group} <span className="text-sm muted font-normal">({list.length})</span></h2>
              <ul className="grid gap-3 grid-cols-[repeat(auto-fill,minmax(11rem,1fr))]">
                {list.map((c) => {
                  const photo = representativePhoto(c.photos, c.score);
                  return (
                    <li key={c.specimen.id} className="panel p-2 space-y-1" data-specimen={c.specimen.label}>
                      <Link href={`/specimens/${c.specimen.id}/timeline`} className="block" aria-label={`${c.specimen.label}: open its timeline`}>
                        {photo ? <PhotoThumb photo={photo} alt={`${c.specimen.label}, day ${inspection.dayNumber}`} /> : (
                          <div className="w-full aspect-[4/3] rounded border border-dashed border-[var(--line)] grid place-items-center text-xs muted">No photo</div>
                        )}
                      </Link>
                      <p className="text-sm font-medium">{c.specimen.label}{c.photos.length > 1 ? <span className="text-xs muted font-normal"> · {c.photos.length} photos</span> : null}</p>
                      <ScoreSummary score={c.score} hidden={grid.blind} />
                      {c.score && !grid.blind && <AreaMm2 record={scaledBy.get(c.specimen.id)} />}
                      {photo && protocol.length > 0 && <ProtocolFlag evidence={evidence.get(photo.id)} compact />}
                      {photo && <TimeCheckNote check={photo.check} ack={photo.checkAck} compact />}
                    </li>
                  );
                })}
              </ul>
            </section>
          ))}
        </>
      )}
    </div>
  );
}
