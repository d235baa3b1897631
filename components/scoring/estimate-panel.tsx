"use client";
// The automatic colour estimate: run it, see the mask and the percent, then accept, correct or reject.
import { RUST_COLOUR_THRESHOLDS as T } from "@/lib/scoring/rust-estimate";
import type { EstimateState } from "./use-rust-estimate";

export type EstimateDecision = "none" | "accepted" | "corrected" | "rejected";

type Props = {
  state: EstimateState;
  canRun: boolean;
  stale: boolean;
  decision: EstimateDecision;
  onRun: () => void;
  onDecide: (d: EstimateDecision) => void;
  readOnly: boolean;
};

const DECISION_TEXT: Record<EstimateDecision, string> = {
  none: "",
  accepted: "Accepted: the score's area is the estimate.",
  corrected: "Correcting with marks: the score's area follows your marks; the estimate is kept beside it for comparison.",
  rejected: "Rejected: the estimate is not recorded.",
};

export function EstimatePanel(p: Props) {
  const done = p.state.status === "done" ? p.state : null;
  return (
    <section className="panel p-3 space-y-2" aria-labelledby="estimate-h">
      <h2 id="estimate-h" className="font-semibold">Colour estimate</h2>
      <p className="text-xs muted">
        Counts face pixels whose colour reads as rust: CIELAB hue {T.hueMinDeg}°–{T.hueMaxDeg}°, chroma above {T.chromaMin},
        lightness L* {T.lightnessMin}–{T.lightnessMax} (D65). These thresholds are Rustline&apos;s own choice, tuned by eye on
        typical rust colours; no published source sets them. Weathered yellow-brown silicate may be counted and dark rust missed,
        so the estimate is a suggestion to accept, correct with marks, or reject.
      </p>
      {!p.readOnly && (
        <button type="button" className="btn-quiet text-sm" onClick={p.onRun} disabled={!p.canRun || p.state.status === "running"}>
          {done ? "Run the estimate again" : "Run the colour estimate"}
        </button>
      )}
      {!p.canRun && !p.readOnly && <p className="text-xs muted">Outline the face first: the estimate looks only inside it.</p>}
      <div aria-live="polite" className="text-sm space-y-2">
        {p.state.status === "running" && <p role="status"><progress className="align-middle mr-2" aria-label="Estimating" /> {p.state.stage}</p>}
        {p.state.status === "error" && <p role="alert" className="text-rust-600">{p.state.message}</p>}
        {done && (
          <>
            <p>
              Estimated rust-coloured area: <strong className="tabular-nums" data-testid="estimate-percent">{done.percent.toFixed(3)} %</strong> of the face
              {p.stale && <span className="text-rust-600"> — the face changed since; run it again.</span>}
            </p>
            <p className="text-xs muted">The mask (cyan) and its opacity are under Layers, beside the spot marks.</p>
            {!p.readOnly && (
              <div className="flex flex-wrap gap-2" role="group" aria-label="Use of the estimate">
                <button type="button" className="btn-quiet text-sm" aria-pressed={p.decision === "accepted"} onClick={() => p.onDecide("accepted")} disabled={p.stale}>Accept</button>
                <button type="button" className="btn-quiet text-sm" aria-pressed={p.decision === "corrected"} onClick={() => p.onDecide("corrected")} disabled={p.stale}>Correct with marks</button>
                <button type="button" className="btn-quiet text-sm" aria-pressed={p.decision === "rejected"} onClick={() => p.onDecide("rejected")}>Reject</button>
              </div>
            )}
            {p.decision !== "none" && <p className="text-xs">{DECISION_TEXT[p.decision]}</p>}
          </>
        )}
      </div>
    </section>
  );
}
