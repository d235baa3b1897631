import "server-only";
import { and, eq, inArray, sql } from "drizzle-orm";
import type { CsvParseResult, CsvRowError } from "@/lib/validation/specimens";
import { db } from "../client";
import { specimens } from "../schema";
import { locationPaths } from "./locations";

type Row = CsvParseResult["rows"][number];

/** Accession numbers of the file already used in the lab (case-insensitive), by line. */
export async function registerConflicts(labId: string, rows: readonly Row[]): Promise<CsvRowError[]> {
  const withAccession = rows.filter((r) => r.value.accessionNumber);
  const errors: CsvRowError[] = [];
  for (let i = 0; i < withAccession.length; i += 1000) {
    const chunk = withAccession.slice(i, i + 1000);
    const existing = await db.select({ a: specimens.accessionNumber }).from(specimens)
      .where(and(eq(specimens.labId, labId), inArray(sql`lower(${specimens.accessionNumber})`, chunk.map((r) => r.value.accessionNumber!.toLowerCase()))));
    const taken = new Set(existing.map((e) => e.a!.toLowerCase()));
    for (const r of chunk) {
      if (taken.has(r.value.accessionNumber!.toLowerCase())) errors.push({ line: r.line, field: "accession_number", message: `Accession number "${r.value.accessionNumber}" is already used in this lab.` });
    }
  }
  return errors;
}

/**
 * The `location` cell of each row → a storage location of this lab, matched by its path
 * ("Store 2 / Cabinet B") or, when unique, its name alone (case-insensitive). Unknown, ambiguous,
 * archived or trial-jar names are errors at the line.
 */
export async function resolvePlaces(labId: string, rows: readonly Row[]) {
  const byLine = new Map<number, { id: string; path: string }>();
  const errors: CsvRowError[] = [];
  if (!rows.some((r) => r.location)) return { byLine, errors };
  const paths = await locationPaths({ labId });
  const byPath = new Map<string, { id: string; path: string; archived: boolean; storage: boolean }[]>();
  const add = (key: string, v: { id: string; path: string; archived: boolean; storage: boolean }) => byPath.set(key, [...(byPath.get(key) ?? []), v]);
  for (const [id, p] of paths) {
    const v = { id, ...p };
    add(norm(p.path), v);
    const leaf = p.path.split(" / ").pop()!;
    if (norm(leaf) !== norm(p.path)) add(`leaf:${norm(leaf)}`, v);
  }
  for (const r of rows) {
    if (!r.location) continue;
    const key = norm(r.location);
    const found = byPath.get(key) ?? byPath.get(`leaf:${key}`) ?? [];
    const err = (message: string) => errors.push({ line: r.line, field: "location", message });
    if (found.length === 0) err(`No location "${r.location}" in this lab. Use its name or its path as the collection page shows it.`);
    else if (found.length > 1) err(`"${r.location}" names ${found.length} locations; write the path, e.g. "${found[0].path}".`);
    else if (!found[0].storage) err(`"${found[0].path}" is a trial jar; objects go into trial jars through a trial.`);
    else if (found[0].archived) err(`"${found[0].path}" is archived; restore it or choose another location.`);
    else byLine.set(r.line, { id: found[0].id, path: found[0].path });
  }
  return { byLine, errors };
}

const norm = (s: string) => s.trim().toLowerCase().split("/").map((p) => p.trim()).join(" / ");
