import { redirect } from "next/navigation";
import { listTreatments } from "@/db/queries/treatments";
import { hasAllocation, listArms, listChamberChoices, listPeopleChoices, listTrialMembers } from "@/db/queries/trials";
import { trialPage } from "@/lib/auth/page";
import { teamRights } from "@/lib/trials/team";
import { TrialForm } from "@/components/trials/trial-form";

export const metadata = { title: "Edit trial design" };

export default async function EditTrialPage({ params }: { params: Promise<{ trialId: string }> }) {
  const { trialId } = await params;
  const { ctx, trial } = await trialPage("/trials/[trialId]/edit", trialId);
  if (trial.status !== "draft") redirect(`/trials/${trialId}`);
  const [chambers, treatments, people, arms, members, allocated] = await Promise.all([
    listChamberChoices({ labId: ctx.labId }), listTreatments({ labId: ctx.labId, pageSize: 500 }), listPeopleChoices({ labId: ctx.labId }),
    listArms({ labId: ctx.labId, trialId }), listTrialMembers({ labId: ctx.labId, trialId }), hasAllocation({ labId: ctx.labId, trialId }),
  ]);
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Edit the design</h1>
      <TrialForm chambers={chambers} treatments={treatments.rows} people={people} team={teamRights(ctx.role)} trial={{
        id: trial.id, title: trial.title, question: trial.question, hypothesis: trial.hypothesis, primaryOutcome: trial.primaryOutcome,
        replicatesPerArm: trial.replicatesPerArm, chamberIds: [...new Set(arms.map((a) => a.chamberId))], treatmentIds: [...new Set(arms.map((a) => a.treatmentId))],
        technicianIds: members.filter((m) => m.role === "technician").map((m) => m.userId),
        scorers: members.filter((m) => m.role === "scorer").map((m) => ({ userId: m.userId, blind: m.blind })),
        scoreRule: trial.scoreRule, primaryScorerId: trial.primaryScorerId, photoProtocol: trial.photoProtocol, plan: trial.schedulePlan, allocated,
      }} />
    </div>
  );
}
