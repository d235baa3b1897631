// Automatic colour-based rust estimate: the fraction of face pixels whose colour reads as rust.
// A suggestion for the scorer to accept or correct, never a score by itself.
//
// Pixels are converted sRGB → CIELAB (D65, 2° observer) and classified by lightness L*, chroma
// C*ab and hue angle h_ab. The face is filled by scanline (crossings per pixel row), so the cost
// is one pass over the face's pixels with no per-pixel point-in-polygon test.
import { polygonCrossings, type Point } from "./geometry";

export type RgbaImage = { width: number; height: number; data: Uint8ClampedArray };

/**
 * Rust colour window. Our own choice, tuned on common practice of the trade (rust on iron reads
 * orange-brown to red-brown); there is no published threshold to cite.
 * - hue 25°–75°: red-brown (akaganeite/haematite-like, ~30–45°) through orange-brown (~50–70°);
 *   above ~80° lie the olive, yellow-green and green silicate grains of stony-irons, below ~25°
 *   magenta-reds that rust does not produce.
 * - chroma > 18: etched or polished metal is near-neutral grey (C* below ~8 even under warm light);
 *   18 keeps a margin for white-balance drift and sensor noise.
 * - L* 20–82: below ~20 dark grains (troilite, dark silicate, shadow) have unreliable hue;
 *   above ~82 are specular highlights.
 * Weathered olivine that has turned yellow-brown sits near the upper hue edge and may be counted;
 * the scorer's correction covers that case.
 */
export const RUST_COLOUR_THRESHOLDS = {
  hueMinDeg: 25,
  hueMaxDeg: 75,
  chromaMin: 18,
  lightnessMin: 20,
  lightnessMax: 82,
} as const;

// sRGB 8-bit → linear light, once; the per-pixel loop then only does table look-ups.
const SRGB_TO_LINEAR = new Float64Array(256);
for (let i = 0; i < 256; i++) {
  const c = i / 255;
  SRGB_TO_LINEAR[i] = c <= 0.04045 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4);
}

// D65 reference white for the sRGB → XYZ matrix below (IEC 61966-2-1 primaries).
const XN = 0.95047;
const YN = 1.0;
const ZN = 1.08883;
const EPS = 216 / 24389; // (6/29)^3
const KAPPA_OVER_116 = 24389 / 27 / 116;

function labF(t: number): number {
  return t > EPS ? Math.cbrt(t) : KAPPA_OVER_116 * t + 16 / 116;
}

/** CIELAB (D65) of an 8-bit sRGB colour. */
export function srgbToLab(r: number, g: number, b: number): { L: number; a: number; b: number } {
  const rl = SRGB_TO_LINEAR[r & 255];
  const gl = SRGB_TO_LINEAR[g & 255];
  const bl = SRGB_TO_LINEAR[b & 255];
  const fx = labF((0.4124564 * rl + 0.3575761 * gl + 0.1804375 * bl) / XN);
  const fy = labF((0.2126729 * rl + 0.7151522 * gl + 0.072175 * bl) / YN);
  const fz = labF((0.0193339 * rl + 0.119192 * gl + 0.9503041 * bl) / ZN);
  return { L: 116 * fy - 16, a: 500 * (fx - fy), b: 200 * (fy - fz) };
}

const T = RUST_COLOUR_THRESHOLDS;
const TAN_HUE_MIN = Math.tan((T.hueMinDeg * Math.PI) / 180);
const TAN_HUE_MAX = Math.tan((T.hueMaxDeg * Math.PI) / 180);
const CHROMA_MIN_SQ = T.chromaMin * T.chromaMin;
// L* limits turned into limits on f(Y) so the loop can reject on lightness before the other cube roots.
const FY_MIN = (T.lightnessMin + 16) / 116;
const FY_MAX = (T.lightnessMax + 16) / 116;

