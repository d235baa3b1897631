import { describe, expect, it } from "vitest";
import {
  pointInPolygon,
  polygonArea,
  rustedAreaDetail,
  rustedAreaPercent,
  type Mark,
  type Point,
} from "@/lib/scoring/geometry";

const square = (x0: number, y0: number, side: number): Point[] => [
  { x: x0, y: y0 },
  { x: x0 + side, y: y0 },
  { x: x0 + side, y: y0 + side },
  { x: x0, y: y0 + side },
];
const face = square(0, 0, 1000);

// Grid measurement: within 0.5 % (relative) of the exact area (our resolution target for rusted-area marks).
function expectNear(got: number, exact: number): void {
  expect(Math.abs(got - exact) / exact).toBeLessThan(0.005);
}

describe("polygonArea and pointInPolygon", () => {
  it("computes shoelace areas of simple shapes", () => {
    expect(polygonArea(face)).toBe(1_000_000); // side² (geometry)
    expect(polygonArea([...face].reverse())).toBe(1_000_000); // orientation does not matter
    expect(polygonArea([{ x: 0, y: 0 }, { x: 4, y: 0 }, { x: 0, y: 3 }])).toBe(6); // right triangle ½·4·3
    expect(polygonArea([{ x: 0, y: 0 }, { x: 1, y: 1 }])).toBe(0);
  });

  it("tells inside from outside, including a concave notch", () => {
    const notched: Point[] = [
      { x: 0, y: 0 },
      { x: 10, y: 0 },
      { x: 10, y: 10 },
      { x: 5, y: 4 },
      { x: 0, y: 10 },
    ];
    expect(pointInPolygon({ x: 5, y: 2 }, notched)).toBe(true);
    expect(pointInPolygon({ x: 5, y: 8 }, notched)).toBe(false); // inside the notch
    expect(pointInPolygon({ x: 11, y: 5 }, notched)).toBe(false);
  });
});

describe("rustedAreaPercent", () => {
  it("measures a circle inside a square face as πr²/side² within 0.5 %", () => {
    for (const r of [5, 37.5, 120, 400]) {
      const exact = (100 * Math.PI * r * r) / 1_000_000; // πr²/side² (geometry)
      expectNear(rustedAreaPercent(face, [{ kind: "circle", cx: 480, cy: 515, r }]), exact);
    }
  });

  it("counts overlapping spots once", () => {
    const a: Mark = { kind: "circle", cx: 400, cy: 500, r: 100 };
    const b: Mark = { kind: "circle", cx: 500, cy: 500, r: 100 };
    // Lens of two circles radius r, centre distance d: 2r²·acos(d/2r) − (d/2)·√(4r² − d²) (geometry)
    const r = 100;
    const d = 100;
    const lens = 2 * r * r * Math.acos(d / (2 * r)) - (d / 2) * Math.sqrt(4 * r * r - d * d);
    const exact = (100 * (2 * Math.PI * r * r - lens)) / 1_000_000;
    expectNear(rustedAreaPercent(face, [a, b]), exact);
    // The same spot marked twice adds nothing.
    expect(rustedAreaPercent(face, [a, a])).toBeCloseTo(rustedAreaPercent(face, [a]), 10);
  });

  it("clips a spot that runs off the face", () => {
    // Circle centred on the left edge: exactly half of it is on the face (geometry).
    const exact = (100 * (Math.PI * 200 * 200)) / 2 / 1_000_000;
    expectNear(rustedAreaPercent(face, [{ kind: "circle", cx: 0, cy: 500, r: 200 }]), exact);
    // A polygon spot half outside: 100 × 200 inside of 200 × 200 drawn.
    const poly: Mark = { kind: "polygon", points: square(-100, 300, 200) };
    expectNear(rustedAreaPercent(face, [poly]), (100 * 100 * 200) / 1_000_000);
    // Entirely outside → nothing.
    expect(rustedAreaPercent(face, [{ kind: "circle", cx: -500, cy: -500, r: 100 }])).toBe(0);
  });

  it("removes erased area, and paints again after the erase", () => {
    const spot: Mark = { kind: "polygon", points: square(100, 100, 400) }; // 160 000 px²
    const eraser: Mark = { kind: "erase", shape: { kind: "polygon", points: square(100, 100, 200) } }; // 40 000 px²
    expectNear(rustedAreaPercent(face, [spot]), 16); // 160 000 / 1 000 000 (geometry)
    expectNear(rustedAreaPercent(face, [spot, eraser]), 12); // (160 000 − 40 000) / 1 000 000 (geometry)
    // Order matters like paint: a spot after the eraser is rust again.
    expect(rustedAreaPercent(face, [spot, eraser, spot])).toBe(rustedAreaPercent(face, [spot]));
    // An eraser on bare metal changes nothing.
    expect(rustedAreaPercent(face, [eraser])).toBe(0);
  });

  it("measures a brush stroke as a swept disc (capsule)", () => {
    // Straight stroke of length L and radius r: area 2rL + πr² (geometry)
    const stroke: Mark = {
      kind: "brush",
      radius: 20,
      points: [
        { x: 200, y: 300 },
        { x: 350, y: 450 },
        { x: 500, y: 600 },
      ],
    };
    const L = Math.hypot(300, 300);
    const exact = (100 * (2 * 20 * L + Math.PI * 400)) / 1_000_000;
    expectNear(rustedAreaPercent(face, [stroke]), exact);
    // A brush eraser along the same path removes it all.
    expect(rustedAreaPercent(face, [stroke, { kind: "erase", shape: { ...stroke, radius: 21 } }])).toBe(0);
  });

  it("works on a non-square face and reports its resolution error", () => {
    const tri: Point[] = [
      { x: 0, y: 0 },
      { x: 3000, y: 0 },
      { x: 0, y: 2000 },
    ];
    const detail = rustedAreaDetail(tri, [{ kind: "circle", cx: 600, cy: 600, r: 300 }]);
    const exact = (100 * Math.PI * 300 * 300) / 3_000_000; // πr² / (½·3000·2000) (geometry)
    expectNear(detail.percent, exact);
    expect(detail.faceAreaPx2).toBe(3_000_000);
    expect(detail.sampleSpacingPx).toBeCloseTo(3000 / 4096, 10);
    expect(Math.abs(detail.percent - exact)).toBeLessThanOrEqual(detail.errorBoundPercent);
  });

  it("reads 100 % when a spot covers the whole face", () => {
    expect(rustedAreaPercent(face, [{ kind: "polygon", points: square(-10, -10, 1020) }])).toBe(100);
  });

  it("rejects a degenerate face or a bad mark", () => {
    expect(() => rustedAreaPercent([{ x: 0, y: 0 }, { x: 1, y: 1 }], [])).toThrow(RangeError);
    expect(() => rustedAreaPercent(face, [{ kind: "circle", cx: 1, cy: 1, r: Number.NaN }])).toThrow(RangeError);
    expect(() => rustedAreaPercent(face, [{ kind: "brush", points: [], radius: 3 }])).toThrow(RangeError);
  });
});
