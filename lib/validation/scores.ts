// Rust scores and marks: one set of schemas for the score form (FormData strings), the JSON API and
// the client (which reuses them to show the same messages before sending).
import { z } from "zod";
import { PATCH_LIGHTNESS_RANGE, patchProblem } from "@/lib/scoring/colour-normalise";
import { ASTM_DISTRIBUTION } from "@/lib/scoring/grades";

// Coordinates are original-image pixels; a 200-megapixel frame is ~20 000 px on a side, so ±1e6 is
// generous while still refusing nonsense that would make the area raster enormous.
const coord = z.number("Coordinates must be numbers.").finite().min(-1e6).max(1e6);
const length = z.number().finite().positive("Sizes must be above 0.").max(1e6);
export const pointSchema = z.object({ x: coord, y: coord });
const points = z.array(pointSchema).max(5000, "A shape may have at most 5000 points.");

export const spotShapeSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("outline"), points: points.min(3, "An outline needs at least 3 points.") }),
  z.object({ kind: z.literal("polygon"), points: points.min(3, "A polygon needs at least 3 points.") }),
  z.object({ kind: z.literal("circle"), cx: coord, cy: coord, r: length }),
  z.object({ kind: z.literal("brush"), points: points.min(1, "A brush stroke needs a point."), radius: length }),
]);
export const markSchema = z.union([spotShapeSchema, z.object({ kind: z.literal("erase"), shape: spotShapeSchema })]);
export const faceSchema = z.array(pointSchema).min(3, "Outline the face with at least 3 points.").max(2000, "The face outline may have at most 2000 points.");

/** Accepts a value as is (JSON API) or a JSON string (hidden form field). */
function jsonField<S extends z.ZodType>(schema: S) {
  return z.preprocess((v) => {
    if (typeof v !== "string") return v;
    if (v.trim() === "") return undefined;
    try {
      return JSON.parse(v);
    } catch {
      return Symbol("invalid JSON"); // fails the schema with its own message
    }
  }, schema);
}

/** Checkbox ("on"), JSON boolean, or "true"/"1"; anything else (absent) is false. */
const checkbox = z.preprocess((v) => v === true || v === "on" || v === "true" || v === "1", z.boolean());
const optionalUuid = z.preprocess((v) => (v === "" || v == null ? undefined : v), z.uuid("Not a valid id.").optional());
const optionalPercent = z.preprocess(
  (v) => (v === "" || v == null ? undefined : v),
  z.coerce.number("Enter a percentage.").min(0, "Cannot be below 0 %.").max(100, "Cannot be above 100 %.").optional(),
);

const linearLevel = z.number().finite().min(0).max(1);
/**
 * The grey patch as the estimate measured it: the rectangle (original-image pixels), the patch's known
 * lightness and its reading. A clipped, dark, tiny or coloured patch is refused here, on the client
 * and the server alike, with the sentence from colour-normalise.ts.
 */
export const colourPatchSchema = z
  .object({
    x: coord,
    y: coord,
    width: length,
    height: length,
    patchLightness: z.number("Enter the patch's lightness L*.").min(PATCH_LIGHTNESS_RANGE.min, `The patch's L* must be ${PATCH_LIGHTNESS_RANGE.min} or more.`)
      .max(PATCH_LIGHTNESS_RANGE.max, `The patch's L* must be ${PATCH_LIGHTNESS_RANGE.max} or less.`),
    pixels: z.number().int().min(0),
    meanLinear: z.tuple([linearLevel, linearLevel, linearLevel]),
    clippedFraction: z.number().min(0).max(1),
  }, "The grey patch must be a rectangle with its reading.")
  .superRefine((p, ctx) => {
    const problem = patchProblem(p);
    if (problem) ctx.addIssue({ code: "custom", message: problem.message });
  });
export type ColourPatchInput = z.infer<typeof colourPatchSchema>;

export const ASTM_LETTERS = Object.keys(ASTM_DISTRIBUTION) as (keyof typeof ASTM_DISTRIBUTION)[];
export const SILICATE_CHANGES = ["none", "slight", "marked"] as const;
export const AREA_SOURCES = ["marks", "estimate", "manual", "previous"] as const;
export type AreaSource = (typeof AREA_SOURCES)[number];

