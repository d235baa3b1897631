import { index, jsonb, pgTable, timestamp, uuid } from "drizzle-orm/pg-core";
import type { Point } from "../../lib/scoring/geometry";
import { labs, users } from "./auth";
import { photos } from "./photos";

// Control points placed on a photo to register it to the specimen's first photo in a trial
// (lib/photos/align.ts). Points are in the photo's original-image pixels, in the order placed; the
// first photo's own row holds the points every later photo is matched against. referencePhotoId is
// the first photo the points were placed against (its own id on the first photo), so a series whose
// first photo changed shows which photos need their points placed again.
export const photoControlPoints = pgTable("photo_control_points", {
  photoId: uuid("photo_id").primaryKey().references(() => photos.id, { onDelete: "cascade" }),
  labId: uuid("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
  referencePhotoId: uuid("reference_photo_id").notNull().references(() => photos.id, { onDelete: "cascade" }),
  points: jsonb("points").$type<Point[]>().notNull(),
  updatedBy: uuid("updated_by").references(() => users.id, { onDelete: "set null" }),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
}, (t) => [index("photo_control_points_lab_ref_idx").on(t.labId, t.referencePhotoId)]);
