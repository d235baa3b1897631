import { ConfirmSignUpForm } from "@/components/auth/confirm-sign-up-form";
import { openSignUp } from "@/lib/auth/sign-up-token";

export const metadata = { title: "Finish creating your lab" };

// A GET only shows what will be created; the button posts (mail scanners that open links create nothing).
export default async function ConfirmSignUpPage({ searchParams }: { searchParams: Promise<{ token?: string | string[] }> }) {
  const raw = (await searchParams).token;
  const token = Array.isArray(raw) ? raw[0] : raw;
  const pending = token ? await openSignUp(token) : null;
  if (!token || !pending) {
    return (
      <div className="panel p-6 space-y-3">
        <h1 className="text-xl font-semibold">Link not valid</h1>
        <p role="alert">This sign-up link is not valid or has expired. <a className="link" href="/sign-up">Sign up again</a> to get a new one.</p>
      </div>
    );
  }
  return (
    <div className="panel p-6 space-y-4">
      <h1 className="text-xl font-semibold">Create {pending.labName}</h1>
      <p className="text-sm">You, {pending.name} ({pending.email}), become the lab&apos;s lead.</p>
      <ConfirmSignUpForm token={token} />
    </div>
  );
}
