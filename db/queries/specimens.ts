import "server-only";
import { and, asc, desc, eq, ilike, inArray, isNotNull, isNull, or, sql, type SQL } from "drizzle-orm";
import { AppError, pgErrorOf } from "@/lib/auth/errors";
import { can, type Permission, type Role } from "@/lib/auth/permissions";
import { parseSpecimenCsv, type CsvRowError, type SpecimenInput, type SpecimenListParams } from "@/lib/validation/specimens";
import { recordAudit } from "../audit";
import { db } from "../client";
import { auditEvents, chambers, placements, specimens, treatments, trials } from "../schema";
import { isUuid } from "@/lib/ids";
import { currentPlaces, openFirstStays } from "./object-locations";
import { registerConflicts, resolvePlaces } from "./register-import";

export type Actor = { userId: string; labId: string; role: Role };
export type Specimen = typeof specimens.$inferSelect;

/** Write queries check the role themselves too, so every caller (action, route, script) gets the same answer. */
export function assertAllowed(actor: Actor, permission: Permission) {
  if (!can(actor.role, permission)) throw new AppError("forbidden", `Your role (${actor.role}) does not allow this.`);
}

const SORT_COLUMNS = {
  label: specimens.label,
  findName: specimens.findName,
  materialClass: specimens.materialClass,
  massG: specimens.massG,
  createdAt: specimens.createdAt,
} as const;

