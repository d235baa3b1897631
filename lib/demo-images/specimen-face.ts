// Deterministic synthetic photos of a cut specimen face, for the demo data and for testing the
// colour estimate against a known rusted area. Pure: returns an RGBA buffer, encodes nothing.
//
// Usage from a seed script (sharp stays out of lib/):
//   const img = renderSpecimenFace({ width: 1600, height: 1200, seed: "demo-7", kind: "iron", rustSpots });
//   await sharp(Buffer.from(img.data.buffer), { raw: { width: img.width, height: img.height, channels: 4 } })
//     .jpeg({ quality: 90 }).toFile("face.jpg");
import { createRng, randomBetween, randomInt, type Rng } from "@/lib/allocation/prng";
import { polygonCrossings, type Point } from "@/lib/scoring/geometry";
import { addSensorNoise, applyLighting, hashInt, paintGreyPatch, setRgb, softenEdges, type GreyPatch, type LightingShift } from "./photo-effects";
import { paintScaleBar, type DrawnScaleBar } from "./scale-bar";

export type SpecimenKind = "iron" | "stony-iron";
/** "rust" (default): orange- to red-brown with a dark rim; "dark": thick black-brown crust; "droplet": a pale weeping bead. */
export type RustSpotKind = "rust" | "dark" | "droplet";
export type RustSpot = { x: number; y: number; r: number; kind?: RustSpotKind };

export type SpecimenFaceOptions = {
  width: number;
  height: number;
  seed: string | number;
  kind: SpecimenKind;
  rustSpots: readonly RustSpot[];
  /** A colour card's neutral patch painted on the backdrop (outside the face), of known L*. */
  greyPatch?: GreyPatch;
  /** The scene photographed under other light (gains in linear light), before sensor noise. */
  lighting?: LightingShift;
  /** Draw a white scale bar of lengthMm (default 10) at this many px per mm, bottom left, off the face. */
  scaleBar?: { pxPerMm: number; lengthMm?: number };
};


export type SpecimenFace = {
  width: number;
  height: number;
  data: Uint8ClampedArray;
  /** The face outline in pixel coordinates, as a scorer would draw it. */
  face: Point[];
  /** Painted rust pixels inside the face / face pixels (pixel centre inside the outline). */
  trueRustFraction: number;
  /** Painted rust pixels inside the face (px², one pixel = 1 px²). */
  rustPixels: number;
  scaleBar: DrawnScaleBar | null;
};

type Rgb = [number, number, number];

// Colours picked for what the classes look like on a photo, not to suit any classifier.
const BACKDROP: Rgb = [34, 34, 37];
const SILICATE_COLOURS: Rgb[] = [
  [112, 108, 52], // olive
  [88, 118, 62], // green olivine
  [150, 160, 72], // yellow-green
  [120, 110, 60], // olive-brown
  [48, 46, 42], // dark grain
];
const RUST_CORES: Rgb[] = [
  [170, 88, 38], // orange-brown
  [185, 100, 45], // lighter orange-brown
  [130, 58, 38], // red-brown
];
const RUST_RIM: Rgb = [100, 46, 30]; // darker red-brown rim around a spot
const DARK_RUST: Rgb = [62, 34, 24]; // thick black-brown crust
const DROPLET: Rgb = [234, 204, 160]; // pale buff weeping bead

/** The face outline for a seed: an irregular slice filling most of the frame. */
export function specimenFaceOutline(width: number, height: number, seed: string | number): Point[] {
  const rng = createRng(`face-outline:${seed}`);
  const n = 13;
  const start = rng() * Math.PI * 2;
  const pts: Point[] = [];
  for (let i = 0; i < n; i++) {
    const t = start + (i / n) * Math.PI * 2 + randomBetween(rng, -0.12, 0.12);
    const k = randomBetween(rng, 0.86, 1);
    pts.push({ x: width / 2 + Math.cos(t) * width * 0.44 * k, y: height / 2 + Math.sin(t) * height * 0.44 * k });
  }
  return pts;
}

/** Spots with centres inside the face (by rejection), radii in [rMin, rMax] px. */
export function scatterRustSpots(
  face: readonly Point[],
  opts: { count: number; rMin: number; rMax: number; seed: string | number },
): RustSpot[] {
  const rng = createRng(`rust-spots:${opts.seed}`);
  const xs = face.map((p) => p.x);
  const ys = face.map((p) => p.y);
  const [x0, x1, y0, y1] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
  const spots: RustSpot[] = [];
  for (let tries = 0; spots.length < opts.count && tries < opts.count * 100; tries++) {
    const x = randomBetween(rng, x0, x1);
    const y = randomBetween(rng, y0, y1);
    if (insideFace(face, x, y)) spots.push({ x, y, r: randomBetween(rng, opts.rMin, opts.rMax) });
  }
  return spots;
}

