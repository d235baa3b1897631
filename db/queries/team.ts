import "server-only";
// The people named in a trial's team fields must be current members of the lab whose role can do the
// job (lib/trials/team). One check for the design form, the team forms, the Scoring tab and the API.
import { and, eq, inArray } from "drizzle-orm";
import type { Role } from "@/lib/auth/permissions";
import { findUnqualified, personError, type PersonField } from "@/lib/trials/team";
import { AppError } from "@/lib/auth/errors";
import type { Tx } from "../client";
import { memberships, trialMembers } from "../schema";

type Named = { technicianIds?: string[]; scorers?: { userId: string }[]; primaryScorerId?: string | null };

/** 422 (nothing written yet) when a named person is not a member of the lab or cannot do the job. */
export async function assertTeamPeople(tx: Tx, labId: string, input: Named, formField?: Partial<Record<PersonField, string>>) {
  const byField: [PersonField, string[]][] = [
    ["technicianIds", input.technicianIds ?? []],
    ["scorers", (input.scorers ?? []).map((s) => s.userId)],
    ["primaryScorerId", input.primaryScorerId ? [input.primaryScorerId] : []],
  ];
  const ids = [...new Set(byField.flatMap(([, v]) => v))];
  if (!ids.length) return;
  const rows = await tx.select({ userId: memberships.userId, role: memberships.role }).from(memberships)
    .where(and(eq(memberships.labId, labId), inArray(memberships.userId, ids)));
  const roleOf = new Map(rows.map((r) => [r.userId, r.role as Role]));
  for (const [field, userIds] of byField) {
    const bad = findUnqualified(field, userIds, roleOf);
    if (bad) throw personError(field, bad.role, formField?.[field]);
  }
}

/**
 * The primary scorer, as given or as kept, is one of the trial's scorers, as given or as stored: a
 * primary scorer named alone must already score the trial, and new scorers must keep the current one.
 */
export async function assertPrimaryIsScorer(tx: Tx, trialId: string, change: { primaryScorerId?: string | null; scorers?: { userId: string }[]; currentPrimaryId: string | null }) {
  const primary = change.primaryScorerId !== undefined ? change.primaryScorerId : change.currentPrimaryId;
  if (!primary) return;
  const scorerIds = change.scorers !== undefined
    ? change.scorers.map((s) => s.userId)
    : (await tx.select({ userId: trialMembers.userId }).from(trialMembers).where(and(eq(trialMembers.trialId, trialId), eq(trialMembers.role, "scorer")))).map((r) => r.userId);
  if (scorerIds.includes(primary)) return;
  throw change.primaryScorerId !== undefined
    ? new AppError("invalid", "The primary scorer must be one of the trial's scorers. Nothing was saved.", { primaryScorerId: ["Choose one of the trial's scorers."] })
    : new AppError("invalid", "The new scorers leave out the trial's primary scorer. Keep them among the scorers or choose a new primary scorer. Nothing was saved.", { primaryScorerId: ["Choose one of the new scorers as primary scorer."] });
}
