import "server-only";
import { and, desc, eq, sql } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { importCsv, type CsvImportError } from "@/lib/climate/csv-import";
import type { ApiReading, CsvImportOptionsInput } from "@/lib/validation/chambers";
import { recordAudit } from "../audit";
import { db, type DbOrTx } from "../client";
import { chamberTokens, chambers, readingImports, readings } from "../schema";
import { getChamber, hashChamberToken } from "./chambers";

export type NewReading = { takenAt: Date; rhPercent: number; tempC: number | null; dewPointC: number | null; instrument: string };
type Source = "manual" | "csv" | "api";

const BATCH = 10_000;

/**
 * Insert readings in batches through unnest() (one statement per 10,000 rows instead of one bind
 * parameter per value); a row that already exists for chamber + time + instrument is skipped.
 * Returns how many were stored.
 */
export async function insertReadings(
  tx: DbOrTx,
  { labId, chamberId, source, importId = null, rows, onBatch }: { labId: string; chamberId: string; source: Source; importId?: string | null; rows: readonly NewReading[]; onBatch?: (done: number) => void | Promise<void> },
): Promise<number> {
  let stored = 0;
  for (let i = 0; i < rows.length; i += BATCH) {
    const part = rows.slice(i, i + BATCH);
    const result = await tx.execute<{ n: string }>(sql`
      with ins as (
        insert into ${readings} (lab_id, chamber_id, taken_at, rh_percent, temp_c, dew_point_c, source, instrument, import_id)
        select ${labId}::uuid, ${chamberId}::uuid, u.t, u.rh, u.tc, u.dp, ${source}::reading_source, u.ins, ${importId}::uuid
        from unnest(${sql.param(part.map((r) => r.takenAt.toISOString()))}::timestamptz[],
                    ${sql.param(part.map((r) => r.rhPercent))}::float8[],
                    ${sql.param(part.map((r) => r.tempC))}::float8[],
                    ${sql.param(part.map((r) => r.dewPointC))}::float8[],
                    ${sql.param(part.map((r) => r.instrument))}::text[]) as u(t, rh, tc, dp, ins)
        on conflict (chamber_id, taken_at, instrument) do nothing
        returning 1
      ) select count(*)::text as n from ins`);
    stored += Number(result.rows[0]?.n ?? 0);
    await onBatch?.(Math.min(rows.length, i + BATCH));
  }
  return stored;
}

export async function addManualReading({ labId, userId, chamberId, reading }: { labId: string; userId: string; chamberId: string; reading: Omit<NewReading, "dewPointC"> }) {
  return db.transaction(async (tx) => {
    const chamber = await getChamber({ labId, chamberId }, tx);
    if (chamber.archivedAt) throw new AppError("conflict", "This chamber is archived; restore it before adding readings.");
    const [row] = await tx.insert(readings).values({ labId, chamberId, ...reading, source: "manual" }).onConflictDoNothing().returning();
    if (!row) {
      throw new AppError("conflict", "Nothing was saved.", { takenAt: [`"${reading.instrument}" already has a reading at this time in this chamber.`] });
    }
    await recordAudit(tx, { labId, userId, entity: "reading", entityId: String(row.id), action: "create", summary: `Reading ${reading.rhPercent} %RH typed in for "${chamber.name}"`, after: row });
    return row;
  });
}

export type ImportProgress = { phase: "parsing" } | { phase: "storing"; done: number; total: number };
export type ImportOutcome =
  | { ok: false; errors: CsvImportError[]; totalErrors: number }
  | { ok: true; importId: string; stored: number; duplicatesInFile: number; duplicatesExisting: number; firstAt: Date; lastAt: Date };

const MAX_ERRORS_SHOWN = 200;

/**
 * All-or-nothing import of a logger CSV: parse everything first; any row error means nothing is
 * stored and the errors (with line numbers) come back. Otherwise one transaction stores the rows,
 * the reading_imports record and the audit event, so a failure half way leaves no trace.
 */
