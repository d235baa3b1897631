import { auditEvents } from "./schema";
import type { DbOrTx } from "./client";

export type AuditInput = {
  labId: string;
  userId: string | null;
  entity: string;
  entityId: string;
  /** The trial the change belongs to; inferred for trial entities and rows that carry a trialId. */
  trialId?: string | null;
  action: "create" | "update" | "delete";
  summary?: string;
  before?: unknown;
  after?: unknown;
};

// Dates and other values are stored as JSON; strip secrets before they reach the trail.
function clean(v: unknown): unknown {
  if (v == null) return null;
  return JSON.parse(JSON.stringify(v, (k, val) => (k === "passwordHash" || k === "tokenHash" ? undefined : val)));
}

function trialOf(e: AuditInput): string | null {
  if (e.trialId !== undefined) return e.trialId;
  if (e.entity === "trial") return e.entityId;
  if (e.entity === "trial_member") return e.entityId.split(":")[0] || null;
  for (const v of [e.after, e.before]) {
    const id = v && typeof v === "object" ? (v as { trialId?: unknown }).trialId : undefined;
    if (typeof id === "string") return id;
  }
  return null;
}

/** Write one audit event; call it with the same transaction as the change it describes. */
export async function recordAudit(tx: DbOrTx, e: AuditInput) {
  await tx.insert(auditEvents).values({
    labId: e.labId,
    userId: e.userId,
    entity: e.entity,
    entityId: e.entityId,
    trialId: trialOf(e),
    action: e.action,
    summary: e.summary ?? null,
    before: clean(e.before),
    after: clean(e.after),
  });
}
