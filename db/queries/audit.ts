import "server-only";
import { and, desc, eq, lt, type SQL } from "drizzle-orm";
import { db } from "../client";
import { auditEvents, users } from "../schema";

export async function listAuditEvents({ labId, entity, userId, before, limit = 50 }: { labId: string; entity?: string; userId?: string; before?: number; limit?: number }) {
  const where: SQL[] = [eq(auditEvents.labId, labId)];
  if (entity) where.push(eq(auditEvents.entity, entity));
  if (userId) where.push(eq(auditEvents.userId, userId));
  if (before) where.push(lt(auditEvents.id, before));
  return db
    .select({ id: auditEvents.id, at: auditEvents.at, entity: auditEvents.entity, entityId: auditEvents.entityId, action: auditEvents.action, summary: auditEvents.summary, before: auditEvents.before, after: auditEvents.after, userName: users.name, userId: auditEvents.userId })
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
