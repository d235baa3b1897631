import Link from "next/link";
import { labPage } from "@/lib/auth/page";
import { TreatmentForm } from "@/components/treatments/treatment-form";

export const metadata = { title: "Add treatment" };

export default async function NewTreatmentPage() {
  await labPage("/treatments/new");
  return (
    <div className="space-y-4">
      <p className="text-sm"><Link className="link" href="/treatments">Treatments</Link> /</p>
      <h1 className="text-2xl font-semibold">Add a treatment</h1>
      <TreatmentForm />
    </div>
  );
}
