"use client";
import { useActionState } from "react";
import { moveSpecimenAction } from "@/app/_actions/trials";
import { Field, FormMessage, SelectField, SubmitButton } from "@/components/ui/form";

export function MoveForm({ trialId, specimens, arms }: { trialId: string; specimens: { id: string; label: string; where: string }[]; arms: { id: string; label: string }[] }) {
  const [state, action] = useActionState(moveSpecimenAction, undefined);
  return (
    <form action={action} className="space-y-3 max-w-2xl" noValidate>
      <input type="hidden" name="trialId" value={trialId} />
      <div className="grid gap-3 md:grid-cols-2">
        <SelectField name="specimenId" label="Specimen" state={state} options={[{ value: "", label: "— choose —" }, ...specimens.map((s) => ({ value: s.id, label: `${s.label} · now ${s.where}` }))]} />
        <SelectField name="armId" label="Move to" state={state} options={[{ value: "", label: "Take out of the trial" }, ...arms.map((a) => ({ value: a.id, label: a.label }))]} />
      </div>
      <Field name="at" label="When (UTC, empty = now)" type="datetime-local" state={state} />
      <Field name="reason" label="Reason (goes into the audit trail)" state={state} hint="e.g. Jar B lid cracked; moved to the spare jar at the same humidity." />
      <FormMessage state={state} />
      <SubmitButton>Record the move</SubmitButton>
    </form>
  );
}
