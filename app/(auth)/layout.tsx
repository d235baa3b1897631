import Link from "next/link";
import { Wordmark } from "@/components/ui/logo";

export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <main className="min-h-screen grid place-items-center px-4 py-10">
      <div className="w-full max-w-md space-y-6">
        <Link href="/" className="block w-fit"><Wordmark /></Link>
        {children}
        <p className="text-xs muted">
          Rustline keeps the record of humidity-exposure trials: chambers, schedules, photos, rust scores and the comparison of treatments.
        </p>
      </div>
    </main>
  );
}
