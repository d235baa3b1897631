// What a viewer may see of a trial: the one view rule. Pages, route handlers, exports, the audit
// trail and home activity all ask it, so blinding does not depend on which screen is open.
// A blind scorer of a trial that is not concluded sees no arm (chamber, treatment) next to any
// specimen or photo, no result (comparison, report, exports) and no other scorer's score. When the
// trial is concluded the record is unblinded for everyone.
import { AppError } from "@/lib/auth/errors";

export type TrialStatus = "draft" | "running" | "concluded";
/** primary: the primary scorer; open: a scorer who sees treatments; blind: scores without them. */
export type ScorerRole = "primary" | "open" | "blind";

export type TrialAccess = {
  trialId: string;
  status: TrialStatus;
  /** Concluded: the record is locked; only notes may be added. */
  locked: boolean;
  /** The viewer's scorer assignment on this trial; null when not a scorer. */
  scorerRole: ScorerRole | null;
  /** True while the viewer scores blind and the trial is not concluded. */
  blind: boolean;
};

export const BLIND_HIDDEN = "hidden: you score this trial blind";
export const RESULTS_HIDDEN = "The comparison, report and exports of this trial are hidden from blind scorers until the trial is concluded.";

export function scorerRoleOf(assignment: { blind: boolean } | null, isPrimary: boolean): ScorerRole | null {
  if (!assignment) return null;
  if (assignment.blind) return "blind";
  return isPrimary ? "primary" : "open";
}

export function trialAccess(
  trial: { id: string; status: TrialStatus; primaryScorerId: string | null },
  viewer: { userId: string; assignment: { blind: boolean } | null },
): TrialAccess {
  const scorerRole = scorerRoleOf(viewer.assignment, trial.primaryScorerId === viewer.userId);
  const locked = trial.status === "concluded";
  return { trialId: trial.id, status: trial.status, locked, scorerRole, blind: scorerRole === "blind" && !locked };
}

/** Results (comparison, report, analysis JSON, outcome CSV, data package, agreement) need this. */
export function assertResultsVisible(access: Pick<TrialAccess, "blind">) {
  if (access.blind) throw new AppError("forbidden", RESULTS_HIDDEN);
}

type ArmFields = { armId?: unknown; armLabel?: unknown; chamberId?: unknown; chamberName?: unknown; treatmentId?: unknown; treatmentName?: unknown; treatmentKind?: unknown; swapReason?: unknown; reason?: unknown };

/**
 * Rows that pair specimens with arms, as a blind viewer may see them: every arm field emptied (a
 * swap or move reason names arms, the first placement's names the seed) and the rows in
 * specimen-label order (the arm order alone would reveal the groups).
 */
export function hideArms<T extends ArmFields & { label: string }>(rows: readonly T[], blind: boolean): T[] {
  if (!blind) return rows.slice();
  return rows.map(withoutArm).sort((a, b) => (a.label < b.label ? -1 : a.label > b.label ? 1 : 0));
}

function withoutArm<T extends ArmFields>(r: T): T {
  return { ...r, armId: null, armLabel: null, chamberId: null, chamberName: null, treatmentId: null, treatmentName: null, treatmentKind: null, swapReason: null, reason: BLIND_HIDDEN, blinded: true };
}

/** Rows of several trials (a specimen's placement history): arms hidden in the trials the viewer scores blind. */
export function hideArmsOfTrials<T extends ArmFields & { trialId: string }>(rows: readonly T[], blindTrialIds: ReadonlySet<string>): (T & { blinded?: boolean })[] {
  return rows.map((r) => (blindTrialIds.has(r.trialId) ? withoutArm(r) : r));
}

/**
 * A photo look-up as a blind scorer may see it: the image and its technical record, but nothing that
 * names the specimen (label, original file name) or ties it to an inspection day.
 */
export function photoForBlindViewer<T extends { specimenLabel?: string; filename: string; specimenId: string; inspectionId: string | null }>(view: T) {
  return {
    ...view, specimenId: null, specimenLabel: null, filename: BLIND_HIDDEN, inspectionId: null,
    capturedAtRaw: null, capturedOffset: null, capturedAt: null, check: null, checkAck: null, uploadedAt: null, uploadedBy: null, blinded: true,
  };
}

/**
 * A photo in a blind scorer's list of an inspection's photos: the specimen stays (the scorer knows
 * which specimen is which), the original file name and the uploader go, since names often carry jar
 * or treatment codes.
 */
export function photoInListForViewer<T extends { filename: string; uploadedBy: string | null; checkAck?: { note: string; by: string | null; at: string } | null }>(view: T, access: Pick<TrialAccess, "blind">): T {
  // A note on the capture time may name jars or treatments as file names do: a blind scorer sees that
  // the warning was looked at, not what was written.
  return access.blind ? { ...view, filename: BLIND_HIDDEN, uploadedBy: null, checkAck: view.checkAck ? { note: BLIND_HIDDEN, by: null, at: view.checkAck.at } : view.checkAck } : view;
}

export type AuditEventView = { userId: string | null; trialId: string | null; summary: string | null; before: unknown; after: unknown };

/**
 * An audit event as the viewer may read it: events of a trial the viewer scores blind, made by
 * someone else (allocation, swaps, moves, uploads, other scorers' scores), keep who and when but
 * not what.
 */
export function auditEventForViewer<T extends AuditEventView>(event: T, viewer: { userId: string; blindTrialIds: ReadonlySet<string> }): T & { hidden: boolean } {
  const hidden = !!event.trialId && viewer.blindTrialIds.has(event.trialId) && event.userId !== viewer.userId;
  return hidden ? { ...event, summary: BLIND_HIDDEN, before: null, after: null, hidden } : { ...event, hidden };
}

type PlacementSpan = { trialId: string; fromAt: Date | string | null };

/**
 * A specimen's history (weighings, chloride and akaganeite findings, treatments) as a blind scorer
 * may see it: prior treatments and earlier findings are history, not the arm, and stay visible; an
 * entry dated on or after the day the specimen entered a trial the viewer scores blind is hidden
 * (a weighing or a treatment recorded during the trial can tell a coated arm from a bare one).
 * Returns the entries shown and how many were hidden.
 */
export function historyForViewer<T extends { on: string }>(entries: readonly T[], placements: readonly PlacementSpan[], blindTrialIds: ReadonlySet<string>): { shown: T[]; hidden: number } {
  const starts = placements.filter((p) => p.fromAt && blindTrialIds.has(p.trialId)).map((p) => new Date(p.fromAt!).toISOString().slice(0, 10));
  if (starts.length === 0) return { shown: entries.slice(), hidden: 0 };
  const from = starts.reduce((a, b) => (a < b ? a : b));
  const shown = entries.filter((e) => e.on < from);
  return { shown, hidden: entries.length - shown.length };
}

/**
 * The trial a history entry dated `on` belongs to, for its audit event (so the audit trail hides it
 * from that trial's blind scorers as historyForViewer hides it on the page): the latest placement of
 * the specimen that had started by that day; null before any placement.
 */
export function trialOfHistoryDate(on: string, placements: readonly PlacementSpan[]): string | null {
  let best: { trialId: string; start: string } | null = null;
  for (const p of placements) {
    if (!p.fromAt) continue;
    const start = new Date(p.fromAt).toISOString().slice(0, 10);
    if (start <= on && (!best || start >= best.start)) best = { trialId: p.trialId, start };
  }
  return best?.trialId ?? null;
}
