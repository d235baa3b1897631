// The grey-patch normalisation and the colour conversions under it. Conversions are checked against
// the published formulas' own reference points (IEC 61966-2-1 sRGB, CIE 15:2004 CIELAB) and against
// color-convert (a general-purpose npm library in node_modules); the normalisation against the demo
// generator's own colours rendered under shifted light (the reference is the image's construction).
import convert from "color-convert";
import { describe, expect, it } from "vitest";
import { neutralLevel } from "@/lib/demo-images/photo-effects";
import { renderSpecimenFace, scatterRustSpots, specimenFaceOutline } from "@/lib/demo-images/specimen-face";
import {
  SRGB8_TO_LINEAR, chroma, lightnessToLuminance, linearToSrgbComponent, srgbComponentToLinear, srgbToLab,
} from "@/lib/scoring/colour-space";
import { PATCH_LIMITS, gainTable, measurePatch, normaliseImage, patchGains, patchProblem } from "@/lib/scoring/colour-normalise";
import { estimateRustFraction, type RgbaImage } from "@/lib/scoring/rust-estimate";
import { pointInPolygon } from "@/lib/scoring/geometry";

describe("sRGB and CIELAB conversions", () => {
  it("follow IEC 61966-2-1 at the transfer function's break point and ends", () => {
    // IEC 61966-2-1:1999: linear segment below 0.04045 (encoded) ↔ 0.0031308 (linear), slope 12.92.
    expect(srgbComponentToLinear(0.04045)).toBeCloseTo(0.04045 / 12.92, 9);
    expect(linearToSrgbComponent(0.0031308)).toBeCloseTo(0.0031308 * 12.92, 6);
    expect(srgbComponentToLinear(1)).toBe(1);
    expect(SRGB8_TO_LINEAR[0]).toBe(0);
    for (let i = 0; i < 256; i++) expect(Math.round(linearToSrgbComponent(SRGB8_TO_LINEAR[i]) * 255)).toBe(i);
  });

  it("follow CIE 15 for lightness: Y = 0.18 is L* 49.50 and the inverse returns it", () => {
    // CIE 15:2004 L* = 116 (Y/Yn)^(1/3) − 16: 116 × 0.18^(1/3) − 16 = 49.496 (recomputed by hand).
    expect(lightnessToLuminance(49.496)).toBeCloseTo(0.18, 4);
    expect(lightnessToLuminance(100)).toBeCloseTo(1, 12);
    // Below the CIE 15 break (L* 8): Y = L* / 903.3.
    expect(lightnessToLuminance(5)).toBeCloseTo(5 / 903.3, 5);
  });

  it("agree with color-convert's rgb → lab (D65) to within its 4-digit matrix", () => {
    const samples: [number, number, number][] = [
      [255, 255, 255], [0, 0, 0], [119, 119, 119], [170, 88, 38], [130, 58, 38], [62, 34, 24], [234, 204, 160],
      [88, 118, 62], [150, 160, 72], [255, 0, 0], [0, 255, 0], [0, 0, 255], [12, 200, 250],
    ];
    for (const c of samples) {
      const ours = srgbToLab(...c);
      const [L, a, b] = convert.rgb.lab.raw(c);
      expect(Math.abs(ours.L - L)).toBeLessThan(0.1);
      expect(Math.abs(ours.a - a)).toBeLessThan(0.15);
      expect(Math.abs(ours.b - b)).toBeLessThan(0.15);
    }
  });
});

const W = 640;
const H = 480;
// On the backdrop, top-left: the face fills the middle ~88 % of the frame as an irregular slice.
const PATCH = { x: 8, y: 8, width: 40, height: 30, lightness: 50 };
const inner = { x: 12, y: 12, width: 32, height: 22 }; // the scorer marks inside the patch's edges

function scene(seed: string, gains?: [number, number, number]) {
  const outline = specimenFaceOutline(W, H, seed);
  const rustSpots = [
    ...scatterRustSpots(outline, { count: 8, rMin: 8, rMax: 30, seed }),
    ...scatterRustSpots(outline, { count: 3, rMin: 8, rMax: 20, seed: `${seed}-dark` }).map((s) => ({ ...s, kind: "dark" as const })),
    ...scatterRustSpots(outline, { count: 3, rMin: 5, rMax: 12, seed: `${seed}-drop` }).map((s) => ({ ...s, kind: "droplet" as const })),
  ];
  return renderSpecimenFace({ width: W, height: H, seed, kind: "stony-iron", rustSpots, greyPatch: PATCH, lighting: gains ? { gains } : undefined });
}

