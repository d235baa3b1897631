"use client";
// Deleting a wrong history entry: the reason is required and kept in the audit trail.
import { useActionState } from "react";
import { deleteSpecimenHistoryAction } from "@/app/_actions/specimen-history";
import { Field, FormMessage, SubmitButton } from "@/components/ui/form";
import type { EditedEntry } from "./history-form";

export function HistoryDeleteForm({ specimenId, entry }: { specimenId: string; entry: Pick<EditedEntry, "id" | "kind"> }) {
  const [state, action] = useActionState(deleteSpecimenHistoryAction, undefined);
  return (
    <form action={action} className="space-y-3 max-w-2xl" noValidate>
      <input type="hidden" name="specimenId" value={specimenId} />
      <input type="hidden" name="entryId" value={entry.id} />
      <input type="hidden" name="kind" value={entry.kind} />
      <Field name="reason" label="Why delete this entry?" state={state} hint="Kept in the audit trail, e.g. entered on the wrong specimen." />
      <FormMessage state={state} />
      <SubmitButton>Delete the entry</SubmitButton>
    </form>
  );
}
