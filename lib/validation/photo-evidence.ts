// The form that records a photo's protocol points and scale. One schema for the form and the tests:
// a scale of zero length (two identical points, 0 or negative px per mm, a non-number) is refused at
// its field, and nothing is saved.
import { z } from "zod";
import { type ScaleSource, pointsProblem, pxPerMmFromPoints, pxPerMmProblem } from "@/lib/scoring/scale";

const checkbox = z.preprocess((v) => v === true || v === "on" || v === "true" || v === "1", z.boolean());
const numberText = z.preprocess((v) => (v == null ? "" : String(v)), z.string().trim().max(40));
const num = (s: string) => (s === "" ? Number.NaN : Number(s.replace(",", ".")));

export const SCALE_MODES = { keep: "Keep the current scale", none: "No scale on this photo", points: "Two points on the scale bar", typed: "Pixels per millimetre" } as const;

export const photoEvidenceSchema = z.object({
  photoId: z.guid("Not a valid photo."),
  "protocol[]": z.preprocess((v) => (v == null ? [] : Array.isArray(v) ? v : [v]), z.array(z.string().trim().min(1).max(300)).max(30)),
  scaleMode: z.enum(Object.keys(SCALE_MODES) as [keyof typeof SCALE_MODES, ...(keyof typeof SCALE_MODES)[]], "Choose how the scale is given."),
  x1: numberText, y1: numberText, x2: numberText, y2: numberText, lengthMm: numberText, pxPerMm: numberText,
  /** Framing is fixed: the scale holds for every photo of this specimen in this trial. */
  forSeries: checkbox,
}).transform((d, ctx) => {
  let scale: { pxPerMm: number; source: ScaleSource } | null = null;
  if (d.scaleMode === "points") {
    const a = { x: num(d.x1), y: num(d.y1) };
    const b = { x: num(d.x2), y: num(d.y2) };
    const p = pointsProblem(a, b, num(d.lengthMm));
    if (p) {
      ctx.addIssue({ code: "custom", path: [p.field === "pxPerMm" ? "points" : p.field], message: p.message });
      return z.NEVER;
    }
    scale = { pxPerMm: pxPerMmFromPoints(a, b, num(d.lengthMm)), source: { kind: "points", a, b, lengthMm: num(d.lengthMm) } };
  } else if (d.scaleMode === "typed") {
    const v = num(d.pxPerMm);
    const p = pxPerMmProblem(v);
    if (p) {
      ctx.addIssue({ code: "custom", path: ["pxPerMm"], message: p.message });
      return z.NEVER;
    }
    scale = { pxPerMm: v, source: { kind: "typed" } };
  }
  if (d.forSeries && !scale) {
    ctx.addIssue({ code: "custom", path: ["forSeries"], message: "Give a scale (two points or px per mm) to use it for the whole series." });
    return z.NEVER;
  }
  return { photoId: d.photoId, protocolConfirmed: d["protocol[]"], mode: d.scaleMode, scale, forSeries: d.forSeries };
});
export type PhotoEvidenceInput = z.output<typeof photoEvidenceSchema>;
