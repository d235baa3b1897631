// Registering the photos of one specimen to its first photo from two or three control points.
//
// A control point is a feature the user can find on every photo of the specimen (a corner, a
// scratch, a reference mark), placed in the same order on each photo, in original-image pixels.
// The fitted transform maps a photo's pixels into the first photo's frame:
//   two points   → similarity (one scale, one rotation, a translation), exact through both points;
//   three points → affine (also shear and unequal scales, e.g. a slightly tilted camera), exact
//                  through all three.
// Both are solved in closed form: the similarity as the complex ratio q = α·p + β, the affine by
// Cramer's rule on the 3×3 system [x y 1]·[a b c]ᵀ = x′ (and the same for y′).
import type { Point } from "@/lib/scoring/geometry";

/** x′ = a·x + b·y + c, y′ = d·x + e·y + f. */
export type Affine = { a: number; b: number; c: number; d: number; e: number; f: number };
export type AlignKind = "similarity" | "affine";

export const MIN_CONTROL_POINTS = 2;
export const MAX_CONTROL_POINTS = 3;
/** Closer than this (px) two points are one point; a third point this close to the line of the other two is on it. */
export const MIN_SEPARATION_PX = 8;

export const IDENTITY: Affine = { a: 1, b: 0, c: 0, d: 0, e: 1, f: 0 };

export function applyAffine(t: Affine, p: Point): Point {
  return { x: t.a * p.x + t.b * p.y + t.c, y: t.d * p.x + t.e * p.y + t.f };
}

export function determinant(t: Affine): number {
  return t.a * t.e - t.b * t.d;
}

export function invertAffine(t: Affine): Affine {
  const det = determinant(t);
  if (!(Math.abs(det) > 1e-12) || !Number.isFinite(det)) throw new RangeError("the transform is singular and has no inverse");
  const a = t.e / det;
  const b = -t.b / det;
  const d = -t.d / det;
  const e = t.a / det;
  return { a, b, c: -(a * t.c + b * t.f), d, e, f: -(d * t.c + e * t.f) };
}

/** Apply `first`, then `second`. */
export function composeAffine(second: Affine, first: Affine): Affine {
  return {
    a: second.a * first.a + second.b * first.d,
    b: second.a * first.b + second.b * first.e,
    c: second.a * first.c + second.b * first.f + second.c,
    d: second.d * first.a + second.e * first.d,
    e: second.d * first.b + second.e * first.e,
    f: second.d * first.c + second.e * first.f + second.f,
  };
}

/** The SVG/CSS `matrix(…)` argument order for the same transform. */
export function cssMatrix(t: Affine): string {
  return `matrix(${[t.a, t.d, t.b, t.e, t.c, t.f].map((v) => +v.toFixed(6)).join(" ")})`;
}

/** Scale (√|det|, the area factor's root), rotation in degrees and translation, for showing a fit. */
export function describeAffine(t: Affine): { scale: number; rotationDeg: number; dx: number; dy: number } {
  return { scale: Math.sqrt(Math.abs(determinant(t))), rotationDeg: (Math.atan2(t.d - t.b, t.a + t.e) * 180) / Math.PI, dx: t.c, dy: t.f };
}

/**
 * What is wrong with a set of control points on a photo of width × height px, or null. The message
 * names the point(s) by their number as the user placed them.
 */
export function controlPointProblem(points: readonly Point[], size: { width: number; height: number } | null): string | null {
  if (points.length < MIN_CONTROL_POINTS) return `Place at least ${MIN_CONTROL_POINTS} control points (${points.length} placed): two fix position, scale and rotation; a third also corrects tilt.`;
  if (points.length > MAX_CONTROL_POINTS) return `Place at most ${MAX_CONTROL_POINTS} control points (${points.length} placed).`;
  for (const [i, p] of points.entries()) {
    if (!Number.isFinite(p.x) || !Number.isFinite(p.y)) return `Point ${i + 1} has no valid position.`;
    if (size && (p.x < 0 || p.y < 0 || p.x > size.width || p.y > size.height)) {
      return `Point ${i + 1} (${Math.round(p.x)}, ${Math.round(p.y)}) lies outside the photo (${size.width} × ${size.height} px).`;
    }
  }
  for (let i = 0; i < points.length; i++) {
    for (let j = i + 1; j < points.length; j++) {
      if (Math.hypot(points[i].x - points[j].x, points[i].y - points[j].y) < MIN_SEPARATION_PX) {
        return `Points ${i + 1} and ${j + 1} are less than ${MIN_SEPARATION_PX} px apart: they mark the same place. Spread the points across the specimen.`;
      }
    }
  }
  if (points.length === 3 && distanceToLongestSide(points) < MIN_SEPARATION_PX) {
    return `The three points lie on one line, which cannot fix a tilt. Move one of them away from the line through the other two, or use two points.`;
  }
  return null;
}

