"use client";
import { useSession } from "next-auth/react";
import { useRouter } from "next/navigation";

// Shown when the session names a lab the user no longer belongs to (removed, or a session from another
// installation): pick one of the labs they are in now.
export function LabChooser({ labs }: { labs: { labId: string; labName: string; role: string }[] }) {
  const { update } = useSession();
  const router = useRouter();
  return (
    <ul className="space-y-2">
      {labs.map((l) => (
        <li key={l.labId}>
          <button type="button" className="btn-quiet" onClick={async () => {
            await update({ labId: l.labId });
            router.refresh();
          }}>
            Open {l.labName} ({l.role})
          </button>
        </li>
      ))}
    </ul>
  );
}
