"use client";
// The photo with its SVG overlay: wheel/drag zoom and pan, and drawing with the chosen tool.
// All geometry is in original-image pixels because the SVG's user space is the original image.
import { useCallback, useEffect, useId, useRef, useState } from "react";
import type { PatchRect } from "@/lib/scoring/colour-normalise";
import type { Mark, Point } from "@/lib/scoring/geometry";
import type { Annotation, AnnotationAction } from "./use-annotation";
import { isTyping } from "./use-annotation";
import { DraftLayer, FaceLayer, GhostLayer, SpotLayer, type Draft } from "./mark-layers";
import { panBy, zoomAt, type ViewBox } from "./view-box";

export type Tool = "pan" | "face" | "circle" | "polygon" | "brush" | "erase" | "patch";

export type Ghost = { face: Point[] | null; marks: Mark[]; sx: number; sy: number };

type Props = {
  src: string | null;
  W: number;
  H: number;
  view: ViewBox;
  setView: (v: ViewBox | ((v: ViewBox) => ViewBox)) => void;
  tool: Tool;
  brushRadius: number;
  annotation: Annotation;
  dispatch: (a: AnnotationAction) => void;
  ghost: Ghost | null;
  maskUrl: string | null;
  /** Opacity of the estimate's mask, 0–1. */
  maskOpacity?: number;
  /** Draw the spot marks (hide them to see the photo or the mask beneath). */
  showSpots?: boolean;
  readOnly: boolean;
  label: string;
  /** The colour card's grey patch (drawn as a dashed rectangle) and where a new one is dragged to. */
  patch?: PatchRect | null;
  onPatch?: (r: PatchRect) => void;
};

/** The rectangle spanned by two corners, rounded to whole image pixels. */
function rectOf(a: Point, b: Point): PatchRect {
  const x = Math.round(Math.min(a.x, b.x));
  const y = Math.round(Math.min(a.y, b.y));
  return { x, y, width: Math.round(Math.max(a.x, b.x)) - x, height: Math.round(Math.max(a.y, b.y)) - y };
}

const CLOSE_PX = 10; // click this close to the first point to close an outline