/** Height of the triangle over its longest side (0 when collinear). */
function distanceToLongestSide([p, q, r]: readonly Point[]): number {
  const twiceArea = Math.abs((q.x - p.x) * (r.y - p.y) - (r.x - p.x) * (q.y - p.y));
  const longest = Math.max(Math.hypot(q.x - p.x, q.y - p.y), Math.hypot(r.x - q.x, r.y - q.y), Math.hypot(p.x - r.x, p.y - r.y));
  return longest === 0 ? 0 : twiceArea / longest;
}

/**
 * The transform taking `from` (points on this photo) onto `to` (the same points on the first photo).
 * Throws a RangeError with the user-facing reason when the points cannot define one.
 */
export function fitAlignment(from: readonly Point[], to: readonly Point[]): { kind: AlignKind; transform: Affine } {
  if (from.length !== to.length) {
    throw new RangeError(`The first photo has ${to.length} control points; place ${to.length} here, in the same order (${from.length} placed).`);
  }
  const problem = controlPointProblem(from, null) ?? controlPointProblem(to, null);
  if (problem) throw new RangeError(problem);
  return from.length === 2 ? { kind: "similarity", transform: fitSimilarity(from, to) } : { kind: "affine", transform: fitAffine(from, to) };
}

/** q = α·p + β over the complex numbers, α = (q₂ − q₁)/(p₂ − p₁). */
function fitSimilarity([p1, p2]: readonly Point[], [q1, q2]: readonly Point[]): Affine {
  const px = p2.x - p1.x;
  const py = p2.y - p1.y;
  const qx = q2.x - q1.x;
  const qy = q2.y - q1.y;
  const den = px * px + py * py;
  const re = (qx * px + qy * py) / den;
  const im = (qy * px - qx * py) / den;
  return { a: re, b: -im, c: q1.x - (re * p1.x - im * p1.y), d: im, e: re, f: q1.y - (im * p1.x + re * p1.y) };
}

function fitAffine(from: readonly Point[], to: readonly Point[]): Affine {
  const [p1, p2, p3] = from;
  const det = p1.x * (p2.y - p3.y) - p1.y * (p2.x - p3.x) + (p2.x * p3.y - p3.x * p2.y);
  const solve = (v1: number, v2: number, v3: number) => ({
    u: (v1 * (p2.y - p3.y) - p1.y * (v2 - v3) + (v2 * p3.y - v3 * p2.y)) / det,
    v: (p1.x * (v2 - v3) - v1 * (p2.x - p3.x) + (p2.x * v3 - p3.x * v2)) / det,
    w: (p1.x * (p2.y * v3 - p3.y * v2) - p1.y * (p2.x * v3 - p3.x * v2) + v1 * (p2.x * p3.y - p3.x * p2.y)) / det,
  });
  const x = solve(to[0].x, to[1].x, to[2].x);
  const y = solve(to[0].y, to[1].y, to[2].y);
  return { a: x.u, b: x.v, c: x.w, d: y.u, e: y.v, f: y.w };
}

export type AlignState =
  | { status: "reference"; transform: Affine; pointCount: number }
  | { status: "aligned"; transform: Affine; kind: "similarity" | "affine" }
  | { status: "not-aligned" | "stale"; transform: null; reason: string };

/**
 * How one photo of a series lines up with the first: the fit from its points and the first photo's
 * points (`pts` by photo id, each with the first photo it was placed against).
 */
export function alignStateOf(photoId: string, referenceId: string | null, pts: ReadonlyMap<string, { points: Point[]; referencePhotoId: string }>): AlignState {
  if (photoId === referenceId) return { status: "reference", transform: IDENTITY, pointCount: pts.get(photoId)?.points.length ?? 0 };
  const mine = pts.get(photoId);
  const ref = referenceId ? pts.get(referenceId) : undefined;
  if (!referenceId || !ref) return { status: "not-aligned", transform: null, reason: "Place control points on the first photo first." };
  if (!mine) return { status: "not-aligned", transform: null, reason: "No control points placed yet." };
  if (mine.referencePhotoId !== referenceId) return { status: "stale", transform: null, reason: "Its points were placed against another first photo (the series' first photo changed, or this photo was moved); place them again." };
  try {
    const fit = fitAlignment(mine.points, ref.points);
    return { status: "aligned", transform: fit.transform, kind: fit.kind };
  } catch (e) {
    return { status: "stale", transform: null, reason: e instanceof Error ? e.message : String(e) };
  }
}
