import { linearRegression } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { renderSpecimenFace, specimenFaceOutline } from "@/lib/demo-images/specimen-face";
import {
  areaMm2FromPx2, countBySizeClass, equivalentDiameterMm, growthMm2PerDay, pointsProblem, pxPerMmFromPoints, pxPerMmProblem,
  rustedAreaMm2, spotAreasPx2, spotSizeClass,
} from "@/lib/scoring/scale";

const W = 640;
const H = 480;
const PX_PER_MM = 20; // the generator's known scale: a 10 mm bar is 200 px

/** The bar's ends found in the image itself: the longest run of near-white pixels on its row. */
function findBarEnds(img: { width: number; data: Uint8ClampedArray }, row: number) {
  let best = { start: 0, end: 0 };
  let start = -1;
  for (let x = 0; x <= img.width; x++) {
    const o = (row * img.width + x) * 4;
    const white = x < img.width && img.data[o] > 220 && img.data[o + 1] > 220 && img.data[o + 2] > 220;
    if (white && start < 0) start = x;
    if (!white && start >= 0) {
      if (x - start > best.end - best.start) best = { start, end: x };
      start = -1;
    }
  }
  return { a: { x: best.start, y: row + 0.5 }, b: { x: best.end, y: row + 0.5 } };
}

describe("scale from the generated photo's 10 mm scale bar", () => {
  const face = specimenFaceOutline(W, H, "scale-1");
  const cx = face.reduce((s, p) => s + p.x, 0) / face.length;
  const cy = face.reduce((s, p) => s + p.y, 0) / face.length;
  const rMm = 2;
  const img = renderSpecimenFace({ width: W, height: H, seed: "scale-1", kind: "iron", rustSpots: [{ x: cx, y: cy, r: rMm * PX_PER_MM }], scaleBar: { pxPerMm: PX_PER_MM } });

  it("marking the bar's ends as found in the pixels gives the known px/mm", () => {
    expect(img.scaleBar?.lengthPx).toBe(200);
    const ends = findBarEnds(img, img.scaleBar!.row);
    expect(ends.b.x - ends.a.x).toBe(200);
    expect(pxPerMmFromPoints(ends.a, ends.b, 10)).toBe(PX_PER_MM);
    // The reported ends agree with the drawn pixels.
    expect(pxPerMmFromPoints(img.scaleBar!.a, img.scaleBar!.b, img.scaleBar!.lengthMm)).toBe(PX_PER_MM);
  });

  it("a generated spot of radius 2 mm converts to about π·(2 mm)² = 12.57 mm²", () => {
    // The blob's edge is the radius modulated by three small harmonics (amplitude < 0.09 each), so its
    // area is π r² (1 + Σ a²/2), within 1.3 % of π r² (geometry of the curve r(θ), integral of r²/2).
    const areaMm2 = areaMm2FromPx2(img.rustPixels, pxPerMmFromPoints(img.scaleBar!.a, img.scaleBar!.b, 10));
    expect(areaMm2).toBeCloseTo(img.rustPixels / 400, 10);
    expect(Math.abs(areaMm2 / (Math.PI * rMm ** 2) - 1)).toBeLessThan(0.03);
  });

  it("refuses a bar that does not fit the image", () => {
    expect(() => renderSpecimenFace({ width: W, height: H, seed: "scale-1", kind: "iron", rustSpots: [], scaleBar: { pxPerMm: 100 } })).toThrow(/does not fit/);
  });
});

