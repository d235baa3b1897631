"use client";
// Small forms on the chamber page: a typed reading, a desiccant log entry, a hygrometer check.
import { useActionState, useState } from "react";
import { addDesiccantEventAction, addHygrometerCheckAction, addReadingAction, setCheckAppliedAction } from "@/app/(lab)/chambers/[chamberId]/actions";
import { Field, FormMessage, SelectField, SubmitButton, TextArea } from "@/components/ui/form";
import { SALT_IDS, SALTS, isSaltId } from "@/lib/humidity/salts";
import { hygrometerOffset } from "@/lib/climate/hygrometer-check";
import { saltAt } from "@/lib/validation/chambers";
import { ControlledInput, ControlledSelect, TimeZoneInput, WhenField } from "./form-controls";

export function ReadingForm({ chamberId, instruments }: { chamberId: string; instruments: string[] }) {
  const [state, action] = useActionState(addReadingAction, undefined);
  return (
    <form action={action} className="space-y-3" noValidate>
      <input type="hidden" name="chamberId" value={chamberId} />
      <TimeZoneInput />
      <WhenField name="takenAt" label="Time" error={state?.errors?.takenAt} defaultValue={state?.values?.takenAt} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field name="rhPercent" label="RH (%RH)" state={state} step="0.1" />
        <Field name="tempC" label="Temperature (°C, optional)" state={state} step="0.1" />
      </div>
      <Field name="instrument" label="Instrument" state={state} defaultValue="manual" hint={instruments.length ? `Used here: ${instruments.join(", ")}` : "e.g. the hygrometer's name or serial"} />
      <FormMessage state={state} />
      <SubmitButton>Save reading</SubmitButton>
    </form>
  );
}

const EVENT_OPTIONS = [
  { value: "charged", label: "Charged (fresh desiccant in)" },
  { value: "regenerated", label: "Regenerated (dried and put back)" },
  { value: "replaced", label: "Replaced" },
  { value: "checked", label: "Checked / weighed" },
];

export function DesiccantEventForm({ chamberId }: { chamberId: string }) {
  const [state, action] = useActionState(addDesiccantEventAction, undefined);
  return (
    <form action={action} className="space-y-3" noValidate>
      <input type="hidden" name="chamberId" value={chamberId} />
      <TimeZoneInput />
      <SelectField name="kind" label="What was done" options={EVENT_OPTIONS} state={state} defaultValue="regenerated" />
      <WhenField name="at" label="When" error={state?.errors?.at} defaultValue={state?.values?.at} />
      <Field name="massG" label="Mass (g, optional)" state={state} step="0.1" hint="Weighing the charge shows how much water it has taken up." />
      <TextArea name="notes" label="Notes" state={state} rows={2} />
      <FormMessage state={state} />
      <SubmitButton>Log it</SubmitButton>
    </form>
  );
}

const saltOptions = SALT_IDS.map((id) => ({ value: id, label: SALTS[id].displayName }));

export function HygrometerCheckForm({ chamberId, instruments, defaultSalt, defaultTempC }: { chamberId: string; instruments: string[]; defaultSalt: string; defaultTempC: number }) {
  const [state, action] = useActionState(addHygrometerCheckAction, undefined);
  const [salt, setSalt] = useState(state?.values?.saltId ?? defaultSalt);
  const [temp, setTemp] = useState(state?.values?.tempC ?? String(defaultTempC));
  const [reading, setReading] = useState(state?.values?.readingRhPercent ?? "");
  const t = Number(temp.replace(",", "."));
  const r = Number(reading.replace(",", "."));
  const at = isSaltId(salt) && temp.trim() !== "" && Number.isFinite(t) ? saltAt(salt, t) : null;
  const preview = at?.ok && reading.trim() !== "" && Number.isFinite(r) && r >= 0 && r <= 100 ? hygrometerOffset({ readingRhPercent: r, salt: salt as never, tempC: t }) : null;
  return (
    <form action={action} className="space-y-3" noValidate>
      <input type="hidden" name="chamberId" value={chamberId} />
      <TimeZoneInput />
      <Field name="instrument" label="Instrument" state={state} defaultValue={instruments[0] ?? ""} hint="Exactly as it appears on its readings, so the offset finds them." />
      <ControlledSelect name="saltId" label="Reference salt" value={salt} onChange={setSalt} options={saltOptions} error={state?.errors?.saltId} />
      <div className="grid gap-3 sm:grid-cols-2">
        <ControlledInput name="tempC" label="Temperature (°C)" inputMode="decimal" value={temp} onChange={setTemp} error={state?.errors?.tempC} warning={at && !at.ok ? at.message : null} />
        <ControlledInput name="readingRhPercent" label="Instrument read (%RH)" inputMode="decimal" value={reading} onChange={setReading} error={state?.errors?.readingRhPercent} />
      </div>
      <p className="text-sm" aria-live="polite">
        {at?.ok ? <>Reference: {at.rhPercent.toFixed(2)} ± {at.uncertaintyPercent} %RH (Greenspan 1977).</> : null}
        {preview ? <> Offset: <strong>{preview.offsetPercent >= 0 ? "+" : "−"}{Math.abs(preview.offsetPercent).toFixed(2)} %RH</strong> ({preview.offsetPercent >= 0 ? "reads high" : "reads low"}).</> : null}
      </p>
      <WhenField name="checkedAt" label="Checked at" error={state?.errors?.checkedAt} defaultValue={state?.values?.checkedAt} />
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" name="apply" className="mt-1" />
        <span>Correct this instrument&apos;s readings from this time on (at display and analysis; the logged values stay as they are).</span>
      </label>
      <TextArea name="notes" label="Notes" state={state} rows={2} />
      <FormMessage state={state} />
      <SubmitButton>Save check</SubmitButton>
    </form>
  );
}

export function ApplyOffsetToggle({ chamberId, checkId, applied }: { chamberId: string; checkId: string; applied: boolean }) {
  const [state, action] = useActionState(setCheckAppliedAction, undefined);
  return (
    <form action={action} className="inline-flex items-center gap-2">
      <input type="hidden" name="chamberId" value={chamberId} />
      <input type="hidden" name="checkId" value={checkId} />
      <input type="hidden" name="applied" value={applied ? "0" : "1"} />
      <SubmitButton pendingText="…">{applied ? "Stop applying" : "Apply offset"}</SubmitButton>
      {state?.message && <span role={state.ok ? "status" : "alert"} className="text-xs">{state.message}</span>}
    </form>
  );
}
