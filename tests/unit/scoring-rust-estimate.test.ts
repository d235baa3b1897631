import sharp from "sharp";
import { describe, expect, it } from "vitest";
import { renderSpecimenFace, scatterRustSpots, specimenFaceOutline, type SpecimenKind } from "@/lib/demo-images/specimen-face";
import { pointInPolygon } from "@/lib/scoring/geometry";
import { srgbToLab } from "@/lib/scoring/colour-space";
import { countRust, estimateRustFraction, isRustColour, rustClass, rustMask } from "@/lib/scoring/rust-estimate";

const W = 800;
const H = 600;

function face(kind: SpecimenKind, seed: string, spotCount: number) {
  const outline = specimenFaceOutline(W, H, seed);
  const rustSpots = scatterRustSpots(outline, { count: spotCount, rMin: 6, rMax: 45, seed });
  return renderSpecimenFace({ width: W, height: H, seed, kind, rustSpots });
}

describe("srgbToLab", () => {
  it("matches the usual sRGB (D65) Lab values", () => {
    const white = srgbToLab(255, 255, 255);
    expect(white.L).toBeCloseTo(100, 2); // CIELAB definition: reference white L* = 100
    expect(Math.hypot(white.a, white.b)).toBeLessThan(0.05); // CIELAB definition: white is neutral
    // sRGB primaries in CIELAB D65 — from memory (commonly tabulated), hence the 0.5 tolerance.
    const red = srgbToLab(255, 0, 0);
    expect(red.L).toBeCloseTo(53.24, 0); // from memory
    expect(red.a).toBeCloseTo(80.09, 0); // from memory
    expect(red.b).toBeCloseTo(67.2, 0); // from memory
    const blue = srgbToLab(0, 0, 255);
    expect(blue.L).toBeCloseTo(32.3, 0); // from memory
    expect(blue.b).toBeCloseTo(-107.86, 0); // from memory
  });
});

describe("isRustColour", () => {
  it("accepts orange-brown and red-brown, rejects metal, silicates and dark grains", () => {
    expect(isRustColour(170, 88, 38)).toBe(true); // orange-brown
    expect(isRustColour(130, 58, 38)).toBe(true); // red-brown
    expect(isRustColour(100, 46, 30)).toBe(true); // dark red-brown rim
    expect(isRustColour(152, 150, 147)).toBe(false); // etched metal, grey
    expect(isRustColour(160, 152, 140)).toBe(false); // metal under warm light
    expect(isRustColour(88, 118, 62)).toBe(false); // green olivine
    expect(isRustColour(150, 160, 72)).toBe(false); // yellow-green
    expect(isRustColour(112, 108, 52)).toBe(false); // olive
    expect(isRustColour(48, 46, 42)).toBe(false); // dark grain
    expect(isRustColour(250, 250, 250)).toBe(false); // highlight
  });
});

describe("rust classes", () => {
  it("reads dark crust and pale droplets as their own classes, not dark grains, shadow or highlights", () => {
    expect(rustClass(170, 88, 38)).toBe(1); // orange-brown
    expect(rustClass(62, 34, 24)).toBe(2); // black-brown crust, L* ≈ 17 (below the main window)
    expect(rustClass(234, 204, 160)).toBe(3); // pale buff droplet, L* ≈ 84, hue ≈ 80°
    expect(rustClass(48, 46, 42)).toBe(0); // dark grain, C* ≈ 3
    expect(rustClass(34, 34, 37)).toBe(0); // backdrop / shadow, bluish
    expect(rustClass(245, 243, 238)).toBe(0); // highlight on metal, near-neutral
    expect(rustClass(150, 160, 72)).toBe(0); // yellow-green silicate, hue ≈ 110°
    expect(rustClass(120, 110, 60)).toBe(0); // olive-brown silicate, L* ≈ 46
  });

  // The generator paints each kind of spot; the true area is its own painted pixels.
  const kinds: Array<["dark" | "droplet", 2 | 3, number, number]> = [
    ["dark", 2, 10, 35],
    ["droplet", 3, 4, 14],
  ];
  it.each(kinds)("finds %s spots on a stony-iron face within ±35 %% of their true area", (kind, cls, rMin, rMax) => {
    const outline = specimenFaceOutline(W, H, `only-${kind}`);
    const rustSpots = scatterRustSpots(outline, { count: 12, rMin, rMax, seed: `only-${kind}` }).map((s) => ({ ...s, kind }));
    const img = renderSpecimenFace({ width: W, height: H, seed: `only-${kind}`, kind: "stony-iron", rustSpots });
    expect(img.trueRustFraction).toBeGreaterThan(0.002);
    const counts = countRust(img, img.face);
    const est = counts.rust / counts.face;
    expect(Math.abs(est - img.trueRustFraction) / img.trueRustFraction).toBeLessThanOrEqual(0.35);
    // Most of it is found by the class made for it: the orange-brown window alone would miss it.
    expect(counts.byClass[cls]).toBeGreaterThan(counts.rust * 0.6);
  });
});

