// Photo scale: pixels per millimetre from two points marked on the scale bar (or typed in), and the
// conversions that turn pixel areas on a photo into mm² on the specimen. Pure.
//
// A length of L px on the photo is L / pxPerMm mm on the specimen; an area of A px² is A / pxPerMm² mm²
// (the scale bar lies in the plane of the face, so one factor holds in both directions).
//
// Growth per specimen is the ordinary least-squares slope of rusted area (mm²) on days since day 0,
// over every scored inspection with a scale: it uses all the points and does not hang on the first
// and last alone, as a first difference would.
import { rustedAreaDetail, type Mark, type Point, type SpotMark } from "./geometry";

/** How a scale was given: two marked ends of a known length, or the px per mm typed in. */
export type ScaleSource = { kind: "points"; a: Point; b: Point; lengthMm: number } | { kind: "typed" };

/** Photos taken further away than this, or a bar shorter than a few px, are not a usable scale. */
export const MIN_PX_PER_MM = 0.5;
export const MAX_PX_PER_MM = 10_000;

export type ScaleProblem = { field: "points" | "lengthMm" | "pxPerMm"; message: string };

/** Why a scale cannot be used, or null. Messages are written for the form field they belong to. */
export function pxPerMmProblem(pxPerMm: number): ScaleProblem | null {
  if (!Number.isFinite(pxPerMm)) return { field: "pxPerMm", message: "Type the pixels per millimetre as a number, e.g. 24.5." };
  if (pxPerMm <= 0) return { field: "pxPerMm", message: "Pixels per millimetre must be greater than 0." };
  if (pxPerMm < MIN_PX_PER_MM || pxPerMm > MAX_PX_PER_MM) return { field: "pxPerMm", message: `Use a value between ${MIN_PX_PER_MM} and ${MAX_PX_PER_MM} pixels per millimetre.` };
  return null;
}

export function pointsProblem(a: Point, b: Point, lengthMm: number): ScaleProblem | null {
  if (![a.x, a.y, b.x, b.y].every(Number.isFinite)) return { field: "points", message: "Give both ends of the scale bar as pixel coordinates (numbers)." };
  if (a.x === b.x && a.y === b.y) return { field: "points", message: "The two ends of the scale bar are the same point; mark both ends of the bar." };
  if (!Number.isFinite(lengthMm) || lengthMm <= 0) return { field: "lengthMm", message: "The length between the two points must be more than 0 mm." };
  return pxPerMmProblem(Math.hypot(b.x - a.x, b.y - a.y) / lengthMm);
}

/** Pixels per mm from two points lengthMm apart on the scale bar; throws RangeError on a zero-length scale. */
export function pxPerMmFromPoints(a: Point, b: Point, lengthMm: number): number {
  const p = pointsProblem(a, b, lengthMm);
  if (p) throw new RangeError(p.message);
  return Math.hypot(b.x - a.x, b.y - a.y) / lengthMm;
}

export function areaMm2FromPx2(areaPx2: number, pxPerMm: number): number {
  const p = pxPerMmProblem(pxPerMm);
  if (p) throw new RangeError(p.message);
  if (!Number.isFinite(areaPx2) || areaPx2 < 0) throw new RangeError("area must be a finite number of px² ≥ 0");
  return areaPx2 / (pxPerMm * pxPerMm);
}

/** Rusted area in mm²: the scored percentage of the face outline's area (px²), converted. */
export function rustedAreaMm2({ areaPercent, faceAreaPx2, pxPerMm }: { areaPercent: number; faceAreaPx2: number; pxPerMm: number }): number {
  return (areaPercent / 100) * areaMm2FromPx2(faceAreaPx2, pxPerMm);
}

// Spot size classes by the diameter of a circle of the same area. Our own classes (no standard sets
// them for rust spots on cut faces): pin-point, small, medium, large.
export const SPOT_SIZE_CLASSES = [
  { key: "under-0.5", label: "< 0.5 mm", maxDiameterMm: 0.5 },
  { key: "0.5-1", label: "0.5–1 mm", maxDiameterMm: 1 },
  { key: "1-3", label: "1–3 mm", maxDiameterMm: 3 },
  { key: "3-up", label: "≥ 3 mm", maxDiameterMm: Infinity },
] as const;
export type SpotSizeClass = (typeof SPOT_SIZE_CLASSES)[number]["key"];

export function equivalentDiameterMm(areaMm2: number): number {
  return 2 * Math.sqrt(areaMm2 / Math.PI);
}

export function spotSizeClass(areaMm2: number): SpotSizeClass {
  const d = equivalentDiameterMm(areaMm2);
  return SPOT_SIZE_CLASSES.find((c) => d < c.maxDiameterMm)!.key;
}

/** Count of spots per size class, from each spot's area in mm². */
export function countBySizeClass(areasMm2: readonly number[]): Record<SpotSizeClass, number> {
  const out = Object.fromEntries(SPOT_SIZE_CLASSES.map((c) => [c.key, 0])) as Record<SpotSizeClass, number>;
  for (const a of areasMm2) if (a > 0) out[spotSizeClass(a)]++;
  return out;
}

/**
 * Each painted spot's own area (px²) within the face. Erase marks are not spots; a spot is measured
 * alone, so two touching spots count as two, as the scorer drew them.
 */
export function spotAreasPx2(face: readonly Point[], marks: readonly Mark[]): number[] {
  return marks.filter((m): m is SpotMark => m.kind !== "erase").map((m) => rustedAreaDetail(face, [m]).rustedAreaPx2);
}

/** Least-squares slope of area (mm²) on day; null with fewer than two distinct days. */
export function growthMm2PerDay(points: readonly { day: number; areaMm2: number }[]): number | null {
  const n = points.length;
  if (n < 2) return null;
  const mx = points.reduce((s, p) => s + p.day, 0) / n;
  const my = points.reduce((s, p) => s + p.areaMm2, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (const p of points) {
    sxx += (p.day - mx) ** 2;
    sxy += (p.day - mx) * (p.areaMm2 - my);
  }
  return sxx === 0 ? null : sxy / sxx;
}
