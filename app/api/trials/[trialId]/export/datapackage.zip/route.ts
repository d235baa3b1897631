// GET /api/trials/[trialId]/export/datapackage.zip — the trial as a Frictionless tabular data
// package: datapackage.json, CSVs of every table, a photo manifest with checksums, and a README.
import { buildTrialDataPackage } from "@/db/queries/analysis";
import { getTrialAccess } from "@/db/queries/trial-access";
import { labRoute } from "@/lib/auth/route";
import { assertResultsVisible } from "@/lib/trials/access";

export const dynamic = "force-dynamic";

export const GET = labRoute<{ trialId: string }>("export.read", async (ctx, _req, { trialId }) => {
  const { trial, access } = await getTrialAccess({ labId: ctx.labId, trialId, userId: ctx.userId });
  assertResultsVisible(access);
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
