// Every page under app/(lab) as a route pattern, found on disk: the page-access and blinding tests
// walk these, so a new page is covered without anyone listing it.
import fs from "node:fs";
import path from "node:path";
import { walk } from "./registry";
import { repoRoot } from "./s3";

export type PageEntry = { file: string; route: string; source: string };

export function listLabPages(): PageEntry[] {
  const base = path.join(repoRoot, "app", "(lab)");
  return walk(base).filter((f) => /[/\\]page\.tsx$/.test(f)).sort().map((f) => {
    const rel = path.relative(base, path.dirname(f)).split(path.sep).filter(Boolean).join("/");
    return { file: path.relative(repoRoot, f), route: `/${rel}`, source: fs.readFileSync(f, "utf8") };
  });
}

/** Route handlers' GET patterns under app/api (from the registry of tests/support/registry). */
export function fillRoute(route: string, ids: Record<string, string>): string {
  return route.replace(/\[([^\]]+)\]/g, (_m, name: string) => {
    const v = ids[name];
    if (!v) throw new Error(`${route}: the test has no value for [${name}]; add one to the test's id table`);
    return v;
  });
}
