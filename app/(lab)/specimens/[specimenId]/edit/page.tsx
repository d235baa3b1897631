import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { getSpecimen } from "@/db/queries/specimens";
import { getLabContext } from "@/lib/auth/context";
import { SpecimenForm } from "@/components/specimens/specimen-form";

export const metadata = { title: "Edit specimen" };

export default async function EditSpecimenPage({ params }: { params: Promise<{ specimenId: string }> }) {
  const { specimenId } = await params;
  const ctx = await getLabContext("specimens.write");
  if (!ctx) redirect(`/specimens/${specimenId}`);
  const specimen = await getSpecimen({ labId: ctx.labId, specimenId });
  if (!specimen) notFound();
  return (
    <div className="space-y-4">
      <p className="text-sm"><Link className="link" href="/specimens">Specimens</Link> / <Link className="link" href={`/specimens/${specimen.id}`}>{specimen.label}</Link> /</p>
      <h1 className="text-2xl font-semibold">Edit {specimen.label}</h1>
      <SpecimenForm specimen={specimen} />
    </div>
  );
}