export async function importReadingsFromCsv({ labId, userId, chamberId, filename, text, options, onProgress }: {
  labId: string; userId: string; chamberId: string; filename: string; text: string; options: CsvImportOptionsInput;
  onProgress?: (p: ImportProgress) => void | Promise<void>;
}): Promise<ImportOutcome> {
  const chamber = await getChamber({ labId, chamberId });
  if (chamber.archivedAt) throw new AppError("conflict", "This chamber is archived; restore it before importing readings.");
  await onProgress?.({ phase: "parsing" });
  let parsed: ReturnType<typeof importCsv>;
  try {
    parsed = importCsv(text, {
      mapping: options.mapping,
      delimiter: options.delimiter,
      skipLines: options.skipLines,
      hasHeader: options.hasHeader,
      timeZone: options.timeZone,
      temperatureUnit: options.temperatureUnit,
      dateFormat: options.dateFormat,
    });
  } catch (err) {
    if (err instanceof RangeError) return { ok: false, errors: [{ line: 0, message: err.message }], totalErrors: 1 };
    throw err;
  }
  if (parsed.errors.length > 0) {
    return { ok: false, errors: parsed.errors.slice(0, MAX_ERRORS_SHOWN), totalErrors: parsed.errors.length };
  }
  if (parsed.rows.length === 0) return { ok: false, errors: [{ line: 0, message: "The file has no readings below the header." }], totalErrors: 1 };
  const rows: NewReading[] = parsed.rows.map((r) => ({ takenAt: r.takenAt, rhPercent: r.rhPercent, tempC: r.tempC, dewPointC: r.dewPointC ?? null, instrument: options.instrument }));
  const total = rows.length;
  return db.transaction(async (tx) => {
    const [imp] = await tx.insert(readingImports).values({ labId, chamberId, filename, instrument: options.instrument, createdBy: userId }).returning();
    const stored = await insertReadings(tx, { labId, chamberId, source: "csv", importId: imp.id, rows, onBatch: (done) => onProgress?.({ phase: "storing", done, total }) });
    const duplicatesExisting = total - stored;
    const duplicatesSkipped = parsed.duplicatesSkipped + duplicatesExisting;
    const [after] = await tx.update(readingImports).set({ rowsImported: stored, duplicatesSkipped }).where(eq(readingImports.id, imp.id)).returning();
    await recordAudit(tx, {
      labId, userId, entity: "reading-import", entityId: imp.id, action: "create",
      summary: `Imported ${stored} readings from "${filename}" into "${chamber.name}" (${duplicatesSkipped} duplicates skipped)`,
      after: { ...after, options: { ...options } },
    });
    return { ok: true as const, importId: imp.id, stored, duplicatesInFile: parsed.duplicatesSkipped, duplicatesExisting, firstAt: rows[0].takenAt, lastAt: rows[rows.length - 1].takenAt };
  });
}

export async function listReadingImports({ labId, chamberId, limit = 10 }: { labId: string; chamberId: string; limit?: number }) {
  return db.select().from(readingImports).where(and(eq(readingImports.labId, labId), eq(readingImports.chamberId, chamberId))).orderBy(desc(readingImports.createdAt)).limit(limit);
}

export async function listRecentReadings({ labId, chamberId, limit = 10 }: { labId: string; chamberId: string; limit?: number }) {
  return db.select().from(readings).where(and(eq(readings.labId, labId), eq(readings.chamberId, chamberId))).orderBy(desc(readings.takenAt)).limit(limit);
}

/**
 * Logger API: store readings posted with a chamber token. An unknown or revoked token is
 * "unauthenticated" (401); a valid token used on another chamber's URL is "not-found" (404), so a
 * token never reveals which other chambers exist.
 */
export async function authenticateChamberToken({ token, chamberId }: { token: string; chamberId: string }) {
  const [found] = await db
    .select({ id: chamberTokens.id, labId: chamberTokens.labId, chamberId: chamberTokens.chamberId, label: chamberTokens.label, revokedAt: chamberTokens.revokedAt, chamberName: chambers.name, archivedAt: chambers.archivedAt })
    .from(chamberTokens)
    .innerJoin(chambers, eq(chambers.id, chamberTokens.chamberId))
    .where(eq(chamberTokens.tokenHash, hashChamberToken(token)))
    .limit(1);
  if (!found || found.revokedAt) throw new AppError("unauthenticated", "The token is not valid or has been revoked.");
  if (found.chamberId !== chamberId) throw new AppError("not-found", "No such chamber for this token.");
  if (found.archivedAt) throw new AppError("conflict", "This chamber is archived; readings are not accepted.");
  return found;
}

export async function postReadingsWithToken({ token, chamberId, body }: { token: string; chamberId: string; body: ApiReading[] }) {
  const found = await authenticateChamberToken({ token, chamberId });
  const rows: NewReading[] = body.map((r) => ({ takenAt: new Date(r.takenAt), rhPercent: r.rhPercent, tempC: r.tempC ?? null, dewPointC: r.dewPointC ?? null, instrument: r.instrument ?? "logger" }));
  return db.transaction(async (tx) => {
    const stored = await insertReadings(tx, { labId: found.labId, chamberId, source: "api", rows });
    await tx.update(chamberTokens).set({ lastUsedAt: new Date() }).where(eq(chamberTokens.id, found.id));
    await recordAudit(tx, {
      labId: found.labId, userId: null, entity: "reading-batch", entityId: found.id, action: "create",
      summary: `${stored} reading(s) posted to "${found.chamberName}" with logger token "${found.label}"${rows.length - stored ? ` (${rows.length - stored} duplicates skipped)` : ""}`,
      after: { received: rows.length, stored, first: rows[0]?.takenAt, last: rows[rows.length - 1]?.takenAt },
    });
    return { received: rows.length, stored, duplicatesSkipped: rows.length - stored };
  });
}

// ——— Chart and analysis ———
// In readings-series.ts (hourly summaries + the hours that leave the band); re-exported so the
// chamber page and its components keep importing from here.
