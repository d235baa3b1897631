// The 403 page: which roles may open this page, or that it is hidden from blind scorers until the
// trial is concluded. The rule comes from the same map the server checked (lib/auth/page-routes);
// the path comes from the server (scripts/serve.mjs) or, under `next dev`, from the browser.
import Link from "next/link";
import { headers } from "next/headers";
import { ForbiddenText } from "@/components/ui/forbidden-text";
import { forbiddenText } from "@/lib/auth/page-routes";

export default async function Forbidden() {
  const path = (await headers()).get("x-rustline-path");
  return (
    <div className="max-w-2xl space-y-3">
      <h1 className="text-2xl font-semibold">Not open to you</h1>
      <p>{path ? forbiddenText(path) : <ForbiddenText />}</p>
      <p><Link className="link" href="/">Back to the lab home</Link></p>
    </div>
  );
}
