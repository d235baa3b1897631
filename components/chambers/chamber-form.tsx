"use client";
// Create / edit a chamber. The salt's equilibrium RH, the water-jar note, the desiccant budget and
// the hazard notes update as the user types; the server checks the same schema again on save.
import { startTransition, useActionState, useState } from "react";
import type { ActionState } from "@/lib/auth/action";
import { desiccantBudget, DESICCANTS, INDICATOR_KINDS, INDICATOR_LABELS, isIndicatorKind, type DesiccantKind } from "@/lib/humidity/desiccant";
import { CHAMBER_KINDS, WATER_CHAMBER_NOTE, type ChamberKind } from "@/lib/humidity/hazards";
import { isSaltId, SALT_IDS, SALTS } from "@/lib/humidity/salts";
import { CHAMBER_KIND_LABELS, DEFAULT_TOLERANCE, DESICCANT_KINDS, roundTo, saltAt, WATER_DEFAULT_SETPOINT, WATER_DEFAULT_TOLERANCE } from "@/lib/validation/chambers";
import { Field, FormMessage, TextArea } from "@/components/ui/form";
import { SaltCurveChartLoader } from "./chart-loaders";
import { ControlledInput, ControlledSelect } from "./form-controls";
import { DesiccantBudgetView } from "./desiccant-budget-view";
import { HazardPanel } from "./hazard-panel";

type Action = (prev: ActionState | undefined, fd: FormData) => Promise<ActionState>;
export type ChamberFormValues = Partial<Record<
  "name" | "kind" | "saltId" | "desiccantKind" | "desiccantIndicator" | "desiccantMassG" | "nominalTempC" | "volumeL" | "setpointRhPercent" | "toleranceRhPercent" | "roomRhPercent" | "airExchangePerDay" | "notes",
  string
>>;

const num = (s: string) => (s.trim() === "" ? null : Number(s.replace(",", ".")));
const kindOptions = CHAMBER_KINDS.map((k) => ({ value: k, label: CHAMBER_KIND_LABELS[k] }));
const saltOptions = [{ value: "", label: "Choose a salt…" }, ...SALT_IDS.map((id) => ({ value: id, label: `${SALTS[id].displayName}, ${SALTS[id].rangeC[0]}–${SALTS[id].rangeC[1]} °C` }))];
const indicatorOptions = [{ value: "", label: "Choose the indicator…" }, ...INDICATOR_KINDS.map((k) => ({ value: k, label: INDICATOR_LABELS[k] }))];
const desiccantOptions = [{ value: "", label: "Choose a desiccant…" }, ...DESICCANT_KINDS.map((k) => ({ value: k, label: DESICCANTS[k].displayName }))];

function defaultSetpoint(v: ChamberFormValues): string {
  const t = num(v.nominalTempC ?? "");
  if (v.kind === "saturated-salt" && v.saltId && isSaltId(v.saltId) && t !== null) {
    const eq = saltAt(v.saltId, t);
    return eq.ok ? String(roundTo(eq.rhPercent, 1)) : "";
  }
  return v.kind === "water" ? String(WATER_DEFAULT_SETPOINT) : "";
}
const lowerFirst = (t: string) => t.charAt(0).toLowerCase() + t.slice(1);
const defaultTolerance = (kind?: string) => String(kind === "water" ? WATER_DEFAULT_TOLERANCE : DEFAULT_TOLERANCE);

