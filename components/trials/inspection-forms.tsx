"use client";
import { useActionState } from "react";
import { recordInspectionAction, rescheduleInspectionAction } from "@/app/_actions/inspections";
import { Field, FormMessage, SubmitButton, TextArea } from "@/components/ui/form";

// Ids are suffixed per inspection so several forms on one page keep unique, labelled fields.
export function RecordInspectionForm({ inspectionId, compact = false }: { inspectionId: string; compact?: boolean }) {
  const [state, action] = useActionState(recordInspectionAction, undefined);
  if (state?.ok) return <p role="status" className="text-sm text-verdigris-800">{state.message}</p>;
  return (
    <form action={action} className="space-y-2" noValidate>
      <input type="hidden" name="inspectionId" value={inspectionId} />
      {!compact && <Field name="doneAt" label="Done at (UTC, empty = now)" type="datetime-local" state={state} />}
      {compact ? (
        <div className="space-y-1">
          <label htmlFor={`notes-${inspectionId}`} className="block text-xs font-medium">Notes (optional)</label>
          <input id={`notes-${inspectionId}`} name="notes" className="field" defaultValue={state?.values?.notes} />
        </div>
      ) : <TextArea name="notes" label="Notes (optional)" state={state} hint="What you saw or did, e.g. jar opened 8 min; slight fogging on the lid." />}
      <FormMessage state={state} />
      <SubmitButton pendingText="Saving…">Mark done</SubmitButton>
    </form>
  );
}

export function RescheduleForm({ inspectionId, plannedAt }: { inspectionId: string; plannedAt: string }) {
  const [state, action] = useActionState(rescheduleInspectionAction, undefined);
  if (state?.ok) return <p role="status" className="text-sm text-verdigris-800">{state.message}</p>;
  const err = state?.errors ?? {};
  return (
    <form action={action} className="space-y-2" noValidate>
      <input type="hidden" name="inspectionId" value={inspectionId} />
      <div className="space-y-1">
        <label htmlFor={`planned-${inspectionId}`} className="block text-xs font-medium">New time (UTC)</label>
        <input id={`planned-${inspectionId}`} name="plannedAt" type="datetime-local" className="field" defaultValue={state?.values?.plannedAt ?? plannedAt.slice(0, 16)}
          aria-invalid={err.plannedAt ? true : undefined} aria-describedby={err.plannedAt ? `planned-err-${inspectionId}` : undefined} />
        {err.plannedAt && <p id={`planned-err-${inspectionId}`} role="alert" className="text-sm text-rust-600">{err.plannedAt.join(" ")}</p>}
      </div>
      <div className="space-y-1">
        <label htmlFor={`reason-${inspectionId}`} className="block text-xs font-medium">Reason (audited)</label>
        <input id={`reason-${inspectionId}`} name="reason" className="field" defaultValue={state?.values?.reason}
          aria-invalid={err.reason ? true : undefined} aria-describedby={err.reason ? `reason-err-${inspectionId}` : undefined} />
        {err.reason && <p id={`reason-err-${inspectionId}`} role="alert" className="text-sm text-rust-600">{err.reason.join(" ")}</p>}
      </div>
      <FormMessage state={state} />
      <SubmitButton pendingText="Saving…">Reschedule</SubmitButton>
    </form>
  );
}
