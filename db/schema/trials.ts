import { sql } from "drizzle-orm";
import { boolean, index, integer, jsonb, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { labs, users } from "./auth";
import { chambers } from "./chambers";
import { scoreRuleEnum, trialMemberRoleEnum, trialStatusEnum } from "./enums";
import { specimens, treatments } from "./specimens";

export type SchedulePlan =
  | { kind: "fixed"; intervalDays: number; count: number }
  | { kind: "geometric"; count: number }
  | { kind: "custom"; days: number[] };

export const trials = pgTable("trials", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  title: text("title").notNull(),
  question: text("question").notNull(),
  hypothesis: text("hypothesis").notNull().default(""),
  primaryOutcome: text("primary_outcome").notNull().default("time-to-first-rust"),
  status: trialStatusEnum("status").notNull().default("draft"),
  replicatesPerArm: integer("replicates_per_arm").notNull().default(1),
  allocationSeed: text("allocation_seed"),
  blockByMaterial: boolean("block_by_material").notNull().default(true),
  /** Specimen-history blocking factors used beside the material class (lib/allocation/allocate.ts BlockFactor). */
  blockFactors: jsonb("block_factors").$type<string[]>().notNull().default([]),
  schedulePlan: jsonb("schedule_plan").$type<SchedulePlan>().notNull(),
  scoreRule: scoreRuleEnum("score_rule").notNull().default("primary-scorer"),
  primaryScorerId: uuid("primary_scorer_id").references(() => users.id, { onDelete: "set null" }),
  photoProtocol: jsonb("photo_protocol").$type<string[]>().notNull().default([]),
  startedAt: timestamp("started_at", { withTimezone: true }),
  concludedAt: timestamp("concluded_at", { withTimezone: true }),
  createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [index("trials_lab_status_idx").on(t.labId, t.status, t.createdAt)]);

// An arm is one chamber × treatment combination; chambers and treatments are never cascaded away.
export const trialArms = pgTable("trial_arms", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  trialId: uuid("trial_id").notNull().references(() => trials.id, { onDelete: "restrict" }),
  chamberId: uuid("chamber_id").notNull().references(() => chambers.id, { onDelete: "restrict" }),
  treatmentId: uuid("treatment_id").notNull().references(() => treatments.id, { onDelete: "restrict" }),
  label: text("label").notNull(),
}, (t) => [uniqueIndex("trial_arms_combo_idx").on(t.trialId, t.chamberId, t.treatmentId), index("trial_arms_lab_idx").on(t.labId, t.trialId)]);

export const trialMembers = pgTable("trial_members", {
  trialId: uuid("trial_id").notNull().references(() => trials.id, { onDelete: "restrict" }),
  userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  role: trialMemberRoleEnum("role").notNull(),
  blind: boolean("blind").notNull().default(false),
}, (t) => [primaryKey({ columns: [t.trialId, t.userId, t.role] }), index("trial_members_lab_idx").on(t.labId, t.userId)]);

export const placements = pgTable("placements", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  trialId: uuid("trial_id").notNull().references(() => trials.id, { onDelete: "restrict" }),
  specimenId: uuid("specimen_id").notNull().references(() => specimens.id, { onDelete: "restrict" }),
  armId: uuid("arm_id").references(() => trialArms.id, { onDelete: "restrict" }),
  chamberId: uuid("chamber_id").notNull().references(() => chambers.id, { onDelete: "restrict" }),
  treatmentId: uuid("treatment_id").notNull().references(() => treatments.id, { onDelete: "restrict" }),
  fromAt: timestamp("from_at", { withTimezone: true }),
  toAt: timestamp("to_at", { withTimezone: true }),
  reason: text("reason").notNull().default(""),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [
  index("placements_lab_trial_idx").on(t.labId, t.trialId),
  index("placements_specimen_idx").on(t.specimenId, t.fromAt),
]);

export const inspections = pgTable("inspections", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  trialId: uuid("trial_id").notNull().references(() => trials.id, { onDelete: "restrict" }),
  dayNumber: integer("day_number").notNull(),
  plannedAt: timestamp("planned_at", { withTimezone: true }).notNull(),
  doneAt: timestamp("done_at", { withTimezone: true }),
  doneBy: uuid("done_by").references(() => users.id, { onDelete: "set null" }),
  rescheduleReason: text("reschedule_reason"),
  notes: text("notes").notNull().default(""),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [
  index("inspections_lab_planned_idx").on(t.labId, t.plannedAt),
  index("inspections_lab_open_idx").on(t.labId, t.doneAt, t.plannedAt),
  // The due list: open inspections of a lab in planned order, without walking the done ones.
  index("inspections_lab_open_planned_idx").on(t.labId, t.plannedAt, t.id).where(sql`${t.doneAt} is null`),
  index("inspections_trial_idx").on(t.trialId, t.plannedAt),
]);

export const reminderLog = pgTable("reminder_log", {
  inspectionId: uuid("inspection_id").notNull().references(() => inspections.id, { onDelete: "cascade" }),
  userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
  kind: text("kind").notNull(),
  queuedAt: timestamp("queued_at", { withTimezone: true }).notNull().defaultNow(),
  // Null until the mail server accepted the message; the queue retries until then.
  sentAt: timestamp("sent_at", { withTimezone: true }),
  attempts: integer("attempts").notNull().default(0),
}, (t) => [primaryKey({ columns: [t.inspectionId, t.userId, t.kind] })]);

// After a trial is concluded only notes can be appended.
export const trialNotes = pgTable("trial_notes", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  trialId: uuid("trial_id").notNull().references(() => trials.id, { onDelete: "restrict" }),
  body: text("body").notNull(),
  createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [index("trial_notes_trial_idx").on(t.labId, t.trialId, t.createdAt)]);

// The draft allocation: which selected specimen goes to which arm. armId null = selected but left
// over (more specimens than arms × replicates). Starting the trial turns these rows into placements.
export const trialAllocations = pgTable("trial_allocations", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  trialId: uuid("trial_id").notNull().references(() => trials.id, { onDelete: "restrict" }),
  specimenId: uuid("specimen_id").notNull().references(() => specimens.id, { onDelete: "restrict" }),
  armId: uuid("arm_id").references(() => trialArms.id, { onDelete: "restrict" }),
  // The material class at allocation time (the block), so later edits of a specimen do not rewrite it.
  blockKey: text("block_key").notNull().default(""),
  swapReason: text("swap_reason"),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [
  uniqueIndex("trial_allocations_specimen_idx").on(t.trialId, t.specimenId),
  index("trial_allocations_lab_idx").on(t.labId, t.trialId),
]);