export function AnnotatorCanvas({ src, W, H, view, setView, tool, brushRadius, annotation, dispatch, ghost, maskUrl, maskOpacity = 0.7, showSpots = true, readOnly, label, patch = null, onPatch }: Props) {
  const svgRef = useRef<SVGSVGElement>(null);
  const maskId = useId().replace(/:/g, "");
  const [draft, setDraft] = useState<Draft | null>(null);
  const [hover, setHover] = useState<Point | null>(null);
  const [patchDraft, setPatchDraft] = useState<{ a: Point; b: Point } | null>(null);
  const panRef = useRef<{ x: number; y: number; view: ViewBox } | null>(null);
  const spaceRef = useRef(false);

  /** Image units per screen pixel (the CTM scale is the same on both axes with "meet"). */
  const unit = useCallback(() => {
    const m = svgRef.current?.getScreenCTM();
    return m ? 1 / m.a : 1;
  }, []);

  const toImage = useCallback((clientX: number, clientY: number): Point => {
    const m = svgRef.current?.getScreenCTM();
    if (!m) return { x: 0, y: 0 };
    const p = new DOMPoint(clientX, clientY).matrixTransform(m.inverse());
    return { x: Math.round(p.x * 100) / 100, y: Math.round(p.y * 100) / 100 };
  }, []);

  // Wheel zoom needs a non-passive listener to stop the page from scrolling.
  useEffect(() => {
    const svg = svgRef.current;
    if (!svg) return;
    const onWheel = (e: WheelEvent) => {
      e.preventDefault();
      const p = toImage(e.clientX, e.clientY);
      setView((v) => zoomAt(v, Math.exp(-e.deltaY * 0.0015), p.x, p.y, W, H));
    };
    svg.addEventListener("wheel", onWheel, { passive: false });
    return () => svg.removeEventListener("wheel", onWheel);
  }, [toImage, setView, W, H]);

  const closePoints = useCallback((d: Draft | null) => {
    if (d?.kind !== "points" || d.points.length < 3) return false;
    if (d.target === "face") dispatch({ type: "set-face", face: d.points });
    else dispatch({ type: "add-mark", mark: { kind: "polygon", points: d.points } });
    setDraft(null);
    return true;
  }, [dispatch]);

  // Enter closes an outline, Escape drops the draft, Backspace removes the last clicked point.
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.key === " " && !isTyping(e.target)) spaceRef.current = e.type === "keydown";
      if (e.type !== "keydown" || isTyping(e.target) || !draft) return;
      if (e.key === "Enter") {
        if (closePoints(draft)) e.preventDefault();
      } else if (e.key === "Escape") {
        setDraft(null);
      } else if (e.key === "Backspace" && draft.kind === "points") {
        e.preventDefault();
        setDraft(draft.points.length > 1 ? { ...draft, points: draft.points.slice(0, -1) } : null);
      }
    };
    window.addEventListener("keydown", onKey);
    window.addEventListener("keyup", onKey);
    return () => {
      window.removeEventListener("keydown", onKey);
      window.removeEventListener("keyup", onKey);
    };
  }, [draft, closePoints]);

  // A tool change abandons a half-drawn shape rather than finishing it as something else.
  useEffect(() => {
    setDraft(null);
    setPatchDraft(null);
  }, [tool]);

  const onPointerDown = (e: React.PointerEvent<SVGSVGElement>) => {
    const panning = tool === "pan" || readOnly || e.button === 1 || spaceRef.current;
    if (e.button !== 0 && !(e.button === 1)) return;
    e.currentTarget.setPointerCapture(e.pointerId);
    if (panning) {
      panRef.current = { x: e.clientX, y: e.clientY, view };
      return;
    }
    const p = toImage(e.clientX, e.clientY);
    const u = unit();
    if (tool === "face" || tool === "polygon") {
      const target = tool;
      if (draft?.kind === "points" && draft.target === target) {
        const first = draft.points[0];
        const last = draft.points[draft.points.length - 1];
        // Clicking the first point, or the last one again (a double-click), closes the outline.
        if (Math.hypot(p.x - first.x, p.y - first.y) <= CLOSE_PX * u || Math.hypot(p.x - last.x, p.y - last.y) <= 3 * u) {
          if (closePoints(draft)) return;
        }
        setDraft({ ...draft, points: [...draft.points, p] });
      } else {
        setDraft({ kind: "points", target, points: [p] });
      }
    } else if (tool === "patch") {
      setPatchDraft({ a: p, b: p });
    } else if (tool === "circle") {
      setDraft({ kind: "circle", c: p, r: 0 });
    } else if (tool === "brush" || tool === "erase") {
      setDraft({ kind: "stroke", erase: tool === "erase", points: [p], radius: brushRadius });
    }
  };

  const onPointerMove = (e: React.PointerEvent<SVGSVGElement>) => {
    const pan = panRef.current;
    if (pan) {
      const m = svgRef.current?.getScreenCTM();
      const k = m ? 1 / m.a : 1;
      setView(panBy(pan.view, -(e.clientX - pan.x) * k, -(e.clientY - pan.y) * k, W, H));
      return;
    }
    const p = toImage(e.clientX, e.clientY);
    setHover(p);
    if (patchDraft) setPatchDraft({ ...patchDraft, b: p });
    if (draft?.kind === "circle") setDraft({ ...draft, r: Math.hypot(p.x - draft.c.x, p.y - draft.c.y) });
    else if (draft?.kind === "stroke") {
      const last = draft.points[draft.points.length - 1];
      if (Math.hypot(p.x - last.x, p.y - last.y) >= Math.max(draft.radius / 3, unit())) setDraft({ ...draft, points: [...draft.points, p] });
    }
  };

  const onPointerUp = (e: React.PointerEvent<SVGSVGElement>) => {
    if (e.currentTarget.hasPointerCapture(e.pointerId)) e.currentTarget.releasePointerCapture(e.pointerId);
    if (panRef.current) {
      panRef.current = null;
      return;
    }
    if (patchDraft) {
      const r = rectOf({ x: Math.max(0, patchDraft.a.x), y: Math.max(0, patchDraft.a.y) }, { x: Math.min(W, patchDraft.b.x), y: Math.min(H, patchDraft.b.y) });
      if (r.width >= 2 && r.height >= 2) onPatch?.(r);
      setPatchDraft(null);
      return;
    }
    if (draft?.kind === "circle") {
      // A click without a drag leaves a spot of the brush radius.
      const r = draft.r * (1 / unit()) < 3 ? brushRadius : draft.r;
      dispatch({ type: "add-mark", mark: { kind: "circle", cx: draft.c.x, cy: draft.c.y, r: Math.round(r * 100) / 100 } });
      setDraft(null);
    } else if (draft?.kind === "stroke") {
      const shape = { kind: "brush" as const, points: draft.points, radius: draft.radius };
      dispatch({ type: "add-mark", mark: draft.erase ? { kind: "erase", shape } : shape });
      setDraft(null);
    }
  };

  // Arrow keys pan when the canvas has focus (Shift for bigger steps), so the photo can be explored without a pointer.
  const onKeyDown = (e: React.KeyboardEvent<SVGSVGElement>) => {
    const step = (e.shiftKey ? 0.25 : 0.05) * view.w;
    const d = { ArrowLeft: [-step, 0], ArrowRight: [step, 0], ArrowUp: [0, -step], ArrowDown: [0, step] }[e.key];
    if (!d) return;
    e.preventDefault();
    setView((v) => panBy(v, d[0], d[1], W, H));
  };

  const u = svgRef.current ? unit() : 1;
  const cursor = readOnly || tool === "pan" ? "grab" : tool === "brush" || tool === "erase" ? "none" : "crosshair";
  return (
    <svg ref={svgRef} role="application" aria-roledescription="annotation canvas" aria-label={`${label}. Arrow keys pan; plus and minus zoom.`} tabIndex={0}
      viewBox={`${view.x} ${view.y} ${view.w} ${view.h}`} preserveAspectRatio="xMidYMid meet"
      className="w-full h-full touch-none select-none bg-iron-950 rounded-md" style={{ cursor }}
      onPointerDown={onPointerDown} onPointerMove={onPointerMove} onPointerUp={onPointerUp} onPointerCancel={onPointerUp}
      onPointerLeave={() => setHover(null)} onKeyDown={onKeyDown} data-testid="annotation-canvas">
      {src ? <image href={src} x={0} y={0} width={W} height={H} preserveAspectRatio="none" /> : <rect width={W} height={H} fill="#282d33" />}
      <FaceLayer face={annotation.face} W={W} H={H} />
      {showSpots && <SpotLayer id={`spots-${maskId}`} marks={annotation.marks} W={W} H={H} />}
      {/* Over the spots, so it stays visible where they cover it; its opacity is the scorer's choice. */}
      {maskUrl && <image href={maskUrl} x={0} y={0} width={W} height={H} preserveAspectRatio="none" opacity={maskOpacity} style={{ imageRendering: "pixelated" }} data-testid="estimate-mask" />}
      {ghost && <GhostLayer {...ghost} />}
      {(patchDraft || patch) && (() => {
        const r = patchDraft ? rectOf(patchDraft.a, patchDraft.b) : patch!;
        return (
          <g pointerEvents="none" data-testid="grey-patch">
            <rect x={r.x} y={r.y} width={r.width} height={r.height} fill="none" stroke="#000000" strokeWidth={3} vectorEffect="non-scaling-stroke" />
            <rect x={r.x} y={r.y} width={r.width} height={r.height} fill="none" stroke="#ffffff" strokeWidth={1.5} strokeDasharray="6 4" vectorEffect="non-scaling-stroke" />
          </g>
        );
      })()}
      <DraftLayer draft={draft} unit={u} hover={draft?.kind === "points" ? hover : null} />
      {hover && !readOnly && (tool === "brush" || tool === "erase") && (
        <circle cx={hover.x} cy={hover.y} r={brushRadius} fill="none" stroke={tool === "erase" ? "#ffffff" : "#ff7a1a"} strokeWidth={1.5} vectorEffect="non-scaling-stroke" pointerEvents="none" />
      )}
    </svg>
  );
}
