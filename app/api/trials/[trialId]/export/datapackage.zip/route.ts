// GET /api/trials/[trialId]/export/datapackage.zip — the trial as a Frictionless tabular data
// package: datapackage.json, CSVs of every table, a photo manifest with checksums, and a README.
import { buildTrialDataPackage, getAnalysisTrial } from "@/db/queries/analysis";
import { AppError } from "@/lib/auth/errors";
import { labRoute } from "@/lib/auth/route";

export const dynamic = "force-dynamic";

export const GET = labRoute<{ trialId: string }>("export.read", async (ctx, _req, { trialId }) => {
  const trial = await getAnalysisTrial({ labId: ctx.labId, trialId });
  if (!trial) throw new AppError("not-found", "No such trial in this lab.");
  const { zip, filename } = await buildTrialDataPackage({ labId: ctx.labId, trial });
  return new Response(Buffer.from(zip), {
    headers: {
      "Content-Type": "application/zip",
      "Content-Disposition": `attachment; filename="${filename}"`,
      "Content-Length": String(zip.byteLength),
      "Cache-Control": "no-store",
    },
  });
});
