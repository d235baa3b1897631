"use client";
// Team and photo protocol while the trial runs (draft trials edit them in the design form).
import { useActionState } from "react";
import { updateProtocolAction, updateScorersAction, updateTechniciansAction } from "@/app/(lab)/trials/actions";
import { FormMessage, SubmitButton } from "@/components/ui/form";
import { ProtocolLines } from "./protocol-lines";
import { ScorerFields, TechnicianFields, type Person, type ScorerPick } from "./team-fields";

export function TechniciansForm({ trialId, people, initial }: { trialId: string; people: Person[]; initial: string[] }) {
  const [state, action] = useActionState(updateTechniciansAction, undefined);
  return (
    <form action={action} className="space-y-3">
      <input type="hidden" name="trialId" value={trialId} />
      <TechnicianFields people={people} initial={initial} error={state?.errors?.technicianIds} />
      <FormMessage state={state} />
      <SubmitButton>Save technicians</SubmitButton>
    </form>
  );
}

export function ScorersForm({ trialId, people, initial, scoreRule, primaryScorerId }: { trialId: string; people: Person[]; initial: ScorerPick[]; scoreRule: string; primaryScorerId: string | null }) {
  const [state, action] = useActionState(updateScorersAction, undefined);
  return (
    <form action={action} className="space-y-3">
      <input type="hidden" name="trialId" value={trialId} />
      <ScorerFields people={people} initial={initial} scoreRule={scoreRule} primaryScorerId={primaryScorerId} errors={state?.errors} />
      <FormMessage state={state} />
      <SubmitButton>Save scorers</SubmitButton>
    </form>
  );
}

export function ProtocolForm({ trialId, initial }: { trialId: string; initial: string[] }) {
  const [state, action] = useActionState(updateProtocolAction, undefined);
  return (
    <form action={action} className="space-y-3">
      <input type="hidden" name="trialId" value={trialId} />
      <ProtocolLines initial={initial} error={state?.errors?.photoProtocol} />
      <FormMessage state={state} />
      <SubmitButton>Save protocol</SubmitButton>
    </form>
  );
}
