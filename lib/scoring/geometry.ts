// Rusted-area percent from marks drawn on a photo, in original-image pixel coordinates.
//
// The union of overlapping circles, brush strokes and polygons, cut back by erase marks and clipped
// to the specimen face, has no convenient closed form, so it is measured on a sample grid laid over
// the face's bounding box: RASTER_CELLS cells along the longer side, each cell sampled
// RASTER_SUPERSAMPLE × RASTER_SUPERSAMPLE times at sample centres (spacing h = longer side / 4096).
// Resolution error: every row a boundary crosses misplaces less than one sample, so the area error
// is below about P·h, P being the total boundary length of the face and marks; as a percentage that
// is below 100·P·h / faceArea (reported as errorBoundPercent). For a 1000-px face with a handful of
// spots this is a few hundredths of a percentage point at worst; in practice the errors of opposite
// boundaries cancel and the true error is far smaller.
//
// Marks apply in order, like paint: a spot sets its area, an erase clears its area, and a spot drawn
// after an erase paints over it again. Polygons and outlines are filled with the even-odd rule, so a
// self-crossing freehand outline still gives a sensible area.

export type Point = { x: number; y: number };

export type SpotMark =
  | { kind: "outline"; points: Point[] } // freehand closed outline of a spot
  | { kind: "polygon"; points: Point[] } // click-by-click polygon
  | { kind: "circle"; cx: number; cy: number; r: number }
  | { kind: "brush"; points: Point[]; radius: number }; // stroke: disc of `radius` swept along the points

/** Erasing uses the same shapes as painting, so the annotator's eraser can be a brush or a lasso. */
export type EraseMark = { kind: "erase"; shape: SpotMark };
export type Mark = SpotMark | EraseMark;

export const RASTER_CELLS = 1024;
export const RASTER_SUPERSAMPLE = 4;

/** Signed shoelace area; positive for counter-clockwise points in a y-up frame. */
export function signedPolygonArea(points: readonly Point[]): number {
  let twice = 0;
  for (let i = 0, j = points.length - 1; i < points.length; j = i++) {
    twice += points[j].x * points[i].y - points[i].x * points[j].y;
  }
  return twice / 2;
}

/** Polygon area by the shoelace formula (absolute value; a simple polygon is assumed). */
export function polygonArea(points: readonly Point[]): number {
  return points.length < 3 ? 0 : Math.abs(signedPolygonArea(points));
}

/** Even-odd ray cast; a point exactly on an edge may fall either way. */
export function pointInPolygon(p: Point, polygon: readonly Point[]): boolean {
  let inside = false;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) {
    const a = polygon[i];
    const b = polygon[j];
    if (a.y > p.y !== b.y > p.y && p.x < ((b.x - a.x) * (p.y - a.y)) / (b.y - a.y) + a.x) inside = !inside;
  }
  return inside;
}

/** x positions where the horizontal line at y crosses the polygon's edges, sorted (even-odd pairs). */
export function polygonCrossings(polygon: readonly Point[], y: number, out: number[] = []): number[] {
  out.length = 0;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) {
    const a = polygon[j];
    const b = polygon[i];
    // Half-open in y so a vertex shared by two edges is counted once.
    if ((a.y <= y && y < b.y) || (b.y <= y && y < a.y)) {
      out.push(a.x + ((y - a.y) * (b.x - a.x)) / (b.y - a.y));
    }
  }
  return out.sort((u, v) => u - v);
}

export type RustedAreaDetail = {
  percent: number;
  /** Union of spots ∩ face, px², measured on the sample grid. */
  rustedAreaPx2: number;
  /** Face area by the shoelace formula, px². */
  faceAreaPx2: number;
  sampleSpacingPx: number;
  /** Conservative resolution error of `percent`, in percentage points (see file header). */
  errorBoundPercent: number;
};

/** Area of (union of spots ∩ face) / face area × 100. */
export function rustedAreaPercent(face: readonly Point[], spots: readonly Mark[]): number {
  return rustedAreaDetail(face, spots).percent;
}

