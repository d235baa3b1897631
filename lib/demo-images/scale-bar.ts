// The scale bar drawn on generated specimen photos: a known length in mm at a known px per mm, so
// the scale conversion can be checked against an image whose true scale is known.
import type { Point } from "@/lib/scoring/geometry";

/** Where the scale bar was drawn: its two ends (pixel edges, on the bar's centre line) and its length. */
export type DrawnScaleBar = { a: Point; b: Point; lengthMm: number; lengthPx: number; row: number };

/** A crisp white bar lengthMm × pxPerMm px long (rounded to whole px), in the bottom-left corner. */
export function paintScaleBar(data: Uint8ClampedArray, faceMask: Uint8Array, width: number, height: number, bar: { pxPerMm: number; lengthMm?: number }): DrawnScaleBar {
  const lengthMm = bar.lengthMm ?? 10;
  const lengthPx = Math.round(lengthMm * bar.pxPerMm);
  const thick = Math.max(3, Math.round(bar.pxPerMm * 0.5));
  const x0 = Math.round(width * 0.02);
  const y0 = height - Math.round(height * 0.02) - thick;
  if (!(lengthPx >= 2) || x0 + lengthPx > width || y0 < 0) throw new RangeError(`a ${lengthMm} mm scale bar at ${bar.pxPerMm} px/mm does not fit a ${width}×${height} image`);
  for (let y = y0; y < y0 + thick; y++) {
    for (let x = x0; x < x0 + lengthPx; x++) {
      if (faceMask[y * width + x]) throw new RangeError("the scale bar would cover the specimen face; use a larger image or fewer px per mm");
      data.fill(245, (y * width + x) * 4, (y * width + x) * 4 + 3);
    }
  }
  const row = y0 + (thick >> 1);
  return { a: { x: x0, y: row + 0.5 }, b: { x: x0 + lengthPx, y: row + 0.5 }, lengthMm, lengthPx, row };
}
