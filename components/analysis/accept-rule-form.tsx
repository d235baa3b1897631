"use client";
// Accept one threshold as the lab's storage rule. The server computes the threshold again from the
// same choices; the form only names which one.
import { useActionState, useState } from "react";
import { acceptStorageRuleAction } from "@/app/_actions/storage-rules";
import { FormMessage, SubmitButton, TextArea } from "@/components/ui/form";

export function AcceptRuleForm({ trialId, materialClass, treatmentId, share, horizon, pool, label }: {
  trialId: string; materialClass: string; treatmentId: string; share: number; horizon: number; pool: string[]; label: string;
}) {
  const [state, action] = useActionState(acceptStorageRuleAction, undefined);
  const [open, setOpen] = useState(false);
  if (!open && !state?.ok) {
    return <button type="button" className="btn-quiet text-sm" onClick={() => setOpen(true)} aria-label={`Accept as storage rule: ${label}`}>Accept as storage rule…</button>;
  }
  return (
    <form action={action} className="space-y-2" noValidate>
      <input type="hidden" name="trialId" value={trialId} />
      <input type="hidden" name="materialClass" value={materialClass} />
      <input type="hidden" name="treatmentId" value={treatmentId} />
      <input type="hidden" name="share" value={share} />
      <input type="hidden" name="horizon" value={horizon} />
      <input type="hidden" name="pool" value={pool.join(",")} />
      {!state?.ok && (
        <>
          <TextArea name="note" label={`Note for the rule: ${label}`} rows={2} state={state} hint="Why the lab adopts it, or limits on its use (optional). The rule is versioned and audited." />
          <SubmitButton pendingText="Accepting…">Accept as storage rule</SubmitButton>
        </>
      )}
      <FormMessage state={state} />
    </form>
  );
}
