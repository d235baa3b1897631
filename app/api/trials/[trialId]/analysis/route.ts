// GET /api/trials/[trialId]/analysis?groupBy=treatment&method=turnbull — the comparison as JSON:
// groups with curves, medians and tests, the plain-language summary, and per-specimen outcomes.
import { NextResponse } from "next/server";
import { getTrialAnalysis } from "@/db/queries/analysis";
import { analysisQuery } from "@/lib/analysis/params";
import { getTrialAccess } from "@/db/queries/trial-access";
import { labRoute } from "@/lib/auth/route";
import { assertResultsVisible } from "@/lib/trials/access";
import { outcomeRows } from "@/lib/export/outcome-rows";

export const dynamic = "force-dynamic";

export const GET = labRoute<{ trialId: string }>("analysis.read", async (ctx, req, { trialId }) => {
  const { groupBy, method } = analysisQuery(new URL(req.url).searchParams);
  const { access } = await getTrialAccess({ labId: ctx.labId, trialId, userId: ctx.userId });
  assertResultsVisible(access);
  const analysis = await getTrialAnalysis({ labId: ctx.labId, trialId, groupBy, method });
  const { trial } = analysis;
  return NextResponse.json(
    {
      trial: { id: trial.id, title: trial.title, status: trial.status, startedAt: trial.startedAt },
      startAt: analysis.startAt,
      doneInspections: analysis.doneInspections,
      recordScores: analysis.recordScores,
      outcomes: outcomeRows(analysis.outcomes),
      comparison: analysis.comparison,
    },
    { headers: { "Cache-Control": "no-store" } },
  );
});
