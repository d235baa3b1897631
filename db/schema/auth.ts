import { boolean, index, integer, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { roleEnum } from "./enums";

export const users = pgTable("users", {
  id: uuid("id").primaryKey().defaultRandom(),
  email: text("email").notNull(),
  name: text("name").notNull(),
  passwordHash: text("password_hash").notNull(),
  remindersOptOut: boolean("reminders_opt_out").notNull().default(false),
  /** Collection alerts gathered into one daily e-mail instead of one per exceedance. */
  collectionDigest: boolean("collection_digest").notNull().default(false),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [uniqueIndex("users_email_idx").on(t.email)]);

export const labs = pgTable("labs", {
  id: uuid("id").primaryKey().defaultRandom(),
  name: text("name").notNull(),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
});

export const memberships = pgTable("memberships", {
  userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  role: roleEnum("role").notNull(),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [primaryKey({ columns: [t.userId, t.labId] }), index("memberships_lab_idx").on(t.labId)]);

export const invitations = pgTable("invitations", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  email: text("email").notNull(),
  role: roleEnum("role").notNull(),
  // Only a SHA-256 of the token is stored; the token itself travels in the e-mail link.
  tokenHash: text("token_hash").notNull(),
  expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  acceptedAt: timestamp("accepted_at", { withTimezone: true }),
  revokedAt: timestamp("revoked_at", { withTimezone: true }),
  invitedBy: uuid("invited_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [uniqueIndex("invitations_token_idx").on(t.tokenHash), index("invitations_lab_idx").on(t.labId, t.createdAt)]);

// Failed sign-ins per key ("account:<e-mail>", "address:<client address>"), counted atomically before the
// password is checked; past a free number each failure makes the next attempt wait longer (lib/auth/throttle).
// Keyed by the typed address, not the user, so unknown and known accounts are throttled alike.
export const signInThrottles = pgTable("sign_in_throttles", {
  key: text("key").primaryKey(),
  failures: integer("failures").notNull(),
  lastFailureAt: timestamp("last_failure_at", { withTimezone: true }).notNull(),
  waitUntil: timestamp("wait_until", { withTimezone: true }),
});
