"use client";
import { useEffect, useState } from "react";
// Controlled variants of the shared form fields (components/ui/form.tsx) for forms whose fields
// depend on each other. Same markup: label, error tied by aria-describedby, hint below.

// `id` matters where several forms on one page share field names (instrument, notes…).
type Common = { name: string; label: string; id?: string; error?: string[]; hint?: React.ReactNode; warning?: string | null };

function describedBy(id: string, error?: string[], hint?: React.ReactNode, warning?: string | null) {
  return [error?.length ? `${id}-err` : null, warning ? `${id}-warn` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
}

function Messages({ id, error, hint, warning }: { id: string; error?: string[]; hint?: React.ReactNode; warning?: string | null }) {
  return (
    <>
      {hint && <p id={`${id}-hint`} className="text-xs muted">{hint}</p>}
      {warning && !error?.length && <p id={`${id}-warn`} className="text-sm text-rust-600">{warning}</p>}
      {error?.length ? <p id={`${id}-err`} className="text-sm text-rust-600" role="alert">{error.join(" ")}</p> : null}
    </>
  );
}

export function ControlledInput({ name, label, id: idIn, error, hint, warning, value, onChange, inputMode, type = "text", ...rest }: Common & {
  value: string; onChange: (v: string) => void; inputMode?: "decimal" | "text"; type?: string; placeholder?: string; autoComplete?: string;
}) {
  const id = idIn ?? `f-${name}`;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <input id={id} name={name} type={type} value={value} onChange={(e) => onChange(e.target.value)} inputMode={inputMode}
        aria-invalid={error?.length || warning ? true : undefined} aria-describedby={describedBy(id, error, hint, warning)} className="field" {...rest} />
      <Messages id={id} error={error} hint={hint} warning={warning} />
    </div>
  );
}

export function ControlledSelect({ name, label, id: idIn, error, hint, value, onChange, options }: Common & {
  value: string; onChange: (v: string) => void; options: { value: string; label: string }[];
}) {
  const id = idIn ?? `f-${name}`;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <select id={id} name={name} value={value} onChange={(e) => onChange(e.target.value)} className="field"
        aria-invalid={error?.length ? true : undefined} aria-describedby={describedBy(id, error, hint)}>
        {options.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
      </select>
      <Messages id={id} error={error} hint={hint} />
    </div>
  );
}

/** The browser's IANA zone, sent with datetime-local inputs so the server reads them as the user meant. */
export function TimeZoneInput() {
  const zone = useBrowserZone();
  return <input type="hidden" name="timeZone" value={zone} />;
}

/** The browser's zone after mount ("UTC" during server rendering, so hydration matches). */
export function useBrowserZone(): string {
  const [zone, setZone] = useState("UTC");
  useEffect(() => setZone(Intl.DateTimeFormat().resolvedOptions().timeZone || "UTC"), []);
  return zone;
}

/** A datetime-local field that starts at "now" in the browser's zone once mounted. */
export function WhenField({ name, label, id, error, defaultValue }: { name: string; label: string; id?: string; error?: string[]; defaultValue?: string }) {
  const [value, setValue] = useState(defaultValue ?? "");
  useEffect(() => {
    if (!defaultValue) setValue(nowLocal());
  }, [defaultValue]);
  const zone = useBrowserZone();
  return <ControlledInput name={name} id={id} label={label} type="datetime-local" value={value} onChange={setValue} error={error} hint={`Your local time (${zone}).`} />;
}

/** datetime-local value for "now" in the browser's zone. */
export function nowLocal(): string {
  const d = new Date();
  d.setMinutes(d.getMinutes() - d.getTimezoneOffset());
  return d.toISOString().slice(0, 16);
}

/** An uncontrolled field like components/ui/form's Field, with its own id; re-seeded with the echoed value after an error. */
export function TextField({ name, label, id, error, hint, value, multiline = false, inputMode }: {
  name: string; label: string; id: string; error?: string[]; hint?: React.ReactNode; value?: string; multiline?: boolean; inputMode?: "decimal" | "text";
}) {
  const props = {
    id, name, defaultValue: value, className: "field",
    "aria-invalid": error?.length ? true : undefined, "aria-describedby": describedBy(id, error, hint),
  };
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      {multiline ? <textarea key={value} rows={2} {...props} /> : <input key={value} type="text" inputMode={inputMode} {...props} />}
      <Messages id={id} error={error} hint={hint} />
    </div>
  );
}
