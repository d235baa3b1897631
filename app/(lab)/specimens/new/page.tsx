import Link from "next/link";
import { labPage } from "@/lib/auth/page";
import { SpecimenForm } from "@/components/specimens/specimen-form";

export const metadata = { title: "Add specimen" };

export default async function NewSpecimenPage() {
  await labPage("/specimens/new");
  return (
    <div className="space-y-4">
      <p className="text-sm"><Link className="link" href="/specimens">Specimens</Link> /</p>
      <h1 className="text-2xl font-semibold">Add a specimen</h1>
      <SpecimenForm />
    </div>
  );
}
