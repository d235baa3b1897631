// sRGB ↔ linear light ↔ CIELAB, written once for the colour estimate and the grey-patch normalisation.
// sRGB transfer function and primaries: IEC 61966-2-1:1999; CIELAB: CIE 15:2004 (D65, 2° observer).

/** IEC 61966-2-1 decoding of one sRGB component (0–1) to linear light (0–1). */
export function srgbComponentToLinear(c: number): number {
  return c <= 0.04045 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4);
}

/** IEC 61966-2-1 encoding of linear light (0–1, clamped) to an sRGB component (0–1). */
export function linearToSrgbComponent(v: number): number {
  const c = Math.min(1, Math.max(0, v));
  return c <= 0.0031308 ? 12.92 * c : 1.055 * Math.pow(c, 1 / 2.4) - 0.055;
}

/** 8-bit sRGB → linear light, once; per-pixel loops then only do table look-ups. */
export const SRGB8_TO_LINEAR: Float64Array = (() => {
  const t = new Float64Array(256);
  for (let i = 0; i < 256; i++) t[i] = srgbComponentToLinear(i / 255);
  return t;
})();

/** Linear light → nearest 8-bit sRGB level. */
export function linearToSrgb8(v: number): number {
  return Math.round(linearToSrgbComponent(v) * 255);
}

// D65 reference white for the sRGB → XYZ matrix below (IEC 61966-2-1 primaries).
export const XN = 0.95047;
export const YN = 1.0;
export const ZN = 1.08883;
const EPS = 216 / 24389; // (6/29)^3, CIE 15
const KAPPA_OVER_116 = 24389 / 27 / 116;

export function labF(t: number): number {
  return t > EPS ? Math.cbrt(t) : KAPPA_OVER_116 * t + 16 / 116;
}

/** Relative luminance Y of linear sRGB (the matrix's middle row). */
export function linearLuminance(rl: number, gl: number, bl: number): number {
  return 0.2126729 * rl + 0.7151522 * gl + 0.072175 * bl;
}

export function linearToX(rl: number, gl: number, bl: number): number {
  return 0.4124564 * rl + 0.3575761 * gl + 0.1804375 * bl;
}

export function linearToZ(rl: number, gl: number, bl: number): number {
  return 0.0193339 * rl + 0.119192 * gl + 0.9503041 * bl;
}

export type Lab = { L: number; a: number; b: number };

/** CIELAB (D65) of a linear-light sRGB colour. */
export function linearToLab(rl: number, gl: number, bl: number): Lab {
  const fx = labF(linearToX(rl, gl, bl) / XN);
  const fy = labF(linearLuminance(rl, gl, bl) / YN);
  const fz = labF(linearToZ(rl, gl, bl) / ZN);
  return { L: 116 * fy - 16, a: 500 * (fx - fy), b: 200 * (fy - fz) };
}

/** CIELAB (D65) of an 8-bit sRGB colour. */
export function srgbToLab(r: number, g: number, b: number): Lab {
  return linearToLab(SRGB8_TO_LINEAR[r & 255], SRGB8_TO_LINEAR[g & 255], SRGB8_TO_LINEAR[b & 255]);
}

/** Relative luminance Y (0–1) of a neutral of lightness L* (CIE 15 inverse). */
export function lightnessToLuminance(L: number): number {
  const f = (L + 16) / 116;
  return f > 6 / 29 ? f * f * f : (L * 27) / 24389;
}

export function chroma(lab: Lab): number {
  return Math.hypot(lab.a, lab.b);
}
