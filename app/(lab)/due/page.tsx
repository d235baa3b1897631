import { labPage } from "@/lib/auth/page";
import { DueList } from "@/components/due/due-list";

export const metadata = { title: "Due inspections" };

export default async function DuePage() {
  const ctx = await labPage("/due");
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Due inspections</h1>
      <p className="text-sm muted max-w-3xl">Inspections across the running trials of {ctx.labName}: overdue first, then due, then upcoming in the coming week. Open one to record it, upload its photos and score them.</p>
      <DueList />
    </div>
  );
}
