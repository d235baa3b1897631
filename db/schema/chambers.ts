import { type AnyPgColumn, bigserial, boolean, doublePrecision, index, integer, pgTable, primaryKey, smallint, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { labs, users } from "./auth";
import { chamberKindEnum, desiccantEventKindEnum, locationKindEnum, readingSourceEnum } from "./enums";

export const chambers = pgTable("chambers", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  name: text("name").notNull(),
  kind: chamberKindEnum("kind").notNull(),
  saltId: text("salt_id"),
  desiccantKind: text("desiccant_kind"),
  desiccantMassG: doublePrecision("desiccant_mass_g"),
  /** Colour indicator in a silica gel charge (lib/humidity/desiccant IndicatorKind); null for none chosen. */
  desiccantIndicator: text("desiccant_indicator"),
  nominalTempC: doublePrecision("nominal_temp_c").notNull(),
  volumeL: doublePrecision("volume_l"),
  setpointRhPercent: doublePrecision("setpoint_rh_percent").notNull(),
  toleranceRhPercent: doublePrecision("tolerance_rh_percent").notNull(),
  airExchangePerDay: doublePrecision("air_exchange_per_day"),
  roomRhPercent: doublePrecision("room_rh_percent"),
  notes: text("notes").notNull().default(""),
  // The collection tree (lib/collection/locations.ts): a trial jar is a location used in a trial.
  // Same lab and no cycles are checked by the trigger of migration 0022 as well as by the queries.
  locationKind: locationKindEnum("location_kind").notNull().default("trial-jar"),
  parentId: uuid("parent_id").references((): AnyPgColumn => chambers.id, { onDelete: "restrict" }),
  keeperId: uuid("keeper_id").references(() => users.id, { onDelete: "set null" }),
  /** A storage location out of rule this long (hours) e-mails its keeper. */
  alertAfterHours: doublePrecision("alert_after_hours").notNull().default(6),
  archivedAt: timestamp("archived_at", { withTimezone: true }),
  createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [index("chambers_lab_idx").on(t.labId, t.name), index("chambers_parent_idx").on(t.parentId)]);

export const readings = pgTable("readings", {
  id: bigserial("id", { mode: "number" }).primaryKey(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  chamberId: uuid("chamber_id").notNull().references(() => chambers.id, { onDelete: "restrict" }),
  takenAt: timestamp("taken_at", { withTimezone: true }).notNull(),
  rhPercent: doublePrecision("rh_percent").notNull(),
  tempC: doublePrecision("temp_c"),
  dewPointC: doublePrecision("dew_point_c"),
  source: readingSourceEnum("source").notNull(),
  instrument: text("instrument").notNull().default(""),
  importId: uuid("import_id"),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [
  uniqueIndex("readings_chamber_time_instrument_idx").on(t.chamberId, t.takenAt, t.instrument),
  index("readings_lab_chamber_time_idx").on(t.labId, t.chamberId, t.takenAt),
]);

// One row per chamber, block (1 or 6 hours from the epoch) and instrument summarising that block's
// readings. Kept current by statement triggers on readings (migrations 0007, 0009) so the chamber
// chart and its band statistics read a year of minute readings as ~1,500 six-hour summaries plus
// the few hours that need every reading. Spans are to the next reading of the chamber within the
// block, in (taken_at, instrument) order.
export const readingBlocks = pgTable("reading_blocks", {
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  chamberId: uuid("chamber_id").notNull().references(() => chambers.id, { onDelete: "cascade" }),
  widthHours: smallint("width_hours").notNull().default(1),
  blockStart: timestamp("block_start", { withTimezone: true }).notNull(),
  instrument: text("instrument").notNull(),
  n: integer("n").notNull(),
  firstAt: timestamp("first_at", { withTimezone: true }).notNull(),
  lastAt: timestamp("last_at", { withTimezone: true }).notNull(),
  lastRhPercent: doublePrecision("last_rh_percent").notNull(),
  minRhPercent: doublePrecision("min_rh_percent").notNull(),
  minAt: timestamp("min_at", { withTimezone: true }).notNull(),
  minTempC: doublePrecision("min_temp_c"),
  minDewPointC: doublePrecision("min_dew_point_c"),
  maxRhPercent: doublePrecision("max_rh_percent").notNull(),
  maxAt: timestamp("max_at", { withTimezone: true }).notNull(),
  maxTempC: doublePrecision("max_temp_c"),
  maxDewPointC: doublePrecision("max_dew_point_c"),
  /** Σ span (ms) of this instrument's readings, the hour's last reading excluded. */
  spanMs: doublePrecision("span_ms").notNull(),
  /** Σ span (ms) × raw RH over the same readings. */
  spanRhMs: doublePrecision("span_rh_ms").notNull(),
  /** Longest span (whole ms) from one of this instrument's readings to the next in the block. */
  maxSpanMs: doublePrecision("max_span_ms").notNull().default(0),
}, (t) => [primaryKey({ columns: [t.labId, t.chamberId, t.widthHours, t.blockStart, t.instrument] })]);

// Tokens that change whenever anything a chamber's chart and band statistics are read from changes:
// one per chamber for its readings (insert, update, delete, truncate; migration 0028) and one per lab for
// its hygrometer checks, whose offsets follow the instrument into every chamber (migration 0029). Kept by
// triggers, so every writer renews them; a new random value each time, never reused, even across a
// database rebuilt from scratch. The chamber page reuses a computed chart while both stand
// (db/queries/readings-series.ts getChamberSeriesReused).
export const climateVersions = pgTable("climate_versions", {
  chamberId: uuid("chamber_id").primaryKey().references(() => chambers.id, { onDelete: "cascade" }),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  version: uuid("version").notNull().defaultRandom(),
}, (t) => [index("climate_versions_lab_idx").on(t.labId)]);
export const checkVersions = pgTable("check_versions", {
  labId: uuid("lab_id").primaryKey().references(() => labs.id, { onDelete: "cascade" }),
  version: uuid("version").notNull().defaultRandom(),
});

export const readingImports = pgTable("reading_imports", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  chamberId: uuid("chamber_id").notNull().references(() => chambers.id, { onDelete: "restrict" }),
  filename: text("filename").notNull(),
  rowsImported: integer("rows_imported").notNull().default(0),
  duplicatesSkipped: integer("duplicates_skipped").notNull().default(0),
  instrument: text("instrument").notNull().default(""),
  createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [index("reading_imports_lab_idx").on(t.labId, t.createdAt)]);

export const desiccantEvents = pgTable("desiccant_events", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  chamberId: uuid("chamber_id").notNull().references(() => chambers.id, { onDelete: "restrict" }),
  kind: desiccantEventKindEnum("kind").notNull(),
  at: timestamp("at", { withTimezone: true }).notNull(),
  massG: doublePrecision("mass_g"),
  notes: text("notes").notNull().default(""),
  createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [index("desiccant_events_lab_chamber_idx").on(t.labId, t.chamberId, t.at)]);

export const chamberTokens = pgTable("chamber_tokens", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  chamberId: uuid("chamber_id").notNull().references(() => chambers.id, { onDelete: "restrict" }),
  label: text("label").notNull(),
  // SHA-256 of the token; the token is shown once when created.
  tokenHash: text("token_hash").notNull(),
  lastUsedAt: timestamp("last_used_at", { withTimezone: true }),
  revokedAt: timestamp("revoked_at", { withTimezone: true }),
  createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [uniqueIndex("chamber_tokens_hash_idx").on(t.tokenHash), index("chamber_tokens_lab_idx").on(t.labId, t.chamberId)]);

export const hygrometerChecks = pgTable("hygrometer_checks", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  instrument: text("instrument").notNull(),
  saltId: text("salt_id").notNull(),
  tempC: doublePrecision("temp_c").notNull(),
  readingRhPercent: doublePrecision("reading_rh_percent").notNull(),
  referenceRhPercent: doublePrecision("reference_rh_percent").notNull(),
  offsetRhPercent: doublePrecision("offset_rh_percent").notNull(),
  // A two-salt check: the second salt, the reading over it and its reference, and the instrument's
  // slope (Δreading / Δreference); null for a one-salt check (slope 1).
  salt2Id: text("salt2_id"),
  reading2RhPercent: doublePrecision("reading2_rh_percent"),
  reference2RhPercent: doublePrecision("reference2_rh_percent"),
  slope: doublePrecision("slope"),
  applied: boolean("applied").notNull().default(false),
  // The chamber page the check was recorded from (informational; the offset belongs to the instrument).
  chamberId: uuid("chamber_id").references(() => chambers.id, { onDelete: "restrict" }),
  notes: text("notes").notNull().default(""),
  checkedAt: timestamp("checked_at", { withTimezone: true }).notNull(),
  createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [index("hygrometer_checks_lab_idx").on(t.labId, t.instrument, t.checkedAt)]);

// Desiccant exhaustion reminders: the scan claims (charge event, recipient) once; sentAt stays null
// until the mail server accepted the message, so unsent claims are retried by later scans.
export const desiccantReminders = pgTable("desiccant_reminders", {
  eventId: uuid("event_id").notNull().references(() => desiccantEvents.id, { onDelete: "cascade" }),
  userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  chamberId: uuid("chamber_id").notNull().references(() => chambers.id, { onDelete: "cascade" }),
  exhaustionAt: timestamp("exhaustion_at", { withTimezone: true }).notNull(),
  queuedAt: timestamp("queued_at", { withTimezone: true }).notNull().defaultNow(),
  sentAt: timestamp("sent_at", { withTimezone: true }),
  attempts: integer("attempts").notNull().default(0),
}, (t) => [primaryKey({ columns: [t.eventId, t.userId] }), index("desiccant_reminders_unsent_idx").on(t.sentAt, t.queuedAt)]);
