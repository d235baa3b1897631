// The alignment fit checked against known transforms built here directly from their parameters
// (scale·rotation matrix plus translation, written out with cos/sin), on synthetic points and on the
// demo image generator's face warped by a known transform and recovered from its rust spots.
// No general-purpose matrix library is installed, so the reference is this direct construction;
// the fit itself solves in closed form (complex ratio, Cramer's rule) and must reproduce it.
import { describe, expect, it } from "vitest";
import {
  alignStateOf, applyAffine, composeAffine, controlPointProblem, cssMatrix, describeAffine, fitAlignment, invertAffine, MIN_SEPARATION_PX, type Affine,
} from "@/lib/photos/align";
import { renderSpecimenFace, specimenFaceOutline } from "@/lib/demo-images/specimen-face";
import { isRustColour } from "@/lib/scoring/rust-estimate";
import type { Point } from "@/lib/scoring/geometry";

/** Known similarity: rotate by deg about the origin, scale, then shift. */
function similarity(scale: number, deg: number, dx: number, dy: number): Affine {
  const r = (deg * Math.PI) / 180;
  return { a: scale * Math.cos(r), b: -scale * Math.sin(r), c: dx, d: scale * Math.sin(r), e: scale * Math.cos(r), f: dy };
}
const map = (t: Affine, p: Point): Point => ({ x: t.a * p.x + t.b * p.y + t.c, y: t.d * p.x + t.e * p.y + t.f });
function expectAffineClose(got: Affine, want: Affine, linear: number, shift: number) {
  for (const k of ["a", "b", "d", "e"] as const) expect(Math.abs(got[k] - want[k]), k).toBeLessThan(linear);
  for (const k of ["c", "f"] as const) expect(Math.abs(got[k] - want[k]), k).toBeLessThan(shift);
}

describe("fitAlignment on synthetic points", () => {
  it("recovers a similarity (scale, rotation, translation) from two points", () => {
    const known = similarity(1.25, 17, 40, -22);
    const from = [{ x: 120, y: 80 }, { x: 610, y: 455 }];
    const { kind, transform } = fitAlignment(from, from.map((p) => map(known, p)));
    expect(kind).toBe("similarity");
    expectAffineClose(transform, known, 1e-12, 1e-9);
    const d = describeAffine(transform);
    expect(d.scale).toBeCloseTo(1.25, 12);
    expect(d.rotationDeg).toBeCloseTo(17, 10);
    // Any other point follows the same similarity.
    const p = { x: -300, y: 900 };
    expect(applyAffine(transform, p).x).toBeCloseTo(map(known, p).x, 9);
    expect(applyAffine(transform, p).y).toBeCloseTo(map(known, p).y, 9);
  });

  it("recovers a general affine (shear, unequal scales) from three points", () => {
    const known: Affine = { a: 1.1, b: 0.15, c: -35, d: -0.08, e: 0.92, f: 60 };
    const from = [{ x: 50, y: 40 }, { x: 900, y: 120 }, { x: 300, y: 700 }];
    const { kind, transform } = fitAlignment(from, from.map((p) => map(known, p)));
    expect(kind).toBe("affine");
    expectAffineClose(transform, known, 1e-12, 1e-9);
  });

  it("inverts and composes consistently with the direct construction", () => {
    const t = similarity(0.8, -33, 12, 7);
    const inv = invertAffine(t);
    // Inverse of a similarity by hand: scale 1/s, rotation −θ, shift −R⁻¹t/s.
    const want = similarity(1 / 0.8, 33, 0, 0);
    want.c = -(want.a * 12 + want.b * 7);
    want.f = -(want.d * 12 + want.e * 7);
    expectAffineClose(inv, want, 1e-12, 1e-9);
    const id = composeAffine(inv, t);
    expectAffineClose(id, { a: 1, b: 0, c: 0, d: 0, e: 1, f: 0 }, 1e-12, 1e-9);
    // SVG/CSS matrix(a b c d e f) puts x′ = a·x + c·y + e (CSS Transforms Level 1, matrix()).
    expect(cssMatrix({ a: 1, b: 2, c: 3, d: 4, e: 5, f: 6 })).toBe("matrix(1 4 2 5 3 6)");
  });
});

