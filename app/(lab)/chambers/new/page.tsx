import Link from "next/link";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { ChamberForm } from "@/components/chambers/chamber-form";
import { createChamberAction } from "@/app/_actions/chambers";

export const metadata = { title: "New chamber" };

export default async function NewChamberPage() {
  const ctx = await labPage("/chambers/new");
  const allowed = can(ctx.role, "chambers.write");
  return (
    <div className="space-y-4">
      <p className="text-sm"><Link className="link" href="/chambers">Chambers</Link> / new</p>
      <h1 className="text-2xl font-semibold">Define a chamber</h1>
      {allowed ? (
        <ChamberForm action={createChamberAction} />
      ) : (
        <p role="alert" className="panel p-4 text-sm">Your role ({ctx.role}) cannot define chambers; ask a lead or researcher.</p>
      )}
    </div>
  );
}
