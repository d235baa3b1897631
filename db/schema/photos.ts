import { sql } from "drizzle-orm";
import { boolean, doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uniqueIndex, uuid, bigint } from "drizzle-orm/pg-core";
import type { EstimateColourBasis } from "../../lib/scoring/colour-normalise";
import type { Mark } from "../../lib/scoring/geometry";
import { labs, users } from "./auth";
import { photoStatusEnum, silicateChangeEnum } from "./enums";
import { specimens } from "./specimens";
import { inspections, trials } from "./trials";

export const photos = pgTable("photos", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  trialId: uuid("trial_id").references(() => trials.id, { onDelete: "restrict" }),
  inspectionId: uuid("inspection_id").references(() => inspections.id, { onDelete: "restrict" }),
  specimenId: uuid("specimen_id").notNull().references(() => specimens.id, { onDelete: "restrict" }),
  objectKey: text("object_key").notNull(),
  filename: text("filename").notNull(),
  status: photoStatusEnum("status").notNull().default("pending"),
  contentType: text("content_type").notNull(),
  sizeBytes: bigint("size_bytes", { mode: "number" }).notNull(),
  sha256: text("sha256"),
  width: integer("width"),
  height: integer("height"),
  capturedAtRaw: text("captured_at_raw"),
  capturedOffset: text("captured_offset"),
  capturedAt: timestamp("captured_at", { withTimezone: true }),
  camera: text("camera"),
  lens: text("lens"),
  exposure: text("exposure"),
  orientation: integer("orientation"),
  gps: jsonb("gps").$type<{ lat: number; lon: number } | null>(),
  derivatives: jsonb("derivatives").$type<Record<string, string>>().notNull().default({}),
  // Why previews could not be made (e.g. a format the server cannot decode); null when fine.
  processingNote: text("processing_note"),
  // A capture-time warning the team has looked at: why the photo is right after all (or what was done).
  // Cleared when the photo moves to another inspection, since the warning is then a different one.
  checkAckNote: text("check_ack_note"),
  checkAckBy: uuid("check_ack_by").references(() => users.id, { onDelete: "set null" }),
  checkAckAt: timestamp("check_ack_at", { withTimezone: true }),
  uploadedBy: uuid("uploaded_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [
  uniqueIndex("photos_object_key_idx").on(t.objectKey),
  index("photos_lab_specimen_idx").on(t.labId, t.specimenId, t.createdAt),
  index("photos_lab_inspection_idx").on(t.labId, t.inspectionId),
]);

// Geometry is stored exactly as lib/scoring/geometry computes with it (original-image pixels), so the
// area is re-derivable from the rows alone. An erase mark wraps the shape it clears.
export type MarkGeometry = Mark;
/** "face": the outline of the specimen face (one per photo and scorer); "spot": rust marks and erasures. */
export type MarkRole = "face" | "spot";

export const marks = pgTable("marks", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  photoId: uuid("photo_id").notNull().references(() => photos.id, { onDelete: "restrict" }),
  scorerId: uuid("scorer_id").references(() => users.id, { onDelete: "set null" }),
  geometry: jsonb("geometry").$type<MarkGeometry>().notNull(),
  role: text("role").$type<MarkRole>().notNull().default("spot"),
  // Paint order: marks apply in sequence (an erase clears what came before it).
  seq: integer("seq").notNull().default(0),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [index("marks_lab_photo_idx").on(t.labId, t.photoId, t.scorerId)]);

export const scores = pgTable("scores", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  trialId: uuid("trial_id").notNull().references(() => trials.id, { onDelete: "restrict" }),
  inspectionId: uuid("inspection_id").notNull().references(() => inspections.id, { onDelete: "restrict" }),
  specimenId: uuid("specimen_id").notNull().references(() => specimens.id, { onDelete: "restrict" }),
  photoId: uuid("photo_id").references(() => photos.id, { onDelete: "set null" }),
  scorerId: uuid("scorer_id").references(() => users.id, { onDelete: "set null" }),
  blind: boolean("blind").notNull().default(false),
  spotCount: integer("spot_count").notNull().default(0),
  areaPercent: doublePrecision("area_percent").notNull().default(0),
  astmGrade: integer("astm_grade"),
  astmLetter: text("astm_letter"),
  isoDegree: integer("iso_degree"),
  autoEstimatePercent: doublePrecision("auto_estimate_percent"),
  /** How the colour estimate's pixels were read: normalised from a grey patch (with its basis) or not; null without an estimate. */
  autoEstimateColour: jsonb("auto_estimate_colour").$type<EstimateColourBasis>(),
  weeping: boolean("weeping").notNull().default(false),
  silicateChange: silicateChangeEnum("silicate_change").notNull().default("none"),
  noChange: boolean("no_change").notNull().default(false),
  notes: text("notes").notNull().default(""),
  isRecord: boolean("is_record").notNull().default(true),
  /** Where the area came from: "marks", "estimate" (accepted colour estimate), "manual" or "previous". */
  areaSource: text("area_source"),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [
  uniqueIndex("scores_unique_idx").on(t.inspectionId, t.specimenId, t.scorerId),
  // One score of record per specimen × inspection, and one consensus score (scorer_id null) at most.
  uniqueIndex("scores_record_idx").on(t.inspectionId, t.specimenId).where(sql`${t.isRecord}`),
  uniqueIndex("scores_consensus_idx").on(t.inspectionId, t.specimenId).where(sql`${t.scorerId} is null`),
  index("scores_lab_trial_idx").on(t.labId, t.trialId, t.specimenId),
]);

/**
 * The colour card's neutral patch marked on a photo (original-image pixels), its known lightness and
 * what it read (mean in linear light, share of clipped pixels). One per photo: the last one marked;
 * the next photo of the specimen starts from its position (found through the photo, so a photo moved
 * to another specimen takes its patch along).
 */
export const photoColourPatches = pgTable("photo_colour_patches", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  photoId: uuid("photo_id").notNull().references(() => photos.id, { onDelete: "cascade" }),
  x: doublePrecision("x").notNull(),
  y: doublePrecision("y").notNull(),
  width: doublePrecision("width").notNull(),
  height: doublePrecision("height").notNull(),
  patchLightness: doublePrecision("patch_lightness").notNull(),
  meanLinear: jsonb("mean_linear").$type<[number, number, number]>().notNull(),
  clippedFraction: doublePrecision("clipped_fraction").notNull(),
  pixels: integer("pixels").notNull(),
  markedBy: uuid("marked_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [
  uniqueIndex("photo_colour_patches_photo_idx").on(t.photoId),
]);
