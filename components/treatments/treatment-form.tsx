"use client";
import { useActionState, useEffect } from "react";
import { useRouter } from "next/navigation";
import { createTreatmentAction, updateTreatmentAction } from "@/app/_actions/treatments";
import { Field, FormMessage, SelectField, SubmitButton, TextArea } from "@/components/ui/form";
import { TREATMENT_KIND_LABELS, TREATMENT_KINDS } from "@/lib/validation/treatments";

type Treatment = { id: string; name: string; kind: string; description: string; protocol: string };
const kindOptions = TREATMENT_KINDS.map((k) => ({ value: k, label: TREATMENT_KIND_LABELS[k] }));

export function TreatmentForm({ treatment }: { treatment?: Treatment }) {
  const [state, action] = useActionState(treatment ? updateTreatmentAction : createTreatmentAction, undefined);
  const router = useRouter();
  useEffect(() => {
    if (state?.ok && !treatment) router.push("/treatments");
  }, [state, treatment, router]);
  return (
    <form action={action} className="space-y-4 max-w-3xl" noValidate>
      {treatment && <input type="hidden" name="treatmentId" value={treatment.id} />}
      <div className="grid gap-4 md:grid-cols-2">
        <Field name="name" label="Name (unique in the lab)" state={state} defaultValue={treatment?.name} hint="e.g. Microcrystalline wax, Uncoated control." />
        <SelectField name="kind" label="Kind" options={kindOptions} state={state} defaultValue={treatment?.kind ?? "coating"} />
      </div>
      <TextArea name="description" label="Description" state={state} defaultValue={treatment?.description} />
      <TextArea name="protocol" label="Protocol" rows={8} state={state} defaultValue={treatment?.protocol}
        hint="Steps as done at the bench: materials, amounts, temperatures (°C), times, drying or curing. For solvents and reagents follow the supplier's SDS and local rules." />
      <FormMessage state={state} />
      <SubmitButton>{treatment ? "Save treatment" : "Add treatment"}</SubmitButton>
    </form>
  );
}
