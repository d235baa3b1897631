"use client";
// Team and photo protocol while the trial runs (draft trials edit them in the design form).
import { useActionState } from "react";
import { updateProtocolAction, updateScorersAction, updateTechniciansAction } from "@/app/_actions/trials";
import { FormMessage } from "@/components/ui/form";
import { PendingButton, useFormSubmit } from "./use-form-submit";
import { ProtocolLines } from "./protocol-lines";
import { ScorerFields, TechnicianFields, type Person, type ScorerPick } from "./team-fields";

export function TechniciansForm({ trialId, people, initial }: { trialId: string; people: Person[]; initial: string[] }) {
  const [state, dispatch, pending] = useActionState(updateTechniciansAction, undefined);
  const onSubmit = useFormSubmit(dispatch);
  return (
    <form onSubmit={onSubmit} className="space-y-3">
      <input type="hidden" name="trialId" value={trialId} />
      <TechnicianFields people={people} initial={initial} error={state?.errors?.technicianIds} />
      <FormMessage state={state} />
      <PendingButton pending={pending}>Save technicians</PendingButton>
    </form>
  );
}

export function ScorersForm({ trialId, people, initial, scoreRule, primaryScorerId }: { trialId: string; people: Person[]; initial: ScorerPick[]; scoreRule: string; primaryScorerId: string | null }) {
  const [state, dispatch, pending] = useActionState(updateScorersAction, undefined);
  const onSubmit = useFormSubmit(dispatch);
  return (
    <form onSubmit={onSubmit} className="space-y-3">
      <input type="hidden" name="trialId" value={trialId} />
      <ScorerFields people={people} initial={initial} scoreRule={scoreRule} primaryScorerId={primaryScorerId} errors={state?.errors} />
      <FormMessage state={state} />
      <PendingButton pending={pending}>Save scorers</PendingButton>
    </form>
  );
}

export function ProtocolForm({ trialId, initial }: { trialId: string; initial: string[] }) {
  const [state, dispatch, pending] = useActionState(updateProtocolAction, undefined);
  const onSubmit = useFormSubmit(dispatch);
  return (
    <form onSubmit={onSubmit} className="space-y-3">
      <input type="hidden" name="trialId" value={trialId} />
      <ProtocolLines initial={initial} error={state?.errors?.photoProtocol} />
      <FormMessage state={state} />
      <PendingButton pending={pending}>Save protocol</PendingButton>
    </form>
  );
}
