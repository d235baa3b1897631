import "server-only";
// Correcting or deleting a wrong history entry of a specimen: the row and its audit event (before
// and after; the reason for a delete) in one transaction. An entry a blind scorer may not see on
// the specimen page (historyForViewer) is "not found" for them here too.
import { and, eq } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { massToTenthMg, tenthMgToGramsText } from "@/lib/specimens/history";
import { historyForViewer, trialOfHistoryDate } from "@/lib/trials/access";
import { historyPermission, type HistoryEntryDeleteInput, type HistoryEntryEditInput } from "@/lib/validation/specimen-history";
import { recordAudit } from "../audit";
import { db } from "../client";
import { akaganeiteChecks, chlorideTests, massMeasurements, placements, priorTreatments, specimens } from "../schema";
import { assertAllowed, type Actor } from "./specimens";
import { blindTrialIds } from "./trial-access";

const KINDS = {
  chloride: { table: chlorideTests, entity: "chloride_test", name: "Chloride test", on: (r: { testedOn: string }) => r.testedOn },
  akaganeite: { table: akaganeiteChecks, entity: "akaganeite_check", name: "Akaganeite check", on: (r: { checkedOn: string }) => r.checkedOn },
  treatment: { table: priorTreatments, entity: "prior_treatment", name: "Treatment", on: (r: { treatedOn: string }) => r.treatedOn },
  mass: { table: massMeasurements, entity: "mass_measurement", name: "Weighing", on: (r: { measuredOn: string }) => r.measuredOn },
} as const;
type Kind = keyof typeof KINDS;
type AnyRow = Record<string, unknown> & { id: string };

const notFound = () => new AppError("not-found", "No such history entry of this specimen.");

/** Locks the entry of the actor's lab (and the specimen), checks the actor may see it; returns the row and the specimen's placements. */
async function lockEntry(tx: Parameters<Parameters<typeof db.transaction>[0]>[0], actor: Actor, kind: Kind, specimenId: string, entryId: string) {
  const { table, on } = KINDS[kind];
  const [specimen] = await tx.select({ id: specimens.id, label: specimens.label }).from(specimens)
    .where(and(eq(specimens.labId, actor.labId), eq(specimens.id, specimenId))).for("share");
  if (!specimen) throw notFound();
  const [row] = (await tx.select().from(table)
    .where(and(eq(table.labId, actor.labId), eq(table.specimenId, specimenId), eq(table.id, entryId))).for("update")) as AnyRow[];
  if (!row) throw notFound();
  const spans = await tx.select({ trialId: placements.trialId, fromAt: placements.fromAt }).from(placements)
    .where(and(eq(placements.labId, actor.labId), eq(placements.specimenId, specimenId)));
  const blind = await blindTrialIds({ labId: actor.labId, userId: actor.userId });
  const day = on(row as never);
  if (historyForViewer([{ on: day }], spans, blind).hidden > 0) throw notFound();
  return { specimen, row, spans, day };
}

/** The columns an edit sets, by kind (the mass normalised to grams to 0.1 mg as on entry). */
function valuesOf(input: HistoryEntryEditInput) {
  switch (input.kind) {
    case "chloride": return { testedOn: input.testedOn, method: input.method, result: input.result, notes: input.notes };
    case "akaganeite": return { checkedOn: input.checkedOn, method: input.method, seen: input.seen === "yes", notes: input.notes };
    case "treatment": return { treatedOn: input.treatedOn, treatment: input.treatment, notes: input.notes };
    case "mass": return { measuredOn: input.measuredOn, massG: tenthMgToGramsText(massToTenthMg(input.mass, input.unit)!), notes: input.notes };
  }
}

/** Correct a history entry in place, audited with before and after. */
export async function updateHistoryEntry({ actor, input }: { actor: Actor; input: HistoryEntryEditInput }) {
  assertAllowed(actor, historyPermission(input.kind));
  const { table, entity, name, on } = KINDS[input.kind];
  return db.transaction(async (tx) => {
    const { specimen, row, spans, day: was } = await lockEntry(tx, actor, input.kind, input.specimenId, input.entryId);
    const [after] = (await tx.update(table).set(valuesOf(input) as never).where(and(eq(table.labId, actor.labId), eq(table.id, row.id))).returning()) as AnyRow[];
    const day = on(after as never);
    await recordAudit(tx, {
      // The old row is in the event: it stays hidden from the blind scorers of the trial it was dated in.
      labId: actor.labId, userId: actor.userId, entity, entityId: row.id, trialId: trialOfHistoryDate(was, spans) ?? trialOfHistoryDate(day, spans), action: "update",
      summary: `${name} of ${specimen.label} on ${day} corrected`, before: row, after,
    });
    return { id: row.id, specimenLabel: specimen.label };
  });
}

/** Delete a wrong history entry, audited with the row and the reason. */
export async function deleteHistoryEntry({ actor, input }: { actor: Actor; input: HistoryEntryDeleteInput }) {
  assertAllowed(actor, historyPermission(input.kind));
  const { table, entity, name } = KINDS[input.kind];
  return db.transaction(async (tx) => {
    const { specimen, row, spans, day } = await lockEntry(tx, actor, input.kind, input.specimenId, input.entryId);
    await tx.delete(table).where(and(eq(table.labId, actor.labId), eq(table.id, row.id)));
    await recordAudit(tx, {
      labId: actor.labId, userId: actor.userId, entity, entityId: row.id, trialId: trialOfHistoryDate(day, spans), action: "delete",
      summary: `${name} of ${specimen.label} on ${day} deleted: ${input.reason}`, before: row,
    });
    return { id: row.id, specimenLabel: specimen.label };
  });
}
