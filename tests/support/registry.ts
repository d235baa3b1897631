// Every server action and route handler of the app, found on disk and imported, with the permission
// each declares (labAction / labRoute attach it). The authorization matrix and the fuzz tests walk this.
// Server actions are every export of a module whose first statement is "use server", wherever it sits
// (app/_actions or anywhere else); a "use server" inside a function body is an inline action that the
// wrapper cannot see, listed by inlineServerActions() so a test can refuse it.
import fs from "node:fs";
import path from "node:path";
import { ROLES, type Permission, type Role } from "@/lib/auth/permissions";
import { repoRoot } from "./s3";

export type ActionEntry = { file: string; name: string; permission: Permission | null; fn: unknown };
export type RouteEntry = { file: string; route: string; method: string; permission: Permission | null; fn: unknown };

/** Every file below a folder. */
export function walk(dir: string, out: string[] = []): string[] {
  for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) walk(p, out);
    else out.push(p);
  }
  return out;
}

const appDir = path.join(repoRoot, "app");
const SOURCE_DIRS = ["app", "components", "lib", "db", "storage"];
const DIRECTIVE = /^\s*(?:(?:\/\/[^\n]*|\/\*[\s\S]*?\*\/)\s*)*["']use server["']/;

function sourceFiles() {
  return SOURCE_DIRS.flatMap((d) => (fs.existsSync(path.join(repoRoot, d)) ? walk(path.join(repoRoot, d)) : []))
    .filter((f) => /\.(ts|tsx|js|mjs)$/.test(f) && !f.includes(`${path.sep}node_modules${path.sep}`)).sort();
}

/** Files whose first statement is the "use server" directive: every export is a server action. */
export function serverActionFiles(): string[] {
  return sourceFiles().filter((f) => DIRECTIVE.test(fs.readFileSync(f, "utf8")));
}

/** Files with a "use server" directive that is not their first statement (inline server actions). */
export function inlineServerActions(): string[] {
  return sourceFiles().filter((f) => /^\s*["']use server["'];?\s*$/m.test(fs.readFileSync(f, "utf8").replace(DIRECTIVE, "")))
    .map((f) => path.relative(repoRoot, f));
}

export async function listActions(): Promise<ActionEntry[]> {
  const files = serverActionFiles();
  const out: ActionEntry[] = [];
  for (const f of files) {
    const mod = (await import(f)) as Record<string, unknown>;
    for (const [name, fn] of Object.entries(mod)) {
      if (typeof fn !== "function") continue;
      const permission = (fn as { permission?: Permission }).permission ?? null;
      out.push({ file: path.relative(repoRoot, f), name, permission, fn });
    }
  }
  return out;
}

export const METHODS = ["GET", "HEAD", "OPTIONS", "POST", "PUT", "PATCH", "DELETE"];

export async function listRoutes(): Promise<RouteEntry[]> {
  const files = walk(path.join(appDir, "api")).filter((f) => /[/\\]route\.ts$/.test(f)).sort();
  const out: RouteEntry[] = [];
  for (const f of files) {
    const route = "/" + path.relative(appDir, path.dirname(f)).split(path.sep).join("/");
    const mod = (await import(f)) as Record<string, unknown>;
    for (const m of METHODS) {
      const fn = mod[m];
      if (typeof fn !== "function") continue;
      out.push({ file: path.relative(repoRoot, f), route, method: m, permission: (fn as { permission?: Permission }).permission ?? null, fn });
    }
  }
  return out;
}

/**
 * The Markdown table printed in DEVELOPERS.md; `rolesFor` is the test's own hand-written role table,
 * which the test has checked against the code.
 */
export function matrixMarkdown(actions: ActionEntry[], routes: RouteEntry[], publicRoutes: Record<string, string>, rolesFor: (p: Permission) => readonly Role[]): string {
  const head = `| entry point | permission | ${ROLES.join(" | ")} | signed out |\n|---|---|${ROLES.map(() => "---").join("|")}|---|`;
  const cell = (p: Permission | null, r: Role) => (p ? (rolesFor(p).includes(r) ? "✓" : "refused") : "");
  const rows: string[] = [];
  for (const a of actions) {
    if (!a.permission) continue;
    rows.push(`| action \`${a.name}\` (${a.file.replace(/^app\/_actions\//, "").replace(/\.tsx?$/, "")}) | ${a.permission} | ${ROLES.map((r) => cell(a.permission, r)).join(" | ")} | refused |`);
  }
  for (const r of routes) {
    if (r.permission) rows.push(`| ${r.method} \`${r.route}\` | ${r.permission} | ${ROLES.map((x) => cell(r.permission, x)).join(" | ")} | 401 |`);
    else rows.push(`| ${r.method} \`${r.route}\` | ${publicRoutes[`${r.method} ${r.route}`] ?? "?"} | ${ROLES.map(() => "–").join(" | ")} | – |`);
  }
  return `${head}\n${rows.join("\n")}`;
}
