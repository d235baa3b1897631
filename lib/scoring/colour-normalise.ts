// White balance and exposure from the colour card's neutral patch, before the colour estimate.
//
// The scorer marks the grey patch once per photo (a rectangle in original-image pixels). Its mean is
// taken in linear light (IEC 61966-2-1 decoding), so a change of illuminant or exposure is one gain
// per channel (the von Kries assumption, applied to the camera's sRGB channels): the gains bring the
// patch to a neutral of its known lightness L*, and every pixel is mapped through the same gains
// before it is classified. A patch that is clipped (channels at 0 or 255) no longer measures the
// light, and one far from neutral is not a grey patch (or the light is beyond what gains can
// correct), so both are refused with a message instead of being used.
import {
  SRGB8_TO_LINEAR, chroma, lightnessToLuminance, linearToLab, linearToSrgb8,
} from "./colour-space";
import type { ChannelTable, RgbaImage } from "./rust-estimate";

/** A rectangle in image pixels: x, y the top-left corner. */
export type PatchRect = { x: number; y: number; width: number; height: number };

export type PatchStats = {
  /** Pixels whose centre lies in the rectangle. */
  pixels: number;
  /** Mean of each channel in linear light (0–1). */
  meanLinear: [number, number, number];
  /** Share (0–1) of the patch's pixels with any channel at 0 or 255. */
  clippedFraction: number;
};

/**
 * Limits on a usable grey patch. Our own choices (no published threshold):
 * - more than 1 % of pixels at 0 or 255 in any channel: the mean under-reads the light;
 * - C*ab of the mean above 20: a grey card under light a camera has roughly white-balanced reads
 *   C* well under 15; above 20 the rectangle is more likely on a coloured patch, on rust, or the
 *   cast is too strong for per-channel gains to be trusted;
 * - L* below 10: too dark to measure against sensor noise (gains would be above ~4);
 * - fewer than 25 pixels: too small to average noise away.
 */
export const PATCH_LIMITS = { clippedFractionMax: 0.01, chromaMax: 20, lightnessMin: 10, pixelsMin: 25 } as const;

/** The usual neutral of a colour card's mid-grey patch (an "18 %" grey reads L* ≈ 50). */
export const DEFAULT_PATCH_LIGHTNESS = 50;
/** The grey patch's known L* the product accepts (a patch darker or lighter reads too noisily or clips). */
export const PATCH_LIGHTNESS_RANGE = { min: 20, max: 95 } as const;

/** Patch statistics over the pixels whose centres lie in the rectangle (clipped to the image). */
export function measurePatch(image: RgbaImage, rect: PatchRect): PatchStats {
  const { width, height, data } = image;
  const x0 = Math.max(0, Math.ceil(rect.x - 0.5));
  const x1 = Math.min(width, Math.ceil(rect.x + rect.width - 0.5));
  const y0 = Math.max(0, Math.ceil(rect.y - 0.5));
  const y1 = Math.min(height, Math.ceil(rect.y + rect.height - 0.5));
  let n = 0;
  let clipped = 0;
  let sr = 0;
  let sg = 0;
  let sb = 0;
  for (let y = y0; y < y1; y++) {
    for (let x = x0, o = (y * width + x0) * 4; x < x1; x++, o += 4) {
      const r = data[o];
      const g = data[o + 1];
      const b = data[o + 2];
      n++;
      if (r === 0 || g === 0 || b === 0 || r === 255 || g === 255 || b === 255) clipped++;
      sr += SRGB8_TO_LINEAR[r];
      sg += SRGB8_TO_LINEAR[g];
      sb += SRGB8_TO_LINEAR[b];
    }
  }
  if (n === 0) return { pixels: 0, meanLinear: [0, 0, 0], clippedFraction: 0 };
  return { pixels: n, meanLinear: [sr / n, sg / n, sb / n], clippedFraction: clipped / n };
}

