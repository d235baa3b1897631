"use client";
import { useActionState } from "react";
import { confirmSignUp } from "@/app/_actions/sign-up";
import { FormMessage, SubmitButton } from "@/components/ui/form";

export function ConfirmSignUpForm({ token }: { token: string }) {
  const [state, action] = useActionState(confirmSignUp, undefined);
  return (
    <form action={action} className="space-y-4">
      <input type="hidden" name="token" value={token} />
      <FormMessage state={state} />
      <SubmitButton pendingText="Creating…">Create the lab</SubmitButton>
    </form>
  );
}
