"use client";
// Runs the colour estimate in a web worker and keeps its result (percent + overlay image URL).
import { useCallback, useEffect, useRef, useState } from "react";
import type { EstimateColourBasis } from "@/lib/scoring/colour-normalise";
import type { Point } from "@/lib/scoring/geometry";
import type { ColourPatchInput } from "@/lib/validation/scores";
import type { EstimateRequest, EstimateResponse } from "./rust-estimate.worker";

export type PatchChoice = EstimateRequest["patch"];

export type EstimateState =
  | { status: "idle" }
  | { status: "running"; stage: string }
  | {
    status: "done"; percent: number; maskUrl: string; faceKey: string;
    /** Percent of the face by class: rust, dark rust, pale droplets. */
    classPercent: [number, number, number];
    basis: EstimateColourBasis; patchReading: ColourPatchInput | null;
  }
  | { status: "error"; message: string; field?: "patch" };

const STAGES: Record<string, string> = {
  loading: "Loading the image…", measuring: "Reading the grey patch…", classifying: "Classifying face pixels…", drawing: "Drawing the overlay…",
};

/** A stable key for a face outline and grey patch, to tell when an estimate no longer matches them. */
export function faceKey(face: readonly Point[] | null, patch: PatchChoice = null): string {
  const f = face ? face.map((p) => `${p.x},${p.y}`).join(";") : "";
  return patch ? `${f}|${patch.x},${patch.y},${patch.width},${patch.height},${patch.patchLightness}` : f;
}

const pct = (n: number, total: number) => (total > 0 ? Math.round((n / total) * 100_000) / 1000 : 0);

export function useRustEstimate(src: string | null, W: number, H: number) {
  const [state, setState] = useState<EstimateState>({ status: "idle" });
  const workerRef = useRef<Worker | null>(null);
  const runId = useRef(0);
  const urlRef = useRef<string | null>(null);

  useEffect(() => () => {
    workerRef.current?.terminate();
    if (urlRef.current) URL.revokeObjectURL(urlRef.current);
  }, []);

  const run = useCallback((face: Point[], patch: PatchChoice) => {
    if (!src) return;
    if (!workerRef.current) {
      workerRef.current = new Worker(new URL("./rust-estimate.worker.ts", import.meta.url), { type: "module" });
    }
    const worker = workerRef.current;
    const id = ++runId.current;
    const key = faceKey(face, patch);
    setState({ status: "running", stage: STAGES.loading });
    worker.onmessage = (e: MessageEvent<EstimateResponse>) => {
      const msg = e.data;
      if (msg.id !== runId.current) return; // an older run finishing late
      if (msg.type === "progress") setState({ status: "running", stage: STAGES[msg.stage] });
      else if (msg.type === "error") {
        setState(msg.field === "patch" ? { status: "error", message: msg.message, field: "patch" } : { status: "error", message: `The estimate failed: ${msg.message}.` });
      } else {
        if (urlRef.current) URL.revokeObjectURL(urlRef.current);
        urlRef.current = URL.createObjectURL(msg.mask);
        const facePixels = msg.facePixels;
        setState({
          status: "done", percent: Math.round(msg.fraction * 100_000) / 1000, maskUrl: urlRef.current, faceKey: key,
          classPercent: [pct(msg.byClass[0], facePixels), pct(msg.byClass[1], facePixels), pct(msg.byClass[2], facePixels)],
          basis: msg.basis, patchReading: msg.patchReading,
        });
      }
    };
    worker.onerror = (e) => setState({ status: "error", message: `The estimate failed: ${e.message || "the worker stopped"}.` });
    const req: EstimateRequest = { id, url: src, face, originalWidth: W, originalHeight: H, patch };
    worker.postMessage(req);
  }, [src, W, H]);

  const reset = useCallback(() => {
    runId.current++;
    setState({ status: "idle" });
  }, []);

  return { state, run, reset };
}
