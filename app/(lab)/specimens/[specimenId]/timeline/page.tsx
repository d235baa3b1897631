import Link from "next/link";
import { notFound } from "next/navigation";
import { getSpecimenTimeline, representativePhoto, type TimelineTrial } from "@/db/queries/photo-timeline";
import { labPage } from "@/lib/auth/page";
import { formatDate, formatDateTime } from "@/lib/format";
import { EmptyState } from "@/components/ui/empty-state";
import { PhotoCard } from "@/components/photos/photo-card";
import { PhotoCompare, type CompareEntry } from "@/components/photos/photo-compare";
import { RefreshWhilePending } from "@/components/photos/refresh-while-pending";
import { ScoreSummary, scoreText } from "@/components/photos/score-summary";
import { AlignedSeries, type SeriesItem } from "@/components/photos/aligned-series";
import { loadAlignedSeries } from "@/db/queries/photo-align";
import { can } from "@/lib/auth/permissions";

export const metadata = { title: "Specimen photo timeline" };

function compareEntries(t: TimelineTrial, label: string): CompareEntry[] {
  return t.entries.flatMap((e) => {
    const p = representativePhoto(e.photos, e.score);
    if (!p?.displayUrl) return [];
    const when = `Day ${e.inspection.dayNumber} · ${formatDate(e.inspection.doneAt ?? e.inspection.plannedAt)}`;
    return [{ key: e.inspection.id, label: when, alt: `${label}, ${when}`, src: p.displayUrl, score: scoreText(e.score, t.blind), aspect: p.width && p.height ? p.width / p.height : 4 / 3 }];
  });
}

/** The aligned series of one trial: the first photo, then each inspection's representative photo. */
async function alignedItems(labId: string, specimenId: string, t: TimelineTrial) {
  const shown = t.entries.flatMap((e) => {
    const p = representativePhoto(e.photos, e.score);
    return p && p.status === "ready" ? [{ id: p.id, inspectionId: p.inspectionId }] : [];
  });
  // A blind scorer sees no scores of record, so no marks and no "new since" either.
  const series = await loadAlignedSeries({ labId, trialId: t.id, specimenId, photos: shown, withMarks: !t.blind });
  const byId = new Map(t.entries.flatMap((e) => e.photos.map((p) => [p.id, { p, e }] as const)));
  const items: SeriesItem[] = series.entries.flatMap((entry) => {
    const found = byId.get(entry.photoId);
    if (!found) return [];
    const day = `Day ${found.e.inspection.dayNumber}`;
    return [{ entry, dayLabel: day, alt: day, src: found.p.displayUrl, width: found.p.width, height: found.p.height }];
  });
  return { reference: series.reference, items };
}

export default async function SpecimenTimelinePage({ params }: { params: Promise<{ specimenId: string }> }) {
  const { specimenId } = await params;
  const ctx = await labPage("/specimens/[specimenId]/timeline");
  const data = await getSpecimenTimeline({ labId: ctx.labId, specimenId, userId: ctx.userId, role: ctx.role });
  if (!data) notFound();
  const { specimen } = data;
  const aligned = await Promise.all(data.trials.map((t) => alignedItems(ctx.labId, specimen.id, t)));
  const pending = data.trials.flatMap((t) => t.entries.flatMap((e) => e.photos)).filter((p) => p.status === "pending").length;

  return (
    <div className="space-y-6">
      <nav aria-label="Breadcrumb" className="text-sm muted">
        <Link className="link" href="/specimens">Specimens</Link> › <Link className="link" href={`/specimens/${specimen.id}`}>{specimen.label}</Link> › Timeline
      </nav>
      <header className="space-y-1">
        <h1 className="text-2xl font-semibold">{specimen.label} · photo timeline</h1>
        <p className="text-sm muted">{specimen.materialClass.replace(/-/g, " ")}{specimen.findName ? ` · ${specimen.findName}` : ""}{specimen.face ? ` · ${specimen.face}` : ""}</p>
      </header>
      <RefreshWhilePending pending={pending} />
      {data.trials.length === 0 && <EmptyState text="This specimen has not been placed in a trial, so it has no inspections or photos yet. Allocate it in a trial first." action={{ href: "/trials", label: "Go to trials" }} />}
      {data.trials.map((t, ti) => (
        <section key={t.id} className="space-y-4" aria-labelledby={`trial-${t.id}`}>
          <div className="space-y-1">
            <h2 id={`trial-${t.id}`} className="text-lg font-semibold"><Link className="link" href={`/trials/${t.id}`}>{t.title}</Link></h2>
            <p className="text-sm muted">
              {t.blind ? "You score this trial blind: the treatment and the scores of record are hidden here." : t.armLabel ? `Arm: ${t.armLabel}` : ""}
              {" "}<Link className="link" href={`/trials/${t.id}/grid`}>All specimens side by side</Link>
            </p>
          </div>
          <div className="panel p-4 space-y-2">
            <h3 className="font-semibold">Compare two dates</h3>
            <PhotoCompare entries={compareEntries(t, specimen.label)} title={`${specimen.label} in ${t.title}`} />
          </div>
          <div className="panel p-4 space-y-2">
            <h3 className="font-semibold">Aligned series</h3>
            <p className="text-sm muted">Each photo lined up with the first one from two or three control points{t.blind ? "" : "; red shows rust marked on the photo of record that was not marked at the previous inspection"}.</p>
            <AlignedSeries items={aligned[ti].items.map((i) => ({ ...i, alt: `${specimen.label}, ${i.dayLabel}` }))} reference={aligned[ti].reference}
              canAlign={can(ctx.role, "photos.upload")} alignHref={(photoId) => `/trials/${t.id}/align/${photoId}`} />
          </div>
          {t.entries.length === 0 ? (
            <EmptyState text="No inspection of this trial has been done yet; photos appear here as they are uploaded." />
          ) : (
            <ol className="space-y-3" aria-label={`Inspections of ${specimen.label} in ${t.title}`}>
              {t.entries.map((e) => (
                <li key={e.inspection.id} className="panel p-3 grid gap-3 md:grid-cols-[12rem_1fr]" data-inspection-day={e.inspection.dayNumber}>
                  <div className="space-y-1">
                    <h3 className="font-medium">Day {e.inspection.dayNumber}</h3>
                    <p className="text-xs muted">{e.inspection.doneAt ? `Done ${formatDateTime(e.inspection.doneAt)}` : `Planned ${formatDateTime(e.inspection.plannedAt)}`}</p>
                    <ScoreSummary score={e.score} hidden={t.blind} />
                    <Link className="link text-xs" href={`/trials/${t.id}/inspections/${e.inspection.id}/photos`}>Inspection photos</Link>
                  </div>
                  {e.photos.length === 0 ? (
                    <p className="text-sm muted self-center">No photo of {specimen.label} at this inspection.</p>
                  ) : (
                    <ul className="grid gap-2 grid-cols-[repeat(auto-fill,minmax(12rem,1fr))]">
                      {e.photos.map((p) => (
                        <li key={p.id}><PhotoCard photo={p} title={`Day ${e.inspection.dayNumber}`} alt={`${specimen.label}, day ${e.inspection.dayNumber}`} /></li>
                      ))}
                    </ul>
                  )}
                </li>
              ))}
            </ol>
          )}
          {t.upcoming > 0 && <p className="text-sm muted">{t.upcoming} more inspection{t.upcoming === 1 ? " is" : "s are"} planned.</p>}
        </section>
      ))}
    </div>
  );
}
