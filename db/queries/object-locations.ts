import "server-only";
import { and, desc, eq, inArray, isNotNull, isNull } from "drizzle-orm";
import { AppError, pgErrorOf } from "@/lib/auth/errors";
import { checkMove } from "@/lib/collection/stays";
import type { MoveObjectInput } from "@/lib/validation/collection";
import { recordAudit } from "../audit";
import { db, type DbOrTx, type Tx } from "../client";
import { chambers, objectLocations, placements, specimens, trials } from "../schema";
import { locationPaths, requireStorageLocation } from "./locations";
import { blindTrialIds } from "./trial-access";

export type ObjectStay = typeof objectLocations.$inferSelect;

const pgCode = (err: unknown) => pgErrorOf(err).code;

/**
 * Move an object (a register entry) to a storage location at `at`: the open stay closes at `at` and
 * a new one opens, with the audit event, in one transaction. The database refuses two stays at once.
 */
export async function moveObject({ labId, userId, input }: { labId: string; userId: string; input: MoveObjectInput }) {
  try {
    return await db.transaction(async (tx) => {
      const [object] = await tx.select({ id: specimens.id, label: specimens.label }).from(specimens)
        .where(and(eq(specimens.labId, labId), eq(specimens.id, input.specimenId))).for("update");
      if (!object) throw new AppError("not-found", "No such object in this lab.", { specimenId: ["Choose an object of this lab."] });
      const [inTrial] = await runningTrialsOf(tx, labId, [object.id]);
      if (inTrial) throw new AppError("conflict", `${object.label} is in the running trial "${inTrial.trialTitle}"; it moves through the trial until the trial ends.`, { specimenId: ["This object is in a running trial."] });
      // Held for share: archiving the location (an update of its row) waits for this move.
      await tx.select({ id: chambers.id }).from(chambers).where(and(eq(chambers.id, input.locationId), eq(chambers.labId, labId))).for("share");
      const location = await requireStorageLocation(tx, { labId, locationId: input.locationId });
      const [open] = await tx.select().from(objectLocations).where(and(eq(objectLocations.specimenId, object.id), isNull(objectLocations.toAt)));
      const check = checkMove(open ?? null, location.id, input.at);
      if (!check.ok) throw new AppError("invalid", check.message, { [check.field]: [check.message] });
      if (open) await tx.update(objectLocations).set({ toAt: input.at }).where(eq(objectLocations.id, open.id));
      const [stay] = await tx.insert(objectLocations).values({ labId, specimenId: object.id, locationId: location.id, fromAt: input.at, reason: input.reason, createdBy: userId }).returning();
      await recordAudit(tx, {
        labId, userId, entity: "object-location", entityId: stay.id, action: "create",
        summary: `${object.label} moved to "${location.name}"${open ? "" : " (first recorded place)"}`, before: open ?? null, after: stay,
      });
      return stay;
    });
  } catch (err) {
    const code = pgCode(err);
    if (code === "23P01" || code === "23505") throw new AppError("conflict", "The object is recorded in another place at that time; nothing was changed.", { at: ["The object is somewhere else then."] });
    throw err;
  }
}

/** First places for objects created in one import (inside the import's transaction). */
export async function openFirstStays(tx: Tx, { labId, userId, stays }: { labId: string; userId: string; stays: { specimenId: string; label: string; locationId: string; locationName: string; at: Date }[] }) {
  if (stays.length === 0) return;
  const rows = await tx.insert(objectLocations).values(stays.map((s) => ({ labId, specimenId: s.specimenId, locationId: s.locationId, fromAt: s.at, reason: "CSV import", createdBy: userId }))).returning();
  for (const [i, row] of rows.entries()) {
    await recordAudit(tx, { labId, userId, entity: "object-location", entityId: row.id, action: "create", summary: `${stays[i].label} placed in "${stays[i].locationName}" (CSV import)`, after: row });
  }
}

/** Open placements of these objects (all when `ids` is null) in running trials, with the trial's title. */
async function runningTrialsOf(q: DbOrTx, labId: string, ids: string[] | null) {
  return q.select({ specimenId: placements.specimenId, trialTitle: trials.title }).from(placements).innerJoin(trials, eq(trials.id, placements.trialId))
    .where(and(eq(placements.labId, labId), isNull(placements.toAt), isNotNull(placements.fromAt), eq(trials.status, "running"), ids ? inArray(placements.specimenId, ids) : undefined));
}

/** Objects whose place this viewer may not see: those in a trial the viewer scores blind (stays could mirror arms). */
export async function hiddenObjectIds({ labId, userId }: { labId: string; userId: string }, q: DbOrTx = db): Promise<Set<string>> {
  const blind = [...(await blindTrialIds({ labId, userId }))];
  if (blind.length === 0) return new Set();
  const rows = await q.selectDistinct({ specimenId: placements.specimenId }).from(placements).where(and(eq(placements.labId, labId), inArray(placements.trialId, blind)));
  return new Set(rows.map((r) => r.specimenId));
}

/** An object's stays, newest first, with location paths; empty (hidden) when the viewer may not see them. */
export async function listObjectStays({ labId, userId, specimenId }: { labId: string; userId: string; specimenId: string }) {
  const hidden = await hiddenObjectIds({ labId, userId });
  if (hidden.has(specimenId)) return { hidden: true as const, stays: [] };
  const [stays, paths] = await Promise.all([
    db.select().from(objectLocations).where(and(eq(objectLocations.labId, labId), eq(objectLocations.specimenId, specimenId))).orderBy(desc(objectLocations.fromAt)),
    locationPaths({ labId }),
  ]);
  return { hidden: false as const, stays: stays.map((s) => ({ ...s, path: paths.get(s.locationId)?.path ?? "" })) };
}

/** Where each object is now (location id and path) and the running trial it sits in, hidden ones left out. */
export async function currentPlaces({ labId, userId }: { labId: string; userId: string }) {
  const [open, paths, hidden, running] = await Promise.all([
    db.select({ specimenId: objectLocations.specimenId, locationId: objectLocations.locationId, fromAt: objectLocations.fromAt }).from(objectLocations)
      .where(and(eq(objectLocations.labId, labId), isNull(objectLocations.toAt))),
    locationPaths({ labId }),
    hiddenObjectIds({ labId, userId }),
    runningTrialsOf(db, labId, null),
  ]);
  const out = new Map<string, { locationId: string; path: string; fromAt: Date }>();
  for (const o of open) if (!hidden.has(o.specimenId)) out.set(o.specimenId, { locationId: o.locationId, path: paths.get(o.locationId)?.path ?? "", fromAt: o.fromAt });
  const inTrial = new Map(running.filter((r) => !hidden.has(r.specimenId)).map((r) => [r.specimenId, r.trialTitle]));
  return { places: out, hidden, inTrial };
}

