"use client";
// Face outline and marks with undo/redo. Every committed change is one history step; drafts
// (a polygon being clicked, a brush stroke being dragged) live in the canvas until committed.
import { useCallback, useEffect, useReducer } from "react";
import type { Mark, Point } from "@/lib/scoring/geometry";

export type Annotation = { face: Point[] | null; marks: Mark[] };
type History = { past: Annotation[]; present: Annotation; future: Annotation[] };
export type AnnotationAction =
  | { type: "set-face"; face: Point[] | null }
  | { type: "add-mark"; mark: Mark }
  | { type: "clear-marks" }
  | { type: "replace"; annotation: Annotation }
  | { type: "undo" }
  | { type: "redo" };

const MAX_STEPS = 200;

function commit(h: History, present: Annotation): History {
  return { past: [...h.past, h.present].slice(-MAX_STEPS), present, future: [] };
}

function reducer(h: History, a: AnnotationAction): History {
  switch (a.type) {
    case "set-face":
      return commit(h, { ...h.present, face: a.face });
    case "add-mark":
      return commit(h, { ...h.present, marks: [...h.present.marks, a.mark] });
    case "clear-marks":
      return h.present.marks.length ? commit(h, { ...h.present, marks: [] }) : h;
    case "replace":
      return commit(h, a.annotation);
    case "undo":
      if (!h.past.length) return h;
      return { past: h.past.slice(0, -1), present: h.past[h.past.length - 1], future: [h.present, ...h.future] };
    case "redo":
      if (!h.future.length) return h;
      return { past: [...h.past, h.present], present: h.future[0], future: h.future.slice(1) };
  }
}

export function useAnnotation(initial: Annotation) {
  const [h, dispatch] = useReducer(reducer, initial, (present) => ({ past: [], present, future: [] }));
  return { ...h.present, canUndo: h.past.length > 0, canRedo: h.future.length > 0, dispatch };
}

/** True when the key event comes from a text field, where the browser's own undo must win. */
export function isTyping(target: EventTarget | null): boolean {
  const el = target as HTMLElement | null;
  if (!el) return false;
  const tag = el.tagName;
  return tag === "TEXTAREA" || tag === "SELECT" || (tag === "INPUT" && !["checkbox", "radio", "button", "submit"].includes((el as HTMLInputElement).type)) || el.isContentEditable;
}

/** Ctrl/⌘+Z undo, Ctrl/⌘+Shift+Z or Ctrl+Y redo, anywhere on the page except in text fields. */
export function useUndoKeys(dispatch: (a: AnnotationAction) => void, enabled: boolean) {
  const onKey = useCallback((e: KeyboardEvent) => {
    if (!enabled || isTyping(e.target) || !(e.ctrlKey || e.metaKey)) return;
    const k = e.key.toLowerCase();
    if (k === "z") {
      e.preventDefault();
      dispatch({ type: e.shiftKey ? "redo" : "undo" });
    } else if (k === "y") {
      e.preventDefault();
      dispatch({ type: "redo" });
    }
  }, [dispatch, enabled]);
  useEffect(() => {
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [onKey]);
}

/** Spot marks are everything painted (circles, polygons, brush strokes); erasures are not spots. */
export function countSpotMarks(marks: readonly Mark[]): number {
  return marks.filter((m) => m.kind !== "erase").length;
}
