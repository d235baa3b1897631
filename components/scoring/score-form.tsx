"use client";
// The score for one specimen at one inspection. Spot count and area follow the marks until the
// scorer types over them; the grades are computed as they go; marks travel as hidden JSON fields so
// the server saves marks and score in one transaction.
import { useRouter } from "next/navigation";
import { startTransition, useActionState, useEffect, useRef, useState } from "react";
import type { ActionState } from "@/lib/auth/action";
import type { Mark, Point } from "@/lib/scoring/geometry";
import { ASTM_DISTRIBUTION, ISO_RULE_TEXT, astmD610Grade, formatAstm, formatIso, isoRustDegree, type AstmDistributionLetter } from "@/lib/scoring/grades";
import type { EstimateColourBasis } from "@/lib/scoring/colour-normalise";
import type { AreaSource, ColourPatchInput } from "@/lib/validation/scores";
import { FormMessage } from "@/components/ui/form";
import { countSpotMarks } from "./use-annotation";

export type ScoreValues = {
  spotCount: number;
  areaPercent: number;
  astmLetter: string | null;
  weeping: boolean;
  silicateChange: "none" | "slight" | "marked";
  notes: string;
  noChange?: boolean;
  autoEstimatePercent?: number | null;
  /** How the recorded colour estimate was read: through a grey patch or not. */
  autoEstimateColour?: EstimateColourBasis | null;
  areaSource?: string | null;
};

type Props = {
  action: (prev: ActionState | undefined, fd: FormData) => Promise<ActionState>;
  hidden: { trialId: string; inspectionId?: string; specimenId?: string; photoId?: string };
  face: Point[] | null;
  marks: Mark[];
  marksArea: number | null;
  areaSource: AreaSource;
  setAreaSource: (s: AreaSource) => void;
  autoEstimate: number | null;
  /** The grey patch reading to save on the photo (null: none), and whether the recorded estimate used it. */
  colourPatch: ColourPatchInput | null;
  estimateNormalised: boolean;
  initial: ScoreValues | null;
  initialMarkCount: number;
  previous: (ScoreValues & { dayNumber: number }) | null;
  readOnly: boolean;
  /** The next photo of the inspection the scorer has not scored yet (save and go there); null when none. */
  next?: { href: string } | null;
};

/** Keyboard shortcut for "Save and next", documented beside the button. */
export const SAVE_AND_NEXT_KEYS = "Control+Enter Meta+Enter";

const round3 = (x: number) => Math.round(x * 1000) / 1000;

function Err({ state, name }: { state?: ActionState; name: string }) {
  const e = state?.errors?.[name];
  return e ? <p id={`sf-${name}-err`} role="alert" className="text-sm text-rust-600">{e.join(" ")}</p> : null;
}

