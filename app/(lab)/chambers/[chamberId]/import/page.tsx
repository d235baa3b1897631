import Link from "next/link";
import { getChamber, listChamberInstruments } from "@/db/queries/chambers";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { CsvImport } from "@/components/chambers/csv-import";
import { orNotFound } from "@/lib/auth/not-found";

export const metadata = { title: "Import logger CSV" };

export default async function ImportPage({ params }: { params: Promise<{ chamberId: string }> }) {
  const ctx = await labPage("/chambers/[chamberId]/import");
  const { chamberId } = await params;
  const chamber = await getChamber({ labId: ctx.labId, chamberId }).catch(orNotFound);
  const instruments = await listChamberInstruments({ labId: ctx.labId, chamberId });
  return (
    <div className="space-y-4 max-w-5xl">
      <p className="text-sm"><Link className="link" href="/chambers">Chambers</Link> / <Link className="link" href={`/chambers/${chamber.id}`}>{chamber.name}</Link> / import</p>
      <h1 className="text-2xl font-semibold">Import a logger file into {chamber.name}</h1>
      <p className="text-sm muted">Choose the file, confirm which column is which, and check it. If any row cannot be read, nothing is imported and every problem is listed with its line number. Times repeated in the file, or already stored for the same instrument, are skipped.</p>
      {!can(ctx.role, "readings.write") ? (
        <p role="alert" className="panel p-4 text-sm">Your role ({ctx.role}) cannot add readings.</p>
      ) : chamber.archivedAt ? (
        <p role="alert" className="panel p-4 text-sm">This chamber is archived; restore it before importing readings.</p>
      ) : (
        <CsvImport chamberId={chamber.id} instruments={instruments} />
      )}
    </div>
  );
}
