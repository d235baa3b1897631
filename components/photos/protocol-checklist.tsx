"use client";
import { useProtocolTicks } from "./protocol-ticks";

/** The trial's photo protocol as a tick list for the person at the bench; the ticks go with each upload. */
export function ProtocolChecklist({ steps }: { steps: string[] }) {
  const ticks = useProtocolTicks();
  const done = ticks?.done ?? steps.map(() => false);
  const count = done.filter(Boolean).length;
  return (
    <fieldset className="space-y-2">
      <legend className="font-semibold">Photo protocol</legend>
      <p className="text-xs muted">From the trial design. Taking every photo of a series the same way is common practice, so that a change on the photo is a change on the specimen, not in the light. Tick what you followed: the ticks are recorded with each photo uploaded while they are set, and can be corrected later on the photo&apos;s card (“Protocol and scale”). Photos without every point are flagged in scoring, the grid and the report.</p>
      <ul className="space-y-1">
        {steps.map((s, i) => (
          <li key={i}>
            <label className="flex gap-2 items-start text-sm">
              <input type="checkbox" className="mt-1" checked={done[i] ?? false} onChange={(e) => ticks?.set(i, e.target.checked)} />
              <span>{s}</span>
            </label>
          </li>
        ))}
      </ul>
      <p className="text-xs muted" aria-live="polite">{count} of {steps.length} checked</p>
    </fieldset>
  );
}
