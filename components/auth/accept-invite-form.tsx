"use client";
import { useActionState } from "react";
import { acceptInvite } from "@/app/_actions/invite";
import { Field, FormMessage, SubmitButton } from "@/components/ui/form";

export function AcceptInviteForm({ token, hasAccount }: { token: string; hasAccount: boolean }) {
  const [state, action] = useActionState(acceptInvite, undefined);
  return (
    <form action={action} className="space-y-4" noValidate>
      <input type="hidden" name="token" value={token} />
      <input type="hidden" name="newAccount" value={hasAccount ? "0" : "1"} />
      {!hasAccount && <Field name="name" label="Your name" state={state} autoComplete="name" />}
      <Field name="password" label={hasAccount ? "Your existing password" : "Choose a password"} type="password" state={state}
        autoComplete={hasAccount ? "current-password" : "new-password"}
        hint={hasAccount ? "You already have a Rustline account with this e-mail; confirm it to link this lab." : "At least 10 characters, mixing letters with digits or symbols."} />
      <FormMessage state={state} />
      <SubmitButton pendingText="Joining…">Join the lab</SubmitButton>
    </form>
  );
}
