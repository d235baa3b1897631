// GET /api/trials/[trialId]/export/outcomes.csv — one row per specimen placement: first-rust interval
// in days since the trial start, censoring, final rusted area. Same columns as the data package's.
import { loadSpecimenOutcomes } from "@/db/queries/analysis";
import { getTrialAccess } from "@/db/queries/trial-access";
import { loadOutcomeAreas } from "@/db/queries/photo-evidence";
import { labRoute } from "@/lib/auth/route";
import { assertResultsVisible } from "@/lib/trials/access";
import { toPackageName } from "@/lib/export/datapackage";
import { outcomeRows } from "@/lib/export/outcome-rows";
import { tableToCsv } from "@/lib/export/table-schema";
import { OUTCOME_TABLE } from "@/lib/export/trial-tables";

export const dynamic = "force-dynamic";

export const GET = labRoute<{ trialId: string }>("export.read", async (ctx, _req, { trialId }) => {
  const { trial, access } = await getTrialAccess({ labId: ctx.labId, trialId, userId: ctx.userId });
  assertResultsVisible(access);
  const { outcomes } = await loadSpecimenOutcomes({ labId: ctx.labId, trial });
  const areas = await loadOutcomeAreas({ labId: ctx.labId, trialId: trial.id, outcomes });
  const csv = tableToCsv(OUTCOME_TABLE, outcomeRows(outcomes, areas));
  return new Response(csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${toPackageName(trial.title)}-outcomes.csv"`,
      "Cache-Control": "no-store",
    },
  });
});
