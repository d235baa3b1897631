// Request bodies of the photo API, shared by the uploader (client) and the route handlers (server).
import { z } from "zod";

export const presignRequestSchema = z.object({
  inspectionId: z.guid("Choose an inspection."),
  specimenId: z.guid("Choose the specimen this photo shows."),
  filename: z.string().trim().min(1, "The file has no name.").max(500),
  contentType: z.string().trim().min(1, "The file type is unknown.").max(100),
  sizeBytes: z.number().int("The size must be a whole number of bytes.").min(1, "The file is empty."),
  /** Hex SHA-256 of the file, computed in the browser; signed into the upload URL. */
  sha256: z.string().trim().toLowerCase().regex(/^[0-9a-f]{64}$/, "The file's SHA-256 checksum is missing or malformed."),
});
export type PresignRequest = z.infer<typeof presignRequestSchema>;

export const finalizeRequestSchema = z.object({
  token: z.string().min(16).max(8000),
  /** The trial's photo protocol points the photographer ticked for this upload; absent: not recorded. */
  protocol: z.array(z.string().trim().min(1).max(300), "List the protocol points followed.").max(30).optional(),
});
export type FinalizeRequest = z.infer<typeof finalizeRequestSchema>;

export const photoVariantSchema = z.enum(["thumb", "display", "original"]);
export type PhotoVariant = z.infer<typeof photoVariantSchema>;

// Looking after a recorded photo (server actions on the inspection's photo page).
const checkbox = z.preprocess((v) => v === true || v === "on" || v === "true" || v === "1", z.boolean());

export const acknowledgeCheckSchema = z.object({
  photoId: z.guid("Not a valid photo."),
  note: z.string().trim().min(1, "Say why the photo is right after all, or what was done about it.").max(1000, "Use at most 1000 characters."),
});

export const movePhotoSchema = z.object({
  photoId: z.guid("Not a valid photo."),
  inspectionId: z.guid("Choose an inspection."),
  specimenId: z.guid("Choose a specimen."),
});

export const deletePhotoSchema = z.object({
  photoId: z.guid("Not a valid photo."),
  /** The person saw what happens to the scores and marks made on this photo, and agreed. */
  confirmScores: checkbox,
});

// Control points for the aligned series (lib/photos/align): the form sends them as JSON, in the
// order placed. How many and where is checked against the photo (controlPointProblem) by the query.
const pointsJson = z.preprocess((v) => {
  if (typeof v !== "string") return v;
  try { return JSON.parse(v); } catch { return v; }
}, z.array(z.object({ x: z.number().finite(), y: z.number().finite() }), "Place the control points on the photo.").max(10, "Place at most 3 control points."));

export const controlPointsSchema = z.object({
  trialId: z.guid("Not a valid trial."),
  photoId: z.guid("Not a valid photo."),
  points: pointsJson,
});
