import Link from "next/link";
import { listTreatments } from "@/db/queries/treatments";
import { listChamberChoices, listPeopleChoices } from "@/db/queries/trials";
import { labPage } from "@/lib/auth/page";
import { teamRights } from "@/lib/trials/team";
import { TrialForm } from "@/components/trials/trial-form";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Design a trial" };

export default async function NewTrialPage() {
  const ctx = await labPage("/trials/new");
  const [chambers, treatments, people] = await Promise.all([
    listChamberChoices({ labId: ctx.labId }), listTreatments({ labId: ctx.labId, pageSize: 500 }), listPeopleChoices({ labId: ctx.labId }),
  ]);
  return (
    <div className="space-y-4">
      <p className="text-sm"><Link className="link" href="/trials">Trials</Link> /</p>
      <h1 className="text-2xl font-semibold">Design a trial</h1>
      <p className="text-sm muted max-w-3xl">The trial starts as a draft. After saving, allocate specimens to the arms at random, check the table, then start it: placements and the inspection schedule are created at the start.</p>
      {chambers.length === 0 || treatments.rows.length === 0 ? (
        <EmptyState text={`A trial needs at least one chamber and one treatment. ${chambers.length === 0 ? "Set up a chamber first." : "Add a treatment (an untreated control counts) first."}`}
          action={chambers.length === 0 ? { href: "/chambers", label: "Go to chambers" } : { href: "/treatments/new", label: "Add a treatment" }} />
      ) : (
        <TrialForm chambers={chambers} treatments={treatments.rows} people={people} team={teamRights(ctx.role)} />
      )}
    </div>
  );
}
