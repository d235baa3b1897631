import "server-only";
import { and, asc, eq, isNull, ne, sql } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { buildTree, isStorageKind, wouldCycle } from "@/lib/collection/locations";
import type { LocationInput } from "@/lib/validation/collection";
import { recordAudit } from "../audit";
import { db, type DbOrTx, type Tx } from "../client";
import { chambers, memberships, objectLocations, users } from "../schema";
import { getChamber } from "./chambers";

export type LocationRow = { id: string; name: string; parentId: string | null; locationKind: string; kind: string; keeperName: string | null; archivedAt: Date | null; setpointRhPercent: number; toleranceRhPercent: number; objectCount: number };

/**
 * The lab's storage locations (trial jars left out) as a tree, each with the number of objects in it now
 * that the viewer may see: `hidden` (hiddenObjectIds) are objects in a trial they score blind, whose place is hidden.
 */
export async function listLocationTree({ labId, hidden = new Set(), archived = false }: { labId: string; hidden?: ReadonlySet<string>; archived?: boolean }) {
  const [rows, open] = await Promise.all([
    db.select({
      id: chambers.id, name: chambers.name, parentId: chambers.parentId, locationKind: chambers.locationKind, kind: chambers.kind,
      keeperName: users.name, archivedAt: chambers.archivedAt, setpointRhPercent: chambers.setpointRhPercent, toleranceRhPercent: chambers.toleranceRhPercent,
    }).from(chambers).leftJoin(users, eq(users.id, chambers.keeperId))
      .where(and(eq(chambers.labId, labId), ne(chambers.locationKind, "trial-jar"), archived ? undefined : isNull(chambers.archivedAt)))
      .orderBy(asc(chambers.name)),
    db.select({ locationId: objectLocations.locationId, specimenId: objectLocations.specimenId }).from(objectLocations)
      .where(and(eq(objectLocations.labId, labId), isNull(objectLocations.toAt))),
  ]);
  const n = new Map<string, number>();
  for (const o of open) if (!hidden.has(o.specimenId)) n.set(o.locationId, (n.get(o.locationId) ?? 0) + 1);
  return buildTree<LocationRow>(rows.map((r) => ({ ...r, objectCount: n.get(r.id) ?? 0 })));
}

/** A storage location of this lab that takes objects now: not-found for another lab's, refused for a jar or an archived one. */
export async function requireStorageLocation(tx: DbOrTx, { labId, locationId, field = "locationId" }: { labId: string; locationId: string; field?: string }) {
  const row = await getChamber({ labId, chamberId: locationId }, tx);
  if (!isStorageKind(row.locationKind)) throw new AppError("invalid", `"${row.name}" is a trial jar; objects go into trial jars through the trial's placements.`, { [field]: ["Choose a storage location, not a trial jar."] });
  if (row.archivedAt) throw new AppError("conflict", `"${row.name}" is archived; restore it before putting anything in it.`, { [field]: ["This location is archived."] });
  return row;
}

async function checkPlace(tx: Tx, labId: string, id: string | null, values: Pick<LocationInput, "parentId" | "keeperId">) {
  // The whole lab's tree is read under the same advisory lock the database trigger takes.
  await tx.execute(sql`select pg_advisory_xact_lock(728191, hashtext(${labId}::text))`);
  if (values.parentId) {
    await requireStorageLocation(tx, { labId, locationId: values.parentId, field: "parentId" });
    if (id) {
      const all = await tx.select({ id: chambers.id, parentId: chambers.parentId }).from(chambers).where(eq(chambers.labId, labId));
      const parentOf = new Map(all.map((r) => [r.id, r.parentId]));
      if (wouldCycle(id, values.parentId, parentOf)) {
        throw new AppError("invalid", "A location cannot sit inside itself or inside one of the locations it holds.", { parentId: ["Choose a location that is not this one or inside it."] });
      }
    }
  }
  if (values.keeperId) {
    const [m] = await tx.select({ userId: memberships.userId }).from(memberships).where(and(eq(memberships.labId, labId), eq(memberships.userId, values.keeperId)));
    if (!m) throw new AppError("invalid", "The keeper must be a member of this lab.", { keeperId: ["Choose a member of this lab."] });
  }
}

export async function createLocation({ labId, userId, values }: { labId: string; userId: string; values: LocationInput }) {
  return db.transaction(async (tx) => {
    await checkPlace(tx, labId, null, values);
    const [row] = await tx.insert(chambers).values({ ...values, parentId: values.parentId ?? null, keeperId: values.keeperId ?? null, labId, createdBy: userId }).returning();
    await recordAudit(tx, { labId, userId, entity: "chamber", entityId: row.id, action: "create", summary: `Storage location "${row.name}" (${row.locationKind}) defined`, after: row });
    return row;
  });
}

/** Fields of a location to change; a key left out stays as it is (`parentId` or `keeperId` given as none clears it). */
export type LocationPatch = Partial<Omit<LocationInput, "keeperId">> & { keeperId?: string | null };

export async function updateLocation({ labId, userId, locationId, values }: { labId: string; userId: string; locationId: string; values: LocationPatch }) {
  return db.transaction(async (tx) => {
    const before = await getChamber({ labId, chamberId: locationId }, tx);
    if (!isStorageKind(before.locationKind)) throw new AppError("invalid", "A trial jar has no place in the storage tree; edit it as a chamber.", { locationId: ["Choose a storage location, not a trial jar."] });
    await checkPlace(tx, labId, locationId, { parentId: values.parentId, keeperId: values.keeperId ?? undefined });
    const patch = { ...values, ...("parentId" in values ? { parentId: values.parentId ?? null } : {}), ...("keeperId" in values ? { keeperId: values.keeperId ?? null } : {}) };
    const [after] = await tx.update(chambers).set({ ...patch, updatedAt: new Date() }).where(and(eq(chambers.id, locationId), eq(chambers.labId, labId))).returning();
    await recordAudit(tx, { labId, userId, entity: "chamber", entityId: locationId, action: "update", summary: `Storage location "${after.name}" edited`, before, after });
    return after;
  });
}

/** Path names ("Store 2 / Cabinet B / Drawer 3") of every location of the lab (a few hundred rows), by id. */
export async function locationPaths({ labId }: { labId: string }, q: DbOrTx = db) {
  const rows = await q.select({ id: chambers.id, name: chambers.name, parentId: chambers.parentId, archivedAt: chambers.archivedAt, locationKind: chambers.locationKind })
    .from(chambers).where(eq(chambers.labId, labId));
  const byId = new Map(rows.map((r) => [r.id, r]));
  const out = new Map<string, { path: string; archived: boolean; storage: boolean }>();
  for (const r of rows) {
    const names: string[] = [];
    const seen = new Set<string>();
    for (let at: typeof r | undefined = r; at && !seen.has(at.id); at = at.parentId ? byId.get(at.parentId) : undefined) {
      seen.add(at.id);
      names.unshift(at.name);
    }
    out.set(r.id, { path: names.join(" / "), archived: r.archivedAt !== null, storage: isStorageKind(r.locationKind) });
  }
  return out;
}
