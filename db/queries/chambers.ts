import "server-only";
import crypto from "node:crypto";
import { and, asc, count, desc, eq, ilike, inArray, isNotNull, isNull, sql, type SQL } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { hygrometerOffset, twoSaltCorrection } from "@/lib/climate/hygrometer-check";
import type { SaltId } from "@/lib/humidity/salts";
import type { ChamberInput, DesiccantEventKind } from "@/lib/validation/chambers";
import { recordAudit } from "../audit";
import { db, type DbOrTx } from "../client";
import { chamberTokens, chambers, desiccantEvents, hygrometerChecks, inspections, objectLocations, readingImports, readings, trialArms } from "../schema";

export type Chamber = typeof chambers.$inferSelect;
export type DesiccantEvent = typeof desiccantEvents.$inferSelect;

export const CHAMBER_SORTS = ["name", "kind", "setpoint", "temperature", "lastReading", "created"] as const;
export type ChamberSort = (typeof CHAMBER_SORTS)[number];

const lastReadingAt = sql<Date | null>`(select max(r.taken_at) from ${readings} r where r.chamber_id = "chambers"."id")`.mapWith((v) => (v ? new Date(v) : null));
const lastRh = sql<number | null>`(select r.rh_percent from ${readings} r where r.chamber_id = "chambers"."id" order by r.taken_at desc limit 1)`.mapWith((v) => (v == null ? null : Number(v)));

/** One page of a lab's chambers, sorted and filtered on the server. */
export async function listChambers({ labId, q, kind, archived = false, sort = "name", dir = "asc", page = 1, pageSize = 20 }: {
  labId: string; q?: string; kind?: string; archived?: boolean; sort?: ChamberSort; dir?: "asc" | "desc"; page?: number; pageSize?: number;
}) {
  const where: SQL[] = [eq(chambers.labId, labId), archived ? isNotNull(chambers.archivedAt) : isNull(chambers.archivedAt)];
  if (q) where.push(ilike(chambers.name, `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`));
  if (kind) where.push(sql`${chambers.kind}::text = ${kind}`);
  const col = { name: chambers.name, kind: chambers.kind, setpoint: chambers.setpointRhPercent, temperature: chambers.nominalTempC, lastReading: lastReadingAt, created: chambers.createdAt }[sort];
  const order = dir === "desc" ? sql`${col} desc nulls last` : sql`${col} asc nulls last`;
  const [rows, [{ total }]] = await Promise.all([
    db
      .select({ id: chambers.id, name: chambers.name, kind: chambers.kind, saltId: chambers.saltId, desiccantKind: chambers.desiccantKind, nominalTempC: chambers.nominalTempC, setpointRhPercent: chambers.setpointRhPercent, toleranceRhPercent: chambers.toleranceRhPercent, lastReadingAt, lastRh })
      .from(chambers)
      .where(and(...where))
      .orderBy(order, asc(chambers.id))
      .limit(pageSize)
      .offset((page - 1) * pageSize),
    db.select({ total: count() }).from(chambers).where(and(...where)),
  ]);
  return { rows, total };
}

/** The chamber, or not-found for a missing id or another lab's chamber. */
export async function getChamber({ labId, chamberId }: { labId: string; chamberId: string }, tx: DbOrTx = db): Promise<Chamber> {
  if (!/^[0-9a-f-]{36}$/i.test(chamberId)) throw new AppError("not-found", "No such chamber in this lab.");
  const [row] = await tx.select().from(chambers).where(and(eq(chambers.id, chamberId), eq(chambers.labId, labId))).limit(1);
  if (!row) throw new AppError("not-found", "No such chamber in this lab.");
  return row;
}

export async function createChamber({ labId, userId, values }: { labId: string; userId: string; values: ChamberInput }) {
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(chambers).values({ ...values, labId, createdBy: userId }).returning();
    await recordAudit(tx, { labId, userId, entity: "chamber", entityId: row.id, action: "create", summary: `Chamber "${row.name}" defined (${row.setpointRhPercent} ± ${row.toleranceRhPercent} %RH)`, after: row });
    return row;
  });
}

export async function updateChamber({ labId, userId, chamberId, values }: { labId: string; userId: string; chamberId: string; values: ChamberInput }) {
  return db.transaction(async (tx) => {
    const before = await getChamber({ labId, chamberId }, tx);
    const [after] = await tx.update(chambers).set({ ...values, updatedAt: new Date() }).where(and(eq(chambers.id, chamberId), eq(chambers.labId, labId))).returning();
    await recordAudit(tx, { labId, userId, entity: "chamber", entityId: chamberId, action: "update", summary: `Chamber "${after.name}" edited`, before, after });
    return after;
  });
}

