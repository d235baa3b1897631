import Link from "next/link";
import { notFound } from "next/navigation";
import { getSpecimen } from "@/db/queries/specimens";
import { labPage } from "@/lib/auth/page";
import { SpecimenForm } from "@/components/specimens/specimen-form";

export const metadata = { title: "Edit specimen" };

export default async function EditSpecimenPage({ params }: { params: Promise<{ specimenId: string }> }) {
  const { specimenId } = await params;
  const ctx = await labPage("/specimens/[specimenId]/edit");
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
