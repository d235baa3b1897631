"use client";
// The automatic colour estimate: run it, see the mask and the percent, then accept, correct or reject.
import type { EstimateColourBasis } from "@/lib/scoring/colour-normalise";
import { DARK_RUST_THRESHOLDS as D, PALE_DROPLET_THRESHOLDS as P, RUST_COLOUR_THRESHOLDS as T } from "@/lib/scoring/rust-estimate";
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
        Counts face pixels whose colour reads as rust (CIELAB, D65): rust at hue {T.hueMinDeg}°–{T.hueMaxDeg}°, chroma above {T.chromaMin},
        L* {T.lightnessMin}–{T.lightnessMax}; dark rust at the same hues, chroma above {D.chromaMin}, L* {D.lightnessMin}–{D.lightnessMax};
        pale weeping droplets at hue {P.hueMinDeg}°–{P.hueMaxDeg}°, chroma above {P.chromaMin}, L* {P.lightnessMin}–{P.lightnessMax}.
        These thresholds are Rustline&apos;s own choice; no published source sets them. They were checked only on the demo
        generator&apos;s synthetic faces, not on real cameras, mixed lighting or real patina. Weathered yellow-brown silicate may be
        counted, so the estimate is a suggestion to accept, correct with marks, or reject.
      </p>
      {!p.readOnly && (
        <button type="button" className="btn-quiet text-sm" onClick={p.onRun} disabled={!p.canRun || p.state.status === "running"}>
          {done ? "Run the estimate again" : "Run the colour estimate"}
        </button>
      )}
      {!p.canRun && !p.readOnly && <p className="text-xs muted">Outline the face first: the estimate looks only inside it.</p>}
      <div aria-live="polite" className="text-sm space-y-2">
        {p.state.status === "running" && <p role="status"><progress className="align-middle mr-2" aria-label="Estimating" /> {p.state.stage}</p>}
        {p.state.status === "error" && (p.state.field === "patch"
          // The reason is shown once, at the grey patch panel.
          ? <p>The estimate did not run: the grey patch cannot be used (see Grey patch).</p>
          : <p role="alert" className="text-rust-600">{p.state.message}</p>)}
        {done && (
          <>
            <p>
              Estimated rust-coloured area: <strong className="tabular-nums" data-testid="estimate-percent">{done.percent.toFixed(3)} %</strong> of the face
              {p.stale && <span className="text-rust-600"> — the face changed since; run it again.</span>}
            </p>
            <p className="text-xs" data-testid="estimate-classes">
              Rust {done.classPercent[0].toFixed(3)} % (cyan) · dark rust {done.classPercent[1].toFixed(3)} % (blue) · pale droplets {done.classPercent[2].toFixed(3)} % (magenta).
            </p>
            <p className="text-xs" data-testid="estimate-normalised"><BasisText basis={done.basis} /></p>
            <p className="text-xs muted">The mask and its opacity are under Layers, beside the spot marks.</p>
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

/** Whether the estimate was read through the grey patch, in a sentence. */
export function BasisText({ basis }: { basis: EstimateColourBasis }) {
  if (!basis.normalised) return <>Not normalised: no grey patch was marked, so the colours are read as the camera recorded them.</>;
  const [r, g, b] = basis.gains.map((x) => x.toFixed(2));
  return <>White balance and exposure normalised from the grey patch (L* {basis.patchLightness}): gains in linear light red ×{r}, green ×{g}, blue ×{b}.</>;
}