export function renderSpecimenFace(opts: SpecimenFaceOptions): SpecimenFace {
  const { width, height, kind } = opts;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 8 || height < 8) {
    throw new RangeError(`image size must be integers ≥ 8, got ${width}×${height}`);
  }
  for (const s of opts.rustSpots) {
    if (![s.x, s.y, s.r].every(Number.isFinite) || s.r <= 0) throw new RangeError("rust spots need finite x, y and r > 0");
  }
  const rng = createRng(`specimen-face:${opts.seed}:${kind}`);
  const face = specimenFaceOutline(width, height, opts.seed);
  const faceMask = fillPolygonMask(face, width, height);
  const data = new Uint8ClampedArray(width * height * 4);

  paintMetal(data, faceMask, width, height, rng);
  if (kind === "stony-iron") paintSilicates(data, faceMask, width, height, rng);
  const rustMask = new Uint8Array(width * height);
  for (const spot of opts.rustSpots) paintRustSpot(data, faceMask, rustMask, width, height, spot, rng);
  // Lens softness then sensor noise, so spot edges and grain edges blend as on a real photo.
  if (opts.greyPatch) paintGreyPatch(data, width, height, opts.greyPatch);
  softenEdges(data, width, height);
  const scaleBar = opts.scaleBar ? paintScaleBar(data, faceMask, width, height, opts.scaleBar) : null;
  if (opts.lighting) applyLighting(data, opts.lighting);
  addSensorNoise(data, randomInt(rng, 2 ** 31));

  let facePixels = 0;
  let rustPixels = 0;
  for (let i = 0; i < faceMask.length; i++) {
    facePixels += faceMask[i];
    rustPixels += rustMask[i];
  }
  return { width, height, data, face, trueRustFraction: facePixels === 0 ? 0 : rustPixels / facePixels, rustPixels, scaleBar };
}


function insideFace(face: readonly Point[], x: number, y: number): boolean {
  const c = polygonCrossings(face, y);
  for (let i = 0; i + 1 < c.length; i += 2) if (x >= c[i] && x < c[i + 1]) return true;
  return false;
}

/** Same pixel-centre rule as the estimator, so "face pixels" means the same thing in both. */
function fillPolygonMask(poly: readonly Point[], width: number, height: number): Uint8Array {
  const mask = new Uint8Array(width * height);
  const c: number[] = [];
  for (let y = 0; y < height; y++) {
    polygonCrossings(poly, y + 0.5, c);
    for (let k = 0; k + 1 < c.length; k += 2) {
      const x0 = Math.max(0, Math.ceil(c[k] - 0.5));
      const x1 = Math.min(width, Math.ceil(c[k + 1] - 0.5));
      if (x1 > x0) mask.fill(1, y * width + x0, y * width + x1);
    }
  }
  return mask;
}

/**
 * Etched iron: three sets of parallel kamacite lamellae 60° apart (octahedrite-like), each lamella a
 * slightly different grey, with thin brighter taenite lines between them, under uneven light.
 */
function paintMetal(data: Uint8ClampedArray, faceMask: Uint8Array, width: number, height: number, rng: Rng): void {
  const theta0 = rng() * Math.PI;
  const spacing = Math.max(4, Math.min(width, height) * randomBetween(rng, 0.03, 0.05));
  const sets = [0, 1, 2].map((k) => {
    const t = theta0 + (k * Math.PI) / 3;
    return { cos: Math.cos(t) / spacing, sin: Math.sin(t) / spacing, phase: rng(), grey: 140 + 8 * k, salt: randomInt(rng, 1e6) };
  });
  const lightDx = randomBetween(rng, -0.08, 0.08) / width;
  const lightDy = randomBetween(rng, -0.08, 0.08) / height;
  for (let y = 0, i = 0; y < height; y++) {
    for (let x = 0; x < width; x++, i++) {
      const o = i * 4;
      data[o + 3] = 255;
      if (faceMask[i] === 0) {
        data[o] = BACKDROP[0];
        data[o + 1] = BACKDROP[1];
        data[o + 2] = BACKDROP[2];
        continue;
      }
      // The pixel belongs to the first set with a lamella here; lamellae vary in width and some
      // are missing, so the three directions interlock instead of forming a regular grid.
      let grey = 148;
      for (const s of sets) {
        const u = x * s.cos + y * s.sin + s.phase;
        const band = Math.floor(u);
        const h = hashInt(band * 31 + s.salt);
        if ((h & 7) >= 5) continue;
        const lamella = 0.18 + (((h >>> 3) & 15) / 15) * 0.3;
        const frac = u - band;
        if (frac >= lamella) continue;
        grey = frac < 0.035 || frac > lamella - 0.035 ? 168 : s.grey + (((h >>> 8) % 9) - 4);
        break;
      }
      const light = 1 + (x - width / 2) * lightDx + (y - height / 2) * lightDy;
      data[o] = grey * light + 2; // faint warm cast of a tungsten-ish lamp
      data[o + 1] = grey * light + 1;
      data[o + 2] = grey * light - 1;
    }
  }
}

