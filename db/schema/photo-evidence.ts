// What was recorded with each photo: which points of the trial's photo protocol were followed, and
// the photo's scale (two points on the scale bar, or px per mm typed in). A series scale holds for
// every photo of one specimen in one trial when the framing is fixed; a photo's own scale wins.
import { doublePrecision, index, jsonb, pgTable, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import type { ScaleSource } from "../../lib/scoring/scale";
import { labs, users } from "./auth";
import { photos } from "./photos";
import { specimens } from "./specimens";
import { trials } from "./trials";

export const photoEvidence = pgTable("photo_evidence", {
  photoId: uuid("photo_id").primaryKey().references(() => photos.id, { onDelete: "cascade" }),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  trialId: uuid("trial_id").notNull().references(() => trials.id, { onDelete: "restrict" }),
  /** The protocol points confirmed for this photo, as worded in the trial's protocol when recorded. */
  protocolConfirmed: jsonb("protocol_confirmed").$type<string[]>().notNull().default([]),
  pxPerMm: doublePrecision("px_per_mm"),
  scaleSource: jsonb("scale_source").$type<ScaleSource | null>(),
  recordedBy: uuid("recorded_by").references(() => users.id, { onDelete: "set null" }),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [index("photo_evidence_lab_trial_idx").on(t.labId, t.trialId)]);

export const seriesScales = pgTable("series_scales", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  trialId: uuid("trial_id").notNull().references(() => trials.id, { onDelete: "restrict" }),
  specimenId: uuid("specimen_id").notNull().references(() => specimens.id, { onDelete: "restrict" }),
  pxPerMm: doublePrecision("px_per_mm").notNull(),
  scaleSource: jsonb("scale_source").$type<ScaleSource>().notNull(),
  setBy: uuid("set_by").references(() => users.id, { onDelete: "set null" }),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [uniqueIndex("series_scales_trial_specimen_idx").on(t.labId, t.trialId, t.specimenId)]);