/** What a scorer records for one specimen at one inspection. */
export const scoreFieldsSchema = z.object({
  spotCount: z.coerce.number("Enter the number of spots.").int("Count whole spots.").min(0, "Cannot be negative.").max(100_000, "At most 100 000 spots."),
  areaPercent: z.coerce.number("Enter the rusted area.").min(0, "Cannot be below 0 %.").max(100, "Cannot be above 100 %."),
  astmLetter: z.preprocess((v) => (v === "" || v == null ? undefined : v), z.enum(ASTM_LETTERS, "Choose S, G, P or H.").optional()),
  weeping: checkbox,
  silicateChange: z.enum(SILICATE_CHANGES, "Choose none, slight or marked."),
  notes: z.string().trim().max(4000, "Use at most 4000 characters.").default(""),
  noChange: checkbox,
  areaSource: z.preprocess((v) => (v === "" || v == null ? "manual" : v), z.enum(AREA_SOURCES)),
  autoEstimatePercent: optionalPercent,
});

function letterWhenRusted<T extends { areaPercent: number; astmLetter?: string }>(data: T, ctx: z.RefinementCtx) {
  if (data.areaPercent > 0 && !data.astmLetter) {
    ctx.addIssue({ code: "custom", path: ["astmLetter"], message: "Choose how the rust is distributed (S, G, P or H)." });
  }
}

export const saveScoreSchema = scoreFieldsSchema
  .extend({
    trialId: z.uuid("Not a valid trial."),
    // The blind page knows only the photo; the server derives inspection and specimen from it.
    inspectionId: optionalUuid,
    specimenId: optionalUuid,
    photoId: optionalUuid,
    face: jsonField(faceSchema.nullable().optional()),
    marks: jsonField(z.array(markSchema, "Marks must be a list of shapes.").max(2000, "At most 2000 marks per photo.").default([])),
    colourPatch: jsonField(colourPatchSchema.nullable().optional()),
    // The recorded colour estimate was read through the grey patch's white balance and exposure.
    estimateNormalised: checkbox,
  })
  .superRefine((data, ctx) => {
    letterWhenRusted(data, ctx);
    if (!data.photoId && !(data.inspectionId && data.specimenId)) {
      ctx.addIssue({ code: "custom", path: ["photoId"], message: "Say which photo, or which inspection and specimen, this score is for." });
    }
    if (data.marks.length > 0 && !data.face) {
      ctx.addIssue({ code: "custom", path: ["face"], message: "Outline the specimen face before marking spots: the area is measured within it." });
    }
    if (data.estimateNormalised && !data.colourPatch) {
      ctx.addIssue({ code: "custom", path: ["colourPatch"], message: "The estimate says it was normalised, but no grey patch came with it; mark the patch and run the estimate again." });
    }
    if ((data.marks.length > 0 || data.face || data.colourPatch) && !data.photoId) {
      ctx.addIssue({ code: "custom", path: ["photoId"], message: "Marks belong to a photo; say which one." });
    }
  });
export type SaveScoreInput = z.infer<typeof saveScoreSchema>;

/** A consensus score after discussion: values only, no marks. */
export const consensusScoreSchema = scoreFieldsSchema
  .omit({ areaSource: true, autoEstimatePercent: true, noChange: true })
  .extend({ trialId: z.uuid(), inspectionId: z.uuid(), specimenId: z.uuid() })
  .superRefine(letterWhenRusted);
export type ConsensusScoreInput = z.infer<typeof consensusScoreSchema>;

export const assignScorerSchema = z.object({
  trialId: z.uuid(),
  userId: z.uuid("Choose a member."),
  blind: checkbox,
});

export const removeScorerSchema = z.object({ trialId: z.uuid(), userId: z.uuid() });

export const scoreRuleSchema = z
  .object({
    trialId: z.uuid(),
    scoreRule: z.enum(["primary-scorer", "consensus"], "Choose how the score of record is chosen."),
    primaryScorerId: optionalUuid,
  })
  .superRefine((data, ctx) => {
    if (data.scoreRule === "primary-scorer" && !data.primaryScorerId) {
      ctx.addIssue({ code: "custom", path: ["primaryScorerId"], message: "Choose the primary scorer." });
    }
  });

export const queueQuerySchema = z.object({
  trialId: z.uuid("Not a valid trial."),
  page: z.coerce.number().int().min(1).max(10_000).default(1),
  show: z.enum(["todo", "all"]).default("todo"),
});
