import Link from "next/link";
import { redirect } from "next/navigation";
import { getLabContext } from "@/lib/auth/context";
import { SpecimenForm } from "@/components/specimens/specimen-form";

export const metadata = { title: "Add specimen" };

export default async function NewSpecimenPage() {
  const ctx = await getLabContext("specimens.write");
  if (!ctx) redirect("/specimens");
  return (
    <div className="space-y-4">
      <p className="text-sm"><Link className="link" href="/specimens">Specimens</Link> /</p>
      <h1 className="text-2xl font-semibold">Add a specimen</h1>
      <SpecimenForm />
    </div>
  );
}
