import "server-only";
// The one trial loader, the row lock writes take, and the viewer's access to a trial (scorer role,
// blind, locked) as decided by lib/trials/access. Every page, route and query loads trials here.
import { and, eq, ne } from "drizzle-orm";
import { cache } from "react";
import { AppError } from "@/lib/auth/errors";
import { isUuid } from "@/lib/ids";
import { trialAccess, type TrialAccess } from "@/lib/trials/access";
import { db, type DbOrTx, type Tx } from "../client";
import { trialMembers, trials } from "../schema";

export type Trial = typeof trials.$inferSelect;

const notFound = () => new AppError("not-found", "No such trial in this lab.");

/** A trial of the lab; another lab's trial, a missing one or a malformed id is "not found". */
export async function getTrial({ labId, trialId }: { labId: string; trialId: string }): Promise<Trial> {
  if (!isUuid(trialId)) throw notFound();
  const [t] = await db.select().from(trials).where(and(eq(trials.labId, labId), eq(trials.id, trialId))).limit(1);
  if (!t) throw notFound();
  return t;
}

/**
 * The trial row locked inside a write's transaction: "update" for writes to the trial itself,
 * "share" for writes beside it (photos, scores), so a concurrent conclusion waits for them.
 */
export async function lockTrial(tx: Tx, labId: string, trialId: string, mode: "update" | "share" = "update"): Promise<Trial> {
  if (!isUuid(trialId)) throw notFound();
  const q = tx.select().from(trials).where(and(eq(trials.labId, labId), eq(trials.id, trialId)));
  const [t] = await (mode === "update" ? q.for("update") : q.for("share"));
  if (!t) throw notFound();
  return t;
}

/** The viewer's scorer assignment on a trial (blind or not), or null when not a scorer. */
export async function scorerAssignment(q: DbOrTx, { labId, trialId, userId }: { labId: string; trialId: string; userId: string }) {
  const [row] = await q.select({ blind: trialMembers.blind }).from(trialMembers)
    .where(and(eq(trialMembers.labId, labId), eq(trialMembers.trialId, trialId), eq(trialMembers.userId, userId), eq(trialMembers.role, "scorer")));
  return row ?? null;
}

/** The trial and what this viewer may see of it, in one query. */
export async function getTrialAccess({ labId, trialId, userId }: { labId: string; trialId: string; userId: string }): Promise<{ trial: Trial; access: TrialAccess }> {
  if (!isUuid(trialId)) throw notFound();
  const [row] = await db.select({ trial: trials, blind: trialMembers.blind }).from(trials)
    .leftJoin(trialMembers, and(eq(trialMembers.trialId, trials.id), eq(trialMembers.userId, userId), eq(trialMembers.role, "scorer")))
    .where(and(eq(trials.labId, labId), eq(trials.id, trialId))).limit(1);
  if (!row) throw notFound();
  return { trial: row.trial, access: trialAccess(row.trial, { userId, assignment: row.blind === null ? null : { blind: row.blind } }) };
}

/** Trials this viewer scores blind right now (not concluded): for pages that span several trials. */
export function blindTrialIds({ labId, userId }: { labId: string; userId: string }): Promise<ReadonlySet<string>> {
  return blindTrialIdsOf(labId, userId);
}

// Once per rendered request (React cache; outside a render, such as in the worker or a server action,
// every call reads): a page's rules, objects and lists all ask.
const blindTrialIdsOf = cache(async (labId: string, userId: string): Promise<ReadonlySet<string>> => {
  const rows = await db.select({ trialId: trialMembers.trialId }).from(trialMembers)
    .innerJoin(trials, eq(trials.id, trialMembers.trialId))
    .where(and(eq(trialMembers.labId, labId), eq(trialMembers.userId, userId), eq(trialMembers.role, "scorer"), eq(trialMembers.blind, true), ne(trials.status, "concluded")));
  return new Set(rows.map((r) => r.trialId));
});
