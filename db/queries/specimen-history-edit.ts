import "server-only";
// Correcting or deleting a wrong history entry of a specimen: the row and its audit event (before
// and after; the reason for a delete) in one transaction. An entry a blind scorer may not see on
// the specimen page (historyForViewer) is "not found" for them here too.
import { and, eq } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { historyForViewer, trialOfHistoryDate } from "@/lib/trials/access";
import { historyPermission, type HistoryEntryDeleteInput, type HistoryEntryEditInput, type HistoryKind } from "@/lib/validation/specimen-history";
import { recordAudit } from "../audit";
import { db } from "../client";
import { placements, specimens } from "../schema";
import { HISTORY_TABLES, historyValues, type HistoryRow } from "./specimen-history-kinds";
import { assertAllowed, type Actor } from "./specimens";
import { blindTrialIds } from "./trial-access";

const notFound = () => new AppError("not-found", "No such history entry of this specimen.");

/** Locks the entry of the actor's lab (and the specimen), checks the actor may see it; returns the row and the specimen's placements. */
async function lockEntry(tx: Parameters<Parameters<typeof db.transaction>[0]>[0], actor: Actor, kind: HistoryKind, specimenId: string, entryId: string) {
  const { table, on } = HISTORY_TABLES[kind];
  const [specimen] = await tx.select({ id: specimens.id, label: specimens.label }).from(specimens)
    .where(and(eq(specimens.labId, actor.labId), eq(specimens.id, specimenId))).for("share");
  if (!specimen) throw notFound();
  const [row] = (await tx.select().from(table)
    .where(and(eq(table.labId, actor.labId), eq(table.specimenId, specimenId), eq(table.id, entryId))).for("update")) as HistoryRow[];
  if (!row) throw notFound();
  const spans = await tx.select({ trialId: placements.trialId, fromAt: placements.fromAt }).from(placements)
    .where(and(eq(placements.labId, actor.labId), eq(placements.specimenId, specimenId)));
  const blind = await blindTrialIds({ labId: actor.labId, userId: actor.userId });
  const day = on(row as never);
  if (historyForViewer([{ on: day }], spans, blind).hidden > 0) throw notFound();
  return { specimen, row, spans, day };
}

/** Correct a history entry in place, audited with before and after. */
export async function updateHistoryEntry({ actor, input }: { actor: Actor; input: HistoryEntryEditInput }) {
  assertAllowed(actor, historyPermission(input.kind));
  const { table, entity, name, on } = HISTORY_TABLES[input.kind];
  return db.transaction(async (tx) => {
    const { specimen, row, spans, day: was } = await lockEntry(tx, actor, input.kind, input.specimenId, input.entryId);
    const [after] = (await tx.update(table).set(historyValues(input) as never).where(and(eq(table.labId, actor.labId), eq(table.id, row.id))).returning()) as HistoryRow[];
    const day = on(after as never);
    await recordAudit(tx, {
      // The old row is in the event: it stays hidden from the blind scorers of the trial it was dated in.
      labId: actor.labId, userId: actor.userId, entity, entityId: row.id, trialId: trialOfHistoryDate(was, spans) ?? trialOfHistoryDate(day, spans), action: "update",
      summary: `${name} of ${specimen.label} on ${day} corrected`, before: row, after,
    });
    return { id: row.id, specimenLabel: specimen.label, name };
  });
}

/** Delete a wrong history entry, audited with the row and the reason. */
export async function deleteHistoryEntry({ actor, input }: { actor: Actor; input: HistoryEntryDeleteInput }) {
  assertAllowed(actor, historyPermission(input.kind));
  const { table, entity, name } = HISTORY_TABLES[input.kind];
  return db.transaction(async (tx) => {
    const { specimen, row, spans, day } = await lockEntry(tx, actor, input.kind, input.specimenId, input.entryId);
    await tx.delete(table).where(and(eq(table.labId, actor.labId), eq(table.id, row.id)));
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity, entityId: row.id, trialId: trialOfHistoryDate(day, spans), action: "delete",
      summary: `${name} of ${specimen.label} on ${day} deleted: ${input.reason}`, before: row,
    });
    return { id: row.id, specimenLabel: specimen.label, name };
  });
}
