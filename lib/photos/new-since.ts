// "New since the last inspection": the rust marked on the current photo that the previous
// inspection's photo did not have, measured in the first photo's frame (where the series is aligned).
//
// Each photo's marks stay in its own pixels; a photo's alignment maps them into the first photo's
// frame. The region is (current spots, in paint order, ∩ current face) minus (previous spots, in paint
// order), sampled on a grid in the first photo's frame: every sample is mapped back into each photo by
// the inverse alignment and tested against that photo's marks, so circles stay exact circles under
// an affine map. Resolution error, as in lib/scoring/geometry: below about P·h (P: boundary length in
// the first photo's frame, h: sample spacing), reported as errorBoundPx2.
import { applyAffine, determinant, invertAffine, type Affine } from "./align";
import { pointInPolygon, type Mark, type Point, type SpotMark } from "@/lib/scoring/geometry";
import { areaMm2FromPx2 } from "@/lib/scoring/scale";

export type AlignedMarks = { marks: readonly Mark[]; face?: readonly Point[] | null; toReference: Affine };

export type NewSinceResult = {
  /** Area of the new rust in the first photo's frame, px². */
  newAreaPx2: number;
  /** Area of all rust on the current photo (∩ its face), first photo's frame, px². */
  currentAreaPx2: number;
  /** Set when pxPerMm (of the first photo) is given. */
  newAreaMm2: number | null;
  sampleSpacingPx: number;
  errorBoundPx2: number;
};

export const NEW_SINCE_SAMPLES = 1024;

/** Whether a shape covers a point (polygons and outlines by the even-odd rule, like the area measure). */
export function shapeCovers(shape: SpotMark, p: Point): boolean {
  switch (shape.kind) {
    case "circle":
      return Math.hypot(p.x - shape.cx, p.y - shape.cy) <= shape.r;
    case "outline":
    case "polygon":
      return shape.points.length >= 3 && pointInPolygon(p, shape.points);
    case "brush": {
      const pts = shape.points;
      if (pts.length === 1) return Math.hypot(p.x - pts[0].x, p.y - pts[0].y) <= shape.radius;
      for (let i = 1; i < pts.length; i++) if (distanceToSegment(p, pts[i - 1], pts[i]) <= shape.radius) return true;
      return false;
    }
  }
}

/** Marks applied in order like paint: the last mark covering the point decides (spot → rust, erase → none). */
export function paintedAt(marks: readonly Mark[], p: Point): boolean {
  let painted = false;
  for (const m of marks) {
    if (m.kind === "erase") {
      if (painted && shapeCovers(m.shape, p)) painted = false;
    } else if (!painted && shapeCovers(m, p)) painted = true;
  }
  return painted;
}

function distanceToSegment(p: Point, a: Point, b: Point): number {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const len2 = dx * dx + dy * dy;
  const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / len2));
  return Math.hypot(p.x - (a.x + t * dx), p.y - (a.y + t * dy));
}

/** Bounding box and boundary length of a spot shape, in its own photo's pixels. */
function shapeExtent(shape: SpotMark): { pts: Point[]; perimeter: number } {
  const box = (x0: number, y0: number, x1: number, y1: number) => [{ x: x0, y: y0 }, { x: x1, y: y0 }, { x: x1, y: y1 }, { x: x0, y: y1 }];
  if (shape.kind === "circle") return { pts: box(shape.cx - shape.r, shape.cy - shape.r, shape.cx + shape.r, shape.cy + shape.r), perimeter: 2 * Math.PI * shape.r };
  const r = shape.kind === "brush" ? shape.radius : 0;
  const xs = shape.points.map((q) => q.x);
  const ys = shape.points.map((q) => q.y);
  let length = 0;
  const closed = shape.kind !== "brush";
  for (let i = closed ? 0 : 1; i < shape.points.length; i++) {
    const q = shape.points[(i + shape.points.length - 1) % shape.points.length];
    length += Math.hypot(shape.points[i].x - q.x, shape.points[i].y - q.y);
  }
  return { pts: box(Math.min(...xs) - r, Math.min(...ys) - r, Math.max(...xs) + r, Math.max(...ys) + r), perimeter: closed ? length : 2 * length + 2 * Math.PI * r };
}

export function newSinceLast(current: AlignedMarks, previous: AlignedMarks | null, opts: { pxPerMm?: number | null; samples?: number } = {}): NewSinceResult {
  const spots = current.marks.filter((m): m is SpotMark => m.kind !== "erase");
  const none = { newAreaPx2: 0, currentAreaPx2: 0, newAreaMm2: opts.pxPerMm ? 0 : null, sampleSpacingPx: 0, errorBoundPx2: 0 };
  if (spots.length === 0) return none;
  // The region can only lie inside the current spots' bounding box, mapped into the first frame.
  const corners = spots.flatMap((s) => shapeExtent(s).pts).map((q) => applyAffine(current.toReference, q));
  const x0 = Math.min(...corners.map((q) => q.x));
  const y0 = Math.min(...corners.map((q) => q.y));
  const w = Math.max(...corners.map((q) => q.x)) - x0;
  const hgt = Math.max(...corners.map((q) => q.y)) - y0;
  const h = Math.max(w, hgt) / (opts.samples ?? NEW_SINCE_SAMPLES);
  if (!(h > 0)) return none;
  const nx = Math.ceil(w / h);
  const ny = Math.ceil(hgt / h);
  const toCurrent = invertAffine(current.toReference);
  const toPrevious = previous ? invertAffine(previous.toReference) : null;
  const face = current.face && current.face.length >= 3 ? current.face : null;
  let currentSamples = 0;
  let newSamples = 0;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const q = { x: x0 + (i + 0.5) * h, y: y0 + (j + 0.5) * h };
      const p = applyAffine(toCurrent, q);
      if (face && !pointInPolygon(p, face)) continue;
      if (!paintedAt(current.marks, p)) continue;
      currentSamples++;
      if (!previous || !toPrevious || !paintedAt(previous.marks, applyAffine(toPrevious, q))) newSamples++;
    }
  }
  // Boundary length grows with the linear scale of each map (√|det| for a similarity; an estimate for an affine).
  const lengthIn = (set: AlignedMarks | null) =>
    set ? Math.sqrt(Math.abs(determinant(set.toReference))) * set.marks.reduce((s, m) => s + shapeExtent(m.kind === "erase" ? m.shape : m).perimeter, 0) : 0;
  const area = h * h;
  const newAreaPx2 = newSamples * area;
  return {
    newAreaPx2,
    currentAreaPx2: currentSamples * area,
    newAreaMm2: opts.pxPerMm ? areaMm2FromPx2(newAreaPx2, opts.pxPerMm) : null,
    sampleSpacingPx: h,
    errorBoundPx2: (lengthIn(current) + lengthIn(previous) + (face ? Math.sqrt(Math.abs(determinant(current.toReference))) * shapeExtent({ kind: "polygon", points: [...face] }).perimeter : 0)) * h,
  };
}