/** True when an 8-bit sRGB colour falls in the rust window. */
export function isRustColour(r: number, g: number, b: number): boolean {
  const rl = SRGB_TO_LINEAR[r & 255];
  const gl = SRGB_TO_LINEAR[g & 255];
  const bl = SRGB_TO_LINEAR[b & 255];
  const fy = labF(0.2126729 * rl + 0.7151522 * gl + 0.072175 * bl);
  if (fy < FY_MIN || fy > FY_MAX) return false;
  const a = 500 * (labF((0.4124564 * rl + 0.3575761 * gl + 0.1804375 * bl) / XN) - fy);
  // Both hue limits lie in the first quadrant, so a* and b* must both be positive.
  if (a <= 0) return false;
  const bb = 200 * (fy - labF((0.0193339 * rl + 0.119192 * gl + 0.9503041 * bl) / ZN));
  if (bb <= 0) return false;
  if (a * a + bb * bb <= CHROMA_MIN_SQ) return false;
  // h = atan2(b, a) in [min, max] ⇔ tan(min)·a ≤ b ≤ tan(max)·a for a > 0, without calling atan2.
  return bb >= TAN_HUE_MIN * a && bb <= TAN_HUE_MAX * a;
}

// Photos repeat colours heavily; remembering each 24-bit colour's verdict makes a 24-megapixel
// face a table look-up per pixel. 0 = not seen yet, 1 = not rust, 2 = rust. 16 MB, allocated on
// first use and kept, since the thresholds never change at run time.
let verdictCache: Uint8Array | null = null;

function classifyFace(image: RgbaImage, face: readonly Point[], mask: Uint8Array | null): { face: number; rust: number } {
  const { width, height, data } = image;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width <= 0 || height <= 0) {
    throw new RangeError(`image size must be positive integers, got ${width}×${height}`);
  }
  if (data.length < width * height * 4) throw new RangeError("image data is shorter than width × height × 4");
  if (face.length < 3) throw new RangeError("face outline needs at least 3 points");
  const cache = (verdictCache ??= new Uint8Array(1 << 24));
  let ys = Infinity;
  let ye = -Infinity;
  for (const p of face) {
    ys = Math.min(ys, p.y);
    ye = Math.max(ye, p.y);
  }
  const rowStart = Math.max(0, Math.floor(ys));
  const rowEnd = Math.min(height, Math.ceil(ye));
  const crossings: number[] = [];
  let facePixels = 0;
  let rustPixels = 0;
  for (let y = rowStart; y < rowEnd; y++) {
    polygonCrossings(face, y + 0.5, crossings);
    for (let c = 0; c + 1 < crossings.length; c += 2) {
      // Pixel x is inside when its centre x + 0.5 lies in [xa, xb).
      const x0 = Math.max(0, Math.ceil(crossings[c] - 0.5));
      const x1 = Math.min(width, Math.ceil(crossings[c + 1] - 0.5));
      if (x1 <= x0) continue;
      facePixels += x1 - x0;
      let o = (y * width + x0) * 4;
      for (let x = x0; x < x1; x++, o += 4) {
        const r = data[o];
        const g = data[o + 1];
        const b = data[o + 2];
        const key = (r << 16) | (g << 8) | b;
        let v = cache[key];
        if (v === 0) {
          v = isRustColour(r, g, b) ? 2 : 1;
          cache[key] = v;
        }
        if (v === 2) {
          rustPixels++;
          if (mask) mask[y * width + x] = 1;
        }
      }
    }
  }
  return { face: facePixels, rust: rustPixels };
}

/**
 * Fraction (0–1) of the pixels inside the face polygon that are rust-coloured.
 * Face points are in image pixel coordinates; a pixel counts as inside when its centre is.
 * Throws RangeError when the face covers no pixel of the image.
 */
export function estimateRustFraction(
  image: { width: number; height: number; data: Uint8ClampedArray /* RGBA */ },
  face: { x: number; y: number }[],
): number {
  const counts = classifyFace(image, face, null);
  if (counts.face === 0) throw new RangeError("the face outline covers no pixel of the image");
  return counts.rust / counts.face;
}

/** Per-pixel mask for the overlay: 1 = rust-coloured pixel inside the face, 0 = anything else. */
export function rustMask(image: RgbaImage, face: readonly Point[]): Uint8Array {
  const mask = new Uint8Array(image.width * image.height);
  classifyFace(image, face, mask);
  return mask;
}
