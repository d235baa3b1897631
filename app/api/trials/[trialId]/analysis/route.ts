// GET /api/trials/[trialId]/analysis?groupBy=treatment&method=turnbull — the comparison as JSON:
// groups with curves, medians and tests, the plain-language summary, and per-specimen outcomes.
import { NextResponse } from "next/server";
import { getTrialAnalysis } from "@/db/queries/analysis";
import { analysisQuery } from "@/lib/analysis/params";
import { AppError } from "@/lib/auth/errors";
import { labRoute } from "@/lib/auth/route";
import { outcomeRows } from "@/lib/export/outcome-rows";

export const dynamic = "force-dynamic";

export const GET = labRoute<{ trialId: string }>("analysis.read", async (ctx, req, { trialId }) => {
  const { groupBy, method } = analysisQuery(new URL(req.url).searchParams);
  const analysis = await getTrialAnalysis({ labId: ctx.labId, trialId, groupBy, method });
  if (!analysis) throw new AppError("not-found", "No such trial in this lab.");
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
