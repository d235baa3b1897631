"use client";
import { useActionState } from "react";
import { signUp } from "@/app/_actions/sign-up";
import { Field, FormMessage, SubmitButton } from "@/components/ui/form";

export function SignUpForm() {
  const [state, action] = useActionState(signUp, undefined);
  if (state?.ok) {
    return (
      <div className="panel p-6 space-y-3">
        <h1 className="text-xl font-semibold">Check your e-mail</h1>
        <FormMessage state={state} />
        <p className="text-sm muted">Nothing is created until you follow the link. <a className="link" href="/sign-in">Sign in</a> if you already have an account.</p>
      </div>
    );
  }
  return (
    <form action={action} className="panel p-6 space-y-4" noValidate>
      <h1 className="text-xl font-semibold">Create a lab</h1>
      <p className="text-sm muted">You become the lab&apos;s lead and can invite researchers, technicians and observers. We send a link to your e-mail to finish.</p>
      <Field name="name" label="Your name" state={state} autoComplete="name" />
      <Field name="email" label="E-mail" type="email" state={state} autoComplete="email" />
      <Field name="password" label="Password" type="password" state={state} autoComplete="new-password" hint="At least 10 characters, mixing letters with digits or symbols." />
      <Field name="labName" label="Lab or collection name" state={state} hint="For example: Stellbrack Museum meteorite store" />
      <FormMessage state={state} />
      <SubmitButton pendingText="Sending…">Create lab</SubmitButton>
      <p className="text-sm muted">Already have an account? <a className="link" href="/sign-in">Sign in</a></p>
    </form>
  );
}
