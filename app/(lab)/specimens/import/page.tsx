import Link from "next/link";
import { labPage } from "@/lib/auth/page";
import { SpecimenImport } from "@/components/specimens/specimen-import";

export const metadata = { title: "Import specimens" };

export default async function ImportSpecimensPage() {
  await labPage("/specimens/import");
  return (
    <div className="space-y-4 max-w-5xl">
      <p className="text-sm"><Link className="link" href="/specimens">Specimens</Link> /</p>
      <h1 className="text-2xl font-semibold">Import specimens from CSV</h1>
      <p className="text-sm muted">
        All or nothing: if any row is wrong, or a label is already used in this lab or repeated in the file, nothing is imported and every
        problem is listed with its line number. The export on the specimen list writes this same format.
      </p>
      <SpecimenImport />
    </div>
  );
}
