"use client";
import { useActionState } from "react";
import { swapAction } from "@/app/_actions/trials";
import { Field, FormMessage, SelectField, SubmitButton } from "@/components/ui/form";

export function SwapForm({ trialId, rows }: { trialId: string; rows: { specimenId: string; label: string; armLabel: string | null }[] }) {
  const [state, action] = useActionState(swapAction, undefined);
  const options = [{ value: "", label: "— choose —" }, ...rows.map((r) => ({ value: r.specimenId, label: `${r.label} · ${r.armLabel ?? "left over"}` }))];
  return (
    <form action={action} className="space-y-3 max-w-2xl" noValidate>
      <input type="hidden" name="trialId" value={trialId} />
      <div className="grid gap-3 md:grid-cols-2">
        <SelectField name="specimenA" label="Specimen" options={options} state={state} />
        <SelectField name="specimenB" label="Swap with" options={options} state={state} />
      </div>
      <Field name="reason" label="Reason (goes into the audit trail)" state={state} hint="e.g. A crack found across the face of TV-M-004 after cutting." />
      <FormMessage state={state} />
      <SubmitButton>Swap</SubmitButton>
    </form>
  );
}
