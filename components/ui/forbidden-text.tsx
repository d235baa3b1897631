"use client";
// The 403 page's sentence, worked out in the browser when the server did not pass the path.
import { usePathname } from "next/navigation";
import { forbiddenText } from "@/lib/auth/page-routes";

export function ForbiddenText() {
  return <>{forbiddenText(usePathname() ?? "/")}</>;
}
