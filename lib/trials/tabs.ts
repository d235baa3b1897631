// Which trial tab a page belongs to, by its path: inspection pages (and their photos) to the
// Schedule, every score page (per specimen, per inspection, the blind queue) to Scoring, the edit page
// to the Overview. Pure, so the rule is tested without a browser.
export const TRIAL_TAB_SEGMENTS = ["", "allocation", "schedule", "grid", "scoring", "agreement", "compare", "report"] as const;
export type TrialTabSegment = (typeof TRIAL_TAB_SEGMENTS)[number];

export function activeTrialTab(path: string, trialId: string): TrialTabSegment | null {
  const base = `/trials/${trialId}`;
  if (path !== base && !path.startsWith(`${base}/`)) return null;
  const rest = path.slice(base.length).replace(/\/+$/, "");
  if (rest === "" || rest === "/edit" || rest.startsWith("/edit/")) return "";
  if (/^\/inspections\/[^/]+\/score(\/|$)/.test(rest)) return "scoring";
  if (/^\/inspections\/[^/]+(\/photos)?$/.test(rest)) return "schedule";
  const seg = rest.split("/")[1] as TrialTabSegment;
  return (TRIAL_TAB_SEGMENTS as readonly string[]).includes(seg) ? seg : null;
}
