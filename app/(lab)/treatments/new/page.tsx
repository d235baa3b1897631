import Link from "next/link";
import { redirect } from "next/navigation";
import { getLabContext } from "@/lib/auth/context";
import { TreatmentForm } from "@/components/treatments/treatment-form";

export const metadata = { title: "Add treatment" };

export default async function NewTreatmentPage() {
  const ctx = await getLabContext("treatments.write");
  if (!ctx) redirect("/treatments");
  return (
    <div className="space-y-4">
      <p className="text-sm"><Link className="link" href="/treatments">Treatments</Link> /</p>
      <h1 className="text-2xl font-semibold">Add a treatment</h1>
      <TreatmentForm />
    </div>
  );
}
