"use client";
// One form for a specimen's history entries: choose what to record, then its fields. A single form
// (not four) so every field id on the page is unique. With `entry` it corrects that entry instead
// (the page then shows it in place of the form for a new one).
import { useActionState, useState } from "react";
import { addSpecimenHistoryAction, updateSpecimenHistoryAction } from "@/app/_actions/specimen-history";
import { Field, FormMessage, SelectField, SubmitButton, TextArea } from "@/components/ui/form";
import { AKAGANEITE_METHOD_LABELS, AKAGANEITE_METHODS, CHLORIDE_METHOD_LABELS, CHLORIDE_METHODS, HISTORY_KINDS } from "@/lib/validation/specimen-history";

const KIND_LABELS: Record<(typeof HISTORY_KINDS)[number], string> = {
  mass: "Weighing", chloride: "Chloride test", akaganeite: "Akaganeite check", treatment: "Earlier treatment",
};

export type EditedEntry = { id: string; kind: (typeof HISTORY_KINDS)[number]; values: Record<string, string> };

/** kinds: what the viewer may record (all unless given; the server checks each entry's kind again). */
export function HistoryForm({ specimenId, today, maxDate, entry, kinds = HISTORY_KINDS }: { specimenId: string; today: string; maxDate: string; entry?: EditedEntry; kinds?: readonly (typeof HISTORY_KINDS)[number][] }) {
  const [state, action] = useActionState((entry ? updateSpecimenHistoryAction : addSpecimenHistoryAction) as typeof addSpecimenHistoryAction, undefined);
  const [kind, setKind] = useState<(typeof HISTORY_KINDS)[number]>(entry?.kind ?? ((state?.values?.kind as (typeof HISTORY_KINDS)[number] | undefined) ?? (kinds.includes("mass") ? "mass" : kinds[0])));
  const v = (name: string, fallback?: string) => entry?.values[name] ?? fallback;
  const day = (name: string) => v(name, today);
  return (
    <form action={action} className="space-y-3 max-w-2xl" noValidate>
      <input type="hidden" name="specimenId" value={specimenId} />
      {entry ? (
        <><input type="hidden" name="entryId" value={entry.id} /><input type="hidden" name="kind" value={entry.kind} /></>
      ) : (
        <div className="space-y-1">
          <label htmlFor="f-kind" className="block text-sm font-medium">Record</label>
          <select id="f-kind" name="kind" className="field" value={kind} onChange={(e) => setKind(e.target.value as typeof kind)}>
            {kinds.map((k) => <option key={k} value={k}>{KIND_LABELS[k]}</option>)}
          </select>
        </div>
      )}
      {kind === "mass" && (
        <div className="grid gap-3 md:grid-cols-3">
          <Field name="measuredOn" label="Weighed on" type="date" max={maxDate} state={state} defaultValue={day("measuredOn")} />
          <Field name="mass" label="Mass" state={state} defaultValue={v("mass")} hint="To 0.1 mg at most: 4 decimals in g, 1 in mg." />
          <SelectField name="unit" label="Unit" state={state} options={[{ value: "g", label: "g" }, { value: "mg", label: "mg" }]} defaultValue={v("unit", "g")} />
        </div>
      )}
      {kind === "chloride" && (
        <>
          <div className="grid gap-3 md:grid-cols-3">
            <Field name="testedOn" label="Tested on" type="date" max={maxDate} state={state} defaultValue={day("testedOn")} />
            <SelectField name="method" label="Method" state={state} options={CHLORIDE_METHODS.map((m) => ({ value: m, label: CHLORIDE_METHOD_LABELS[m] }))} defaultValue={v("method")} />
            <SelectField name="result" label="Result" state={state} options={[{ value: "present", label: "Chloride present" }, { value: "absent", label: "No chloride found" }, { value: "inconclusive", label: "Inconclusive" }]} defaultValue={v("result")} />
          </div>
          <p className="text-xs muted">Silver nitrate stains skin and is corrosive to eyes; test reagents and acids need gloves and eye protection. Follow the supplier&apos;s safety data sheet for each reagent.</p>
        </>
      )}
      {kind === "akaganeite" && (
        <div className="grid gap-3 md:grid-cols-3">
          <Field name="checkedOn" label="Checked on" type="date" max={maxDate} state={state} defaultValue={day("checkedOn")} />
          <SelectField name="method" label="Method" state={state} options={AKAGANEITE_METHODS.map((m) => ({ value: m, label: AKAGANEITE_METHOD_LABELS[m] }))} defaultValue={v("method")} />
          <SelectField name="seen" label="Akaganeite seen" state={state} options={[{ value: "yes", label: "Yes" }, { value: "no", label: "No" }]} defaultValue={v("seen", "no")} />
        </div>
      )}
      {kind === "treatment" && (
        <div className="grid gap-3 md:grid-cols-3">
          <Field name="treatedOn" label="Treated on" type="date" max={maxDate} state={state} defaultValue={day("treatedOn")} />
          <div className="md:col-span-2"><Field name="treatment" label="Treatment" state={state} defaultValue={v("treatment")} hint="e.g. alkaline sulphite wash, 3 weeks; tannic acid; kept in silica gel." /></div>
        </div>
      )}
      <TextArea name="notes" label="Notes" rows={2} state={state} defaultValue={v("notes")} />
      <FormMessage state={state} />
      <SubmitButton>{entry ? "Save the correction" : `Save ${KIND_LABELS[kind].toLowerCase()}`}</SubmitButton>
    </form>
  );
}
