import "server-only";
// What the comparison page and the printable report both start with: the caller may read analyses,
// the URL's choices, and the trial's analysis (another lab's trial, or none, is the not-found page).
import { notFound, redirect } from "next/navigation";
import { getTrialAnalysis } from "@/db/queries/analysis";
import { getLabContext } from "@/lib/auth/context";
import { pageQuery } from "./params";

export type AnalysisPageProps = { params: Promise<{ trialId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

export async function loadAnalysisPage({ params, searchParams }: AnalysisPageProps) {
  const ctx = await getLabContext("analysis.read");
  if (!ctx) redirect("/sign-in");
  const [{ trialId }, raw] = await Promise.all([params, searchParams]);
  const q = pageQuery(raw);
  const analysis = await getTrialAnalysis({ labId: ctx.labId, trialId, groupBy: q.groupBy, method: q.method });
  if (!analysis) notFound();
  return { ctx, q, analysis, trial: analysis.trial, c: analysis.comparison };
}
