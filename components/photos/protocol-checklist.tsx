"use client";
import { useState } from "react";

/** The trial's photo protocol as a tick list for the person at the bench; ticks are not saved. */
export function ProtocolChecklist({ steps }: { steps: string[] }) {
  const [done, setDone] = useState<boolean[]>(() => steps.map(() => false));
  const count = done.filter(Boolean).length;
  return (
    <fieldset className="space-y-2">
      <legend className="font-semibold">Photo protocol</legend>
      <p className="text-xs muted">From the trial design. Taking every photo of a series the same way is common practice, so that a change on the photo is a change on the specimen, not in the light. Tick as you go; the ticks are not recorded.</p>
      <ul className="space-y-1">
        {steps.map((s, i) => (
          <li key={i}>
            <label className="flex gap-2 items-start text-sm">
              <input type="checkbox" className="mt-1" checked={done[i]} onChange={(e) => setDone((d) => d.map((v, j) => (j === i ? e.target.checked : v)))} />
              <span>{s}</span>
            </label>
          </li>
        ))}
      </ul>
      <p className="text-xs muted" aria-live="polite">{count} of {steps.length} checked</p>
    </fieldset>
  );
}