describe("control point checks", () => {
  const size = { width: 1000, height: 800 };
  it("accepts two or three well spread points inside the photo", () => {
    expect(controlPointProblem([{ x: 10, y: 10 }, { x: 900, y: 700 }], size)).toBeNull();
    expect(controlPointProblem([{ x: 10, y: 10 }, { x: 900, y: 700 }, { x: 100, y: 600 }], size)).toBeNull();
  });
  it("refuses too few, too many, coincident, collinear and outside points with a clear message", () => {
    expect(controlPointProblem([{ x: 10, y: 10 }], size)).toMatch(/at least 2 control points \(1 placed\)/);
    expect(controlPointProblem([{ x: 1, y: 1 }, { x: 200, y: 1 }, { x: 1, y: 200 }, { x: 300, y: 300 }], size)).toMatch(/at most 3/);
    expect(controlPointProblem([{ x: 100, y: 100 }, { x: 100 + MIN_SEPARATION_PX / 2, y: 100 }], size)).toMatch(/Points 1 and 2 are less than/);
    expect(controlPointProblem([{ x: 0, y: 0 }, { x: 500, y: 400 }, { x: 1000, y: 801 }], size)).toMatch(/Point 3 .* outside the photo \(1000 × 800 px\)/);
    expect(controlPointProblem([{ x: 0, y: 0 }, { x: 500, y: 402 }, { x: 1000, y: 800 }], size)).toMatch(/lie on one line/);
  });
  it("refuses a fit whose point counts differ, naming what the first photo has", () => {
    expect(() => fitAlignment([{ x: 1, y: 1 }, { x: 300, y: 1 }], [{ x: 1, y: 1 }, { x: 300, y: 1 }, { x: 1, y: 300 }])).toThrow(/first photo has 3 control points/);
  });
});

// ---- the demo image generator: the same face warped by a known transform, recovered from its spots ----
const W = 320;
const H = 240;
const seed = "align-test";
const outline = specimenFaceOutline(W, H, seed);
const cx = outline.reduce((s, p) => s + p.x, 0) / outline.length;
const cy = outline.reduce((s, p) => s + p.y, 0) / outline.length;
// Three spots of clearly different size, so they pair up by size on both photos.
const spots = [{ x: cx - 60, y: cy - 30, r: 16 }, { x: cx + 55, y: cy - 20, r: 11 }, { x: cx - 5, y: cy + 50, r: 7 }];
const base = renderSpecimenFace({ width: W, height: H, seed, kind: "iron", rustSpots: spots });

/** The photo as a camera would see the face moved by `t`: nearest-pixel resampling through t⁻¹ (written here). */
function warp(t: Affine): Uint8ClampedArray {
  const det = t.a * t.e - t.b * t.d;
  const out = new Uint8ClampedArray(W * H * 4);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const u = x + 0.5 - t.c;
      const v = y + 0.5 - t.f;
      const sx = Math.floor((t.e * u - t.b * v) / det);
      const sy = Math.floor((-t.d * u + t.a * v) / det);
      const o = (y * W + x) * 4;
      if (sx < 0 || sy < 0 || sx >= W || sy >= H) { out[o] = 34; out[o + 1] = 34; out[o + 2] = 37; out[o + 3] = 255; continue; }
      out.set(base.data.subarray((sy * W + sx) * 4, (sy * W + sx) * 4 + 4), o);
    }
  }
  return out;
}

/** Centroids of the rust blobs (4-connected rust-coloured pixels), largest first. */
function spotCentroids(data: Uint8ClampedArray): Point[] {
  const seen = new Uint8Array(W * H);
  const rust = (i: number) => isRustColour(data[i * 4], data[i * 4 + 1], data[i * 4 + 2]);
  const blobs: { n: number; sx: number; sy: number }[] = [];
  for (let start = 0; start < W * H; start++) {
    if (seen[start] || !rust(start)) continue;
    const stack = [start];
    seen[start] = 1;
    const blob = { n: 0, sx: 0, sy: 0 };
    while (stack.length) {
      const i = stack.pop()!;
      const x = i % W;
      const y = (i - x) / W;
      blob.n++; blob.sx += x + 0.5; blob.sy += y + 0.5;
      for (const j of [x > 0 ? i - 1 : -1, x < W - 1 ? i + 1 : -1, y > 0 ? i - W : -1, y < H - 1 ? i + W : -1]) {
        if (j >= 0 && !seen[j] && rust(j)) { seen[j] = 1; stack.push(j); }
      }
    }
    blobs.push(blob);
  }
  return blobs.filter((b) => b.n >= 20).sort((p, q) => q.n - p.n).slice(0, 3).map((b) => ({ x: b.sx / b.n, y: b.sy / b.n }));
}

