"use client";
// What a photographer can do about a recorded photo: acknowledge its capture-time warning with a
// note, move it to another inspection or specimen of the trial, or delete it (asking first, and
// saying what happens to scores and marks made on it).
import { useActionState } from "react";
import { useFormStatus } from "react-dom";
import { acknowledgeCheckAction, deletePhotoAction, movePhotoAction } from "@/app/_actions/photos";
import type { ActionState } from "@/lib/auth/action";
import { SubmitButton } from "@/components/ui/form";
import { usePhotoNotice } from "./photo-notices";

export type MoveTargets = {
  inspections: { id: string; label: string }[];
  specimens: { id: string; label: string }[];
};

type Props = {
  photo: { id: string; specimenId: string; inspectionId: string | null; warn: boolean; ackNote: string | null };
  /** Name for buttons and headings: the specimen (and file name where the viewer may see it). */
  name: string;
  targets: MoveTargets;
  /** describeDeletion's text when scores or marks were made on the photo; null when none. */
  deletionImpact: string | null;
};

function Errors({ id, state, field }: { id: string; state?: ActionState; field: string }) {
  const e = state?.errors?.[field];
  return e ? <p id={id} role="alert" className="text-sm text-rust-700 dark:text-rust-300">{e.join(" ")}</p> : null;
}

function Message({ state }: { state?: ActionState }) {
  if (!state?.message || state.ok) return null;
  return <p role="alert" className="text-sm rounded-md px-2 py-1 bg-rust-50 text-rust-800 dark:bg-rust-900/40 dark:text-rust-100">{state.message}</p>;
}

type Action = (prev: ActionState | undefined, fd: FormData) => Promise<ActionState>;

/**
 * The action, telling the page-level status line when it succeeded. Said from inside the action, not
 * from an effect: the card (or the form, keyed by the photo's place) is replaced in the same render
 * that brings the answer.
 */
function useAnnouncing(action: Action) {
  const announce = usePhotoNotice();
  return useActionState(async (prev: ActionState | undefined, fd: FormData) => {
    const r = await action(prev, fd);
    if (r.ok && r.message) announce(r.message);
    return r;
  }, undefined);
}

export function AcknowledgeForm({ photo, name }: Pick<Props, "photo" | "name">) {
  const [state, action] = useAnnouncing(acknowledgeCheckAction);
  const id = `ack-${photo.id}`;
  const err = state?.errors?.note ? `${id}-err` : undefined;
  return (
    <form action={action} className="space-y-1" aria-label={`Acknowledge the capture-time warning of ${name}`}>
      <input type="hidden" name="photoId" value={photo.id} />
      <label htmlFor={id} className="block text-xs font-medium">{photo.ackNote ? "Change the note" : "Acknowledge with a note"}</label>
      <textarea id={id} name="note" rows={2} className="field text-sm" defaultValue={state?.values?.note ?? photo.ackNote ?? ""}
        aria-describedby={[err, `${id}-hint`].filter(Boolean).join(" ")} aria-invalid={err ? true : undefined} />
      <p id={`${id}-hint`} className="text-xs muted">Why the photo is right after all (e.g. the camera clock was not set), or what was done.</p>
      <Errors id={`${id}-err`} state={state} field="note" />
      <Message state={state} />
      <SubmitButton pendingText="Saving…">{photo.ackNote ? "Save note" : "Acknowledge"}</SubmitButton>
    </form>
  );
}

function MoveForm({ photo, name, targets }: Pick<Props, "photo" | "name" | "targets">) {
  const [state, action] = useAnnouncing(movePhotoAction);
  const id = `move-${photo.id}`;
  return (
    <form action={action} className="space-y-2" aria-label={`Move ${name}`}>
      <input type="hidden" name="photoId" value={photo.id} />
      <div>
        <label htmlFor={`${id}-insp`} className="block text-xs font-medium">Inspection</label>
        <select id={`${id}-insp`} name="inspectionId" className="field py-1 text-sm" defaultValue={state?.values?.inspectionId ?? photo.inspectionId ?? ""}
          aria-describedby={state?.errors?.inspectionId ? `${id}-insp-err` : undefined}>
          {targets.inspections.map((i) => <option key={i.id} value={i.id}>{i.label}</option>)}
        </select>
        <Errors id={`${id}-insp-err`} state={state} field="inspectionId" />
      </div>
      <div>
        <label htmlFor={`${id}-spec`} className="block text-xs font-medium">Specimen</label>
        <select id={`${id}-spec`} name="specimenId" className="field py-1 text-sm" defaultValue={state?.values?.specimenId ?? photo.specimenId}
          aria-describedby={state?.errors?.specimenId ? `${id}-spec-err` : undefined}>
          {targets.specimens.map((s) => <option key={s.id} value={s.id}>{s.label}</option>)}
        </select>
        <Errors id={`${id}-spec-err`} state={state} field="specimenId" />
      </div>
      <Message state={state} />
      <SubmitButton pendingText="Moving…">Move photo</SubmitButton>
    </form>
  );
}

function DeleteForm({ photo, name, deletionImpact }: Pick<Props, "photo" | "name" | "deletionImpact">) {
  const [state, action] = useAnnouncing(deletePhotoAction);
  const id = `del-${photo.id}`;
  return (
    <form action={action} className="space-y-2" aria-label={`Delete ${name}`}>
      <input type="hidden" name="photoId" value={photo.id} />
      <p className="text-xs" id={`${id}-what`}>
        The photo and its previews are removed from storage; the deletion is kept in the audit trail.
        {deletionImpact ? ` ${deletionImpact}` : " No score or mark was made on it."}
      </p>
      {deletionImpact && (
        <label className="flex items-start gap-2 text-xs">
          <input type="checkbox" name="confirmScores" className="mt-0.5" aria-describedby={`${id}-what`} />
          <span>I understand what happens to the scores and marks made on this photo</span>
        </label>
      )}
      <Errors id={`${id}-err`} state={state} field="confirmScores" />
      <Message state={state} />
      <DeleteButton />
    </form>
  );
}

function DeleteButton() {
  const { pending } = useFormStatus();
  return <button type="submit" className="btn-quiet text-rust-700 dark:text-rust-300" disabled={pending} aria-busy={pending}>{pending ? "Deleting…" : "Delete photo"}</button>;
}

export function PhotoActions(p: Props) {
  return (
    <div className="space-y-2">
      {/* Keyed by what they show: after a save the forms start again from the photo's new state
          (React resets a form after its action, which would otherwise bring back the old choices). */}
      {p.photo.warn && <AcknowledgeForm key={p.photo.ackNote ?? ""} photo={p.photo} name={p.name} />}
      <details className="text-sm">
        <summary className="cursor-pointer">Move or delete</summary>
        <div className="space-y-3 pt-2">
          <MoveForm key={`${p.photo.inspectionId}|${p.photo.specimenId}`} photo={p.photo} name={p.name} targets={p.targets} />
          <hr className="border-[var(--line)]" />
          <DeleteForm photo={p.photo} name={p.name} deletionImpact={p.deletionImpact} />
        </div>
      </details>
    </div>
  );
}