export async function setChamberArchived({ labId, userId, chamberId, archived }: { labId: string; userId: string; chamberId: string; archived: boolean }) {
  return db.transaction(async (tx) => {
    const before = await getChamber({ labId, chamberId }, tx);
    if (archived) {
      // A storage location still holding objects or open locations would leave them nowhere.
      const [held] = await tx.select({ objects: sql<number>`(select count(*)::int from ${objectLocations} o where o.location_id = ${chamberId} and o.to_at is null)`,
        places: sql<number>`(select count(*)::int from ${chambers} c where c.parent_id = ${chamberId} and c.archived_at is null)` }).from(sql`(select 1) one`);
      if (held.objects > 0 || held.places > 0) {
        throw new AppError("conflict", `"${before.name}" still holds ${held.objects} object(s) and ${held.places} location(s); move them out before archiving it.`);
      }
    }
    const [after] = await tx.update(chambers).set({ archivedAt: archived ? new Date() : null, updatedAt: new Date() }).where(eq(chambers.id, chamberId)).returning();
    await recordAudit(tx, { labId, userId, entity: "chamber", entityId: chamberId, action: "update", summary: `Chamber "${after.name}" ${archived ? "archived" : "restored"}`, before: { archivedAt: before.archivedAt }, after: { archivedAt: after.archivedAt } });
    return after;
  });
}

// ——— Desiccant upkeep ———

export async function listDesiccantEvents({ labId, chamberId, limit = 100 }: { labId: string; chamberId: string; limit?: number }) {
  return db.select().from(desiccantEvents).where(and(eq(desiccantEvents.labId, labId), eq(desiccantEvents.chamberId, chamberId))).orderBy(desc(desiccantEvents.at), desc(desiccantEvents.createdAt)).limit(limit);
}

export async function addDesiccantEvent({ labId, userId, chamberId, kind, at, massG, notes }: { labId: string; userId: string; chamberId: string; kind: DesiccantEventKind; at: Date; massG?: number; notes: string }) {
  return db.transaction(async (tx) => {
    const chamber = await getChamber({ labId, chamberId }, tx);
    if (chamber.kind !== "desiccant") throw new AppError("invalid", "This chamber does not use a desiccant.");
    const [row] = await tx.insert(desiccantEvents).values({ labId, chamberId, kind, at, massG: massG ?? null, notes, createdBy: userId }).returning();
    await recordAudit(tx, { labId, userId, entity: "desiccant-event", entityId: row.id, action: "create", summary: `Desiccant ${kind} in "${chamber.name}"${massG != null ? ` (${massG} g)` : ""}`, after: row });
    return row;
  });
}


/** Latest inspection of a trial that has this chamber in an arm: the jar was opened then. */
export async function lastInspectionOpening({ labId, chamberId }: { labId: string; chamberId: string }): Promise<Date | null> {
  const [row] = await db
    .select({ doneAt: inspections.doneAt })
    .from(inspections)
    .innerJoin(trialArms, and(eq(trialArms.trialId, inspections.trialId), eq(trialArms.chamberId, chamberId)))
    .where(and(eq(inspections.labId, labId), isNotNull(inspections.doneAt)))
    .orderBy(desc(inspections.doneAt))
    .limit(1);
  return row?.doneAt ?? null;
}

// ——— Logger tokens ———

export function hashChamberToken(token: string) {
  return crypto.createHash("sha256").update(token).digest("hex");
}

/** A new token for one chamber; the plain token is returned once and only its SHA-256 is kept. */
export async function createChamberToken({ labId, userId, chamberId, label }: { labId: string; userId: string; chamberId: string; label: string }) {
  const token = `rlc_${crypto.randomBytes(32).toString("base64url")}`;
  const row = await db.transaction(async (tx) => {
    const chamber = await getChamber({ labId, chamberId }, tx);
    const [created] = await tx.insert(chamberTokens).values({ labId, chamberId, label, tokenHash: hashChamberToken(token), createdBy: userId }).returning();
    await recordAudit(tx, { labId, userId, entity: "chamber-token", entityId: created.id, action: "create", summary: `Logger token "${label}" created for "${chamber.name}"`, after: created });
    return created;
  });
  return { token, row };
}

export async function listChamberTokens({ labId, chamberId }: { labId: string; chamberId: string }) {
  return db
    .select({ id: chamberTokens.id, label: chamberTokens.label, createdAt: chamberTokens.createdAt, lastUsedAt: chamberTokens.lastUsedAt, revokedAt: chamberTokens.revokedAt })
    .from(chamberTokens)
    .where(and(eq(chamberTokens.labId, labId), eq(chamberTokens.chamberId, chamberId)))
    .orderBy(desc(chamberTokens.createdAt));
}

