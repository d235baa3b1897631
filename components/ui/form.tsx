"use client";
import { useFormStatus } from "react-dom";
import type { ActionState } from "@/lib/auth/action";

type FieldProps = {
  name: string;
  label: string;
  state?: ActionState;
  type?: string;
  defaultValue?: string | number | null;
  hint?: string;
  required?: boolean;
  autoComplete?: string;
  step?: string;
  min?: string | number;
  max?: string | number;
  placeholder?: string;
  /** Prefix of the element ids (default "f"), for two forms on one page with a field of the same name. */
  idPrefix?: string;
};

/** A labelled input whose error is tied to it with aria-describedby; keeps what the user typed. */
export function Field({ name, label, state, type = "text", defaultValue, hint, idPrefix = "f", ...rest }: FieldProps) {
  const err = state?.errors?.[name];
  const id = `${idPrefix}-${name}`;
  const value = state?.values?.[name] ?? (defaultValue == null ? undefined : String(defaultValue));
  const described = [err ? `${id}-err` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <input id={id} name={name} type={type} defaultValue={type === "password" ? undefined : value} key={value}
        aria-invalid={err ? true : undefined} aria-describedby={described} className="field" {...rest} />
      {hint && <p id={`${id}-hint`} className="text-xs muted">{hint}</p>}
      {err && <p id={`${id}-err`} className="text-sm text-rust-600" role="alert">{err.join(" ")}</p>}
    </div>
  );
}

type SelectProps = { name: string; label: string; state?: ActionState; options: { value: string; label: string }[]; defaultValue?: string | null; hint?: string; idPrefix?: string };

export function SelectField({ name, label, state, options, defaultValue, hint, idPrefix = "f" }: SelectProps) {
  const err = state?.errors?.[name];
  const id = `${idPrefix}-${name}`;
  const value = state?.values?.[name] ?? defaultValue ?? undefined;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <select id={id} name={name} defaultValue={value} key={value} className="field" aria-invalid={err ? true : undefined}
        aria-describedby={err ? `${id}-err` : hint ? `${id}-hint` : undefined}>
        {options.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
      </select>
      {hint && <p id={`${id}-hint`} className="text-xs muted">{hint}</p>}
      {err && <p id={`${id}-err`} className="text-sm text-rust-600" role="alert">{err.join(" ")}</p>}
    </div>
  );
}

export function TextArea({ name, label, state, defaultValue, rows = 3, hint }: { name: string; label: string; state?: ActionState; defaultValue?: string | null; rows?: number; hint?: string }) {
  const err = state?.errors?.[name];
  const id = `f-${name}`;
  const value = state?.values?.[name] ?? defaultValue ?? undefined;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <textarea id={id} name={name} rows={rows} defaultValue={value} key={value} className="field" aria-invalid={err ? true : undefined}
        aria-describedby={err ? `${id}-err` : hint ? `${id}-hint` : undefined} />
      {hint && <p id={`${id}-hint`} className="text-xs muted">{hint}</p>}
      {err && <p id={`${id}-err`} className="text-sm text-rust-600" role="alert">{err.join(" ")}</p>}
    </div>
  );
}

export function SubmitButton({ children, pendingText }: { children: React.ReactNode; pendingText?: string }) {
  const { pending } = useFormStatus();
  return <button type="submit" className="btn" disabled={pending} aria-busy={pending}>{pending ? pendingText ?? "Saving…" : children}</button>;
}

export function FormMessage({ state }: { state?: ActionState }) {
  if (!state?.message) return null;
  return (
    <p role={state.ok ? "status" : "alert"} className={`text-sm rounded-md px-3 py-2 ${state.ok ? "bg-verdigris-50 text-verdigris-800" : "bg-rust-50 text-rust-800"}`}>
      {state.message}
    </p>
  );
}