/** Pallasite-like silicate grains: irregular olive, green, yellow-green and dark blobs. */
function paintSilicates(data: Uint8ClampedArray, faceMask: Uint8Array, width: number, height: number, rng: Rng): void {
  const scale = Math.min(width, height);
  const count = 24 + randomInt(rng, 12);
  for (let n = 0; n < count; n++) {
    const base = SILICATE_COLOURS[randomInt(rng, SILICATE_COLOURS.length)];
    const shade = randomBetween(rng, 0.9, 1.08);
    const colour: Rgb = [base[0] * shade, base[1] * shade, base[2] * shade];
    paintBlob(width, height, rng, randomBetween(rng, 0, width), randomBetween(rng, 0, height), scale * randomBetween(rng, 0.03, 0.08), (i, t) => {
      if (faceMask[i] === 0) return;
      const k = 1 - 0.12 * t; // grains darken a little towards their edges
      setRgb(data, i, colour[0] * k, colour[1] * k, colour[2] * k);
    });
  }
}

function paintRustSpot(
  data: Uint8ClampedArray,
  faceMask: Uint8Array,
  rustMask: Uint8Array,
  width: number,
  height: number,
  spot: RustSpot,
  rng: Rng,
): void {
  if (spot.kind === "dark" || spot.kind === "droplet") {
    // Flat beads of one colour, a little darker at the edge; no stain and no rim.
    const base = spot.kind === "dark" ? DARK_RUST : DROPLET;
    paintBlob(width, height, rng, spot.x, spot.y, spot.r, (i, t) => {
      if (faceMask[i] === 0) return;
      rustMask[i] = 1;
      const k = 1 - 0.06 * t;
      setRgb(data, i, base[0] * k, base[1] * k, base[2] * k);
    });
    return;
  }
  const core = RUST_CORES[randomInt(rng, RUST_CORES.length)];
  const rimStart = randomBetween(rng, 0.65, 0.8);
  const mottleSalt = randomInt(rng, 1e6);
  // A faint stain spreads past the spot: a thin wash that tints the metal but is not rust itself,
  // so it is painted (first, underneath) without entering the true rusted area.
  const stainReach = randomBetween(rng, 1.1, 1.3);
  paintBlob(width, height, createRng(`stain:${mottleSalt}`), spot.x, spot.y, spot.r * stainReach, (i, t) => {
    if (faceMask[i] === 0 || rustMask[i] === 1) return;
    const w = 0.3 * (1 - t);
    const o = i * 4;
    setRgb(data, i, data[o] * (1 - w) + core[0] * w, data[o + 1] * (1 - w) + core[1] * w, data[o + 2] * (1 - w) + core[2] * w);
  });
  paintBlob(width, height, rng, spot.x, spot.y, spot.r, (i, t) => {
    if (faceMask[i] === 0) return;
    rustMask[i] = 1;
    if (t >= rimStart) {
      setRgb(data, i, RUST_RIM[0], RUST_RIM[1], RUST_RIM[2]);
    } else {
      // Slightly darker towards the rim, with a coarse mottle of ±12 % in brightness.
      const mottle = 1 + ((hashInt(((i >> 3) ^ mottleSalt) + (i % 7)) % 25) - 12) / 100;
      const k = (1 - 0.15 * (t / rimStart)) * mottle;
      setRgb(data, i, core[0] * k, core[1] * k, core[2] * k);
    }
  });
}

/**
 * Irregular blob: radius modulated by three low harmonics. Calls paint(index, t) for each covered
 * pixel, t = distance from centre relative to the local edge radius (0 centre … 1 edge).
 */
function paintBlob(
  width: number,
  height: number,
  rng: Rng,
  cx: number,
  cy: number,
  r: number,
  paint: (index: number, t: number) => void,
): void {
  const harmonics = [2, 3, 5].map((k) => ({ k, amp: randomBetween(rng, 0, 0.09), phase: rng() * Math.PI * 2 }));
  const rMax = r * (1 + harmonics.reduce((s, h) => s + h.amp, 0));
  const yStart = Math.max(0, Math.floor(cy - rMax));
  const yEnd = Math.min(height - 1, Math.ceil(cy + rMax));
  const xStart = Math.max(0, Math.floor(cx - rMax));
  const xEnd = Math.min(width - 1, Math.ceil(cx + rMax));
  for (let y = yStart; y <= yEnd; y++) {
    for (let x = xStart; x <= xEnd; x++) {
      const dx = x + 0.5 - cx;
      const dy = y + 0.5 - cy;
      const d = Math.hypot(dx, dy);
      if (d > rMax) continue;
      const a = Math.atan2(dy, dx);
      let edge = r;
      for (const h of harmonics) edge += r * h.amp * Math.sin(h.k * a + h.phase);
      if (d <= edge) paint(y * width + x, d / edge);
    }
  }
}
