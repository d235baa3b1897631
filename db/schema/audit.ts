import { bigserial, index, jsonb, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { labs, users } from "./auth";
import { auditActionEnum } from "./enums";

export const auditEvents = pgTable("audit_events", {
  id: bigserial("id", { mode: "number" }).primaryKey(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  userId: uuid("user_id").references(() => users.id, { onDelete: "set null" }),
  at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
  entity: text("entity").notNull(),
  entityId: text("entity_id").notNull(),
  // The trial an event belongs to, if any: the audit trail hides other people's events of a trial
  // from its blind scorers until it is concluded (lib/trials/access).
  trialId: uuid("trial_id"),
  action: auditActionEnum("action").notNull(),
  summary: text("summary"),
  before: jsonb("before"),
  after: jsonb("after"),
}, (t) => [
  index("audit_lab_at_idx").on(t.labId, t.at),
  index("audit_lab_entity_idx").on(t.labId, t.entity, t.entityId),
  index("audit_lab_user_idx").on(t.labId, t.userId, t.at),
  index("audit_lab_trial_idx").on(t.labId, t.trialId),
]);