/** Mean CIELAB ΔE*ab (CIE 1976) between two images over the face pixels. */
function meanDeltaE(a: RgbaImage, b: RgbaImage, face: { x: number; y: number }[]) {
  let sum = 0;
  let n = 0;
  for (let y = 0; y < H; y += 2) {
    for (let x = 0; x < W; x += 2) {
      if (!pointInPolygon({ x: x + 0.5, y: y + 0.5 }, face)) continue;
      const o = (y * W + x) * 4;
      const p = srgbToLab(a.data[o], a.data[o + 1], a.data[o + 2]);
      const q = srgbToLab(b.data[o], b.data[o + 1], b.data[o + 2]);
      sum += Math.hypot(p.L - q.L, p.a - q.a, p.b - q.b);
      n++;
    }
  }
  return sum / n;
}

describe("white balance and exposure from the grey patch", () => {
  it("paints the generator's patch at the sRGB level of its L*", () => {
    expect(neutralLevel(50)).toBe(119); // CIE 15 Y(L*=50) = 0.1842 → IEC 61966-2-1 encoding 0.4663 × 255 = 118.9
    const img = scene("patch-level");
    const stats = measurePatch(img, inner);
    const lab = srgbToLab(119, 119, 119);
    expect(lab.L).toBeCloseTo(50, 0);
    expect(patchProblem(stats)).toBeNull();
  });

  const shifts: [string, [number, number, number]][] = [
    ["warm lamp", [1.18, 1.0, 0.72]],
    ["cool daylight", [0.85, 0.95, 1.12]],
    ["under-exposed by about a stop", [0.55, 0.55, 0.55]],
    ["over-exposed and warm", [1.2, 1.12, 0.95]],
  ];
  it.each(shifts)("restores the generator's colours under a %s", (_name, gains) => {
    const seed = "normalise";
    const reference = scene(seed);
    const shifted = scene(seed, gains);
    const stats = measurePatch(shifted, inner);
    expect(patchProblem(stats)).toBeNull();
    const g = patchGains(stats, PATCH.lightness);
    // The gains undo the shift (within the patch's 8-bit rounding and noise).
    for (let c = 0; c < 3; c++) expect(g[c] * gains[c]).toBeCloseTo(1, 1);
    const restored = normaliseImage(shifted, g);
    const before = meanDeltaE(reference, shifted, reference.face);
    const after = meanDeltaE(reference, restored, reference.face);
    expect(before).toBeGreaterThan(4); // the shift is visible
    expect(after).toBeLessThan(1.2); // about the just-noticeable difference
    // And the estimate follows: within 5 % (relative) of the estimate under the original light.
    const truth = estimateRustFraction(reference, reference.face);
    const normalised = estimateRustFraction(shifted, shifted.face, gainTable(g));
    expect(Math.abs(normalised - truth) / truth).toBeLessThan(0.05);
  });

  it("a shift the estimate would misread without the patch is corrected with it", () => {
    const reference = scene("misread");
    const shifted = scene("misread", [1.25, 1.0, 0.7]);
    const truth = estimateRustFraction(reference, reference.face);
    const raw = estimateRustFraction(shifted, shifted.face);
    const g = patchGains(measurePatch(shifted, inner), PATCH.lightness);
    const fixed = estimateRustFraction(shifted, shifted.face, gainTable(g));
    expect(Math.abs(raw - truth) / truth).toBeGreaterThan(0.1);
    expect(Math.abs(fixed - truth)).toBeLessThan(Math.abs(raw - truth) / 3);
  });
});

describe("refusing a patch that cannot measure the light", () => {
  const flat = (rgb: [number, number, number], w = 10, h = 10): RgbaImage => {
    const data = new Uint8ClampedArray(w * h * 4);
    for (let i = 0; i < w * h; i++) data.set([...rgb, 255], i * 4);
    return { width: w, height: h, data };
  };
  const all = { x: 0, y: 0, width: 10, height: 10 };

  it("refuses a blown-out patch (a channel at 255)", () => {
    const p = patchProblem(measurePatch(flat([255, 250, 240]), all));
    expect(p?.problem).toBe("clipped");
    expect(p?.message).toMatch(/clipped: 100 % of its pixels/);
  });
  it("refuses a patch with a channel at 0", () => {
    expect(patchProblem(measurePatch(flat([40, 30, 0]), all))?.problem).toBe("clipped");
  });
  it("refuses a coloured patch (rust, C* ≈ 52) and names its chroma", () => {
    const p = patchProblem(measurePatch(flat([170, 88, 38]), all));
    expect(p?.problem).toBe("not-neutral");
    expect(chroma(srgbToLab(170, 88, 38))).toBeGreaterThan(PATCH_LIMITS.chromaMax);
    expect(p?.message).toMatch(/not neutral grey \(chroma C\* \d+\.\d/);
  });
  it("refuses a black patch and one too small to average", () => {
    expect(patchProblem(measurePatch(flat([12, 12, 12]), all))?.problem).toBe("too-dark");
    expect(patchProblem(measurePatch(flat([119, 119, 119]), { x: 0, y: 0, width: 4, height: 4 }))?.problem).toBe("too-small");
  });
  it("accepts a grey patch under a mild cast", () => {
    expect(patchProblem(measurePatch(flat([132, 119, 100]), all))).toBeNull();
  });
});
