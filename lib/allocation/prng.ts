// Seeded pseudo-random numbers shared by allocation and the demo-image generator.
// Reproducibility is the point: the same seed must give the same allocation (or image) on any
// machine, so nothing here touches Math.random.

export type Rng = () => number;

/**
 * Hash a seed to an unsigned 32-bit integer.
 * Numbers are hashed through their decimal string so that seed 42 typed into a form ("42") and
 * the number 42 from an API give the same allocation.
 * FNV-1a over UTF-16 code units, then the murmur3 finaliser to spread short seeds over all bits.
 */
export function hashSeed(seed: string | number): number {
  if (typeof seed === "number" && !Number.isFinite(seed)) {
    throw new RangeError(`seed must be a finite number or a string, got ${seed}`);
  }
  const text = String(seed);
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** mulberry32: tiny, fast, full 2^32 period; plenty for shuffles and synthetic images. */
export function mulberry32(seed32: number): Rng {
  let a = seed32 >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A generator seeded from any string or number seed. */
export function createRng(seed: string | number): Rng {
  return mulberry32(hashSeed(seed));
}

/** Integer in [0, n). */
export function randomInt(rng: Rng, n: number): number {
  return Math.floor(rng() * n);
}

/** Uniform in [lo, hi). */
export function randomBetween(rng: Rng, lo: number, hi: number): number {
  return lo + (hi - lo) * rng();
}

/** Standard normal draw (Box–Muller); used for image noise. */
export function randomNormal(rng: Rng): number {
  const u = 1 - rng(); // (0, 1] so the log is finite
  const v = rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

/** Fisher–Yates shuffle into a new array; the input is left untouched. */
export function shuffled<T>(items: readonly T[], rng: Rng): T[] {
  const out = items.slice();
  for (let i = out.length - 1; i > 0; i--) {
    const j = randomInt(rng, i + 1);
    const tmp = out[i] as T;
    out[i] = out[j] as T;
    out[j] = tmp;
  }
  return out;
}
