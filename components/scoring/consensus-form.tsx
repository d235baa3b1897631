"use client";
// The consensus score a lead or researcher records after the scorers discussed a disagreement.
import { useActionState } from "react";
import type { ActionState } from "@/lib/auth/action";
import { ASTM_DISTRIBUTION } from "@/lib/scoring/grades";
import { Field, FormMessage, SelectField, SubmitButton, TextArea } from "@/components/ui/form";

type Props = {
  action: (prev: ActionState | undefined, fd: FormData) => Promise<ActionState>;
  ids: { trialId: string; inspectionId: string; specimenId: string };
  defaults: { spotCount: number; areaPercent: number; astmLetter: string | null; weeping: boolean; silicateChange: string; notes: string } | null;
};

export function ConsensusForm({ action, ids, defaults }: Props) {
  const [state, formAction] = useActionState(action, undefined);
  const letters = [{ value: "", label: "— (no rust)" }, ...Object.entries(ASTM_DISTRIBUTION).map(([k, v]) => ({ value: k, label: `${k} — ${v}` }))];
  const weeping = state?.values ? state.values.weeping === "on" : defaults?.weeping ?? false;
  return (
    <form action={formAction} className="space-y-3" noValidate aria-label="Consensus score">
      {Object.entries(ids).map(([k, v]) => <input key={k} type="hidden" name={k} value={v} />)}
      <div className="grid grid-cols-2 gap-3">
        <Field name="spotCount" label="Rust spots" type="number" min={0} step="1" state={state} defaultValue={defaults?.spotCount ?? 0} />
        <Field name="areaPercent" label="Rusted area (% of face)" type="number" min={0} max={100} step="any" state={state} defaultValue={defaults?.areaPercent ?? 0} />
      </div>
      <SelectField name="astmLetter" label="Rust distribution (ASTM D610 letter)" options={letters} state={state} defaultValue={defaults?.astmLetter ?? ""} />
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" name="weeping" defaultChecked={weeping} key={String(weeping)} /> Weeping droplets
      </label>
      <SelectField name="silicateChange" label="Silicate discoloration" state={state} defaultValue={defaults?.silicateChange ?? "none"}
        options={[{ value: "none", label: "None" }, { value: "slight", label: "Slight" }, { value: "marked", label: "Marked" }]} />
      <TextArea name="notes" label="What the scorers agreed, and why" state={state} defaultValue={defaults?.notes ?? ""} />
      <FormMessage state={state} />
      <SubmitButton pendingText="Saving…">Record consensus score</SubmitButton>
    </form>
  );
}
