"use client";
// Small forms on the chamber page: a typed reading, a desiccant log entry, a hygrometer check.
import { useActionState, useState } from "react";
import { addDesiccantEventAction, addHygrometerCheckAction, addReadingAction, setCheckAppliedAction } from "@/app/_actions/chamber-records";
import { FormMessage, SelectField, SubmitButton } from "@/components/ui/form";
import { SALT_IDS, SALTS, isSaltId } from "@/lib/humidity/salts";
import { hygrometerOffset, twoSaltCorrection } from "@/lib/climate/hygrometer-check";
import { saltAt } from "@/lib/validation/chambers";
import { ControlledInput, ControlledSelect, TextField, TimeZoneInput, WhenField } from "./form-controls";

export function ReadingForm({ chamberId, instruments }: { chamberId: string; instruments: string[] }) {
  const [state, action] = useActionState(addReadingAction, undefined);
  return (
    <form action={action} className="space-y-3" noValidate>
      <input type="hidden" name="chamberId" value={chamberId} />
      <TimeZoneInput />
      <WhenField name="takenAt" id="rd-takenAt" label="Time" error={state?.errors?.takenAt} defaultValue={state?.values?.takenAt} />
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField name="rhPercent" id="rd-rhPercent" label="RH (%RH)" inputMode="decimal" error={state?.errors?.rhPercent} value={state?.values?.rhPercent} />
        <TextField name="tempC" id="rd-tempC" label="Temperature (°C, optional)" inputMode="decimal" error={state?.errors?.tempC} value={state?.values?.tempC} />
      </div>
      <TextField name="instrument" id="rd-instrument" label="Instrument" error={state?.errors?.instrument} value={state?.values?.instrument ?? "manual"}
        hint={instruments.length ? `Used here: ${instruments.join(", ")}` : "e.g. the hygrometer's name or serial"} />
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
      <WhenField name="at" id="de-at" label="When" error={state?.errors?.at} defaultValue={state?.values?.at} />
      <TextField name="massG" id="de-massG" label="Mass (g, optional)" inputMode="decimal" error={state?.errors?.massG} value={state?.values?.massG}
        hint="Weigh the charge when it goes in and again later: the gain shows how fast it is loading." />
      <TextField name="notes" id="de-notes" label="Notes" multiline error={state?.errors?.notes} value={state?.values?.notes} />
      <FormMessage state={state} />
      <SubmitButton>Log it</SubmitButton>
    </form>
  );
}

const saltOptions = SALT_IDS.map((id) => ({ value: id, label: SALTS[id].displayName }));
const salt2Options = [{ value: "", label: "None (one-salt check)" }, ...saltOptions];

/** The two-salt slope for the preview, or null while the inputs cannot give one. */
function slopePreview(salt: string, salt2: string, tempC: number, reading: number, reading2Text: string): string | null {
  const reading2 = Number(reading2Text.replace(",", "."));
  if (!isSaltId(salt) || !isSaltId(salt2) || reading2Text.trim() === "" || !Number.isFinite(reading2)) return null;
  try {
    return twoSaltCorrection({ tempC, first: { salt, readingRhPercent: reading }, second: { salt: salt2, readingRhPercent: reading2 } }).slope.toFixed(3);
  } catch {
    return null;
  }
}

export function HygrometerCheckForm({ chamberId, instruments, defaultSalt, defaultTempC }: { chamberId: string; instruments: string[]; defaultSalt: string; defaultTempC: number }) {
  const [state, action] = useActionState(addHygrometerCheckAction, undefined);
  const [salt, setSalt] = useState(state?.values?.saltId ?? defaultSalt);
  const [temp, setTemp] = useState(state?.values?.tempC ?? String(defaultTempC));
  const [reading, setReading] = useState(state?.values?.readingRhPercent ?? "");
  const t = Number(temp.replace(",", "."));
  const r = Number(reading.replace(",", "."));
  const at = isSaltId(salt) && temp.trim() !== "" && Number.isFinite(t) ? saltAt(salt, t) : null;
  const preview = at?.ok && reading.trim() !== "" && Number.isFinite(r) && r >= 0 && r <= 100 ? hygrometerOffset({ readingRhPercent: r, salt: salt as never, tempC: t }) : null;
  const [salt2, setSalt2] = useState(state?.values?.salt2Id ?? "");
  const [reading2, setReading2] = useState(state?.values?.reading2RhPercent ?? "");
  const slope = preview ? slopePreview(salt, salt2, t, r, reading2) : null;
  return (
    <form action={action} className="space-y-3" noValidate>
      <input type="hidden" name="chamberId" value={chamberId} />
      <TimeZoneInput />
      <TextField name="instrument" id="hc-instrument" label="Instrument" error={state?.errors?.instrument} value={state?.values?.instrument ?? instruments[0] ?? ""}
        hint="Exactly as it appears on its readings, so the offset finds them." />
      <ControlledSelect name="saltId" id="hc-saltId" label="Reference salt" value={salt} onChange={setSalt} options={saltOptions} error={state?.errors?.saltId} />
      <div className="grid gap-3 sm:grid-cols-2">
        <ControlledInput name="tempC" id="hc-tempC" label="Jar temperature (°C)" inputMode="decimal" value={temp} onChange={setTemp} error={state?.errors?.tempC} warning={at && !at.ok ? at.message : null} />
        <ControlledInput name="readingRhPercent" id="hc-reading" label="Instrument read (%RH)" inputMode="decimal" value={reading} onChange={setReading} error={state?.errors?.readingRhPercent} />
      </div>
      <div className="grid gap-3 sm:grid-cols-2">
        <ControlledSelect name="salt2Id" id="hc-salt2Id" label="Second salt (optional)" value={salt2} onChange={setSalt2} options={salt2Options} error={state?.errors?.salt2Id}
          hint="A second salt on the other side of the band gives the slope as well as the offset." />
        <ControlledInput name="reading2RhPercent" id="hc-reading2" label="Instrument read over it (%RH)" inputMode="decimal" value={reading2} onChange={setReading2} error={state?.errors?.reading2RhPercent} />
      </div>
      <p className="text-sm" aria-live="polite">
        {at?.ok ? <>Reference: {at.rhPercent.toFixed(2)} ± {at.uncertaintyPercent} %RH (Greenspan 1977).</> : null}
        {preview ? <> Offset: <strong>{preview.offsetPercent >= 0 ? "+" : "−"}{Math.abs(preview.offsetPercent).toFixed(2)} %RH</strong> ({preview.offsetPercent >= 0 ? "reads high" : "reads low"}).</> : null}
        {slope ? <> Slope: <strong>{slope}</strong> %RH read per %RH (1 = no slope error).</> : null}
      </p>
      <WhenField name="checkedAt" id="hc-checkedAt" label="Checked at" error={state?.errors?.checkedAt} defaultValue={state?.values?.checkedAt} />
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" name="apply" className="mt-1" />
        <span>Apply the check: correct this instrument&apos;s readings by its offset and slope. The chart, its statistics and a trial&apos;s exposure figures all interpolate between applied checks and hold the nearest check before the first and after the last. The logged values stay as they are.</span>
      </label>
      <TextField name="notes" id="hc-notes" label="Notes" multiline error={state?.errors?.notes} value={state?.values?.notes} />
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
