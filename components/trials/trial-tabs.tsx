"use client";
// The trial's sub-navigation. Photos grid, Scoring, Agreement, Compare, Humidity response and Report are their own pages.
import Link from "next/link";
import { usePathname } from "next/navigation";
import { PAGE_ROUTES, type PageRule } from "@/lib/auth/page-routes";
import { activeTrialTab } from "@/lib/trials/tabs";

// Tabs whose pages show results, as marked in the one page map (hidden from blind scorers).
const RESULT_TABS = new Set(Object.entries(PAGE_ROUTES as Record<string, PageRule>)
  .filter(([route, rule]) => rule.results && /^\/trials\/\[trialId\]\/[a-z-]+$/.test(route))
  .map(([route]) => route.split("/").pop()!));
const TABS = [
  { seg: "", label: "Overview" },
  { seg: "allocation", label: "Allocation" },
  { seg: "schedule", label: "Schedule" },
  { seg: "grid", label: "Photos grid" },
  { seg: "scoring", label: "Scoring" },
  { seg: "agreement", label: "Agreement" },
  { seg: "compare", label: "Compare" },
  { seg: "humidity", label: "Humidity response" },
  { seg: "report", label: "Report" },
];

export function TrialTabs({ trialId, resultsHidden }: { trialId: string; resultsHidden: boolean }) {
  const path = usePathname();
  const base = `/trials/${trialId}`;
  const current = activeTrialTab(path, trialId);
  return (
    <nav aria-label="Trial sections" className="no-print border-b border-[var(--line)]">
      <ul className="flex flex-wrap gap-1">
        {TABS.filter((t) => !(resultsHidden && RESULT_TABS.has(t.seg))).map((t) => {
          const href = t.seg ? `${base}/${t.seg}` : base;
          const active = current === t.seg;
          return (
            <li key={t.seg}>
              <Link href={href} aria-current={active ? "page" : undefined}
                className={`block px-3 py-2 text-sm border-b-2 -mb-px ${active ? "border-verdigris-600 font-medium" : "border-transparent hover:border-iron-300"}`}>
                {t.label}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