export async function revokeChamberToken({ labId, userId, chamberId, tokenId }: { labId: string; userId: string; chamberId: string; tokenId: string }) {
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(chamberTokens).where(and(eq(chamberTokens.id, tokenId), eq(chamberTokens.labId, labId), eq(chamberTokens.chamberId, chamberId)));
    if (!before) throw new AppError("not-found", "No such token for this chamber.");
    if (before.revokedAt) return before;
    const [after] = await tx.update(chamberTokens).set({ revokedAt: new Date() }).where(eq(chamberTokens.id, tokenId)).returning();
    await recordAudit(tx, { labId, userId, entity: "chamber-token", entityId: tokenId, action: "update", summary: `Logger token "${before.label}" revoked`, before, after });
    return after;
  });
}

// ——— Hygrometer checks ———

export type HygrometerCheck = typeof hygrometerChecks.$inferSelect;

export async function addHygrometerCheck({ labId, userId, chamberId, values }: {
  labId: string; userId: string; chamberId: string;
  values: { instrument: string; saltId: SaltId; tempC: number; readingRhPercent: number; salt2Id?: SaltId; reading2RhPercent?: number; checkedAt: Date; apply: boolean; notes: string };
}) {
  const offset = hygrometerOffset({ readingRhPercent: values.readingRhPercent, salt: values.saltId, tempC: values.tempC });
  const two = values.salt2Id !== undefined && values.reading2RhPercent !== undefined
    ? twoSaltCorrection({ tempC: values.tempC, first: { salt: values.saltId, readingRhPercent: values.readingRhPercent }, second: { salt: values.salt2Id, readingRhPercent: values.reading2RhPercent } })
    : null;
  return db.transaction(async (tx) => {
    const chamber = await getChamber({ labId, chamberId }, tx);
    const [row] = await tx.insert(hygrometerChecks).values({
      labId, chamberId, instrument: values.instrument, saltId: values.saltId, tempC: values.tempC, readingRhPercent: values.readingRhPercent,
      referenceRhPercent: offset.referenceRhPercent, offsetRhPercent: offset.offsetPercent,
      salt2Id: two ? values.salt2Id : null, reading2RhPercent: two ? values.reading2RhPercent : null,
      reference2RhPercent: two?.second.referenceRhPercent ?? null, slope: two?.slope ?? null,
      applied: values.apply, checkedAt: values.checkedAt, notes: values.notes, createdBy: userId,
    }).returning();
    const over = two ? `${values.saltId} and ${values.salt2Id} (offset ${offset.offsetPercent.toFixed(2)} %RH, slope ${two.slope.toFixed(3)}` : `${values.saltId} (offset ${offset.offsetPercent.toFixed(2)} %RH`;
    await recordAudit(tx, { labId, userId, entity: "hygrometer-check", entityId: row.id, action: "create", summary: `Hygrometer "${values.instrument}" checked over ${over}${values.apply ? ", applied" : ""}) from "${chamber.name}"`, after: row });
    return row;
  });
}

export async function setHygrometerCheckApplied({ labId, userId, checkId, applied }: { labId: string; userId: string; checkId: string; applied: boolean }) {
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(hygrometerChecks).where(and(eq(hygrometerChecks.id, checkId), eq(hygrometerChecks.labId, labId)));
    if (!before) throw new AppError("not-found", "No such hygrometer check in this lab.");
    const [after] = await tx.update(hygrometerChecks).set({ applied }).where(eq(hygrometerChecks.id, checkId)).returning();
    await recordAudit(tx, { labId, userId, entity: "hygrometer-check", entityId: checkId, action: "update", summary: `Offset of "${before.instrument}" ${applied ? "applied to readings from" : "no longer applied from"} ${before.checkedAt.toISOString().slice(0, 16)}`, before, after });
    return after;
  });
}

/** Checks of the given instruments (lab-wide: an offset belongs to the instrument, wherever it sits). */
export async function listHygrometerChecks({ labId, instruments }: { labId: string; instruments: string[] }) {
  if (instruments.length === 0) return [];
  return db.select().from(hygrometerChecks).where(and(eq(hygrometerChecks.labId, labId), inArray(hygrometerChecks.instrument, instruments))).orderBy(desc(hygrometerChecks.checkedAt));
}

/**
 * Instruments known for this chamber: those in its latest 2,000 readings, its imports and the
 * hygrometer checks recorded from it. (A distinct over every reading would scan a year of minutes.)
 */
export async function listChamberInstruments({ labId, chamberId }: { labId: string; chamberId: string }) {
  const res = await db.execute<{ instrument: string }>(sql`
    select instrument from (select instrument from ${readings} where lab_id = ${labId} and chamber_id = ${chamberId} order by taken_at desc limit 2000) latest
    union select instrument from ${readingImports} where lab_id = ${labId} and chamber_id = ${chamberId}
    union select instrument from ${hygrometerChecks} where lab_id = ${labId} and chamber_id = ${chamberId}`);
  return res.rows.map((r) => r.instrument).sort();
}
