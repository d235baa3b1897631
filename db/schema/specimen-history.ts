// A specimen's history before and beside its trials: chloride tests, akaganeite checks, earlier
// treatments and dated weighings. Each row is one dated fact; the specimen's origin (parent piece,
// slice, provenance) sits on the specimen itself. Methods and results are checked by
// lib/validation/specimen-history.ts; the database keeps them to the same lists.
import { sql } from "drizzle-orm";
import { boolean, check, date, index, numeric, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { labs, users } from "./auth";
import { specimens } from "./specimens";

const common = {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  specimenId: uuid("specimen_id").notNull().references(() => specimens.id, { onDelete: "cascade" }),
  notes: text("notes").notNull().default(""),
  createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
};

export const chlorideTests = pgTable("chloride_tests", {
  ...common,
  testedOn: date("tested_on", { mode: "string" }).notNull(),
  method: text("method").notNull(),
  result: text("result").notNull(),
}, (t) => [
  index("chloride_tests_specimen_idx").on(t.labId, t.specimenId, t.testedOn),
  check("chloride_tests_method_check", sql`${t.method} in ('silver-nitrate-spot', 'chloride-strip', 'ion-chromatography', 'titration', 'other')`),
  check("chloride_tests_result_check", sql`${t.result} in ('present', 'absent', 'inconclusive')`),
]);

export const akaganeiteChecks = pgTable("akaganeite_checks", {
  ...common,
  checkedOn: date("checked_on", { mode: "string" }).notNull(),
  method: text("method").notNull(),
  seen: boolean("seen").notNull(),
}, (t) => [
  index("akaganeite_checks_specimen_idx").on(t.labId, t.specimenId, t.checkedOn),
  check("akaganeite_checks_method_check", sql`${t.method} in ('visual', 'microscope', 'raman', 'xrd', 'other')`),
]);

export const priorTreatments = pgTable("prior_treatments", {
  ...common,
  treatedOn: date("treated_on", { mode: "string" }).notNull(),
  treatment: text("treatment").notNull(),
}, (t) => [index("prior_treatments_specimen_idx").on(t.labId, t.specimenId, t.treatedOn)]);

/** Mass in grams to 0.1 mg, kept as an exact decimal (numeric(12,4)), read back as a string. */
export const massMeasurements = pgTable("mass_measurements", {
  ...common,
  measuredOn: date("measured_on", { mode: "string" }).notNull(),
  massG: numeric("mass_g", { precision: 12, scale: 4 }).notNull(),
}, (t) => [
  index("mass_measurements_specimen_idx").on(t.labId, t.specimenId, t.measuredOn),
  check("mass_measurements_positive", sql`${t.massG} > 0`),
]);
