import "server-only";
import { and, desc, eq, lt, type SQL } from "drizzle-orm";
import { db } from "../client";
import { auditEventForViewer } from "@/lib/trials/access";
import { auditEvents, users } from "../schema";
import { blindTrialIds } from "./trial-access";

/**
 * The lab's audit events, newest first, as this viewer may read them: events of a trial the viewer
 * scores blind, made by others, keep who and when but read "hidden: you score this trial blind".
 */
export async function listAuditEvents({ labId, viewerId, entity, userId, before, limit = 50 }: { labId: string; viewerId: string; entity?: string; userId?: string; before?: number; limit?: number }) {
  const [rows, blind] = await Promise.all([listRawAuditEvents({ labId, entity, userId, before, limit }), blindTrialIds({ labId, userId: viewerId })]);
  return rows.map((e) => auditEventForViewer(e, { userId: viewerId, blindTrialIds: blind }));
}

async function listRawAuditEvents({ labId, entity, userId, before, limit }: { labId: string; entity?: string; userId?: string; before?: number; limit: number }) {
  const where: SQL[] = [eq(auditEvents.labId, labId)];
  if (entity) where.push(eq(auditEvents.entity, entity));
  if (userId) where.push(eq(auditEvents.userId, userId));
  if (before) where.push(lt(auditEvents.id, before));
  return db
    .select({ id: auditEvents.id, at: auditEvents.at, entity: auditEvents.entity, entityId: auditEvents.entityId, trialId: auditEvents.trialId, action: auditEvents.action, summary: auditEvents.summary, before: auditEvents.before, after: auditEvents.after, userName: users.name, userId: auditEvents.userId })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.userId))
    .where(and(...where))
    .orderBy(desc(auditEvents.id))
    .limit(limit);
}

export async function listAuditEntities({ labId }: { labId: string }) {
  const rows = await db.selectDistinct({ entity: auditEvents.entity }).from(auditEvents).where(eq(auditEvents.labId, labId));
  return rows.map((r) => r.entity).sort();
}
