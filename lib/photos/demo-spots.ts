// Rust spots for the demo photos that agree with the demo scores: for a specimen, a fixed set of
// spot sites that switch on one after another and only ever grow as the rusted area rises, sized so
// the painted area fraction of the face matches the score's area percent.
import { createRng, randomBetween } from "@/lib/allocation/prng";
import { polygonCrossings, type Point } from "@/lib/scoring/geometry";
import { scatterRustSpots, type RustSpot } from "@/lib/demo-images/specimen-face";

// Area (in "a" units, ≈ % of the face) at which each successive site starts to rust.
const ONSET = [0, 0.03, 0.08, 0.2, 0.4, 0.8, 1.5, 3, 5, 8, 12, 18];
const GRID_PX = 3;

export type SpotPlanner = {
  /** Spots whose painted area is `areaPercent` % of the face (± the coarse grid's resolution). */
  spotsFor(areaPercent: number): RustSpot[];
  /** Fraction of the face covered by the spots, measured on the coarse grid. */
  coverage(spots: readonly RustSpot[]): number;
};

export function createSpotPlanner({ face, width, height, seed }: { face: readonly Point[]; width: number; height: number; seed: string }): SpotPlanner {
  const sites = scatterRustSpots(face, { count: ONSET.length, rMin: 1, rMax: 2, seed: `demo-sites:${seed}` });
  const rng = createRng(`demo-weights:${seed}`);
  const raw = sites.map(() => randomBetween(rng, 0.5, 1.5));
  const total = raw.reduce((s, w) => s + w, 0);
  const weights = raw.map((w) => w / total);

  // Coarse face mask: sample points at pixel centres every GRID_PX pixels.
  const gw = Math.ceil(width / GRID_PX);
  const gh = Math.ceil(height / GRID_PX);
  const inFace = new Uint8Array(gw * gh);
  let facePoints = 0;
  const c: number[] = [];
  for (let gy = 0; gy < gh; gy++) {
    const y = gy * GRID_PX + 0.5;
    polygonCrossings(face, y, c);
    for (let k = 0; k + 1 < c.length; k += 2) {
      for (let gx = Math.max(0, Math.ceil((c[k] - 0.5) / GRID_PX)); gx < gw && gx * GRID_PX + 0.5 < c[k + 1]; gx++) {
        if (gx * GRID_PX + 0.5 >= c[k]) {
          inFace[gy * gw + gx] = 1;
          facePoints++;
        }
      }
    }
  }
  const faceAreaPx = facePoints * GRID_PX * GRID_PX;
  const covered = new Uint8Array(gw * gh);

  function coverage(spots: readonly RustSpot[]): number {
    if (facePoints === 0 || spots.length === 0) return 0;
    covered.fill(0);
    let n = 0;
    for (const s of spots) {
      const gy0 = Math.max(0, Math.floor((s.y - s.r) / GRID_PX));
      const gy1 = Math.min(gh - 1, Math.ceil((s.y + s.r) / GRID_PX));
      const gx0 = Math.max(0, Math.floor((s.x - s.r) / GRID_PX));
      const gx1 = Math.min(gw - 1, Math.ceil((s.x + s.r) / GRID_PX));
      for (let gy = gy0; gy <= gy1; gy++) {
        const dy = gy * GRID_PX + 0.5 - s.y;
        for (let gx = gx0; gx <= gx1; gx++) {
          const i = gy * gw + gx;
          if (!inFace[i] || covered[i]) continue;
          const dx = gx * GRID_PX + 0.5 - s.x;
          if (dx * dx + dy * dy <= s.r * s.r) {
            covered[i] = 1;
            n++;
          }
        }
      }
    }
    return n / facePoints;
  }

  // Every radius grows with `a`, so a larger area never shrinks or removes an existing spot.
  function spotsAt(a: number): RustSpot[] {
    const out: RustSpot[] = [];
    sites.forEach((site, i) => {
      const share = Math.max(0, a - ONSET[i]) * weights[i];
      const r = Math.sqrt((share / 100) * faceAreaPx / Math.PI);
      if (r >= 0.75) out.push({ x: site.x, y: site.y, r });
    });
    return out;
  }

  function spotsFor(areaPercent: number): RustSpot[] {
    if (!(areaPercent > 0)) return [];
    const target = Math.min(areaPercent, 95) / 100;
    let lo = 0;
    let hi = 1;
    while (coverage(spotsAt(hi)) < target && hi < 1e5) hi *= 2;
    for (let k = 0; k < 30; k++) {
      const mid = (lo + hi) / 2;
      if (coverage(spotsAt(mid)) < target) lo = mid;
      else hi = mid;
    }
    const spots = spotsAt(hi);
    // A trace of rust (a few hundredths of a percent) still shows as one small spot.
    return spots.length ? spots : spotsAt(hi + 1e-3).slice(0, 1);
  }

  return { spotsFor, coverage };
}
