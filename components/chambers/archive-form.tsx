"use client";
import { useActionState } from "react";
import { archiveChamberAction } from "@/app/_actions/chambers";
import { FormMessage, SubmitButton } from "@/components/ui/form";

export function ArchiveForm({ chamberId, archived }: { chamberId: string; archived: boolean }) {
  const [state, action] = useActionState(archiveChamberAction, undefined);
  return (
    <form action={action} className="space-y-2">
      <input type="hidden" name="chamberId" value={chamberId} />
      <input type="hidden" name="archive" value={archived ? "0" : "1"} />
      <SubmitButton pendingText="…">{archived ? "Restore chamber" : "Archive chamber"}</SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}
