// Camera-side effects of the synthetic specimen photos: lens softness, sensor noise, the colour
// card's grey patch and a change of light. Pure pixel operations on an RGBA buffer.
import { SRGB8_TO_LINEAR, linearToSrgb8, lightnessToLuminance } from "@/lib/scoring/colour-space";

/** A neutral grey patch of a colour card, in image pixels, of known CIELAB lightness L*. */
export type GreyPatch = { x: number; y: number; width: number; height: number; lightness: number };

/**
 * A change of light: gains per channel in linear light (e.g. [1.2, 1, 0.8] for a warmer lamp, [0.7,
 * 0.7, 0.7] for a stop of under-exposure, roughly). Applied to the whole scene before sensor noise.
 */
export type LightingShift = { gains: readonly [number, number, number] };

/** The 8-bit sRGB level of a neutral of lightness L* (IEC 61966-2-1 encoding of CIE 15 Y). */
export function neutralLevel(lightness: number): number {
  return linearToSrgb8(lightnessToLuminance(lightness));
}

export function paintGreyPatch(data: Uint8ClampedArray, width: number, height: number, patch: GreyPatch): void {
  const v = neutralLevel(patch.lightness);
  const x0 = Math.max(0, Math.round(patch.x));
  const x1 = Math.min(width, Math.round(patch.x + patch.width));
  const y0 = Math.max(0, Math.round(patch.y));
  const y1 = Math.min(height, Math.round(patch.y + patch.height));
  for (let y = y0; y < y1; y++) for (let x = x0; x < x1; x++) setRgb(data, y * width + x, v, v, v);
}

/** Multiply every pixel by the gains in linear light (clipping at 255 as a sensor would). */
export function applyLighting(data: Uint8ClampedArray, shift: LightingShift): void {
  const t = new Uint8Array(768);
  for (let c = 0; c < 3; c++) for (let i = 0; i < 256; i++) t[c * 256 + i] = linearToSrgb8(SRGB8_TO_LINEAR[i] * shift.gains[c]);
  for (let o = 0; o < data.length; o += 4) {
    data[o] = t[data[o]];
    data[o + 1] = t[256 + data[o + 1]];
    data[o + 2] = t[512 + data[o + 2]];
  }
}

/** Separable [1 2 1]/4 blur in both directions, in place (one row of scratch per pass). */
export function softenEdges(data: Uint8ClampedArray, width: number, height: number): void {
  const line = new Float32Array(Math.max(width, height) * 3);
  for (let y = 0; y < height; y++) {
    const row = y * width * 4;
    for (let x = 0; x < width; x++) for (let c = 0; c < 3; c++) line[x * 3 + c] = data[row + x * 4 + c];
    for (let x = 1; x < width - 1; x++) {
      for (let c = 0; c < 3; c++) data[row + x * 4 + c] = (line[(x - 1) * 3 + c] + 2 * line[x * 3 + c] + line[(x + 1) * 3 + c]) / 4;
    }
  }
  for (let x = 0; x < width; x++) {
    for (let y = 0; y < height; y++) for (let c = 0; c < 3; c++) line[y * 3 + c] = data[(y * width + x) * 4 + c];
    for (let y = 1; y < height - 1; y++) {
      for (let c = 0; c < 3; c++) data[(y * width + x) * 4 + c] = (line[(y - 1) * 3 + c] + 2 * line[y * 3 + c] + line[(y + 1) * 3 + c]) / 4;
    }
  }
}

export function setRgb(data: Uint8ClampedArray, i: number, r: number, g: number, b: number): void {
  data[i * 4] = r;
  data[i * 4 + 1] = g;
  data[i * 4 + 2] = b;
}

/** Mild, independent per-channel noise (about ±4 levels) from a hash, fast enough for 24 MP. */
export function addSensorNoise(data: Uint8ClampedArray, salt: number): void {
  for (let o = 0; o < data.length; o += 4) {
    const h = hashInt(o ^ salt);
    data[o] += ((h & 15) - 7.5) / 2 + ((h >>> 4) & 3) - 1.5;
    data[o + 1] += (((h >>> 8) & 15) - 7.5) / 2 + ((h >>> 12) & 3) - 1.5;
    data[o + 2] += (((h >>> 16) & 15) - 7.5) / 2 + ((h >>> 20) & 3) - 1.5;
  }
}

export function hashInt(n: number): number {
  let h = Math.imul(n ^ (n >>> 16), 0x45d9f3b);
  h = Math.imul(h ^ (h >>> 16), 0x45d9f3b);
  return (h ^ (h >>> 16)) >>> 0;
}
