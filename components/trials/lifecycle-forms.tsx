"use client";
// Start, conclude and notes. The server enforces who may do what and when; these only collect input.
import { useActionState, useState } from "react";
import { addNoteAction, concludeTrialAction, startTrialAction } from "@/app/_actions/trials";
import { FormMessage, SubmitButton, TextArea } from "@/components/ui/form";
import { useFormSubmit } from "./use-form-submit";

/** "YYYY-MM-DDTHH:mm" in UTC, the value a datetime-local input shows (every page uses UTC). */
export function utcInputValue(d: Date) {
  return d.toISOString().slice(0, 16);
}

export function StartForm({ trialId, firstDays }: { trialId: string; firstDays: number[] }) {
  const [state, action] = useActionState(startTrialAction, undefined);
  const [start, setStart] = useState(() => utcInputValue(new Date()));
  const startDate = new Date(`${start}Z`);
  return (
    <form action={action} className="space-y-3" noValidate>
      <input type="hidden" name="trialId" value={trialId} />
      <div className="space-y-1">
        <label htmlFor="f-startAt" className="block text-sm font-medium">Start of exposure (UTC)</label>
        <input id="f-startAt" name="startAt" type="datetime-local" className="field max-w-xs" value={start} onChange={(e) => setStart(e.target.value)}
          aria-invalid={state?.errors?.startAt ? true : undefined} aria-describedby={state?.errors?.startAt ? "start-err" : "start-hint"} />
        <p id="start-hint" className="text-xs muted">
          When the specimens go into the jars; it may be up to 30 days ahead. Day 0 of the plan is this time
          {!Number.isNaN(startDate.getTime()) && firstDays.length > 0 && <>; the first inspections fall on {firstDays.slice(0, 3).map((d) => new Date(startDate.getTime() + d * 86_400_000).toISOString().slice(0, 10)).join(", ")}</>}.
        </p>
        {state?.errors?.startAt && <p id="start-err" role="alert" className="text-sm text-rust-600">{state.errors.startAt.join(" ")}</p>}
      </div>
      <FormMessage state={state} />
      <SubmitButton pendingText="Starting…">Start the trial</SubmitButton>
    </form>
  );
}

export function ConcludeForm({ trialId }: { trialId: string }) {
  const [state, dispatch, pending] = useActionState(concludeTrialAction, undefined);
  const onSubmit = useFormSubmit(dispatch);
  const [sure, setSure] = useState(false);
  return (
    <form onSubmit={onSubmit} className="space-y-3" noValidate>
      <input type="hidden" name="trialId" value={trialId} />
      <TextArea name="note" label="Closing note (optional)" state={state} hint="Why and when the trial ends; it is kept as the first note after the conclusion." />
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" checked={sure} onChange={(e) => setSure(e.target.checked)} />
        I understand that concluding locks the record: placements close now, and inspections, scores, photos and the design can no longer change. Only notes can be added.
      </label>
      <FormMessage state={state} />
      <button type="submit" className="btn" disabled={!sure || pending} aria-busy={pending}>{pending ? "Concluding…" : "Conclude and lock"}</button>
    </form>
  );
}

export function NoteForm({ trialId }: { trialId: string }) {
  const [state, action] = useActionState(addNoteAction, undefined);
  return (
    <form action={action} className="space-y-2" noValidate>
      <input type="hidden" name="trialId" value={trialId} />
      <TextArea name="body" label="Add a note" state={state} />
      <FormMessage state={state} />
      <SubmitButton>Append note</SubmitButton>
    </form>
  );
}