export function ScoreForm(p: Props) {
  const [state, formAction, pending] = useActionState(p.action, undefined);
  const router = useRouter();
  const formRef = useRef<HTMLFormElement>(null);
  const nextRef = useRef<HTMLButtonElement>(null);
  // Set when the scorer chose "Save and next"; the move happens only once the save succeeded.
  const goNext = useRef<string | null>(null);
  useEffect(() => {
    const href = goNext.current;
    goNext.current = null;
    if (href && state?.ok) router.push(href);
  }, [state, router]);
  const nextHref = !p.readOnly ? p.next?.href ?? null : null;
  useEffect(() => {
    if (!nextHref) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key === "Enter" && (e.ctrlKey || e.metaKey) && !e.altKey && !e.shiftKey && nextRef.current && !nextRef.current.disabled) {
        e.preventDefault();
        formRef.current?.requestSubmit(nextRef.current);
      }
    };
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [nextHref]);
  // Submitting through a transition (not <form action>) keeps React from resetting the form after the
  // action: a reset would put radios, checkboxes and selects back to their first-render values while
  // the state (and the saved score) say otherwise.
  const onSubmit = (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const submitter = (e.nativeEvent as SubmitEvent).submitter as HTMLButtonElement | null;
    goNext.current = submitter?.value === "next" ? nextHref : null;
    const fd = new FormData(e.currentTarget);
    startTransition(() => formAction(fd));
  };
  const markCount = countSpotMarks(p.marks);
  const [spotText, setSpotText] = useState<string | null>(p.initial && p.initial.spotCount !== p.initialMarkCount ? String(p.initial.spotCount) : null);
  const [areaText, setAreaText] = useState(p.initial ? String(p.initial.areaPercent) : "0");
  const [letter, setLetter] = useState(p.initial?.astmLetter ?? "");
  const [weeping, setWeeping] = useState(p.initial?.weeping ?? false);
  const [silicate, setSilicate] = useState<ScoreValues["silicateChange"]>(p.initial?.silicateChange ?? "none");
  const [notes, setNotes] = useState(p.initial?.notes ?? "");
  const [noChange, setNoChange] = useState(p.initial?.noChange ?? false);

  // Read-only (an observer, or a concluded trial): the saved values as they are.
  const frozen = p.readOnly && p.initial ? p.initial : null;
  const spotValue = frozen ? String(frozen.spotCount) : spotText ?? String(markCount);
  const areaValue = frozen ? String(frozen.areaPercent)
    : p.areaSource === "marks" ? (p.marksArea == null ? "0" : String(round3(p.marksArea)))
      : p.areaSource === "estimate" ? String(p.autoEstimate ?? 0)
        : areaText;
  const area = Number(areaValue);
  const areaOk = areaValue.trim() !== "" && Number.isFinite(area) && area >= 0 && area <= 100;
  const grade = areaOk ? astmD610Grade(area) : null;
  const iso = areaOk ? isoRustDegree(area) : null;
  const astmText = grade == null ? "—" : area === 0 ? "10 (no rust)" : letter ? formatAstm(grade, letter as AstmDistributionLetter) : `${grade}-? (choose a distribution)`;

  const applyPrevious = (on: boolean) => {
    setNoChange(on);
    if (!on || !p.previous) return;
    setSpotText(String(p.previous.spotCount));
    setAreaText(String(p.previous.areaPercent));
    p.setAreaSource("previous");
    setLetter(p.previous.astmLetter ?? "");
    setWeeping(p.previous.weeping);
    setSilicate(p.previous.silicateChange);
  };

  const sourceText: Record<AreaSource, string> = {
    marks: p.face ? "from your marks within the face outline" : "from marks (outline the face to measure)",
    estimate: "the accepted colour estimate",
    manual: "typed in",
    previous: "copied from the previous inspection",
  };
  const describe = (name: string) => (state?.errors?.[name] ? `sf-${name}-err` : undefined);
  const ro = p.readOnly;

  return (
    <form ref={formRef} action={formAction} onSubmit={onSubmit} className="space-y-4" noValidate aria-label="Score">
      {Object.entries(p.hidden).map(([k, v]) => (v ? <input key={k} type="hidden" name={k} value={v} /> : null))}
      {p.hidden.photoId && <input type="hidden" name="face" value={p.face ? JSON.stringify(p.face) : ""} />}
      {p.hidden.photoId && <input type="hidden" name="marks" value={JSON.stringify(p.marks)} />}
      <input type="hidden" name="areaSource" value={p.areaSource} />
      <input type="hidden" name="autoEstimatePercent" value={p.autoEstimate ?? ""} />
      {p.hidden.photoId && <input type="hidden" name="colourPatch" value={p.colourPatch ? JSON.stringify(p.colourPatch) : ""} />}
      <input type="hidden" name="estimateNormalised" value={p.estimateNormalised ? "1" : ""} />

      {p.previous && !ro && (
        <label className="flex items-start gap-2 text-sm">
          <input type="checkbox" name="noChange" checked={noChange} onChange={(e) => applyPrevious(e.target.checked)} className="mt-1" />
          <span>No change since the last inspection (day {p.previous.dayNumber}) — fills in that score; adjust anything that did change.</span>
        </label>
      )}
      {(!p.previous || ro) && noChange && <input type="hidden" name="noChange" value="on" />}

      <div className="grid grid-cols-2 gap-3">
        <div className="space-y-1">
          <label htmlFor="sf-spotCount" className="block text-sm font-medium">Rust spots</label>
          <input id="sf-spotCount" name="spotCount" type="number" min={0} step={1} inputMode="numeric" className="field" readOnly={ro}
            value={spotValue} onChange={(e) => setSpotText(e.target.value)} aria-invalid={!!state?.errors?.spotCount || undefined}
            aria-describedby={[describe("spotCount"), "sf-spotCount-hint"].filter(Boolean).join(" ")} />
          <p id="sf-spotCount-hint" className="text-xs muted">
            {frozen ? "as saved" : `${markCount} spot mark${markCount === 1 ? "" : "s"}`}
            {spotText != null && Number(spotText) !== markCount && !ro && (
              <> · count typed in · <button type="button" className="link underline" onClick={() => setSpotText(null)}>use the marks</button></>
            )}
          </p>
          <Err state={state} name="spotCount" />
        </div>
        <div className="space-y-1">
          <label htmlFor="sf-areaPercent" className="block text-sm font-medium">Rusted area (% of face)</label>
          <input id="sf-areaPercent" name="areaPercent" type="number" min={0} max={100} step="any" inputMode="decimal" className="field" readOnly={ro}
            value={areaValue} onChange={(e) => { setAreaText(e.target.value); p.setAreaSource("manual"); }}
            aria-invalid={!!state?.errors?.areaPercent || !areaOk || undefined}
            aria-describedby={[describe("areaPercent"), "sf-areaPercent-hint"].filter(Boolean).join(" ")} />
          <p id="sf-areaPercent-hint" className="text-xs muted">
            {frozen ? "as saved" : sourceText[p.areaSource]}
            {p.areaSource !== "marks" && p.face && !ro && (
              <> · <button type="button" className="link underline" onClick={() => p.setAreaSource("marks")}>use the marks</button></>
            )}
          </p>
          <Err state={state} name="areaPercent" />
        </div>
      </div>

      <fieldset className="space-y-1" aria-describedby={describe("astmLetter")}>
        <legend className="text-sm font-medium">Rust distribution (ASTM D610 letter)</legend>
        <div className="flex flex-wrap gap-3">
          {(Object.keys(ASTM_DISTRIBUTION) as AstmDistributionLetter[]).map((l) => (
            <label key={l} className="flex items-center gap-1 text-sm">
              <input type="radio" name="astmLetter" value={l} checked={letter === l} onChange={() => setLetter(l)} disabled={ro} />
              {l} — {ASTM_DISTRIBUTION[l]}
            </label>
          ))}
        </div>
        <Err state={state} name="astmLetter" />
      </fieldset>

      <div className="rounded-md bg-iron-100/60 dark:bg-iron-800/60 p-3 space-y-2">
      <dl className="grid grid-cols-2 gap-3">
        <div>
          <dt className="text-xs muted">ASTM D610 grade</dt>
          <dd className="text-lg font-semibold tabular-nums" data-testid="astm-preview">{astmText}</dd>
        </div>
        <div>
          <dt className="text-xs muted">ISO 4628-3 degree</dt>
          <dd className="text-lg font-semibold tabular-nums" data-testid="iso-preview">{iso == null ? "—" : formatIso(iso)}</dd>
        </div>
      </dl>
      <details className="text-xs">
        <summary className="cursor-pointer">How the ISO degree is assigned between the standard&apos;s values</summary>
        <p className="mt-1">{ISO_RULE_TEXT}</p>
      </details>
      </div>

      <div className="grid grid-cols-2 gap-3">
        <label className="flex items-start gap-2 text-sm">
          <input type="checkbox" name="weeping" checked={weeping} onChange={(e) => setWeeping(e.target.checked)} disabled={ro} className="mt-1" />
          <span>Weeping droplets (at the metal/silicate boundary or on the face)</span>
        </label>
        <div className="space-y-1">
          <label htmlFor="sf-silicateChange" className="block text-sm font-medium">Silicate discoloration</label>
          <select id="sf-silicateChange" name="silicateChange" className="field" value={silicate} disabled={ro}
            onChange={(e) => setSilicate(e.target.value as ScoreValues["silicateChange"])} aria-describedby={describe("silicateChange")}>
            <option value="none">None</option>
            <option value="slight">Slight</option>
            <option value="marked">Marked</option>
          </select>
          <Err state={state} name="silicateChange" />
        </div>
      </div>

      <div className="space-y-1">
        <label htmlFor="sf-notes" className="block text-sm font-medium">Notes</label>
        <textarea id="sf-notes" name="notes" rows={3} className="field" value={notes} readOnly={ro} onChange={(e) => setNotes(e.target.value)} aria-describedby={describe("notes")} />
        <Err state={state} name="notes" />
      </div>

      {["face", "marks", "colourPatch", "photoId", "inspectionId", "specimenId", "trialId"].map((n) => <Err key={n} state={state} name={n} />)}
      <FormMessage state={state} />
      {!ro && (
        <div className="space-y-1">
          <div className="flex flex-wrap gap-2">
            <button type="submit" name="intent" value="save" className={nextHref ? "btn-quiet" : "btn"} disabled={pending} aria-busy={pending}>{pending ? "Saving score…" : "Save score"}</button>
            {nextHref && (
              <button ref={nextRef} type="submit" name="intent" value="next" className="btn" disabled={pending}
                aria-keyshortcuts={SAVE_AND_NEXT_KEYS} aria-describedby="sf-next-hint">Save and next</button>
            )}
          </div>
          <p id="sf-next-hint" className="text-xs muted">
            {nextHref ? "Save and next opens the next photo of this inspection you have not scored. Shortcut: Ctrl+Enter (⌘+Enter on a Mac)."
              : p.next === null ? "Every other photo of this inspection has your score." : ""}
          </p>
        </div>
      )}
    </form>
  );
}
