"use client";
// The colour card's grey patch: mark it (a rectangle on the photo), say its known lightness, and see
// why it cannot be used. The colour estimate then reads the face through the patch's white balance
// and exposure.
import type { PatchRect } from "@/lib/scoring/colour-normalise";
import { PATCH_LIGHTNESS_RANGE, PATCH_LIMITS } from "@/lib/scoring/colour-normalise";

export type PatchFrom = "this-photo" | "previous-photo" | "marked";

type Props = {
  patch: PatchRect | null;
  from: PatchFrom | null;
  lightnessText: string;
  setLightnessText: (v: string) => void;
  lightnessError: string | null;
  /** Why the patch cannot be used (from reading it, or from the server); null when fine or not read yet. */
  patchError: string | null;
  marking: boolean;
  onMark: () => void;
  onClear: () => void;
  readOnly: boolean;
};

const FROM_TEXT: Record<PatchFrom, string> = {
  "this-photo": "Marked on this photo.",
  "previous-photo": "Placed where it was on this specimen's previous photo: check that it sits inside the grey patch, or drag a new one.",
  marked: "Marked; run the estimate to read it.",
};

export function ColourPatchPanel(p: Props) {
  const describedBy = ["cp-hint", p.patchError ? "cp-patch-err" : null].filter(Boolean).join(" ");
  return (
    <section className="panel p-3 space-y-2" aria-labelledby="patch-h">
      <h2 id="patch-h" className="font-semibold">Grey patch (white balance)</h2>
      <p id="cp-hint" className="text-xs muted">
        Drag a rectangle inside the colour card&apos;s neutral grey patch (tool <kbd>G</kbd>). The estimate then evens out the light&apos;s
        colour and the exposure so that the patch reads neutral at its lightness. A patch with more than{" "}
        {PATCH_LIMITS.clippedFractionMax * 100} % of pixels at 0 or 255, or with chroma above {PATCH_LIMITS.chromaMax}, is refused.
      </p>
      <p className="text-sm" data-testid="patch-status" aria-describedby={describedBy}>
        {p.patch ? <>{FROM_TEXT[p.from ?? "marked"]} <span className="muted tabular-nums">({p.patch.width} × {p.patch.height} px at {p.patch.x}, {p.patch.y})</span></>
          : "No grey patch: the estimate reads the colours as the camera recorded them."}
      </p>
      {p.patchError && <p id="cp-patch-err" role="alert" className="text-sm text-rust-600">{p.patchError}</p>}
      {!p.readOnly && (
        <div className="flex flex-wrap items-end gap-3">
          <button type="button" className="btn-quiet text-sm" aria-pressed={p.marking} onClick={p.onMark}>
            {p.patch ? "Mark it again" : "Mark the grey patch"}
          </button>
          {p.patch && <button type="button" className="btn-quiet text-sm" onClick={p.onClear}>Do without a patch</button>}
          <div className="space-y-1">
            <label htmlFor="cp-lightness" className="block text-xs font-medium">Patch lightness L* (from the card maker)</label>
            <input id="cp-lightness" type="number" min={PATCH_LIGHTNESS_RANGE.min} max={PATCH_LIGHTNESS_RANGE.max} step="any" inputMode="decimal" className="field w-24" value={p.lightnessText}
              onChange={(e) => p.setLightnessText(e.target.value)} aria-invalid={!!p.lightnessError || undefined}
              aria-describedby={p.lightnessError ? "cp-lightness-err" : undefined} />
            {p.lightnessError && <p id="cp-lightness-err" role="alert" className="text-xs text-rust-600">{p.lightnessError}</p>}
          </div>
        </div>
      )}
    </section>
  );
}
