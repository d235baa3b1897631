"use client";
import { useActionState } from "react";
import { signInWithPassword } from "@/app/_actions/sign-in";
import { SubmitButton } from "@/components/ui/form";

export function SignInForm({ email, joined, callbackUrl }: { email: string; joined: boolean; callbackUrl: string }) {
  const [state, action] = useActionState(signInWithPassword, undefined);
  const error = state?.ok === false ? state.message : undefined;
  return (
    <form action={action} className="panel p-6 space-y-4">
      <h1 className="text-xl font-semibold">Sign in</h1>
      {joined && <p role="status" className="text-sm bg-verdigris-50 text-verdigris-800 rounded px-3 py-2">You have joined the lab. Sign in to continue.</p>}
      <input type="hidden" name="callbackUrl" value={callbackUrl} />
      <div className="space-y-1">
        <label htmlFor="email" className="block text-sm font-medium">E-mail</label>
        <input id="email" name="email" type="email" autoComplete="email" required className="field" defaultValue={state?.values?.email ?? email}
          key={state?.values?.email ?? email} aria-describedby={error ? "signin-error" : undefined} />
      </div>
      <div className="space-y-1">
        <label htmlFor="password" className="block text-sm font-medium">Password</label>
        <input id="password" name="password" type="password" autoComplete="current-password" required className="field" aria-describedby={error ? "signin-error" : undefined} />
      </div>
      {error && <p id="signin-error" role="alert" className="text-sm bg-rust-50 text-rust-800 rounded px-3 py-2">{error}</p>}
      <SubmitButton pendingText="Signing in…">Sign in</SubmitButton>
      <p className="text-sm muted">New here? <a className="link" href="/sign-up">Create a lab</a></p>
    </form>
  );
}
