// A click on a photo shown scaled maps to the photo's own pixels; worked by hand below.
import { describe, expect, it } from "vitest";
import { photoPointAt } from "@/lib/photos/click-point";

describe("photoPointAt", () => {
  const box = { left: 100, top: 50, width: 400, height: 300 }; // a 4000 × 3000 photo shown at a tenth
  const photo = { width: 4000, height: 3000 };

  it("scales each axis from the shown box to the photo, rounded to whole pixels by default", () => {
    // (100 + 123.45 − 100) / 400 × 4000 = 1234.5 → 1235; (50 + 61.72 − 50) / 300 × 3000 = 617.2 → 617
    expect(photoPointAt({ clientX: 223.45, clientY: 111.72 }, box, photo)).toEqual({ x: 1235, y: 617 });
    expect(photoPointAt({ clientX: 100, clientY: 50 }, box, photo)).toEqual({ x: 0, y: 0 });
    expect(photoPointAt({ clientX: 500, clientY: 350 }, box, photo)).toEqual({ x: 4000, y: 3000 });
  });

  it("keeps tenths of a pixel when asked, and scales the axes independently of each other", () => {
    expect(photoPointAt({ clientX: 223.456, clientY: 111.72 }, box, photo, 1)).toEqual({ x: 1234.6, y: 617.2 });
    // Shown stretched to a square: x by 10, y by 7.5.
    expect(photoPointAt({ clientX: 300, clientY: 250 }, { left: 100, top: 50, width: 400, height: 400 }, photo, 1)).toEqual({ x: 2000, y: 1500 });
  });
});
