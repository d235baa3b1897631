// Where each object of the register (a specimen) is kept: one row per stay in a storage location.
// An object is in one place at a time: the partial unique index allows one open stay per object and
// the exclusion constraint of migration 0017 (btree_gist) refuses any two overlapping stays.
import { sql } from "drizzle-orm";
import { check, index, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
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
