import { SignInForm } from "@/components/auth/sign-in-form";
import { appOrigin, safeCallbackPath } from "@/lib/auth/callback-url";

export const metadata = { title: "Sign in" };

type Search = Record<string, string | string[] | undefined>;
const first = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

// Rendered on the server with the URL's values, so the form is in the HTML and works without JavaScript.
export default async function SignInPage({ searchParams }: { searchParams: Promise<Search> }) {
  const q = await searchParams;
  return (
    <SignInForm
      email={first(q.email) ?? ""}
      joined={!!first(q.joined)}
      callbackUrl={safeCallbackPath(first(q.callbackUrl), appOrigin())}
    />
  );
}
