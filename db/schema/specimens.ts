import { sql } from "drizzle-orm";
import { doublePrecision, index, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { labs, users } from "./auth";
import { chlorideStateEnum, materialClassEnum, treatmentKindEnum } from "./enums";

export const specimens = pgTable("specimens", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  label: text("label").notNull(),
  materialClass: materialClassEnum("material_class").notNull(),
  findName: text("find_name").notNull().default(""),
  description: text("description").notNull().default(""),
  face: text("face").notNull().default(""),
  surfacePrep: text("surface_prep").notNull().default(""),
  massG: doublePrecision("mass_g"),
  history: text("history").notNull().default(""),
  // Where the piece was cut from: the parent piece's name and this slice's mark on it (blocking factors).
  parentPiece: text("parent_piece").notNull().default(""),
  slice: text("slice").notNull().default(""),
  provenance: text("provenance").notNull().default(""),
  contaminationNotes: text("contamination_notes").notNull().default(""),
  // Object register (a specimen never in a trial is an object too).
  accessionNumber: text("accession_number"),
  treatmentsApplied: text("treatments_applied").notNull().default(""),
  chlorideState: chlorideStateEnum("chloride_state").notNull().default("unknown"),
  storageNotes: text("storage_notes").notNull().default(""),
  createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [
  uniqueIndex("specimens_lab_label_idx").on(t.labId, t.label),
  // Accession numbers are unique in a lab whatever their case ("TAR.1" and "tar.1" are one number), as the app checks.
  uniqueIndex("specimens_lab_accession_idx").on(t.labId, sql`lower(${t.accessionNumber})`),
  index("specimens_lab_class_idx").on(t.labId, t.materialClass),
  index("specimens_lab_created_idx").on(t.labId, t.createdAt),
]);

export const treatments = pgTable("treatments", {
  id: uuid("id").primaryKey().defaultRandom(),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  name: text("name").notNull(),
  kind: treatmentKindEnum("kind").notNull(),
  description: text("description").notNull().default(""),
  protocol: text("protocol").notNull().default(""),
  createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [uniqueIndex("treatments_lab_name_idx").on(t.labId, t.name)]);
