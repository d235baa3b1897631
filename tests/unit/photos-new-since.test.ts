// "New since the last inspection" checked on generated shapes whose areas are known in closed form:
// circle area πr², annulus π(R² − r²), rectangles by width × height, and a circle's area scaling by
// s² under a similarity (all elementary geometry). The alignments are built directly from scale,
// rotation and shift here, so the marks of each photo really sit in different frames.
import { describe, expect, it } from "vitest";
import { IDENTITY, invertAffine, type Affine } from "@/lib/photos/align";
import { newSinceLast, paintedAt } from "@/lib/photos/new-since";
import type { Mark, Point, SpotMark } from "@/lib/scoring/geometry";

function similarity(scale: number, deg: number, dx: number, dy: number): Affine {
  const r = (deg * Math.PI) / 180;
  return { a: scale * Math.cos(r), b: -scale * Math.sin(r), c: dx, d: scale * Math.sin(r), e: scale * Math.cos(r), f: dy };
}
const at = (t: Affine, p: Point): Point => ({ x: t.a * p.x + t.b * p.y + t.c, y: t.d * p.x + t.e * p.y + t.f });
const rect = (x0: number, y0: number, x1: number, y1: number): SpotMark => ({ kind: "polygon", points: [{ x: x0, y: y0 }, { x: x1, y: y0 }, { x: x1, y: y1 }, { x: x0, y: y1 }] });

describe("newSinceLast", () => {
  it("a spot that grew: the annulus between the two radii, in the first photo's frame", () => {
    // First photo frame: the spot centred at (400, 300), r = 30 last time and R = 50 now.
    const prevToRef = similarity(0.8, -12, 35, 10); // previous photo: another distance and angle
    const curToRef = similarity(1.3, 21, -60, 44);
    const centre = { x: 400, y: 300 };
    const prevC = at(invertAffine(prevToRef), centre);
    const curC = at(invertAffine(curToRef), centre);
    const previous = { marks: [{ kind: "circle", cx: prevC.x, cy: prevC.y, r: 30 / 0.8 }] as Mark[], toReference: prevToRef };
    const current = { marks: [{ kind: "circle", cx: curC.x, cy: curC.y, r: 50 / 1.3 }] as Mark[], toReference: curToRef };
    const r = newSinceLast(current, previous);
    const annulus = Math.PI * (50 ** 2 - 30 ** 2); // π(R² − r²)
    expect(Math.abs(r.newAreaPx2 - annulus)).toBeLessThan(r.errorBoundPx2);
    expect(Math.abs(r.newAreaPx2 - annulus) / annulus).toBeLessThan(0.005);
    expect(Math.abs(r.currentAreaPx2 - Math.PI * 50 ** 2) / (Math.PI * 50 ** 2)).toBeLessThan(0.005);
    expect(r.newAreaMm2).toBeNull();
  });

  it("without alignment the same spot would look new: a misregistered frame is not the same as aligned", () => {
    const curToRef = similarity(1, 0, 40, 0); // the current photo is shifted 40 px to the left of the first
    const previous = { marks: [rect(100, 100, 200, 200)], toReference: IDENTITY };
    const aligned = newSinceLast({ marks: [rect(60, 100, 160, 200)], toReference: curToRef }, previous);
    expect(aligned.newAreaPx2).toBeLessThan(aligned.errorBoundPx2); // nothing new once aligned
    const unaligned = newSinceLast({ marks: [rect(60, 100, 160, 200)], toReference: IDENTITY }, previous);
    expect(Math.abs(unaligned.newAreaPx2 - 40 * 100)).toBeLessThan(unaligned.errorBoundPx2); // 40 × 100 px strip
  });

  it("new spots beside old ones, clipped to the current face, reported in mm² with a scale", () => {
    const previous = { marks: [rect(0, 0, 100, 100)], toReference: IDENTITY };
    // Now: the old square, a new 50 × 40 rectangle and a circle r = 20 centred on the face's edge x = 300.
    const current = {
      marks: [rect(0, 0, 100, 100), rect(150, 0, 200, 40), { kind: "circle", cx: 300, cy: 200, r: 20 }] as Mark[],
      face: [{ x: -10, y: -10 }, { x: 300, y: -10 }, { x: 300, y: 400 }, { x: -10, y: 400 }],
      toReference: IDENTITY,
    };
    const r = newSinceLast(current, previous, { pxPerMm: 10 });
    const want = 50 * 40 + (Math.PI * 20 ** 2) / 2; // rectangle + half disc (the face edge runs through the centre)
    expect(Math.abs(r.newAreaPx2 - want)).toBeLessThan(r.errorBoundPx2);
    expect(r.newAreaMm2).toBeCloseTo(r.newAreaPx2 / 100, 10); // 10 px per mm → 100 px² per mm²
  });

  it("erasures count as paint order says: an erased part of an old spot that rusts again is new", () => {
    // Last time: a square with its right half erased. Now: the whole square.
    const previous = { marks: [rect(0, 0, 100, 100), { kind: "erase", shape: rect(50, 0, 100, 100) }] as Mark[], toReference: IDENTITY };
    const current = { marks: [rect(0, 0, 100, 100)], toReference: IDENTITY };
    const r = newSinceLast(current, previous);
    expect(Math.abs(r.newAreaPx2 - 50 * 100)).toBeLessThan(r.errorBoundPx2);
    // A spot painted over an erasure is rust again.
    expect(paintedAt([rect(0, 0, 10, 10), { kind: "erase", shape: rect(0, 0, 10, 10) }, { kind: "circle", cx: 5, cy: 5, r: 1 }], { x: 5, y: 5 })).toBe(true);
    expect(paintedAt([rect(0, 0, 10, 10), { kind: "erase", shape: rect(0, 0, 10, 10) }], { x: 5, y: 5 })).toBe(false);
  });

  it("with no previous inspection everything on the current photo is new; a brush stroke is a capsule", () => {
    const stroke: Mark = { kind: "brush", points: [{ x: 100, y: 100 }, { x: 200, y: 100 }], radius: 10 };
    const r = newSinceLast({ marks: [stroke], toReference: similarity(2, 30, 5, 5) }, null);
    const capsule = 4 * (100 * 20 + Math.PI * 10 ** 2); // (length × width + disc) × s², s = 2
    expect(Math.abs(r.newAreaPx2 - capsule)).toBeLessThan(r.errorBoundPx2);
    expect(newSinceLast({ marks: [], toReference: IDENTITY }, null).newAreaPx2).toBe(0);
  });
});
