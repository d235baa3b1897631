import { sql } from "drizzle-orm";
import { check, date, doublePrecision, index, integer, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { labs, users } from "./auth";
import { treatments } from "./specimens";

// A lab's storage rule: keep this material class (bare or under this treatment) below this RH. A rule
// comes from a trial's humidity response ("trial") or is entered by hand from a publication, a
// standard or the lab's own decision ("entered", with that source and its date). Each acceptance is a
// new version; the one with no superseded_at is in force. Rules are never edited in
// place, so a report can always say which version it used.
export const storageRules = pgTable("storage_rules", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  materialClass: text("material_class").notNull(),
  treatmentId: uuid("treatment_id").references(() => treatments.id, { onDelete: "restrict" }),
  /** The treatment's name when the rule was accepted (the treatment may be renamed later). */
  treatmentName: text("treatment_name").notNull(),
  version: integer("version").notNull(),
  thresholdRhPercent: doublePrecision("threshold_rh_percent").notNull(),
  lower95RhPercent: doublePrecision("lower95_rh_percent"),
  upper95RhPercent: doublePrecision("upper95_rh_percent"),
  /** The share of specimens rusted (0–1) and the horizon the threshold was read at (trial rules only). */
  shareRusted: doublePrecision("share_rusted"),
  horizonDays: doublePrecision("horizon_days"),
  origin: text("origin").notNull().default("trial"),
  /** Where an entered rule comes from (publication, standard, lab decision) and that source's date. */
  source: text("source").notNull().default(""),
  sourceDate: date("source_date", { mode: "string" }),
  /** How the threshold was found, in words (model, covariates, interval method). */
  method: text("method").notNull(),
  /** The plain sentence shown with the rule. */
  statement: text("statement").notNull(),
  sourceTrialIds: uuid("source_trial_ids").array().notNull().default(sql`'{}'::uuid[]`),
  note: text("note").notNull().default(""),
  acceptedBy: uuid("accepted_by").references(() => users.id, { onDelete: "set null" }),
  acceptedAt: timestamp("accepted_at", { withTimezone: true }).notNull().defaultNow(),
  supersededAt: timestamp("superseded_at", { withTimezone: true }),
}, (t) => [
  uniqueIndex("storage_rules_version_key").on(t.labId, t.materialClass, t.treatmentName, t.version),
  // At most one rule in force per material class and treatment.
  uniqueIndex("storage_rules_current_key").on(t.labId, t.materialClass, t.treatmentName).where(sql`superseded_at is null`),
  index("storage_rules_lab_idx").on(t.labId, t.acceptedAt),
  check("storage_rules_origin_check", sql`origin in ('trial', 'entered')`),
  // A rule without a source is refused by the database too: a trial rule names its trials, an entered one its source and date.
  check("storage_rules_source_check", sql`(origin = 'trial' and share_rusted is not null and horizon_days is not null) or (origin = 'entered' and length(btrim(source)) > 0 and source_date is not null)`),
]);
