import Link from "next/link";
import { getChamber } from "@/db/queries/chambers";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { ChamberForm, type ChamberFormValues } from "@/components/chambers/chamber-form";
import { ArchiveForm } from "@/components/chambers/archive-form";
import { updateChamberAction } from "@/app/_actions/chambers";
import { orNotFound } from "@/lib/auth/not-found";

export const metadata = { title: "Edit chamber" };

const str = (v: number | string | null) => (v == null ? "" : String(v));

export default async function EditChamberPage({ params }: { params: Promise<{ chamberId: string }> }) {
  const ctx = await labPage("/chambers/[chamberId]/edit");
  const { chamberId } = await params;
  const chamber = await getChamber({ labId: ctx.labId, chamberId }).catch(orNotFound);
  const initial: ChamberFormValues = {
    name: chamber.name, kind: chamber.kind, saltId: str(chamber.saltId), desiccantKind: str(chamber.desiccantKind), desiccantMassG: str(chamber.desiccantMassG), desiccantIndicator: str(chamber.desiccantIndicator),
    nominalTempC: str(chamber.nominalTempC), volumeL: str(chamber.volumeL), setpointRhPercent: str(chamber.setpointRhPercent), toleranceRhPercent: str(chamber.toleranceRhPercent),
    roomRhPercent: str(chamber.roomRhPercent), airExchangePerDay: str(chamber.airExchangePerDay), notes: chamber.notes,
  };
  return (
    <div className="space-y-4">
      <p className="text-sm"><Link className="link" href="/chambers">Chambers</Link> / <Link className="link" href={`/chambers/${chamber.id}`}>{chamber.name}</Link> / edit</p>
      <h1 className="text-2xl font-semibold">Edit {chamber.name}</h1>
      {can(ctx.role, "chambers.write") ? (
        <>
          <ChamberForm action={updateChamberAction} initial={initial} chamberId={chamber.id} submitLabel="Save changes" />
          <section className="panel p-4 space-y-2 max-w-xl" aria-labelledby="archive-h">
            <h2 id="archive-h" className="font-semibold">{chamber.archivedAt ? "Archived" : "Archive"}</h2>
            <p className="text-sm muted">{chamber.archivedAt ? "This chamber is archived: it is hidden from the list and accepts no readings." : "Archiving hides the chamber from the list and stops it accepting readings; nothing is deleted."}</p>
            <ArchiveForm chamberId={chamber.id} archived={!!chamber.archivedAt} />
          </section>
        </>
      ) : (
        <p role="alert" className="panel p-4 text-sm">Your role ({ctx.role}) cannot edit chambers.</p>
      )}
    </div>
  );
}
