"use client";
// Record with a photo which protocol points were followed and its scale: two points on the scale bar
// (pixel coordinates on the original photo) a known length apart, or px per mm typed in; optionally for
// the whole series when the framing is fixed. Errors are tied to their fields; nothing saves half-way.
// Submitted from onSubmit, not as a form action: React resets a form after its action, and that reset
// turns a controlled radio back to the mode it first rendered with (react/react#31695).
import { startTransition, useActionState, useState } from "react";
import { savePhotoEvidenceAction } from "@/app/_actions/photo-evidence";
import type { ActionState } from "@/lib/auth/action";
import { SCALE_MODES } from "@/lib/validation/photo-evidence";
import { ScalePointPicker } from "./scale-point-picker";

type Props = {
  photoId: string;
  name: string;
  protocol: string[];
  confirmed: string[];
  hasOwnScale: boolean;
  /** The photo's display copy and original size, to click the bar's ends on it. */
  picker?: { src: string; width: number; height: number } | null;
};

function FieldError({ id, state, field }: { id: string; state?: ActionState; field: string }) {
  const e = state?.errors?.[field];
  return e ? <p id={id} role="alert" className="text-sm text-rust-700 dark:text-rust-300">{e.join(" ")}</p> : null;
}

function NumberInput({ id, name, label, state, defaultValue }: { id: string; name: string; label: string; state?: ActionState; defaultValue?: string }) {
  const errField = name === "lengthMm" || name === "pxPerMm" ? name : "points";
  const err = state?.errors?.[errField];
  const value = state?.values?.[name] ?? defaultValue;
  return (
    <div>
      <label htmlFor={`${id}-${name}`} className="block text-xs font-medium">{label}</label>
      <input id={`${id}-${name}`} name={name} inputMode="decimal" className="field py-1 text-sm w-24" defaultValue={value} key={value}
        aria-invalid={err ? true : undefined} aria-describedby={err ? `${id}-${errField}-err` : undefined} />
    </div>
  );
}

export function PhotoEvidenceForm({ photoId, name, protocol, confirmed, hasOwnScale, picker }: Props) {
  const [state, action, pending] = useActionState(savePhotoEvidenceAction, undefined);
  const [mode, setMode] = useState<keyof typeof SCALE_MODES>((state?.values?.scaleMode as keyof typeof SCALE_MODES) ?? (hasOwnScale ? "keep" : "none"));
  const id = `ev-${photoId}`;
  const ticked = state?.values ? (state.values["protocol[]"] ?? "").split("\n") : confirmed;
  return (
    <form className="space-y-2" aria-label={`Protocol and scale of ${name}`}
      onSubmit={(e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        startTransition(() => action(fd));
      }}>
      <input type="hidden" name="photoId" value={photoId} />
      {protocol.length > 0 && (
        <fieldset className="space-y-1" aria-describedby={state?.errors?.["protocol[]"] ? `${id}-protocol-err` : undefined}>
          <legend className="text-xs font-medium">Protocol points followed for this photo</legend>
          {protocol.map((line, i) => (
            <label key={i} className="flex gap-2 items-start text-xs">
              <input type="checkbox" name="protocol[]" value={line} defaultChecked={ticked.includes(line)} key={String(ticked.includes(line))} className="mt-0.5" />
              <span>{line}</span>
            </label>
          ))}
          <FieldError id={`${id}-protocol-err`} state={state} field="protocol[]" />
        </fieldset>
      )}
      <fieldset className="space-y-1">
        <legend className="text-xs font-medium">Scale</legend>
        {(Object.keys(SCALE_MODES) as (keyof typeof SCALE_MODES)[]).filter((m) => m !== "keep" || hasOwnScale).map((m) => (
          <label key={m} className="flex gap-2 items-center text-xs">
            <input type="radio" name="scaleMode" value={m} checked={mode === m} onChange={() => setMode(m)} />{SCALE_MODES[m]}
          </label>
        ))}
      </fieldset>
      {mode === "points" && (
        <div className="space-y-1">
          <p className="text-xs muted">Pixel coordinates of the two ends on the original photo (x to the right, y down from the top-left corner).</p>
          <div className="flex flex-wrap gap-2">
            <NumberInput id={id} name="x1" label="End 1 x (px)" state={state} />
            <NumberInput id={id} name="y1" label="End 1 y (px)" state={state} />
            <NumberInput id={id} name="x2" label="End 2 x (px)" state={state} />
            <NumberInput id={id} name="y2" label="End 2 y (px)" state={state} />
            <NumberInput id={id} name="lengthMm" label="Length between (mm)" state={state} defaultValue="10" />
          </div>
          {picker && <ScalePointPicker fieldId={id} src={picker.src} width={picker.width} height={picker.height} />}
          <FieldError id={`${id}-points-err`} state={state} field="points" />
          <FieldError id={`${id}-lengthMm-err`} state={state} field="lengthMm" />
        </div>
      )}
      {mode === "typed" && (
        <div>
          <NumberInput id={id} name="pxPerMm" label="Pixels per millimetre" state={state} />
          <FieldError id={`${id}-pxPerMm-err`} state={state} field="pxPerMm" />
        </div>
      )}
      {(mode === "points" || mode === "typed") && (
        <label className="flex gap-2 items-start text-xs">
          <input type="checkbox" name="forSeries" defaultChecked={state?.values?.forSeries === "on"} key={state?.values?.forSeries ?? "off"} className="mt-0.5" aria-describedby={state?.errors?.forSeries ? `${id}-series-err` : undefined} />
          <span>Framing is fixed: use this scale for every photo of this specimen in this trial (a photo's own scale still wins)</span>
        </label>
      )}
      <FieldError id={`${id}-series-err`} state={state} field="forSeries" />
      {state?.message && <p role={state.ok ? "status" : "alert"} className={`text-sm ${state.ok ? "" : "text-rust-700 dark:text-rust-300"}`}>{state.message}</p>}
      <FieldError id={`${id}-mode-err`} state={state} field="scaleMode" />
      <button type="submit" className="btn" disabled={pending} aria-busy={pending}>{pending ? "Saving…" : "Save protocol and scale"}</button>
    </form>
  );
}
