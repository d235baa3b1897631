"use client";
// The photo protocol as a checklist of editable lines.
import { useState } from "react";
import { DEFAULT_PHOTO_PROTOCOL } from "@/lib/validation/trials";

export function ProtocolLines({ initial, error, disabled }: { initial?: string[]; error?: string[]; disabled?: boolean }) {
  const [lines, setLines] = useState<string[]>(initial && initial.length ? initial : DEFAULT_PHOTO_PROTOCOL);
  const set = (i: number, v: string) => setLines((l) => l.map((x, j) => (j === i ? v : x)));
  return (
    <fieldset className="space-y-2" disabled={disabled} aria-describedby={error ? "protocol-err" : "protocol-hint"}>
      <legend className="text-sm font-medium">Photo protocol checklist</legend>
      <p id="protocol-hint" className="text-xs muted">The defaults are common practice for comparable corrosion photos; edit them to your set-up. Photographers see this list at every inspection.</p>
      <ol className="space-y-2">
        {lines.map((line, i) => (
          <li key={i} className="flex gap-2 items-center">
            <label className="sr-only" htmlFor={`protocol-${i}`}>Protocol line {i + 1}</label>
            <input id={`protocol-${i}`} className="field" name="photoProtocol[]" value={line} onChange={(e) => set(i, e.target.value)} />
            <button type="button" className="btn-quiet" onClick={() => setLines((l) => l.filter((_, j) => j !== i))} aria-label={`Remove line ${i + 1}`}>Remove</button>
          </li>
        ))}
      </ol>
      <div className="flex gap-2">
        <button type="button" className="btn-quiet" onClick={() => setLines((l) => [...l, ""])}>Add a line</button>
        <button type="button" className="btn-quiet" onClick={() => setLines(DEFAULT_PHOTO_PROTOCOL)}>Reset to the defaults</button>
      </div>
      {error && <p id="protocol-err" role="alert" className="text-sm text-rust-600">{error.join(" ")}</p>}
    </fieldset>
  );
}