describe("scale input checks", () => {
  it("names the field for a zero-length, non-numeric or non-positive scale", () => {
    expect(pointsProblem({ x: 5, y: 5 }, { x: 5, y: 5 }, 10)?.field).toBe("points");
    expect(pointsProblem({ x: 5, y: 5 }, { x: 50, y: 5 }, 0)?.field).toBe("lengthMm");
    expect(pointsProblem({ x: Number.NaN, y: 5 }, { x: 50, y: 5 }, 10)?.field).toBe("points");
    expect(pxPerMmProblem(0)?.message).toMatch(/greater than 0/);
    expect(pxPerMmProblem(-3)?.message).toMatch(/greater than 0/);
    expect(pxPerMmProblem(Number.NaN)?.message).toMatch(/number/);
    expect(pxPerMmProblem(24.5)).toBeNull();
    expect(() => pxPerMmFromPoints({ x: 1, y: 1 }, { x: 1, y: 1 }, 10)).toThrow(/same point/);
  });

  it("uses the Euclidean distance between the two ends (3-4-5 triangle)", () => {
    expect(pxPerMmFromPoints({ x: 0, y: 0 }, { x: 300, y: 400 }, 25)).toBe(20);
  });
});

describe("rusted area in mm²", () => {
  it("is the scored share of the face area divided by px/mm squared", () => {
    // Direct recomputation: a 1000 × 800 px face at 20 px/mm is 50 × 40 mm = 2000 mm²; 5 % of it is 100 mm².
    expect(rustedAreaMm2({ areaPercent: 5, faceAreaPx2: 1000 * 800, pxPerMm: 20 })).toBeCloseTo(100, 10);
  });
});

describe("spot size classes", () => {
  it("classes each spot by the diameter of a circle of the same area", () => {
    // A circle of diameter d has area π d²/4 (geometry).
    expect(equivalentDiameterMm(Math.PI)).toBeCloseTo(2, 12);
    expect(spotSizeClass((Math.PI * 0.4 ** 2) / 4)).toBe("under-0.5");
    expect(spotSizeClass((Math.PI * 0.8 ** 2) / 4)).toBe("0.5-1");
    expect(spotSizeClass((Math.PI * 2 ** 2) / 4)).toBe("1-3");
    expect(spotSizeClass((Math.PI * 5 ** 2) / 4)).toBe("3-up");
    expect(countBySizeClass([0.01, 0.5, 0.6, 3, 30, 0])).toEqual({ "under-0.5": 1, "0.5-1": 2, "1-3": 1, "3-up": 1 });
  });

  it("measures each drawn spot alone inside the face and leaves erasures out", () => {
    const square = [{ x: 0, y: 0 }, { x: 1000, y: 0 }, { x: 1000, y: 1000 }, { x: 0, y: 1000 }];
    const areas = spotAreasPx2(square, [
      { kind: "circle", cx: 200, cy: 200, r: 50 },
      { kind: "polygon", points: [{ x: 500, y: 500 }, { x: 600, y: 500 }, { x: 600, y: 600 }, { x: 500, y: 600 }] },
      { kind: "erase", shape: { kind: "circle", cx: 200, cy: 200, r: 10 } },
    ]);
    expect(areas).toHaveLength(2);
    expect(areas[0] / (Math.PI * 50 ** 2)).toBeCloseTo(1, 2); // π r²
    expect(areas[1] / 10_000).toBeCloseTo(1, 2); // 100 × 100 px, within the sample grid's resolution
  });
});

describe("growth in mm² per day", () => {
  it("is the least-squares slope, as simple-statistics' linearRegression gives it", () => {
    const pts = [{ day: 0, areaMm2: 0 }, { day: 7, areaMm2: 1.2 }, { day: 14, areaMm2: 3.9 }, { day: 28, areaMm2: 6.1 }, { day: 56, areaMm2: 14.8 }];
    const ref = linearRegression(pts.map((p) => [p.day, p.areaMm2])).m;
    expect(growthMm2PerDay(pts)).toBeCloseTo(ref, 12);
  });

  it("is unknown with one point or a single day", () => {
    expect(growthMm2PerDay([{ day: 3, areaMm2: 1 }])).toBeNull();
    expect(growthMm2PerDay([{ day: 3, areaMm2: 1 }, { day: 3, areaMm2: 2 }])).toBeNull();
  });
});
