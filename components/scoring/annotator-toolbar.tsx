"use client";
// Tools, zoom, undo/redo and layer toggles. Every control is a labelled button or input reachable
// by Tab; the single-key shortcuts are listed in each label and work when focus is not in a field.
import { useEffect } from "react";
import type { Tool } from "./annotator-canvas";
import { isTyping } from "./use-annotation";

export const TOOLS: { tool: Tool; label: string; key: string; hint: string }[] = [
  { tool: "pan", label: "Pan", key: "h", hint: "Drag to move the photo (or hold Space, or drag with the middle button)." },
  { tool: "face", label: "Face outline", key: "f", hint: "Click around the specimen face; click the first point, double-click or press Enter to close." },
  { tool: "circle", label: "Circle spot", key: "c", hint: "Drag from a spot's centre outwards; a click leaves a spot of the brush radius." },
  { tool: "polygon", label: "Polygon spot", key: "p", hint: "Click around a spot; close as for the face." },
  { tool: "brush", label: "Brush", key: "b", hint: "Paint rusted area with the brush radius." },
  { tool: "erase", label: "Erase", key: "e", hint: "Paint over marks to take area away again." },
  { tool: "patch", label: "Grey patch", key: "g", hint: "Drag a rectangle inside the colour card's neutral grey patch, clear of its edges." },
];

type Props = {
  tool: Tool;
  setTool: (t: Tool) => void;
  brushRadius: number;
  setBrushRadius: (r: number) => void;
  maxRadius: number;
  zoomPercent: number;
  onZoomIn: () => void;
  onZoomOut: () => void;
  onFit: () => void;
  canUndo: boolean;
  canRedo: boolean;
  onUndo: () => void;
  onRedo: () => void;
  onClearMarks: () => void;
  readOnly: boolean;
};

export function AnnotatorToolbar(p: Props) {
  // Single-key shortcuts for tools and zoom, ignored while typing in a field.
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (isTyping(e.target) || e.ctrlKey || e.metaKey || e.altKey) return;
      const t = TOOLS.find((x) => x.key === e.key.toLowerCase());
      if (t && (!p.readOnly || t.tool === "pan")) p.setTool(t.tool);
      else if (e.key === "+" || e.key === "=") p.onZoomIn();
      else if (e.key === "-") p.onZoomOut();
      else if (e.key === "0") p.onFit();
    };
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [p]);

  const active = TOOLS.find((t) => t.tool === p.tool);
  const btn = (on: boolean) => `btn-quiet text-sm ${on ? "!bg-verdigris-600 !text-white" : ""}`;
  return (
    <div className="space-y-2">
      <div role="toolbar" aria-label="Annotation tools" className="flex flex-wrap items-center gap-1">
        {TOOLS.filter((t) => !p.readOnly || t.tool === "pan").map((t) => (
          <button key={t.tool} type="button" className={btn(p.tool === t.tool)} aria-pressed={p.tool === t.tool}
            aria-keyshortcuts={t.key.toUpperCase()} title={t.hint} onClick={() => p.setTool(t.tool)}>
            {t.label} <kbd className="text-xs opacity-70">{t.key.toUpperCase()}</kbd>
          </button>
        ))}
        <span className="mx-1 h-6 w-px bg-[var(--line)]" aria-hidden="true" />
        <button type="button" className={btn(false)} onClick={p.onZoomOut} aria-keyshortcuts="-" aria-label="Zoom out">−</button>
        <span className="text-sm tabular-nums w-14 text-center" aria-live="polite" aria-label={`Zoom ${p.zoomPercent} %`}>{p.zoomPercent} %</span>
        <button type="button" className={btn(false)} onClick={p.onZoomIn} aria-keyshortcuts="+" aria-label="Zoom in">+</button>
        <button type="button" className={btn(false)} onClick={p.onFit} aria-keyshortcuts="0">Fit <kbd className="text-xs opacity-70">0</kbd></button>
        {!p.readOnly && (
          <>
            <span className="mx-1 h-6 w-px bg-[var(--line)]" aria-hidden="true" />
            <button type="button" className={btn(false)} onClick={p.onUndo} disabled={!p.canUndo} aria-keyshortcuts="Control+Z">Undo</button>
            <button type="button" className={btn(false)} onClick={p.onRedo} disabled={!p.canRedo} aria-keyshortcuts="Control+Shift+Z">Redo</button>
            <button type="button" className={btn(false)} onClick={p.onClearMarks}>Clear marks</button>
          </>
        )}
      </div>
      {!p.readOnly && (
        <div className="flex flex-wrap items-center gap-3 text-sm">
          <label htmlFor="brush-radius" className="font-medium">Brush and click-spot radius</label>
          <input id="brush-radius" type="range" min={1} max={p.maxRadius} value={p.brushRadius}
            onChange={(e) => p.setBrushRadius(Number(e.target.value))} aria-describedby="brush-radius-unit" className="w-40" />
          <span id="brush-radius-unit" className="tabular-nums">{p.brushRadius} px of the original image</span>
        </div>
      )}
      <p className="text-xs muted" aria-live="polite">{active?.hint} Undo: Ctrl+Z · Redo: Ctrl+Shift+Z · Escape drops a half-drawn shape.</p>
    </div>
  );
}