describe("fitAlignment on the demo face, shifted, rotated and scaled by a known amount", () => {
  const first = spotCentroids(base.data);
  it("finds the three spots on the unmoved face", () => {
    expect(first).toHaveLength(3);
    first.forEach((c, k) => expect(Math.hypot(c.x - spots[k].x, c.y - spots[k].y)).toBeLessThan(3));
  });

  it("recovers a similarity from two spot centres (within a pixel's worth)", () => {
    // The later photo: face turned 8°, 6 % closer, moved by (9, −6) px about the frame.
    const moved = similarity(1.06, 8, 0, 0);
    moved.c = 9 + cx - (moved.a * cx + moved.b * cy);
    moved.f = -6 + cy - (moved.d * cx + moved.e * cy);
    const later = spotCentroids(warp(moved));
    expect(later).toHaveLength(3);
    // Register the later photo to the first one: the fit should be the inverse of the move.
    const { transform } = fitAlignment(later.slice(0, 2), first.slice(0, 2));
    const want = invertAffine(moved);
    const d = describeAffine(transform);
    expect(Math.abs(d.scale - 1 / 1.06)).toBeLessThan(0.01);
    expect(Math.abs(d.rotationDeg - -8)).toBeLessThan(0.6);
    // Where the fit sends the face's centre, against the known inverse.
    const c = applyAffine(transform, applyAffine(moved, { x: cx, y: cy }));
    expect(Math.hypot(c.x - cx, c.y - cy)).toBeLessThan(1.5);
    expectAffineClose(transform, want, 0.015, 4);
  });

  it("recovers an affine (tilted camera) from three spot centres", () => {
    const moved: Affine = { a: 1.04, b: 0.06, c: 0, d: -0.03, e: 0.95, f: 0 };
    moved.c = -5 + cx - (moved.a * cx + moved.b * cy);
    moved.f = 7 + cy - (moved.d * cx + moved.e * cy);
    const later = spotCentroids(warp(moved));
    const { kind, transform } = fitAlignment(later, first);
    expect(kind).toBe("affine");
    const probe = outline.map((p) => applyAffine(transform, applyAffine(moved, p)));
    // Every outline vertex of the later photo lands within 2 px of where it is on the first one.
    probe.forEach((p, k) => expect(Math.hypot(p.x - outline[k].x, p.y - outline[k].y)).toBeLessThan(2));
  });
});

describe("alignStateOf", () => {
  const ref = { points: [{ x: 10, y: 10 }, { x: 300, y: 200 }], referencePhotoId: "first" };
  const known = similarity(2, 90, 5, -5);
  const later = { points: ref.points.map((p) => applyAffine(invertAffine(known), p)), referencePhotoId: "first" };
  it("names the first photo, fits a later one and says why others are not lined up", () => {
    expect(alignStateOf("first", "first", new Map([["first", ref]]))).toMatchObject({ status: "reference", pointCount: 2 });
    const aligned = alignStateOf("later", "first", new Map([["first", ref], ["later", later]]));
    expect(aligned.status).toBe("aligned");
    expectAffineClose(aligned.transform!, known, 1e-9, 1e-7);
    expect(alignStateOf("later", "first", new Map([["later", later]]))).toMatchObject({ status: "not-aligned", reason: expect.stringMatching(/first photo first/) });
    expect(alignStateOf("later", "first", new Map([["first", ref]]))).toMatchObject({ status: "not-aligned", reason: "No control points placed yet." });
    expect(alignStateOf("later", "first", new Map([["first", ref], ["later", { ...later, referencePhotoId: "older" }]]))).toMatchObject({ status: "stale" });
    const three = { points: [...ref.points, { x: 10, y: 250 }], referencePhotoId: "first" };
    expect(alignStateOf("later", "first", new Map([["first", three], ["later", later]]))).toMatchObject({ status: "stale", reason: expect.stringMatching(/first photo has 3 control points/) });
  });
});
