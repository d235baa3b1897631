// GET /api/trials/[trialId]/analysis?groupBy=treatment&method=turnbull&outcome=weeping — the comparison
// as JSON: groups with curves, medians and tests, the plain-language summary, per-specimen
// outcomes and each placement's chamber exposure (above=25,60; outOfBandMax=10 re-analyses without
// specimens whose jar was out of band more than that share). Without an outcome, the trial's primary outcome picks it (as on the compare page).
import { NextResponse } from "next/server";
import { getTrialAnalysis } from "@/db/queries/analysis";
import { analysisQuery, endpointOf, exposureApiQuery } from "@/lib/analysis/params";
import { getTrialAccess } from "@/db/queries/trial-access";
import { labRoute } from "@/lib/auth/route";
import { assertResultsVisible } from "@/lib/trials/access";
import { outcomeRows } from "@/lib/export/outcome-rows";
import { loadOutcomeAreas } from "@/db/queries/photo-evidence";

export const dynamic = "force-dynamic";

export const GET = labRoute<{ trialId: string }>("analysis.read", async (ctx, req, { trialId }) => {
  const searchParams = new URL(req.url).searchParams;
  analysisQuery(searchParams); // a bad value answers 422 before anything is loaded
  const exposure = exposureApiQuery(searchParams);
  const { access, trial: accessTrial } = await getTrialAccess({ labId: ctx.labId, trialId, userId: ctx.userId });
  assertResultsVisible(access);
  const { groupBy, method, outcome } = analysisQuery(searchParams, accessTrial.primaryOutcome);
  const analysis = await getTrialAnalysis({ labId: ctx.labId, trialId, groupBy, method, endpoint: endpointOf(outcome), exposure });
  const { trial } = analysis;
  return NextResponse.json(
    {
      trial: { id: trial.id, title: trial.title, status: trial.status, startedAt: trial.startedAt, primaryOutcome: trial.primaryOutcome },
      outcome,
      startAt: analysis.startAt,
      doneInspections: analysis.doneInspections,
      recordScores: analysis.recordScores,
      leftOutScores: analysis.leftOut,
      outcomes: outcomeRows(analysis.outcomes, await loadOutcomeAreas({ labId: ctx.labId, trialId: trial.id, outcomes: analysis.outcomes })),
      comparison: analysis.comparison,
      exposure: analysis.exposure,
    },
    { headers: { "Cache-Control": "no-store" } },
  );
});
