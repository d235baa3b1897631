// Every page behind sign-in, by its route pattern, with the permission it needs. A page names its own
// pattern when it calls labPage / trialPage, and tests/integration/page-access.test.ts checks that
// this map and the folders under app/(lab) list the same pages, so no page goes without a check.
// `results`: the page shows a trial's results or other scorers' scores, hidden from blind scorers
// until the trial is concluded (lib/trials/access).
import { RESULTS_HIDDEN } from "@/lib/trials/access";
import { PERMISSIONS, ROLES, type Permission } from "./permissions";

export type PageRule = { permission: Permission; results?: true };

export const PAGE_ROUTES = {
  "/": { permission: "lab.read" },
  "/analysis": { permission: "analysis.read" },
  "/audit": { permission: "audit.read" },
  "/chambers": { permission: "lab.read" },
  "/collection": { permission: "lab.read" },
  "/collection/overview": { permission: "lab.read" },
  "/collection/report": { permission: "lab.read" },
  "/chambers/new": { permission: "chambers.write" },
  "/chambers/[chamberId]": { permission: "lab.read" },
  "/chambers/[chamberId]/edit": { permission: "chambers.write" },
  "/chambers/[chamberId]/import": { permission: "readings.write" },
  "/chambers/[chamberId]/tokens": { permission: "chambers.tokens" },
  "/due": { permission: "lab.read" },
  "/mailbox": { permission: "members.manage" },
  "/settings": { permission: "lab.read" },
  "/specimens": { permission: "lab.read" },
  "/storage-rules": { permission: "lab.read" },
  "/specimens/new": { permission: "specimens.write" },
  "/specimens/import": { permission: "specimens.write" },
  "/specimens/[specimenId]": { permission: "lab.read" },
  "/specimens/[specimenId]/edit": { permission: "specimens.write" },
  "/specimens/[specimenId]/timeline": { permission: "lab.read" },
  "/treatments": { permission: "lab.read" },
  "/treatments/new": { permission: "treatments.write" },
  "/treatments/[treatmentId]": { permission: "lab.read" },
  "/trials": { permission: "lab.read" },
  "/trials/new": { permission: "trials.write" },
  "/trials/[trialId]": { permission: "lab.read" },
  "/trials/[trialId]/edit": { permission: "trials.write" },
  "/trials/[trialId]/allocation": { permission: "lab.read" },
  "/trials/[trialId]/schedule": { permission: "lab.read" },
  "/trials/[trialId]/grid": { permission: "lab.read" },
  "/trials/[trialId]/scoring": { permission: "lab.read" },
  "/trials/[trialId]/scoring/[photoId]": { permission: "scores.write" },
  "/trials/[trialId]/align/[photoId]": { permission: "photos.upload" },
  "/trials/[trialId]/agreement": { permission: "analysis.read", results: true },
  "/trials/[trialId]/compare": { permission: "analysis.read", results: true },
  "/trials/[trialId]/humidity": { permission: "analysis.read", results: true },
  "/trials/[trialId]/report": { permission: "analysis.read", results: true },
  "/trials/[trialId]/inspections/[inspectionId]": { permission: "lab.read" },
  "/trials/[trialId]/inspections/[inspectionId]/photos": { permission: "lab.read" },
  "/trials/[trialId]/inspections/[inspectionId]/score": { permission: "lab.read" },
  "/trials/[trialId]/inspections/[inspectionId]/score/[specimenId]": { permission: "lab.read" },
} as const satisfies Record<string, PageRule>;

export type PageRoute = keyof typeof PAGE_ROUTES;
export type TrialPageRoute = Extract<PageRoute, `/trials/[trialId]${string}`>;

export function pageRule(route: PageRoute): PageRule {
  return PAGE_ROUTES[route];
}

/** What the 403 page says for a path: the roles that may open it, or that results wait for the conclusion. */
export function forbiddenText(pathname: string): string {
  const route = matchPageRoute(pathname);
  const rule: PageRule | null = route ? PAGE_ROUTES[route] : null;
  const roles = rule ? (PERMISSIONS[rule.permission] as readonly string[]) : [];
  if (rule?.results && roles.length === ROLES.length) return `${RESULTS_HIDDEN} You can go on scoring from the trial's Scoring tab.`;
  return `This page needs the ${roles.length ? roles.join(" or ") : "right"} role in this lab. Your role does not include it; a lab lead can change roles in Lab settings.`;
}

/** The route pattern a concrete path belongs to ("/trials/1f…/compare" → "/trials/[trialId]/compare"). */
export function matchPageRoute(pathname: string): PageRoute | null {
  const parts = pathname.replace(/\/+$/, "").split("/").filter(Boolean);
  let best: { route: PageRoute; literals: number } | null = null;
  for (const route of Object.keys(PAGE_ROUTES) as PageRoute[]) {
    const segs = route.split("/").filter(Boolean);
    if (segs.length !== parts.length) continue;
    let literals = 0;
    const ok = segs.every((s, i) => (s.startsWith("[") ? true : s === parts[i] && ++literals > 0));
    // "/trials/new" beats "/trials/[trialId]": the most literal segments win.
    if (ok && (!best || literals > best.literals)) best = { route, literals };
  }
  return best?.route ?? null;
}