function listWhere({ labId, q, materialClass }: { labId: string; q?: string; materialClass?: string }) {
  const where: SQL[] = [eq(specimens.labId, labId)];
  if (q) {
    const pattern = `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    where.push(or(ilike(specimens.label, pattern), ilike(specimens.findName, pattern))!);
  }
  if (materialClass) where.push(eq(specimens.materialClass, materialClass as Specimen["materialClass"]));
  return and(...where);
}

/** One page of specimens, sorted and filtered on the server; label breaks ties so pages are stable. */
export async function listSpecimens({ labId, q, materialClass, sort, dir, page, pageSize }: { labId: string } & SpecimenListParams) {
  const where = listWhere({ labId, q, materialClass });
  const col = SORT_COLUMNS[sort];
  const order = dir === "desc" ? sql`${col} desc nulls last` : sql`${col} asc nulls last`;
  // One round trip: the count is an uncorrelated scalar subquery beside the page (see listInspections).
  const counted = db.select({ total: sql<number>`count(*)::int` }).from(specimens).where(where);
  const page_ = await db.select({ row: specimens, total: sql<number>`(${counted})` }).from(specimens).where(where)
    .orderBy(order, asc(specimens.label), asc(specimens.id)).limit(pageSize).offset((page - 1) * pageSize);
  const total = page_.length ? page_[0].total : page === 1 ? 0 : (await counted)[0].total;
  return { rows: page_.map((r) => r.row), total, page, pageSize };
}

export { isUuid };

export async function getSpecimen({ labId, specimenId }: { labId: string; specimenId: string }) {
  if (!isUuid(specimenId)) return null;
  const [row] = await db.select().from(specimens).where(and(eq(specimens.labId, labId), eq(specimens.id, specimenId))).limit(1);
  return row ?? null;
}

export async function requireSpecimen(args: { labId: string; specimenId: string }) {
  const row = await getSpecimen(args);
  if (!row) throw new AppError("not-found", "No such specimen in this lab.");
  return row;
}

async function labelTaken(labId: string, label: string, exceptId?: string) {
  const rows = await db.select({ id: specimens.id }).from(specimens)
    .where(and(eq(specimens.labId, labId), sql`lower(${specimens.label}) = lower(${label})`)).limit(2);
  return rows.some((r) => r.id !== exceptId);
}

async function accessionTaken(labId: string, accession: string | null | undefined, exceptId?: string) {
  if (!accession) return false;
  const rows = await db.select({ id: specimens.id }).from(specimens)
    .where(and(eq(specimens.labId, labId), sql`lower(${specimens.accessionNumber}) = lower(${accession})`)).limit(2);
  return rows.some((r) => r.id !== exceptId);
}
const accessionConflict = (a: string) => new AppError("conflict", `Accession number "${a}" is already used in this lab.`, { accessionNumber: ["This accession number is already used in this lab."] });

/** A race past the checks above meets the database's unique indexes: the same field errors as the checks give. */
function raceConflict(err: unknown, input: { label?: string; accessionNumber?: string | null }): never {
  const { code, constraint } = pgErrorOf(err);
  if (code === "23505") {
    if (constraint === "specimens_lab_accession_idx" && input.accessionNumber) throw accessionConflict(input.accessionNumber);
    if (constraint === "specimens_lab_label_idx" && input.label) throw labelConflict(input.label);
  }
  throw err;
}

const labelConflict = (label: string) => new AppError("conflict", `A specimen labelled "${label}" already exists in this lab.`, { label: ["This label is already used in this lab."] });

export async function createSpecimen({ actor, input }: { actor: Actor; input: SpecimenInput }) {
  assertAllowed(actor, "specimens.write");
  if (await labelTaken(actor.labId, input.label)) throw labelConflict(input.label);
  if (await accessionTaken(actor.labId, input.accessionNumber)) throw accessionConflict(input.accessionNumber!);
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(specimens).values({ ...input, massG: input.massG ?? null, labId: actor.labId, createdBy: actor.userId }).returning();
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "specimen", entityId: row.id, action: "create", summary: `Specimen ${row.label} added`, after: row });
    return row;
  }).catch((err) => raceConflict(err, input));
}

export async function updateSpecimen({ actor, specimenId, input }: { actor: Actor; specimenId: string; input: Partial<Omit<SpecimenInput, "massG" | "accessionNumber">> & { massG?: number | null; accessionNumber?: string | null } }) {
  assertAllowed(actor, "specimens.write");
  if (!isUuid(specimenId)) throw new AppError("not-found", "No such specimen in this lab.");
  if (input.label && (await labelTaken(actor.labId, input.label, specimenId))) throw labelConflict(input.label);
  if (await accessionTaken(actor.labId, input.accessionNumber, specimenId)) throw accessionConflict(input.accessionNumber!);
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(specimens).where(and(eq(specimens.labId, actor.labId), eq(specimens.id, specimenId))).for("update");
    if (!before) throw new AppError("not-found", "No such specimen in this lab.");
    const patch = Object.fromEntries(Object.entries(input).filter(([, v]) => v !== undefined));
    const [after] = await tx.update(specimens).set({ ...patch, updatedAt: new Date() }).where(eq(specimens.id, specimenId)).returning();
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "specimen", entityId: specimenId, action: "update", summary: `Specimen ${after.label} edited`, before, after });
    return after;
  }).catch((err) => raceConflict(err, input));
}

export type ImportResult = { ok: true; created: number } | { ok: false; errors: CsvRowError[]; total: number };

/**
 * All or nothing: every row must be valid and every label new (in the file and in the lab), else
 * nothing is written and each problem is reported with its line.
 */
export async function importSpecimens({ actor, csv }: { actor: Actor; csv: string }): Promise<ImportResult> {
  assertAllowed(actor, "specimens.write");
  const parsed = parseSpecimenCsv(csv);
  const errors = [...parsed.errors];
  const labels = parsed.rows.map((r) => r.value.label.toLowerCase());
  for (let i = 0; i < labels.length; i += 1000) {
    const chunk = labels.slice(i, i + 1000);
    const existing = await db.select({ label: specimens.label }).from(specimens)
      .where(and(eq(specimens.labId, actor.labId), inArray(sql`lower(${specimens.label})`, chunk)));
    const taken = new Set(existing.map((e) => e.label.toLowerCase()));
    for (const r of parsed.rows.slice(i, i + 1000)) {
      if (taken.has(r.value.label.toLowerCase())) errors.push({ line: r.line, field: "label", message: `Label "${r.value.label}" already exists in this lab.` });
    }
  }
  errors.push(...(await registerConflicts(actor.labId, parsed.rows)));
  const places = await resolvePlaces(actor.labId, parsed.rows);
  errors.push(...places.errors);
  if (errors.length) return { ok: false, errors: errors.sort((a, b) => a.line - b.line), total: parsed.total };
  const at = new Date();
  try {
    await db.transaction(async (tx) => {
      for (let i = 0; i < parsed.rows.length; i += 1000) {
        const slice = parsed.rows.slice(i, i + 1000);
        const rows = await tx.insert(specimens).values(slice.map((r) => ({ ...r.value, massG: r.value.massG ?? null, accessionNumber: r.value.accessionNumber ?? null, labId: actor.labId, createdBy: actor.userId }))).returning();
        // One audit event per specimen, written in bulk (same shape as recordAudit).
        await tx.insert(auditEvents).values(rows.map((row) => ({
          labId: actor.labId, userId: actor.userId, entity: "specimen", entityId: row.id, action: "create" as const,
          summary: `Specimen ${row.label} imported from CSV`, after: JSON.parse(JSON.stringify(row)),
        })));
        const stays = rows.flatMap((row, k) => {
          const place = places.byLine.get(slice[k].line);
          return place ? [{ specimenId: row.id, label: row.label, locationId: place.id, locationName: place.path, at }] : [];
        });
        await openFirstStays(tx, { labId: actor.labId, userId: actor.userId, stays });
      }
    });
  } catch (err) {
    const code = (err as { code?: string; cause?: { code?: string } }).code ?? (err as { cause?: { code?: string } }).cause?.code;
    if (code === "23505") return { ok: false, errors: [{ line: 0, message: "Another import added one of these labels or accession numbers meanwhile. Nothing was imported; try again." }], total: parsed.total };
    if (code === "23514") return { ok: false, errors: [{ line: 0, message: "A location named in the file was changed meanwhile. Nothing was imported; try again." }], total: parsed.total };
    throw err;
  }
  return { ok: true, created: parsed.rows.length };
}

/** The register for the CSV: each object with its current place (blank where the viewer may not see it). */
export async function exportSpecimens({ labId, userId, q, materialClass }: { labId: string; userId: string; q?: string; materialClass?: string }) {
  const [rows, { places }] = await Promise.all([
    db.select().from(specimens).where(listWhere({ labId, q, materialClass })).orderBy(asc(specimens.label)).limit(100_000),
    currentPlaces({ labId, userId }),
  ]);
  return rows.map((r) => ({ ...r, location: places.get(r.id)?.path ?? null }));
}

/** Where a specimen has been: every placement with its trial, chamber and treatment. */
export async function listSpecimenPlacements({ labId, specimenId }: { labId: string; specimenId: string }) {
  return db
    .select({
      id: placements.id, trialId: trials.id, trialTitle: trials.title, trialStatus: trials.status,
      chamberId: chambers.id, chamberName: chambers.name, treatmentId: treatments.id, treatmentName: treatments.name,
      fromAt: placements.fromAt, toAt: placements.toAt, reason: placements.reason,
    })
    .from(placements)
    .innerJoin(trials, eq(trials.id, placements.trialId))
    .innerJoin(chambers, eq(chambers.id, placements.chamberId))
    .innerJoin(treatments, eq(treatments.id, placements.treatmentId))
    .where(and(eq(placements.labId, labId), eq(placements.specimenId, specimenId)))
    .orderBy(desc(placements.fromAt));
}

/** Specimens for the allocation picker, each with the running trial it currently sits in (if any). */
export async function listSpecimenChoices({ labId }: { labId: string }) {
  const [rows, busy] = await Promise.all([
    db.select({ id: specimens.id, label: specimens.label, materialClass: specimens.materialClass, findName: specimens.findName })
      .from(specimens).where(eq(specimens.labId, labId)).orderBy(asc(specimens.label)).limit(20_000),
    db.select({ specimenId: placements.specimenId, trialTitle: trials.title })
      .from(placements).innerJoin(trials, eq(trials.id, placements.trialId))
      .where(and(eq(placements.labId, labId), isNull(placements.toAt), isNotNull(placements.fromAt), eq(trials.status, "running"))),
  ]);
  const busyBy = new Map(busy.map((b) => [b.specimenId, b.trialTitle]));
  return rows.map((r) => ({ ...r, busyIn: busyBy.get(r.id) ?? null }));
}
