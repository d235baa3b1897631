import { auditEvents } from "./schema";
import type { DbOrTx } from "./client";

export type AuditInput = {
  labId: string;
  userId: string | null;
  entity: string;
  entityId: string;
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

/** Write one audit event; call it with the same transaction as the change it describes. */
export async function recordAudit(tx: DbOrTx, e: AuditInput) {
  await tx.insert(auditEvents).values({
    labId: e.labId,
    userId: e.userId,
    entity: e.entity,
    entityId: e.entityId,
    action: e.action,
    summary: e.summary ?? null,
    before: clean(e.before),
    after: clean(e.after),
  });
}
