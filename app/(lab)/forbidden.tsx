"use client";
// The 403 page: which roles may open this page, or that it is hidden from blind scorers until the
// trial is concluded. The rule comes from the same map the server checked (lib/auth/page-routes).
import Link from "next/link";
import { usePathname } from "next/navigation";
import { PAGE_ROUTES, matchPageRoute } from "@/lib/auth/page-routes";
import { PERMISSIONS, ROLE_LABELS, ROLES } from "@/lib/auth/permissions";
import { RESULTS_HIDDEN } from "@/lib/trials/access";

export default function Forbidden() {
  const route = matchPageRoute(usePathname() ?? "/");
  const rule = route ? PAGE_ROUTES[route] : null;
  const roles = rule ? (PERMISSIONS[rule.permission] as readonly string[]) : [];
  const everyone = roles.length === ROLES.length;
  const names = roles.map((r) => ROLE_LABELS[r as keyof typeof ROLE_LABELS].name.toLowerCase());
  return (
    <div className="max-w-2xl space-y-3">
      <h1 className="text-2xl font-semibold">Not open to you</h1>
      {rule && "results" in rule && everyone ? (
        <p>{RESULTS_HIDDEN} You can go on scoring from the trial&apos;s Scoring tab.</p>
      ) : (
        <p>This page needs the {names.length ? names.join(" or ") : "right"} role in this lab. Your role does not include it; a lab lead can change roles in Lab settings.</p>
      )}
      <p><Link className="link" href="/">Back to the lab home</Link></p>
    </div>
  );
}
