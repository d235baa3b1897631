import "server-only";
// The wrapper for Server Component pages, beside labAction and labRoute: session → membership →
// the page's permission (from lib/auth/page-routes) → a context that also answers, per trial, what
// this viewer may see (scorer role, blind, locked). Signed out → sign-in; a role without the
// permission → the 403 page (forbidden.tsx names the roles that may open it); another lab's id → 404.
import { cache } from "react";
import { forbidden, notFound, redirect } from "next/navigation";
import { getTrialAnalysis } from "@/db/queries/analysis";
import { getTrialAccess, type Trial } from "@/db/queries/trial-access";
import { endpointOf, exposureQuery, pageQuery } from "@/lib/analysis/params";
import type { TrialAccess } from "@/lib/trials/access";
import { currentIdentity, requireLab, type LabContext } from "./context";
import { AppError } from "./errors";
import { PAGE_ROUTES, type PageRoute, type TrialPageRoute } from "./page-routes";

export type TrialView = { trial: Trial; access: TrialAccess };
export type PageContext = LabContext & {
  /** The trial of this lab and what the viewer may see of it (cached per request); 404 otherwise. */
  trial: (trialId: string) => Promise<TrialView>;
};

const trialView = cache(async (labId: string, userId: string, trialId: string): Promise<TrialView> => {
  try {
    return await getTrialAccess({ labId, trialId, userId });
  } catch (err) {
    if (err instanceof AppError && err.code === "not-found") notFound();
    throw err;
  }
});

const context = cache(async (route: PageRoute): Promise<PageContext> => {
  let ctx: LabContext;
  try {
    ctx = await requireLab(await currentIdentity(), PAGE_ROUTES[route].permission);
  } catch (err) {
    if (!(err instanceof AppError)) throw err;
    if (err.code === "unauthenticated") redirect("/sign-in");
    // Not a member: the (lab) layout shows the lab chooser instead of this page.
    if (/member/.test(err.message)) notFound();
    forbidden();
  }
  return { ...ctx, trial: (trialId) => trialView(ctx.labId, ctx.userId, trialId) };
});

/** For every page under app/(lab): `const ctx = await labPage("/chambers/[chamberId]")`. */
export function labPage(route: PageRoute): Promise<PageContext> {
  return context(route);
}

/**
 * For pages under /trials/[trialId]: the context, the trial and the viewer's access. Pages marked
 * `results` answer 403 to a blind scorer until the trial is concluded.
 */
export async function trialPage(route: TrialPageRoute, trialId: string): Promise<{ ctx: PageContext } & TrialView> {
  const ctx = await context(route);
  const view = await ctx.trial(trialId);
  if ("results" in PAGE_ROUTES[route] && view.access.blind) forbidden();
  return { ctx, ...view };
}

export type AnalysisPageProps = { params: Promise<{ trialId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

/** The comparison and the printable report: the trial's results page context, the URL's choices and the analysis. */
export async function analysisPage(route: "/trials/[trialId]/compare" | "/trials/[trialId]/report", { params, searchParams }: AnalysisPageProps) {
  const [{ trialId }, raw] = await Promise.all([params, searchParams]);
  const { ctx, trial, access } = await trialPage(route, trialId);
  const q = pageQuery(raw, trial.primaryOutcome);
  const exposure = exposureQuery(raw);
  const analysis = await getTrialAnalysis({ labId: ctx.labId, trialId: trial.id, groupBy: q.groupBy, method: q.method, endpoint: endpointOf(q.outcome), exposure: exposure.value });
  return { ctx, q, access, analysis, trial, c: analysis.comparison, exposureErrors: exposure.errors };
}
