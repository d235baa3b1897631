"use client";
import { signIn } from "next-auth/react";
import { useRouter, useSearchParams } from "next/navigation";
import { useState } from "react";

export function SignInForm() {
  const router = useRouter();
  const params = useSearchParams();
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const [email, setEmail] = useState(params.get("email") ?? "");

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setPending(true);
    setError(null);
    const fd = new FormData(e.currentTarget);
    const res = await signIn("credentials", { email: String(fd.get("email")), password: String(fd.get("password")), redirect: false });
    setPending(false);
    if (!res || res.error) {
      setError(res?.error && res.error !== "CredentialsSignin" ? res.error : "Wrong e-mail or password.");
      return;
    }
    router.push(params.get("callbackUrl")?.startsWith("/") ? params.get("callbackUrl")! : "/");
    router.refresh();
  }

  return (
    <form onSubmit={onSubmit} className="panel p-6 space-y-4" noValidate>
      <h1 className="text-xl font-semibold">Sign in</h1>
      {params.get("joined") && <p role="status" className="text-sm bg-verdigris-50 text-verdigris-800 rounded px-3 py-2">You have joined the lab. Sign in to continue.</p>}
      <div className="space-y-1">
        <label htmlFor="email" className="block text-sm font-medium">E-mail</label>
        <input id="email" name="email" type="email" autoComplete="email" required className="field" value={email} onChange={(e) => setEmail(e.target.value)} aria-describedby={error ? "signin-error" : undefined} />
      </div>
      <div className="space-y-1">
        <label htmlFor="password" className="block text-sm font-medium">Password</label>
        <input id="password" name="password" type="password" autoComplete="current-password" required className="field" aria-describedby={error ? "signin-error" : undefined} />
      </div>
      {error && <p id="signin-error" role="alert" className="text-sm bg-rust-50 text-rust-800 rounded px-3 py-2">{error}</p>}
      <button className="btn w-full justify-center" disabled={pending}>{pending ? "Signing in…" : "Sign in"}</button>
      <p className="text-sm muted">New here? <a className="link" href="/sign-up">Create a lab</a></p>
    </form>
  );
}
