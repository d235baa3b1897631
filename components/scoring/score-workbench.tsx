"use client";
// The scoring screen: photo with annotation overlay, colour estimate, and the score form, sharing
// one annotation state. Used by the open score page and by the blind queue (blind hides the ghost
// layer and the previous score).
import { useCallback, useDeferredValue, useEffect, useMemo, useState } from "react";
import type { ActionState } from "@/lib/auth/action";
import { rustedAreaDetail, type Mark, type Point } from "@/lib/scoring/geometry";
import { DEFAULT_PATCH_LIGHTNESS, PATCH_LIGHTNESS_RANGE, type EstimateColourBasis, type PatchRect } from "@/lib/scoring/colour-normalise";
import type { AreaSource, ColourPatchInput } from "@/lib/validation/scores";
import { AnnotatorCanvas, type Ghost, type Tool } from "./annotator-canvas";
import { AnnotatorToolbar } from "./annotator-toolbar";
import { ColourPatchPanel, type PatchFrom } from "./colour-patch-panel";
import { EstimatePanel, type EstimateDecision } from "./estimate-panel";
import { ScoreForm, type ScoreValues } from "./score-form";
import { countSpotMarks, useAnnotation, useUndoKeys } from "./use-annotation";
import { faceKey, useRustEstimate } from "./use-rust-estimate";
import { fitView, zoomCentre, zoomPercent, type ViewBox } from "./view-box";

export type WorkbenchPhoto = { id: string; url: string | null; width: number; height: number };
type PhotoInput = { id: string; url: string | null; width: number | null; height: number | null };

/**
 * Marks are stored in original-image pixels, so the workbench needs the original size. Until the
 * photo pipeline has recorded it, the display image's own size stands in (the two then coincide).
 */
export function ScoreWorkbenchFor({ photo, ...rest }: Omit<Props, "photo"> & { photo: PhotoInput | null }) {
  const [natural, setNatural] = useState<{ w: number; h: number } | null>(null);
  const known = photo?.width && photo?.height ? { w: photo.width, h: photo.height } : natural;
  useEffect(() => {
    if (!photo?.url || (photo.width && photo.height)) return;
    const img = new Image();
    img.onload = () => setNatural({ w: img.naturalWidth, h: img.naturalHeight });
    img.src = photo.url;
  }, [photo]);
  if (photo && !known) return <p role="status" className="text-sm">Loading the photo…</p>;
  return <ScoreWorkbench {...rest} photo={photo && known ? { id: photo.id, url: photo.url, width: known.w, height: known.h } : null} />;
}

type Props = {
  action: (prev: ActionState | undefined, fd: FormData) => Promise<ActionState>;
  hidden: { trialId: string; inspectionId?: string; specimenId?: string };
  photo: WorkbenchPhoto | null;
  initialFace: Point[] | null;
  initialMarks: Mark[];
  initialScore: ScoreValues | null;
  previous: (ScoreValues & { dayNumber: number }) | null;
  ghost: (Omit<Ghost, "sx" | "sy"> & { width: number | null; height: number | null }) | null;
  readOnly: boolean;
  canvasLabel: string;
  /** The next unscored photo ("Save and next"); null when there is none, absent where not offered. */
  next?: { href: string } | null;
  /** The grey patch saved on this photo, or carried over from the specimen's previous photo. */
  initialPatch?: (PatchRect & { patchLightness: number; from: "this-photo" | "previous-photo" }) | null;
};

/** The reading a saved, normalised estimate was made from, as the form sends it again. */
function readingOf(basis: EstimateColourBasis | null | undefined): ColourPatchInput | null {
  if (!basis?.normalised) return null;
  return { ...basis.patch, patchLightness: basis.patchLightness, meanLinear: basis.meanLinear, clippedFraction: basis.clippedFraction, pixels: basis.pixels };
}

