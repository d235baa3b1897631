"use client";
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useActionState, useEffect, useState } from "react";
import { signUp } from "@/app/(auth)/sign-up/actions";
import { Field, FormMessage, SubmitButton } from "@/components/ui/form";

export function SignUpForm() {
  const [state, action] = useActionState(signUp, undefined);
  // Controlled, because React resets uncontrolled fields after a form action and we sign in with it afterwards.
  const [password, setPassword] = useState("");
  const router = useRouter();

  useEffect(() => {
    if (state?.ok && state.values?.email) {
      signIn("credentials", { email: state.values.email, password, redirect: false }).then(() => {
        router.push("/");
        router.refresh();
      });
    }
  }, [state]);

  return (
    <form action={action} className="panel p-6 space-y-4" noValidate>
      <h1 className="text-xl font-semibold">Create a lab</h1>
      <p className="text-sm muted">You become the lab&apos;s lead and can invite researchers, technicians and observers.</p>
      <Field name="name" label="Your name" state={state} autoComplete="name" />
      <Field name="email" label="E-mail" type="email" state={state} autoComplete="email" />
      <div className="space-y-1">
        <label htmlFor="f-password" className="block text-sm font-medium">Password</label>
        <input value={password} onChange={(e) => setPassword(e.target.value)} id="f-password" name="password" type="password" autoComplete="new-password" className="field"
          aria-invalid={state?.errors?.password ? true : undefined} aria-describedby="f-password-hint f-password-err" />
        <p id="f-password-hint" className="text-xs muted">At least 10 characters, mixing letters with digits or symbols.</p>
        {state?.errors?.password && <p id="f-password-err" role="alert" className="text-sm text-rust-600">{state.errors.password.join(" ")}</p>}
      </div>
      <Field name="labName" label="Lab or collection name" state={state} hint="For example: Hillcrest Museum meteorite store" />
      <FormMessage state={state} />
      <SubmitButton pendingText="Creating…">Create lab</SubmitButton>
      <p className="text-sm muted">Already have an account? <a className="link" href="/sign-in">Sign in</a></p>
    </form>
  );
}
