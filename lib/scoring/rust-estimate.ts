// Automatic colour-based rust estimate: the fraction of face pixels whose colour reads as rust.
// A suggestion for the scorer to accept or correct, never a score by itself.
//
// Pixels are converted sRGB → CIELAB (D65, 2° observer) and classified by lightness L*, chroma
// C*ab and hue angle h_ab into three rust classes (rust, dark rust, pale weeping droplets); a
// white-balance and exposure normalisation from a grey patch (colour-normalise.ts) may map each
// pixel through a per-channel table first. The face is filled by scanline (crossings per pixel row), so the cost
// is one pass over the face's pixels with no per-pixel point-in-polygon test.
import { chroma, srgbToLab } from "./colour-space";
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

/**
 * Dark rust: thick or wet red-brown to black-brown crust that falls below the main window's L* 20.
 * Our own choice like the window above: the same hue range, but a lower chroma floor (dark colours
 * carry little chroma) and L* 8–20. Dark troilite and silicate grains and shadow are near-neutral
 * (C* below ~5) or bluish, so they stay out; below L* 8 hue is noise.
 */
export const DARK_RUST_THRESHOLDS = {
  hueMinDeg: 25,
  hueMaxDeg: 75,
  chromaMin: 10,
  lightnessMin: 8,
  lightnessMax: 20,
} as const;

/**
 * Pale weeping droplets: light yellow-orange to buff beads of chloride-bearing solution, too light or
 * too yellow for the main window. Our own choice: hue 55°–90° (buff to pale yellow-orange), chroma
 * above 14 so that near-neutral specular highlights on metal (C* below ~8) stay out, L* 72–95 so
 * that olive and yellow-brown silicate grains (L* below ~65) stay out.
 */
export const PALE_DROPLET_THRESHOLDS = {
  hueMinDeg: 55,
  hueMaxDeg: 90,
  chromaMin: 14,
  lightnessMin: 72,
  lightnessMax: 95,
} as const;

/** What a pixel's colour reads as: 0 not rust, 1 rust, 2 dark rust, 3 pale weeping droplet. */
export type RustClass = 0 | 1 | 2 | 3;

type Window = { hueMinDeg: number; hueMaxDeg: number; chromaMin: number; lightnessMin: number; lightnessMax: number };

function inWindow(w: Window, L: number, c: number, hDeg: number): boolean {
  return L >= w.lightnessMin && L <= w.lightnessMax && c > w.chromaMin && hDeg >= w.hueMinDeg && hDeg <= w.hueMaxDeg;
}

/** The class of an 8-bit sRGB colour (after any normalisation). */
export function rustClass(r: number, g: number, b: number): RustClass {
  const lab = srgbToLab(r, g, b);
  const c = chroma(lab);
  const hDeg = (Math.atan2(lab.b, lab.a) * 180) / Math.PI;
  if (inWindow(RUST_COLOUR_THRESHOLDS, lab.L, c, hDeg)) return 1;
  if (inWindow(DARK_RUST_THRESHOLDS, lab.L, c, hDeg)) return 2;
  if (inWindow(PALE_DROPLET_THRESHOLDS, lab.L, c, hDeg)) return 3;
  return 0;
}

/** True when an 8-bit sRGB colour reads as rust of any class. */
export function isRustColour(r: number, g: number, b: number): boolean {
  return rustClass(r, g, b) !== 0;
}

// Photos repeat colours heavily; remembering each 24-bit colour's class makes a 24-megapixel face a
// table look-up per pixel. 0 = not seen yet, else class + 1. 16 MB, allocated on first use and kept,
// since the thresholds never change at run time. Normalisation maps a pixel to another 24-bit colour
// first (colour-normalise.ts), so the cache stays keyed by the colour that is classified.
let verdictCache: Uint8Array | null = null;

/** Face pixels and rust pixels by class (index 1–3 as RustClass; index 0 unused). */
export type RustCounts = { face: number; rust: number; byClass: [number, number, number, number] };

/**
 * A per-channel 8-bit → 8-bit table (768 entries: red, green, blue) applied before classifying:
 * the white-balance and exposure normalisation from colour-normalise.ts. Absent: pixels as they are.
 */
export type ChannelTable = Uint8Array;

function classifyFace(image: RgbaImage, face: readonly Point[], mask: Uint8Array | null, table: ChannelTable | null): RustCounts {
  const { width, height, data } = image;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width <= 0 || height <= 0) {
    throw new RangeError(`image size must be positive integers, got ${width}×${height}`);
  }
  if (data.length < width * height * 4) throw new RangeError("image data is shorter than width × height × 4");
  if (face.length < 3) throw new RangeError("face outline needs at least 3 points");
  if (table && table.length !== 768) throw new RangeError("a channel table has 768 entries");
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
  const byClass: [number, number, number, number] = [0, 0, 0, 0];
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
        let r = data[o];
        let g = data[o + 1];
        let b = data[o + 2];
        if (table) {
          r = table[r];
          g = table[256 + g];
          b = table[512 + b];
        }
        const key = (r << 16) | (g << 8) | b;
        let v = cache[key];
        if (v === 0) {
          v = rustClass(r, g, b) + 1;
          cache[key] = v;
        }
        if (v > 1) {
          byClass[v - 1]++;
          if (mask) mask[y * width + x] = v - 1;
        }
      }
    }
  }
  return { face: facePixels, rust: byClass[1] + byClass[2] + byClass[3], byClass };
}

/**
 * Face and rust pixel counts (all classes, and by class). Face points are in image pixel coordinates;
 * a pixel counts as inside when its centre is. Throws RangeError when the face covers no pixel.
 */
export function countRust(image: RgbaImage, face: readonly Point[], table: ChannelTable | null = null, mask: Uint8Array | null = null): RustCounts {
  const counts = classifyFace(image, face, mask, table);
  if (counts.face === 0) throw new RangeError("the face outline covers no pixel of the image");
  return counts;
}

/** Fraction (0–1) of the pixels inside the face polygon whose colour reads as rust of any class. */
export function estimateRustFraction(image: RgbaImage, face: readonly Point[], table: ChannelTable | null = null): number {
  const counts = countRust(image, face, table);
  return counts.rust / counts.face;
}

/** Per-pixel mask for the overlay: the RustClass of each pixel inside the face (0 = not rust or outside). */
export function rustMask(image: RgbaImage, face: readonly Point[], table: ChannelTable | null = null): Uint8Array {
  const mask = new Uint8Array(image.width * image.height);
  classifyFace(image, face, mask, table);
  return mask;
}