export function rustedAreaDetail(face: readonly Point[], spots: readonly Mark[]): RustedAreaDetail {
  assertPoints(face, "face");
  const faceAreaPx2 = polygonArea(face);
  if (face.length < 3 || !(faceAreaPx2 > 0)) throw new RangeError("face outline needs at least 3 points and a positive area");
  for (const m of spots) assertMark(m);

  const xs = face.map((p) => p.x);
  const ys = face.map((p) => p.y);
  const x0 = Math.min(...xs);
  const y0 = Math.min(...ys);
  const w = Math.max(...xs) - x0;
  const hgt = Math.max(...ys) - y0;
  const h = Math.max(w, hgt) / (RASTER_CELLS * RASTER_SUPERSAMPLE);
  const nx = Math.max(1, Math.ceil(w / h));
  const ny = Math.max(1, Math.ceil(hgt / h));

  const shapes = spots.map((m) => (m.kind === "erase" ? { shape: m.shape, value: 0 } : { shape: m, value: 1 }));
  const bounds = shapes.map((s) => shapeBounds(s.shape));
  const row = new Uint8Array(nx);
  const crossings: number[] = [];
  const faceCrossings: number[] = [];
  let faceSamples = 0;
  let rustSamples = 0;

  for (let j = 0; j < ny; j++) {
    const y = y0 + (j + 0.5) * h;
    polygonCrossings(face, y, faceCrossings);
    if (faceCrossings.length < 2) continue;
    // Rows no mark reaches only add to the face count; sparse spots then cost little.
    const active = shapes.filter((_, k) => y >= bounds[k].minY && y <= bounds[k].maxY);
    if (active.length > 0) row.fill(0);
    const fill = (xa: number, xb: number, value: number) => {
      const i0 = Math.max(0, Math.ceil((xa - x0) / h - 0.5));
      const i1 = Math.min(nx, Math.ceil((xb - x0) / h - 0.5));
      if (i1 > i0) row.fill(value, i0, i1);
    };
    for (const { shape, value } of active) forEachInterval(shape, y, crossings, (xa, xb) => fill(xa, xb, value));
    for (let c = 0; c + 1 < faceCrossings.length; c += 2) {
      const i0 = Math.max(0, Math.ceil((faceCrossings[c] - x0) / h - 0.5));
      const i1 = Math.min(nx, Math.ceil((faceCrossings[c + 1] - x0) / h - 0.5));
      if (i1 <= i0) continue;
      faceSamples += i1 - i0;
      if (active.length > 0) for (let i = i0; i < i1; i++) rustSamples += row[i];
    }
  }

  // Ratio of sample counts, so a spot covering the whole face reads exactly 100 %.
  const percent = faceSamples === 0 ? 0 : (100 * rustSamples) / faceSamples;
  const perimeter = polygonPerimeter(face) + shapes.reduce((sum, s) => sum + shapePerimeter(s.shape), 0);
  return {
    percent,
    rustedAreaPx2: rustSamples * h * h,
    faceAreaPx2,
    sampleSpacingPx: h,
    errorBoundPercent: Math.min(100, (100 * perimeter * h) / faceAreaPx2),
  };
}

type Interval = (xa: number, xb: number) => void;

function forEachInterval(shape: SpotMark, y: number, scratch: number[], emit: Interval): void {
  switch (shape.kind) {
    case "outline":
    case "polygon": {
      if (shape.points.length < 3) return;
      polygonCrossings(shape.points, y, scratch);
      for (let c = 0; c + 1 < scratch.length; c += 2) emit(scratch[c], scratch[c + 1]);
      return;
    }
    case "circle": {
      const dy = y - shape.cy;
      if (Math.abs(dy) > shape.r) return;
      const s = Math.sqrt(shape.r * shape.r - dy * dy);
      emit(shape.cx - s, shape.cx + s);
      return;
    }
    case "brush": {
      const pts = shape.points;
      if (pts.length === 1) {
        forEachInterval({ kind: "circle", cx: pts[0].x, cy: pts[0].y, r: shape.radius }, y, scratch, emit);
        return;
      }
      for (let i = 1; i < pts.length; i++) {
        const span = capsuleSpan(pts[i - 1], pts[i], shape.radius, y);
        if (span) emit(span[0], span[1]);
      }
      return;
    }
  }
}

