// Zoom and pan as a viewBox over the original image (W × H pixels): marks drawn inside the SVG are
// then in original-image coordinates whatever the display size or zoom.
export type ViewBox = { x: number; y: number; w: number; h: number };

export const MAX_ZOOM = 40;

export function fitView(W: number, H: number): ViewBox {
  return { x: 0, y: 0, w: W, h: H };
}

function clamp(v: ViewBox, W: number, H: number): ViewBox {
  // Keep at least half the view over the image so it cannot be lost off-screen.
  const x = Math.min(Math.max(v.x, -v.w / 2), W - v.w / 2);
  const y = Math.min(Math.max(v.y, -v.h / 2), H - v.h / 2);
  return { ...v, x, y };
}

/** Zoom by `factor` (> 1 in) keeping the image point (cx, cy) where it is on screen. */
export function zoomAt(v: ViewBox, factor: number, cx: number, cy: number, W: number, H: number): ViewBox {
  const w = Math.min(W, Math.max(W / MAX_ZOOM, v.w / factor));
  const k = w / v.w;
  const h = v.h * k;
  return clamp({ x: cx - (cx - v.x) * k, y: cy - (cy - v.y) * k, w, h }, W, H);
}

export function zoomCentre(v: ViewBox, factor: number, W: number, H: number): ViewBox {
  return zoomAt(v, factor, v.x + v.w / 2, v.y + v.h / 2, W, H);
}

export function panBy(v: ViewBox, dx: number, dy: number, W: number, H: number): ViewBox {
  return clamp({ ...v, x: v.x + dx, y: v.y + dy }, W, H);
}

export function zoomPercent(v: ViewBox, W: number): number {
  return Math.round((W / v.w) * 100);
}
