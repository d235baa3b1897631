// Where each object of the register (a specimen) is kept: one row per stay in a storage location.
// An object is in one place at a time: the partial unique index allows one open stay per object and
// the exclusion constraint of migration 0022 (btree_gist) refuses any two overlapping stays.
import { sql } from "drizzle-orm";
import { check, doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { labs, users } from "./auth";
import { chambers } from "./chambers";
import { specimens } from "./specimens";

export const objectLocations = pgTable("object_locations", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  specimenId: uuid("specimen_id").notNull().references(() => specimens.id, { onDelete: "cascade" }),
  locationId: uuid("location_id").notNull().references(() => chambers.id, { onDelete: "restrict" }),
  fromAt: timestamp("from_at", { withTimezone: true }).notNull(),
  toAt: timestamp("to_at", { withTimezone: true }),
  reason: text("reason").notNull().default(""),
  createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [
  uniqueIndex("object_locations_open_idx").on(t.specimenId).where(sql`${t.toAt} is null`),
  index("object_locations_lab_location_idx").on(t.labId, t.locationId, t.fromAt),
  index("object_locations_lab_specimen_idx").on(t.labId, t.specimenId, t.fromAt),
  check("object_locations_order", sql`${t.toAt} is null or ${t.toAt} > ${t.fromAt}`),
]);

// An e-mail owed to a location's keeper because the location stayed out of rule longer than its alert
// delay. One row per exceedance (its start) and recipient, claimed before sending: a scan after a
// restart finds the row and sends nothing twice; a failed mail leaves sent_at empty for the next scan.
export const locationAlerts = pgTable("location_alerts", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  locationId: uuid("location_id").notNull().references(() => chambers.id, { onDelete: "cascade" }),
  recipientId: uuid("recipient_id").notNull().references(() => users.id, { onDelete: "cascade" }),
  startedAt: timestamp("started_at", { withTimezone: true }).notNull(),
  thresholdRhPercent: doublePrecision("threshold_rh_percent").notNull(),
  peakRhPercent: doublePrecision("peak_rh_percent").notNull(),
  durationMinutes: doublePrecision("duration_minutes").notNull(),
  /** "each" mails at once; "digest" waits for the keeper's daily digest. */
  delivery: text("delivery").notNull().default("each"),
  queuedAt: timestamp("queued_at", { withTimezone: true }).notNull().defaultNow(),
  attempts: integer("attempts").notNull().default(0),
  sentAt: timestamp("sent_at", { withTimezone: true }),
  /** Not sent after all: the location was archived, or the recipient left the lab, between claim and send. */
  withdrawnAt: timestamp("withdrawn_at", { withTimezone: true }),
  withdrawnReason: text("withdrawn_reason"),
}, (t) => [
  uniqueIndex("location_alerts_once_idx").on(t.locationId, t.startedAt, t.recipientId),
  index("location_alerts_unsent_idx").on(t.sentAt, t.queuedAt),
  check("location_alerts_delivery", sql`${t.delivery} in ('each', 'digest')`),
]);

// How each storage location kept its rule, as the last computation found it (db/queries/location-status):
// the overview and a location's page read this instead of counting a year of readings on every request.
// Computed for a viewer who sees every object and rule; viewers who score a trial blind get the
// locations that hold its objects or rest on its rules computed for them. Triggers of migration 0025
// delete a row when its past changes (readings at or before computed_at, checks, upkeep, moves, the
// objects' register entries, rules, the location itself); readings appended later are looked at on read.
export const locationStatus = pgTable("location_status", {
  locationId: uuid("location_id").primaryKey().references(() => chambers.id, { onDelete: "cascade" }),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  computedAt: timestamp("computed_at", { withTimezone: true }).notNull(),
  ruleId: uuid("rule_id"),
  thresholdRhPercent: doublePrecision("threshold_rh_percent"),
  /** Every rule that held for an object here, the strictest or not. */
  ruleIds: uuid("rule_ids").array().notNull().default(sql`'{}'::uuid[]`),
  /** What the overview shows (time in rule, last reading then, desiccant forecast, trace). */
  summary: jsonb("summary").notNull(),
  /** What a location's page and the report add (exceedances, objects at risk). */
  detail: jsonb("detail").notNull(),
}, (t) => [index("location_status_lab_idx").on(t.labId)]);
