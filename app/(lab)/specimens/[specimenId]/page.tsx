import Link from "next/link";
import { notFound } from "next/navigation";
import { getSpecimen, listSpecimenPlacements } from "@/db/queries/specimens";
import { blindTrialIds } from "@/db/queries/trial-access";
import { BLIND_HIDDEN, hideArmsOfTrials } from "@/lib/trials/access";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatDateTime, formatNumber } from "@/lib/format";
import { CHLORIDE_STATE_LABELS, MATERIAL_CLASS_LABELS } from "@/lib/validation/specimens";
import { listObjectStays } from "@/db/queries/object-locations";
import { EmptyState } from "@/components/ui/empty-state";
import { loadSpecimenHistory } from "@/db/queries/specimen-history";
import { latestToday } from "@/lib/specimens/history";
import { HistoryForm, type EditedEntry } from "@/components/specimens/history-form";
import { HistoryDeleteForm } from "@/components/specimens/history-delete-form";
import { SpecimenHistory } from "@/components/specimens/specimen-history";
import { HISTORY_KINDS, historyPermission, type HistoryKind } from "@/lib/validation/specimen-history";

export const metadata = { title: "Specimen" };

function Fact({ term, children }: { term: string; children: React.ReactNode }) {
  return (
    <div>
      <dt className="text-xs muted">{term}</dt>
      <dd className="whitespace-pre-wrap">{children || <span className="muted">—</span>}</dd>
    </div>
  );
}

type History = Awaited<ReturnType<typeof loadSpecimenHistory>>;

/** The entry named by ?entry=<kind>:<id>, among those the viewer sees, with its values as form text. */
function entryToCorrect(history: History, param: string | undefined): EditedEntry | null {
  const [kind, id] = (param ?? "").split(":");
  const w = kind === "mass" ? history.weighings.find((x) => x.id === id) : undefined;
  if (w) return { id: w.id, kind: "mass", values: { measuredOn: w.measuredOn, mass: w.massG, unit: "g", notes: w.notes } };
  const c = kind === "chloride" ? history.chlorideTests.find((x) => x.id === id) : undefined;
  if (c) return { id: c.id, kind: "chloride", values: { testedOn: c.testedOn, method: c.method, result: c.result, notes: c.notes } };
  const a = kind === "akaganeite" ? history.akaganeiteChecks.find((x) => x.id === id) : undefined;
  if (a) return { id: a.id, kind: "akaganeite", values: { checkedOn: a.checkedOn, method: a.method, seen: a.seen ? "yes" : "no", notes: a.notes } };
  const t = kind === "treatment" ? history.priorTreatments.find((x) => x.id === id) : undefined;
  if (t) return { id: t.id, kind: "treatment", values: { treatedOn: t.treatedOn, treatment: t.treatment, notes: t.notes } };
  return null;
}

