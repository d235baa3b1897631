import Link from "next/link";
import { notFound } from "next/navigation";
import { getTreatment, listTreatmentTrials } from "@/db/queries/treatments";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { TREATMENT_KIND_LABELS } from "@/lib/validation/treatments";
import { TreatmentForm } from "@/components/treatments/treatment-form";

export const metadata = { title: "Treatment" };

export default async function TreatmentPage({ params }: { params: Promise<{ treatmentId: string }> }) {
  const { treatmentId } = await params;
  const ctx = await labPage("/treatments/[treatmentId]");
  const t = await getTreatment({ labId: ctx.labId, treatmentId });
  if (!t) notFound();
  const trials = await listTreatmentTrials({ labId: ctx.labId, treatmentId });
  const write = can(ctx.role, "treatments.write");
  return (
    <div className="space-y-4">
      <p className="text-sm"><Link className="link" href="/treatments">Treatments</Link> /</p>
      <h1 className="text-2xl font-semibold">{t.name}</h1>
      <p className="text-sm muted">{TREATMENT_KIND_LABELS[t.kind]}</p>
      {trials.length > 0 && (
        <p className="text-sm">
          Used in {trials.map((x, i) => <span key={x.id}>{i > 0 && ", "}<Link className="link" href={`/trials/${x.id}`}>{x.title}</Link> ({x.status})</span>)}.
          {write && " Edits change the protocol text shown for those trials too; the audit trail keeps the earlier text."}
        </p>
      )}
      {write ? <TreatmentForm treatment={t} /> : (
        <dl className="panel p-4 space-y-3 max-w-3xl">
          <div><dt className="text-xs muted">Description</dt><dd className="whitespace-pre-wrap">{t.description || "—"}</dd></div>
          <div><dt className="text-xs muted">Protocol</dt><dd className="whitespace-pre-wrap">{t.protocol || "—"}</dd></div>
        </dl>
      )}
    </div>
  );
}
