// Where a click on a photo shown at any size falls in the photo's own pixels: the shown box is
// stretched over the whole photo (no letterboxing), so each axis scales on its own.
import type { Point } from "@/lib/scoring/geometry";

/** `decimals` rounds the result: 0 for whole pixels (a scale bar's ends), 1 for tenths (control points). */
export function photoPointAt(click: { clientX: number; clientY: number }, box: { left: number; top: number; width: number; height: number }, photo: { width: number; height: number }, decimals = 0): Point {
  const k = 10 ** decimals;
  return {
    x: Math.round(((click.clientX - box.left) / box.width) * photo.width * k) / k,
    y: Math.round(((click.clientY - box.top) / box.height) * photo.height * k) / k,
  };
}