export default async function SpecimenPage({ params, searchParams }: { params: Promise<{ specimenId: string }>; searchParams: Promise<Record<string, string | undefined>> }) {
  const [{ specimenId }, raw] = await Promise.all([params, searchParams]);
  const ctx = await labPage("/specimens/[specimenId]");
  const specimen = await getSpecimen({ labId: ctx.labId, specimenId });
  if (!specimen) notFound();
  const [rawPlacements, blindIn, storage] = await Promise.all([
    listSpecimenPlacements({ labId: ctx.labId, specimenId }), blindTrialIds({ labId: ctx.labId, userId: ctx.userId }), listObjectStays({ labId: ctx.labId, userId: ctx.userId, specimenId }),
  ]);
  const placements = hideArmsOfTrials(rawPlacements, blindIn);
  const history = await loadSpecimenHistory({ labId: ctx.labId, specimenId, blindTrialIds: blindIn });
  // Technicians record bench measurements; earlier treatments need specimens.write (historyPermission).
  const recordable = HISTORY_KINDS.filter((k) => can(ctx.role, historyPermission(k)));
  const mayFix = (kind: HistoryKind) => recordable.includes(kind);
  const asked = entryToCorrect(history, raw.entry);
  const correcting = asked && mayFix(asked.kind) ? asked : null;
  const today = new Date().toISOString().slice(0, 10);
  return (
    <div className="space-y-6">
      <p className="text-sm"><Link className="link" href="/specimens">Specimens</Link> /</p>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold mr-auto">{specimen.label}</h1>
        <Link className="btn-quiet" href={`/specimens/${specimen.id}/timeline`}>Photo timeline</Link>
        {can(ctx.role, "specimens.write") && <Link className="btn" href={`/specimens/${specimen.id}/edit`}>Edit</Link>}
      </div>
      <section className="panel p-4" aria-labelledby="facts-h">
        <h2 id="facts-h" className="sr-only">Details</h2>
        <dl className="grid gap-4 md:grid-cols-3">
          <Fact term="Material class">{MATERIAL_CLASS_LABELS[specimen.materialClass]}</Fact>
          <Fact term="Find name">{specimen.findName}</Fact>
          <Fact term="Face">{specimen.face}</Fact>
          <Fact term="Surface preparation">{specimen.surfacePrep}</Fact>
          <Fact term="Mass">{specimen.massG == null ? "" : formatNumber(specimen.massG, 2, "g")}</Fact>
          <Fact term="Added">{formatDateTime(specimen.createdAt)}</Fact>
        </dl>
        <dl className="grid gap-4 md:grid-cols-3 mt-4">
          <Fact term="Description">{specimen.description}</Fact>
          <Fact term="History">{specimen.history}</Fact>
          <Fact term="Provenance">{specimen.provenance}</Fact>
          <Fact term="Parent piece and slice">{[specimen.parentPiece, specimen.slice].filter(Boolean).join(", slice ")}</Fact>
          <Fact term="Contamination notes">{specimen.contaminationNotes}</Fact>
        </dl>
        <dl className="grid gap-4 md:grid-cols-4 mt-4">
          <Fact term="Accession number">{specimen.accessionNumber}</Fact>
          <Fact term="Chloride condition (register)">{CHLORIDE_STATE_LABELS[specimen.chlorideState]}</Fact>
          <Fact term="Treatments applied">{specimen.treatmentsApplied}</Fact>
          <Fact term="Storage notes">{specimen.storageNotes}</Fact>
        </dl>
      </section>
      <section className="space-y-2" aria-labelledby="storage-h">
        <h2 id="storage-h" className="text-lg font-semibold">Storage history</h2>
        {storage.hidden ? <p className="muted text-sm">{BLIND_HIDDEN}</p> : storage.stays.length === 0 ? (
          <EmptyState text="No storage place recorded yet." action={{ href: "/collection", label: "Go to the collection" }} />
        ) : (
          <ul className="text-sm space-y-1">
            {storage.stays.map((st) => (
              <li key={st.id}><Link className="link" href={`/chambers/${st.locationId}`}>{st.path}</Link> — {formatDateTime(st.fromAt)} to {st.toAt ? formatDateTime(st.toAt) : <span className="font-medium">now</span>}{st.reason ? ` (${st.reason})` : ""}</li>
            ))}
          </ul>
        )}
      </section>
      <section className="space-y-2" aria-labelledby="history-h">
        <h2 id="history-h" className="text-lg font-semibold">Specimen history</h2>
        <SpecimenHistory history={history} correctHref={recordable.length ? (kind, id) => (mayFix(kind) ? `/specimens/${specimen.id}?entry=${kind}:${id}#correct-h` : undefined) : undefined} />
        {correcting ? (
          <div className="panel p-4 space-y-4">
            <h3 id="correct-h" className="font-medium">Correct the entry</h3>
            <HistoryForm key={correcting.id} specimenId={specimen.id} today={today} maxDate={latestToday()} entry={correcting} />
            <h3 className="font-medium">Or delete it</h3>
            <HistoryDeleteForm specimenId={specimen.id} entry={correcting} />
            <p className="text-sm"><Link className="link" href={`/specimens/${specimen.id}`}>Cancel</Link></p>
          </div>
        ) : recordable.length > 0 && (
          <details className="panel p-4">
            <summary className="cursor-pointer font-medium">Record a weighing, test{mayFix("treatment") ? ", check or treatment" : " or check"}</summary>
            <div className="mt-3"><HistoryForm specimenId={specimen.id} today={today} maxDate={latestToday()} kinds={recordable} /></div>
          </details>
        )}
      </section>
      <section className="space-y-2" aria-labelledby="placements-h">
        <h2 id="placements-h" className="text-lg font-semibold">Placement history</h2>
        {placements.length === 0 ? (
          <EmptyState text="Not placed in any trial yet. It is placed when a trial it is allocated to starts." action={{ href: "/trials", label: "Go to trials" }} />
        ) : (
          <div className="panel overflow-x-auto">
            <table className="data">
              <caption className="sr-only">Where this specimen has been</caption>
              <thead><tr><th scope="col">Trial</th><th scope="col">Chamber</th><th scope="col">Treatment</th><th scope="col">From</th><th scope="col">To</th><th scope="col">Reason</th></tr></thead>
              <tbody>
                {placements.map((p) => (
                  <tr key={p.id}>
                    <td><Link className="link" href={`/trials/${p.trialId}`}>{p.trialTitle}</Link> <span className="text-xs muted">({p.trialStatus})</span></td>
                    {p.blinded ? (
                      <td colSpan={2} className="muted">{BLIND_HIDDEN}</td>
                    ) : (<><td>{p.chamberName}</td><td>{p.treatmentName}</td></>)}
                    <td className="whitespace-nowrap">{p.fromAt ? formatDateTime(p.fromAt) : "—"}</td>
                    <td className="whitespace-nowrap">{p.toAt ? formatDateTime(p.toAt) : <span className="font-medium">current</span>}</td>
                    <td>{p.reason}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
    </div>
  );
}