export function ChamberForm({ action, initial = {}, chamberId, submitLabel = "Save chamber" }: { action: Action; initial?: ChamberFormValues; chamberId?: string; submitLabel?: string }) {
  const [state, formAction, pending] = useActionState(action, undefined);
  const start = (k: keyof ChamberFormValues, fallback = "") => initial[k] ?? fallback;
  const [kind, setKind] = useState<ChamberKind>((start("kind", "saturated-salt") as ChamberKind));
  const [saltId, setSaltId] = useState(start("saltId"));
  const [tempText, setTempText] = useState(start("nominalTempC"));
  // A stored value equal to what the form would compute counts as "not typed", so it keeps following the inputs.
  const [setpoint, setSetpoint] = useState(() => (start("setpointRhPercent") === defaultSetpoint(initial) ? "" : start("setpointRhPercent")));
  const [tolerance, setTolerance] = useState(() => (start("toleranceRhPercent") === defaultTolerance(initial.kind) ? "" : start("toleranceRhPercent")));
  const [desiccant, setDesiccant] = useState(start("desiccantKind"));
  const [indicator, setIndicator] = useState(start("desiccantIndicator"));
  const [massText, setMassText] = useState(start("desiccantMassG"));
  const [volumeText, setVolumeText] = useState(start("volumeL"));
  const [roomText, setRoomText] = useState(start("roomRhPercent"));
  const [airText, setAirText] = useState(start("airExchangePerDay"));

  // A server error belongs to the value that was sent; once the user changes the field it no longer applies.
  const err = (name: keyof ChamberFormValues, current: string) => (state?.values?.[name] === current || state?.values?.[name] === undefined ? state?.errors?.[name] : undefined);

  const tempC = num(tempText);
  const salt = kind === "saturated-salt" && isSaltId(saltId) ? saltId : null;
  const eq = salt && tempC !== null && Number.isFinite(tempC) ? saltAt(salt, tempC) : null;
  const autoSetpoint = eq?.ok ? String(roundTo(eq.rhPercent, 1)) : kind === "water" ? String(WATER_DEFAULT_SETPOINT) : "";
  const shownSetpoint = setpoint !== "" ? setpoint : autoSetpoint;
  const autoTolerance = defaultTolerance(kind);
  const shownTolerance = tolerance !== "" ? tolerance : autoTolerance;

  const desiccantInfo = kind === "desiccant" && desiccant && desiccant in DESICCANTS ? DESICCANTS[desiccant as DesiccantKind] : null;
  const tol = num(shownTolerance);
  let budget: ReturnType<typeof desiccantBudget> | null = null;
  const missing: string[] = [];
  if (kind === "desiccant") {
    const [m, v, r, a, sp] = [num(massText), num(volumeText), num(roomText), num(airText), num(shownSetpoint)];
    if (!desiccant) missing.push("desiccant");
    if (m === null) missing.push("mass");
    if (v === null) missing.push("jar volume");
    if (r === null) missing.push("room RH");
    if (a === null) missing.push("air exchanges per day");
    if (sp === null) missing.push("target RH");
    if (!missing.length && tempC !== null) {
      try {
        budget = desiccantBudget({ kind: desiccant as DesiccantKind, massG: m!, jarVolumeL: v!, tempC, insideRhPercent: sp!, outsideRhPercent: r!, airExchangePerDay: a!, toleranceRhPercent: tol !== null && Number.isFinite(tol) ? tol : undefined });
      } catch {
        budget = null;
      }
    }
  }

  return (
    <form
      action={formAction}
      onSubmit={(e) => {
        // Submit by hand so React does not reset the form: every typed value stays after an error.
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        startTransition(() => formAction(fd));
      }}
      className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,24rem)]"
      noValidate
    >
      <div className="space-y-4">
        {chamberId && <input type="hidden" name="chamberId" value={chamberId} />}
        <Field name="name" label="Name" state={state} defaultValue={initial.name} hint="What is written on the jar, e.g. “Jar C · saturated NaCl”." />
        <ControlledSelect name="kind" label="Kind" value={kind} onChange={(v) => setKind(v as ChamberKind)} options={kindOptions} error={err("kind", kind)} />
        {kind === "saturated-salt" && (
          <ControlledSelect name="saltId" label="Salt" value={saltId} onChange={setSaltId} options={saltOptions} error={err("saltId", saltId)} />
        )}
        <ControlledInput name="nominalTempC" label="Nominal temperature (°C)" inputMode="decimal" value={tempText} onChange={setTempText}
          error={err("nominalTempC", tempText)} warning={eq && !eq.ok ? eq.message : null} placeholder="e.g. 21" />
        {kind === "saturated-salt" && salt && (
          <div className="panel p-3 space-y-2" aria-live="polite">
            <p className="text-sm" data-testid="salt-equilibrium">
              {eq?.ok ? (
                <>Equilibrium over saturated {lowerFirst(SALTS[salt].displayName)}{tempC !== null ? ` at ${tempC} °C` : ""}: <strong>{eq.rhPercent.toFixed(1)} ± {eq.uncertaintyPercent} %RH</strong></>
              ) : (
                <>Enter a temperature in {SALTS[salt].rangeC[0]}–{SALTS[salt].rangeC[1]} °C to see the equilibrium RH.</>
              )}
            </p>
            <p className="text-xs muted">{SALTS[salt].source}; valid {SALTS[salt].rangeC[0]}–{SALTS[salt].rangeC[1]} °C. The uncertainty is Greenspan&apos;s 25 °C figure, used across the range (a lower bound near its ends).</p>
            <SaltCurveChartLoader saltId={salt} tempC={eq?.ok ? tempC : null} />
          </div>
        )}
        {kind === "water" && (
          <p className="panel p-3 text-sm" aria-live="polite">About 100 %RH. {WATER_CHAMBER_NOTE}</p>
        )}
        {kind === "desiccant" && (
          <fieldset className="space-y-3 panel p-3">
            <legend className="text-sm font-semibold px-1">Desiccant</legend>
            <ControlledSelect name="desiccantKind" label="Desiccant" value={desiccant} onChange={setDesiccant} options={desiccantOptions} error={err("desiccantKind", desiccant)} />
            {desiccantInfo?.takesIndicator && (
              <ControlledSelect name="desiccantIndicator" label="Colour indicator" value={indicator} onChange={setIndicator} options={indicatorOptions} error={err("desiccantIndicator", indicator)} />
            )}
            <ControlledInput name="desiccantMassG" label={desiccantInfo?.buffer ? "Mass after conditioning (g)" : "Mass (g)"} inputMode="decimal" value={massText} onChange={setMassText} error={err("desiccantMassG", massText)} />
            <ControlledInput name="roomRhPercent" label="Room RH (%RH)" inputMode="decimal" value={roomText} onChange={setRoomText} error={err("roomRhPercent", roomText)} hint="Typical RH of the room the jar stands in." />
            <ControlledInput name="airExchangePerDay" label="Air exchanges per day" inputMode="decimal" value={airText} onChange={setAirText} error={err("airExchangePerDay", airText)}
              hint="Jar volumes of room air leaking in per day; a good clip-top jar is well below 1 (your estimate)." />
          </fieldset>
        )}
        <ControlledInput name="volumeL" label="Volume (L)" inputMode="decimal" value={volumeText} onChange={setVolumeText} error={err("volumeL", volumeText)} />
        <div className="grid gap-4 sm:grid-cols-2">
          <ControlledInput name="setpointRhPercent" label="Target RH (%RH)" inputMode="decimal" value={shownSetpoint} onChange={setSetpoint} error={err("setpointRhPercent", shownSetpoint)}
            hint={kind === "saturated-salt" ? "Defaults to the salt's equilibrium RH at this temperature." : desiccantInfo?.buffer ? "The RH the gel was conditioned to." : kind === "water" ? "Defaults to 96 %RH: real water jars read a few percent below 100." : undefined} />
          <ControlledInput name="toleranceRhPercent" label="Tolerance (± %RH)" inputMode="decimal" value={shownTolerance} onChange={setTolerance} error={err("toleranceRhPercent", shownTolerance)}
            hint="Readings within setpoint ± tolerance count as in band." />
        </div>
        {setpoint !== "" && autoSetpoint !== "" && setpoint !== autoSetpoint && (
          <button type="button" className="btn-quiet text-sm" onClick={() => setSetpoint("")}>Use the computed {autoSetpoint} %RH</button>
        )}
        <TextArea name="notes" label="Notes" state={state} defaultValue={initial.notes} rows={3} />
        <FormMessage state={state} />
        <button type="submit" className="btn" disabled={pending} aria-busy={pending}>{pending ? "Saving…" : submitLabel}</button>
      </div>
      <aside className="space-y-4">
        {kind === "desiccant" && (
          <section className="panel p-4 space-y-2" aria-labelledby="budget-h">
            <h2 id="budget-h" className="font-semibold">Water budget</h2>
            <DesiccantBudgetView budget={budget} missing={missing} />
          </section>
        )}
        <HazardPanel kind={kind} salt={salt} desiccant={desiccantInfo?.kind ?? null} indicator={desiccantInfo?.takesIndicator && isIndicatorKind(indicator) ? indicator : null} />
      </aside>
    </form>
  );
}