describe("estimateRustFraction on synthetic specimen faces", () => {
  // The true area comes from the generator's own painted rust pixels (lib/demo-images), so the
  // reference here is the construction of the image, not a published value.
  const cases: Array<[SpecimenKind, string, number]> = [
    ["iron", "alpha", 3],
    ["iron", "beta", 8],
    ["iron", "gamma", 20],
    ["stony-iron", "alpha", 3],
    ["stony-iron", "delta", 8],
    ["stony-iron", "epsilon", 20],
  ];
  it.each(cases)("%s face %s with %i spots: within ±35 %% of the true rusted area", (kind, seed, n) => {
    const img = face(kind, seed, n);
    expect(img.trueRustFraction).toBeGreaterThan(0.002); // the case really has rust to find
    const est = estimateRustFraction(img, img.face);
    expect(Math.abs(est - img.trueRustFraction) / img.trueRustFraction).toBeLessThanOrEqual(0.35);
  });

  const clean: Array<[SpecimenKind, string]> = [
    ["iron", "clean-1"],
    ["iron", "clean-2"],
    ["stony-iron", "clean-1"],
    ["stony-iron", "clean-2"],
    ["stony-iron", "clean-3"],
  ];
  it.each(clean)("rust-free %s face %s reads under 0.3 %%", (kind, seed) => {
    const img = face(kind, seed, 0);
    expect(img.trueRustFraction).toBe(0);
    expect(estimateRustFraction(img, img.face)).toBeLessThan(0.003);
  });

  it("survives JPEG encoding with chroma subsampling, as demo photos are stored", async () => {
    for (const kind of ["iron", "stony-iron"] as const) {
      const img = face(kind, "jpeg", 10);
      const jpeg = await sharp(Buffer.from(img.data.buffer), { raw: { width: W, height: H, channels: 4 } })
        .jpeg({ quality: 85 })
        .toBuffer();
      const { data, info } = await sharp(jpeg).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
      const decoded = { width: info.width, height: info.height, data: new Uint8ClampedArray(data.buffer, data.byteOffset, data.length) };
      const est = estimateRustFraction(decoded, img.face);
      expect(Math.abs(est - img.trueRustFraction) / img.trueRustFraction).toBeLessThanOrEqual(0.35);
    }
  });

  it("is deterministic for a seed", () => {
    const a = face("stony-iron", "same", 5);
    const b = face("stony-iron", "same", 5);
    expect(a.trueRustFraction).toBe(b.trueRustFraction);
    expect(Buffer.from(a.data.buffer).equals(Buffer.from(b.data.buffer))).toBe(true);
  });
});

describe("rustMask", () => {
  it("marks exactly the pixels the fraction counts, and nothing outside the face", () => {
    const img = face("iron", "mask", 6);
    const mask = rustMask(img, img.face);
    // Independent check of the scanline fill: per-pixel point-in-polygon on pixel centres.
    let facePixels = 0;
    let rust = 0;
    let rustOutside = 0;
    for (let y = 0; y < H; y++) {
      for (let x = 0; x < W; x++) {
        const inside = pointInPolygon({ x: x + 0.5, y: y + 0.5 }, img.face);
        if (inside) facePixels++;
        if (mask[y * W + x] > 0) rust++;
        if (!inside && mask[y * W + x] > 0) rustOutside++;
      }
    }
    expect(rust).toBeGreaterThan(0);
    expect(rustOutside).toBe(0);
    expect(estimateRustFraction(img, img.face)).toBeCloseTo(rust / facePixels, 12);
  });

  it("ignores rust-coloured pixels outside the face outline", () => {
    const data = new Uint8ClampedArray(10 * 10 * 4);
    for (let i = 0; i < 100; i++) data.set([170, 88, 38, 255], i * 4); // all orange-brown
    const image = { width: 10, height: 10, data };
    const leftHalf = [
      { x: 0, y: 0 },
      { x: 5, y: 0 },
      { x: 5, y: 10 },
      { x: 0, y: 10 },
    ];
    expect(estimateRustFraction(image, leftHalf)).toBe(1);
    const mask = rustMask(image, leftHalf);
    expect(mask.reduce((s, v) => s + v, 0)).toBe(50); // 5 × 10 pixels inside
    expect(mask[9]).toBe(0); // right half stays clear
  });

  it("rejects a face that covers no pixel", () => {
    const image = { width: 4, height: 4, data: new Uint8ClampedArray(64) };
    const offImage = [
      { x: 10, y: 10 },
      { x: 20, y: 10 },
      { x: 20, y: 20 },
    ];
    expect(() => estimateRustFraction(image, offImage)).toThrow(RangeError);
  });
});
