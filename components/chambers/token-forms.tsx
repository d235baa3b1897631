"use client";
import { useActionState, useState } from "react";
import { createTokenAction, revokeTokenAction } from "@/app/_actions/chamber-records";
import { Field, FormMessage, SubmitButton } from "@/components/ui/form";
import type { ActionState } from "@/lib/auth/action";

export function CreateTokenForm({ chamberId }: { chamberId: string }) {
  const [state, action] = useActionState(createTokenAction, undefined as ActionState<{ token: string }> | undefined);
  const [copied, setCopied] = useState(false);
  const token = state?.ok ? (state.data as { token: string } | undefined)?.token : undefined;
  return (
    <div className="space-y-3">
      <form action={action} className="flex flex-wrap items-end gap-3" noValidate>
        <input type="hidden" name="chamberId" value={chamberId} />
        <div className="min-w-64"><Field name="label" label="Label" state={state} hint="e.g. the logger's name or serial" /></div>
        <SubmitButton pendingText="Creating…">Create token</SubmitButton>
      </form>
      <FormMessage state={state} />
      {token && (
        <div className="space-y-2">
          <label htmlFor="new-token" className="block text-sm font-medium">Token (shown once)</label>
          <input id="new-token" readOnly value={token} className="field font-mono text-xs" onFocus={(e) => e.currentTarget.select()} data-testid="new-token" />
          <button type="button" className="btn-quiet text-sm" onClick={async () => { await navigator.clipboard.writeText(token); setCopied(true); }}>{copied ? "Copied" : "Copy"}</button>
        </div>
      )}
    </div>
  );
}

export function RevokeTokenButton({ chamberId, tokenId, label }: { chamberId: string; tokenId: string; label: string }) {
  const [state, action] = useActionState(revokeTokenAction, undefined);
  return (
    <form action={action} className="inline-flex items-center gap-2" onSubmit={(e) => { if (!confirm(`Revoke "${label}"? Loggers using it will be refused.`)) e.preventDefault(); }}>
      <input type="hidden" name="chamberId" value={chamberId} />
      <input type="hidden" name="tokenId" value={tokenId} />
      <SubmitButton pendingText="…">Revoke</SubmitButton>
      {state?.message && <span role={state.ok ? "status" : "alert"} className="text-xs">{state.message}</span>}
    </form>
  );
}
