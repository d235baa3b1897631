"use client";
// Enter a storage rule by hand, from a publication, a standard or the lab's own decision. The source
// and its date are required: every rule in force says where it comes from.
import { useActionState } from "react";
import { enterStorageRuleAction } from "@/app/_actions/storage-rules";
import { Field, FormMessage, SelectField, SubmitButton, TextArea } from "@/components/ui/form";

export function EnterRuleForm({ materials, treatments }: { materials: { value: string; label: string }[]; treatments: { value: string; label: string }[] }) {
  const [state, action] = useActionState(enterStorageRuleAction, undefined);
  return (
    <form action={action} className="grid gap-3 md:grid-cols-2 max-w-3xl" noValidate>
      <SelectField name="materialClass" label="Material class" state={state} options={materials} />
      <SelectField name="treatmentId" label="Treatment" state={state} options={[{ value: "any", label: "Any treatment" }, ...treatments]}
        hint="A rule for one treatment is stricter or looser than the material's general rule only for objects under that treatment." />
      <Field name="thresholdRhPercent" label="Keep below (%RH)" type="number" step="0.1" min={0} max={100} state={state} />
      <Field name="sourceDate" label="Date of the source" type="date" state={state} hint="The publication's or decision's date." />
      <div className="md:col-span-2">
        <Field name="source" label="Source" state={state} hint="Author, title and year of a publication; a standard's number; or the lab's decision with who made it." />
      </div>
      <div className="md:col-span-2">
        <TextArea name="note" label="Note (optional)" rows={2} state={state} hint="Limits on its use. The rule is versioned and audited." />
      </div>
      <div className="md:col-span-2 space-y-2">
        <SubmitButton pendingText="Saving…">Enter storage rule</SubmitButton>
        <FormMessage state={state} />
      </div>
    </form>
  );
}
