"use client";
import { signOut, useSession } from "next-auth/react";
import { useRouter } from "next/navigation";

export function LabSwitcher({ labs, activeLabId }: { labs: { labId: string; labName: string; role: string }[]; activeLabId: string }) {
  const { update } = useSession();
  const router = useRouter();
  if (labs.length < 2) return <span className="text-sm font-medium">{labs[0]?.labName}</span>;
  return (
    <label className="text-sm inline-flex items-center gap-2">
      <span className="sr-only">Active lab</span>
      <select className="field py-1" value={activeLabId} onChange={async (e) => {
        await update({ labId: e.target.value });
        router.push("/");
        router.refresh();
      }}>
        {labs.map((l) => <option key={l.labId} value={l.labId}>{l.labName} ({l.role})</option>)}
      </select>
    </label>
  );
}

export function SignOutButton() {
  return <button type="button" className="btn-quiet text-sm" onClick={() => signOut({ callbackUrl: "/sign-in" })}>Sign out</button>;
}
