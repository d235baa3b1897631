"use client";
import { useActionState, useEffect } from "react";
import { useRouter } from "next/navigation";
import { createSpecimenAction, updateSpecimenAction } from "@/app/_actions/specimens";
import { Field, FormMessage, SelectField, SubmitButton, TextArea } from "@/components/ui/form";
import { CHLORIDE_STATE_LABELS, CHLORIDE_STATES, MATERIAL_CLASS_LABELS, MATERIAL_CLASSES, SURFACE_PREP_STEPS, splitSurfacePrep } from "@/lib/validation/specimens";

type Specimen = {
  id: string; label: string; materialClass: string; findName: string; face: string; description: string; surfacePrep: string; massG: number | null; history: string; parentPiece: string; slice: string; provenance: string; contaminationNotes: string;
  accessionNumber: string | null; treatmentsApplied: string; chlorideState: string; storageNotes: string;
};

const classOptions = MATERIAL_CLASSES.map((c) => ({ value: c, label: MATERIAL_CLASS_LABELS[c] }));
const chlorideOptions = CHLORIDE_STATES.map((c) => ({ value: c, label: CHLORIDE_STATE_LABELS[c] }));

export function SpecimenForm({ specimen }: { specimen?: Specimen }) {
  const [state, action] = useActionState(specimen ? updateSpecimenAction : createSpecimenAction, undefined);
  const router = useRouter();
  const savedId = (state?.data as { id?: string } | undefined)?.id;
  useEffect(() => {
    if (state?.ok && savedId) router.push(`/specimens/${savedId}`);
  }, [state, savedId, router]);
  // After an error the typed steps come back joined by newlines (see echoValues).
  const echoed = state?.values?.["surfacePrepSteps[]"];
  const prep = echoed !== undefined ? { steps: echoed.split("\n"), other: state?.values?.surfacePrepOther ?? "" } : splitSurfacePrep(specimen?.surfacePrep ?? "");
  const prepErr = state?.errors?.surfacePrep;
  return (
    <form action={action} className="space-y-4 max-w-3xl" noValidate>
      {specimen && <input type="hidden" name="specimenId" value={specimen.id} />}
      <div className="grid gap-4 md:grid-cols-2">
        <Field name="label" label="Label (unique in the lab)" state={state} defaultValue={specimen?.label} hint="As written on the specimen's tray, e.g. TV-M-031." />
        <SelectField name="materialClass" label="Material class" options={classOptions} state={state} defaultValue={specimen?.materialClass ?? "iron-meteorite"} />
        <Field name="findName" label="Find name" state={state} defaultValue={specimen?.findName} hint="The meteorite, site or batch the piece comes from." />
        <Field name="face" label="Face" state={state} defaultValue={specimen?.face} hint="Which surface is photographed, e.g. cut face, etched." />
        <Field name="massG" label="Mass (g)" type="number" step="0.01" min="0" state={state} defaultValue={specimen?.massG ?? ""} />
        <Field name="parentPiece" label="Parent piece" state={state} defaultValue={specimen?.parentPiece} hint="The piece this was cut from, e.g. Tarrow mass 2 end piece. Slices of one parent can be balanced across arms." />
        <Field name="slice" label="Slice" state={state} defaultValue={specimen?.slice} hint="This slice's mark on the parent piece, e.g. S3." />
        <Field name="accessionNumber" label="Accession number" state={state} defaultValue={specimen?.accessionNumber ?? ""} hint="The collection's register number, if it has one." />
        <SelectField name="chlorideState" label="Chloride condition (register)" options={chlorideOptions} state={state} defaultValue={specimen?.chlorideState ?? "unknown"} hint="The collection record's summary. Allocation blocks and the humidity covariates use the dated chloride tests in the specimen history instead." />
      </div>
      <fieldset className="space-y-2" aria-describedby={prepErr ? "prep-err" : undefined}>
        <legend className="text-sm font-medium">Surface preparation</legend>
        <div className="flex flex-wrap gap-x-4 gap-y-1" key={prep.steps.join("|")}>
          {SURFACE_PREP_STEPS.map((step) => (
            <label key={step} className="inline-flex items-center gap-1.5 text-sm">
              <input type="checkbox" name="surfacePrepSteps[]" value={step} defaultChecked={prep.steps.includes(step)} /> {step}
            </label>
          ))}
        </div>
        <Field name="surfacePrepOther" label="Other preparation" state={state} defaultValue={prep.other} hint="e.g. 1200 grit, ethanol rinse, nital 2 %." />
        {prepErr && <p id="prep-err" role="alert" className="text-sm text-rust-600">{prepErr.join(" ")}</p>}
      </fieldset>
      <TextArea name="description" label="Description" state={state} defaultValue={specimen?.description} />
      <TextArea name="provenance" label="Provenance" state={state} defaultValue={specimen?.provenance} hint="Find spot, collection, dealer, earlier owners and catalogue numbers." />
      <TextArea name="history" label="History" state={state} defaultValue={specimen?.history} hint="Where it has been stored, earlier treatments, cutting." />
      <TextArea name="contaminationNotes" label="Contamination notes" state={state} defaultValue={specimen?.contaminationNotes}
        hint="Soil salts, earlier rusting, fire or weather damage, handling residues — anything that could speed up or mask rust." />
      <TextArea name="treatmentsApplied" label="Treatments applied" state={state} defaultValue={specimen?.treatmentsApplied} hint="Conservation treatments already done, with years, e.g. alkaline sulfite 1998; tannin." />
      <TextArea name="storageNotes" label="Storage notes" state={state} defaultValue={specimen?.storageNotes} hint="Handling and housing notes for the store." />
      <FormMessage state={state} />
      <SubmitButton>{specimen ? "Save specimen" : "Add specimen"}</SubmitButton>
    </form>
  );
}