/** What a recorded colour estimate was read from: the grey patch and its gains, or the pixels as they were. */
export type EstimateColourBasis =
  | { normalised: false }
  | {
    normalised: true; patch: PatchRect; patchLightness: number;
    /** The patch's reading (PatchStats) and the gains made from it. */
    meanLinear: [number, number, number]; clippedFraction: number; pixels: number; gains: [number, number, number];
  };

export type PatchProblem = "too-small" | "clipped" | "too-dark" | "not-neutral";

/** Why a patch cannot be used, as a sentence for the field; null when it can. */
export function patchProblem(stats: PatchStats): { problem: PatchProblem; message: string } | null {
  if (stats.pixels < PATCH_LIMITS.pixelsMin) {
    return { problem: "too-small", message: `The grey patch covers ${stats.pixels} pixel${stats.pixels === 1 ? "" : "s"}; mark at least ${PATCH_LIMITS.pixelsMin} inside the patch.` };
  }
  if (stats.clippedFraction > PATCH_LIMITS.clippedFractionMax) {
    const pct = Math.round(stats.clippedFraction * 1000) / 10;
    return { problem: "clipped", message: `The grey patch is clipped: ${pct} % of its pixels have a channel at 0 or 255, so it cannot measure the light. Mark a patch that is neither blown out nor black, or retake the photo with less (or more) exposure.` };
  }
  const lab = linearToLab(...stats.meanLinear);
  if (lab.L < PATCH_LIMITS.lightnessMin) {
    return { problem: "too-dark", message: `The grey patch is too dark to measure (L* ${lab.L.toFixed(1)}, at least ${PATCH_LIMITS.lightnessMin} needed). Mark the card's grey patch, not a shadow or a black patch.` };
  }
  const c = chroma(lab);
  if (c > PATCH_LIMITS.chromaMax) {
    return { problem: "not-neutral", message: `The marked patch is not neutral grey (chroma C* ${c.toFixed(1)}, at most ${PATCH_LIMITS.chromaMax}). Mark the colour card's grey patch; if it is the grey patch, the light is too coloured to correct.` };
  }
  return null;
}

/** Gains per channel in linear light that bring the patch mean to a neutral of lightness L*. */
export function patchGains(stats: PatchStats, patchLightness: number = DEFAULT_PATCH_LIGHTNESS): [number, number, number] {
  const y = lightnessToLuminance(patchLightness);
  const [r, g, b] = stats.meanLinear;
  if (!(r > 0 && g > 0 && b > 0)) throw new RangeError("a patch with a channel at zero gives no gains");
  return [y / r, y / g, y / b];
}

/** The 8-bit → 8-bit table of the gains (red, green, blue; 256 entries each), for the classifier. */
export function gainTable(gains: readonly [number, number, number]): ChannelTable {
  const t = new Uint8Array(768);
  for (let c = 0; c < 3; c++) {
    for (let i = 0; i < 256; i++) t[c * 256 + i] = linearToSrgb8(SRGB8_TO_LINEAR[i] * gains[c]);
  }
  return t;
}

/** A normalised copy of an image (alpha kept), e.g. to check or show what the classifier sees. */
export function normaliseImage(image: RgbaImage, gains: readonly [number, number, number]): RgbaImage {
  const t = gainTable(gains);
  const out = new Uint8ClampedArray(image.data.length);
  for (let o = 0; o < image.data.length; o += 4) {
    out[o] = t[image.data[o]];
    out[o + 1] = t[256 + image.data[o + 1]];
    out[o + 2] = t[512 + image.data[o + 2]];
    out[o + 3] = image.data[o + 3];
  }
  return { width: image.width, height: image.height, data: out };
}

/** The basis a recorded estimate keeps when it was read through a grey patch (gains recomputed from the reading). */
export function normalisedBasis(patch: PatchRect & { patchLightness: number } & PatchStats): EstimateColourBasis {
  return {
    normalised: true,
    patch: { x: patch.x, y: patch.y, width: patch.width, height: patch.height },
    patchLightness: patch.patchLightness,
    meanLinear: [...patch.meanLinear],
    clippedFraction: patch.clippedFraction,
    pixels: patch.pixels,
    gains: patchGains(patch, patch.patchLightness),
  };
}