export function ScoreWorkbench(p: Props) {
  const W = p.photo?.width ?? 1;
  const H = p.photo?.height ?? 1;
  const ann = useAnnotation({ face: p.initialFace, marks: p.initialMarks });
  useUndoKeys(ann.dispatch, !p.readOnly);
  const [tool, setTool] = useState<Tool>(p.readOnly ? "pan" : p.initialFace ? "circle" : "face");
  const [brushRadius, setBrushRadius] = useState(() => Math.max(2, Math.round(Math.max(W, H) / 150)));
  const [view, setView] = useState<ViewBox>(() => fitView(W, H));
  const [showGhost, setShowGhost] = useState(true);
  const [showMask, setShowMask] = useState(true);
  const [showSpots, setShowSpots] = useState(true);
  const [maskOpacityPct, setMaskOpacityPct] = useState(70);
  const [decision, setDecision] = useState<EstimateDecision>("none");
  const [autoEstimate, setAutoEstimate] = useState<number | null>(p.initialScore?.autoEstimatePercent ?? null);
  const [areaSource, setAreaSource] = useState<AreaSource>(
    (p.initialScore?.areaSource as AreaSource | undefined) ?? (p.photo ? "marks" : "manual"),
  );
  const estimate = useRustEstimate(p.photo?.url ?? null, W, H);
  const ip = p.initialPatch;
  const [patch, setPatch] = useState<PatchRect | null>(ip ? { x: ip.x, y: ip.y, width: ip.width, height: ip.height } : null);
  const [patchFrom, setPatchFrom] = useState<PatchFrom | null>(ip?.from ?? null);
  const [lightnessText, setLightnessText] = useState(String(ip?.patchLightness ?? DEFAULT_PATCH_LIGHTNESS));
  const lightness = Number(lightnessText);
  const lightnessError = lightnessText.trim() === "" || !Number.isFinite(lightness) || lightness < PATCH_LIGHTNESS_RANGE.min || lightness > PATCH_LIGHTNESS_RANGE.max
    ? `Enter the patch's L* between ${PATCH_LIGHTNESS_RANGE.min} and ${PATCH_LIGHTNESS_RANGE.max}.` : null;
  const patchChoice = useMemo(() => (patch && !lightnessError ? { ...patch, patchLightness: lightness } : null), [patch, lightness, lightnessError]);
  // The patch reading behind the recorded estimate (kept with Accept / Correct, dropped with Reject).
  const [autoPatch, setAutoPatch] = useState<ColourPatchInput | null>(() => readingOf(p.initialScore?.autoEstimateColour));

  // The area is re-measured on every change; deferring keeps drawing responsive on big brush strokes.
  const current = useMemo(() => ({ face: ann.face, marks: ann.marks }), [ann.face, ann.marks]);
  const deferred = useDeferredValue(current);
  const areaDetail = useMemo(() => {
    if (!deferred.face || deferred.face.length < 3) return null;
    try {
      return rustedAreaDetail(deferred.face, deferred.marks);
    } catch {
      return null; // a degenerate outline (zero area) measures nothing
    }
  }, [deferred]);

  const done = estimate.state.status === "done" ? estimate.state : null;
  const stale = !!done && done.faceKey !== faceKey(ann.face, patchChoice);
  const decide = useCallback((d: EstimateDecision) => {
    setDecision(d);
    if (d === "accepted" && done) {
      setAutoEstimate(done.percent);
      setAutoPatch(done.basis.normalised ? done.patchReading : null);
      setAreaSource("estimate");
    } else if (d === "corrected" && done) {
      setAutoEstimate(done.percent);
      setAutoPatch(done.basis.normalised ? done.patchReading : null);
      setAreaSource("marks");
    } else if (d === "rejected") {
      setAutoEstimate(null);
      setAutoPatch(null);
      setShowMask(false);
      setAreaSource(ann.face ? "marks" : "manual");
    }
  }, [done, ann.face]);

  const ghost: Ghost | null = useMemo(() => {
    if (!p.ghost || !showGhost) return null;
    const sx = p.ghost.width ? W / p.ghost.width : 1;
    const sy = p.ghost.height ? H / p.ghost.height : 1;
    return { face: p.ghost.face, marks: p.ghost.marks, sx, sy };
  }, [p.ghost, showGhost, W, H]);

  const form = (
    <ScoreForm action={p.action} hidden={{ ...p.hidden, photoId: p.photo?.id }} face={ann.face} marks={ann.marks}
      marksArea={areaDetail?.percent ?? (ann.face ? 0 : null)} areaSource={areaSource} setAreaSource={setAreaSource}
      autoEstimate={autoEstimate} colourPatch={autoPatch ?? (done && !stale ? done.patchReading : null)}
      estimateNormalised={autoEstimate != null && autoPatch != null} initial={p.initialScore} initialMarkCount={countSpotMarks(p.initialMarks)} previous={p.previous} readOnly={p.readOnly} next={p.next} />
  );
  if (!p.photo) return <div className="max-w-xl">{form}</div>;

  return (
    <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_24rem]">
      <div className="space-y-3 min-w-0">
        <AnnotatorToolbar tool={tool} setTool={setTool} brushRadius={brushRadius} setBrushRadius={setBrushRadius}
          maxRadius={Math.max(10, Math.round(Math.max(W, H) / 10))} zoomPercent={zoomPercent(view, W)}
          onZoomIn={() => setView((v) => zoomCentre(v, 1.25, W, H))} onZoomOut={() => setView((v) => zoomCentre(v, 0.8, W, H))}
          onFit={() => setView(fitView(W, H))} canUndo={ann.canUndo} canRedo={ann.canRedo}
          onUndo={() => ann.dispatch({ type: "undo" })} onRedo={() => ann.dispatch({ type: "redo" })}
          onClearMarks={() => ann.dispatch({ type: "clear-marks" })} readOnly={p.readOnly} />
        <div className="h-[62vh] min-h-80">
          <AnnotatorCanvas src={p.photo.url} W={W} H={H} view={view} setView={setView} tool={tool} brushRadius={brushRadius}
            annotation={{ face: ann.face, marks: ann.marks }} dispatch={ann.dispatch} ghost={ghost}
            maskUrl={done && showMask ? done.maskUrl : null} maskOpacity={maskOpacityPct / 100} showSpots={showSpots} readOnly={p.readOnly} label={p.canvasLabel}
            patch={patch} onPatch={(r) => { setPatch(r); setPatchFrom("marked"); }} />
        </div>
        <div className="flex flex-wrap items-center gap-4 text-sm" aria-live="polite">
          <span data-testid="live-area">
            {areaDetail ? <>Marked area: <strong className="tabular-nums">{areaDetail.percent.toFixed(3)} %</strong> of the face
              <span className="muted"> (±{areaDetail.errorBoundPercent.toFixed(3)} points at most from sampling)</span></>
              : ann.face ? "The face outline has no area; redraw it." : "Outline the specimen face to measure the rusted area."}
          </span>
          <span>{countSpotMarks(ann.marks)} spot mark{countSpotMarks(ann.marks) === 1 ? "" : "s"}{ann.face ? " · face outlined" : ""}</span>
        </div>
        <fieldset className="flex flex-wrap items-center gap-x-4 gap-y-2 text-sm rounded-md border border-[var(--line)] px-3 py-2">
          <legend className="px-1 text-xs font-medium">Layers</legend>
          <label className="flex items-center gap-2">
            <input type="checkbox" checked={showSpots} onChange={(e) => setShowSpots(e.target.checked)} />
            Spot marks (orange)
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" checked={showMask} onChange={(e) => setShowMask(e.target.checked)} disabled={!done} aria-describedby={done ? undefined : "layers-mask-hint"} />
            Estimate mask (cyan)
          </label>
          <label className="flex items-center gap-2">
            Mask opacity
            <input type="range" min={10} max={100} step={5} value={maskOpacityPct} onChange={(e) => setMaskOpacityPct(Number(e.target.value))}
              disabled={!done || !showMask} aria-valuetext={`${maskOpacityPct} %`} />
            <span className="tabular-nums w-10" aria-hidden="true">{maskOpacityPct} %</span>
          </label>
          {!done && <span id="layers-mask-hint" className="text-xs muted">Run the colour estimate to get its mask.</span>}
          {p.ghost && (
            <label className="flex items-center gap-2">
              <input type="checkbox" checked={showGhost} onChange={(e) => setShowGhost(e.target.checked)} />
              My marks from the previous inspection (yellow, dashed)
            </label>
          )}
        </fieldset>
        <ColourPatchPanel patch={patch} from={patchFrom} lightnessText={lightnessText} setLightnessText={setLightnessText}
          lightnessError={lightnessError} patchError={estimate.state.status === "error" && estimate.state.field === "patch" ? estimate.state.message : null}
          marking={tool === "patch"} onMark={() => setTool("patch")} onClear={() => { setPatch(null); setPatchFrom(null); }} readOnly={p.readOnly} />
        <EstimatePanel state={estimate.state} canRun={!!ann.face && !!p.photo.url && !(patch && lightnessError)} stale={stale} decision={decision}
          onRun={() => { if (ann.face) { setDecision("none"); estimate.run(ann.face, patchChoice); } }}
          onDecide={decide} readOnly={p.readOnly} />
      </div>
      <div className="space-y-3">{form}</div>
    </div>
  );
}