/** Where the line at y meets the capsule around segment a–b (convex, so one interval or none). */
function capsuleSpan(a: Point, b: Point, r: number, y: number): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of [a, b]) {
    const dy = y - c.y;
    if (Math.abs(dy) <= r) {
      const s = Math.sqrt(r * r - dy * dy);
      lo = Math.min(lo, c.x - s);
      hi = Math.max(hi, c.x + s);
    }
  }
  const len = Math.hypot(b.x - a.x, b.y - a.y);
  if (len > 0) {
    const nx = (-(b.y - a.y) / len) * r;
    const ny = ((b.x - a.x) / len) * r;
    const quad = [
      { x: a.x + nx, y: a.y + ny },
      { x: b.x + nx, y: b.y + ny },
      { x: b.x - nx, y: b.y - ny },
      { x: a.x - nx, y: a.y - ny },
    ];
    for (let i = 0, j = 3; i < 4; j = i++) {
      const p = quad[j];
      const q = quad[i];
      if (p.y === q.y) continue; // horizontal edge: the end discs already cover it
      if ((p.y <= y && y <= q.y) || (q.y <= y && y <= p.y)) {
        const x = p.x + ((y - p.y) * (q.x - p.x)) / (q.y - p.y);
        lo = Math.min(lo, x);
        hi = Math.max(hi, x);
      }
    }
  }
  return lo <= hi ? [lo, hi] : null;
}

function shapeBounds(shape: SpotMark): { minY: number; maxY: number } {
  switch (shape.kind) {
    case "circle":
      return { minY: shape.cy - shape.r, maxY: shape.cy + shape.r };
    case "brush": {
      const ys = shape.points.map((p) => p.y);
      return { minY: Math.min(...ys) - shape.radius, maxY: Math.max(...ys) + shape.radius };
    }
    default: {
      const ys = shape.points.map((p) => p.y);
      return { minY: Math.min(...ys), maxY: Math.max(...ys) };
    }
  }
}

function polygonPerimeter(points: readonly Point[]): number {
  let sum = 0;
  for (let i = 0, j = points.length - 1; i < points.length; j = i++) {
    sum += Math.hypot(points[i].x - points[j].x, points[i].y - points[j].y);
  }
  return sum;
}

function shapePerimeter(shape: SpotMark): number {
  switch (shape.kind) {
    case "circle":
      return 2 * Math.PI * shape.r;
    case "brush": {
      let len = 0;
      for (let i = 1; i < shape.points.length; i++) {
        len += Math.hypot(shape.points[i].x - shape.points[i - 1].x, shape.points[i].y - shape.points[i - 1].y);
      }
      // Only the union's boundary matters (the capsules are filled into one row buffer): two sides and two caps.
      return 2 * len + 2 * Math.PI * shape.radius;
    }
    default:
      return polygonPerimeter(shape.points);
  }
}

function assertPoints(points: readonly Point[], what: string): void {
  for (const p of points) {
    if (!Number.isFinite(p.x) || !Number.isFinite(p.y)) throw new RangeError(`${what} has a non-finite point`);
  }
}

function assertMark(mark: Mark): void {
  const shape = mark.kind === "erase" ? mark.shape : mark;
  switch (shape.kind) {
    case "circle":
      if (![shape.cx, shape.cy, shape.r].every(Number.isFinite) || shape.r < 0) {
        throw new RangeError("circle mark needs finite centre and radius ≥ 0");
      }
      return;
    case "brush":
      assertPoints(shape.points, "brush mark");
      if (shape.points.length === 0 || !Number.isFinite(shape.radius) || shape.radius <= 0) {
        throw new RangeError("brush mark needs at least one point and a radius > 0");
      }
      return;
    case "outline":
    case "polygon":
      assertPoints(shape.points, `${shape.kind} mark`);
      return;
    default:
      throw new RangeError(`unknown mark kind ${(shape as { kind: string }).kind}`);
  }
}
