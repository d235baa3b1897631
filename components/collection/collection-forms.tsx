"use client";
import { useActionState } from "react";
import { createLocationAction, moveObjectAction, reparentLocationAction, updateLocationAction } from "@/app/_actions/collection";
import { Field, FormMessage, SelectField, SubmitButton, TextArea } from "@/components/ui/form";
import { LOCATION_KIND_LABELS, STORAGE_KINDS } from "@/lib/collection/locations";
import { DESICCANTS } from "@/lib/humidity/desiccant";
import { SALTS } from "@/lib/humidity/salts";

type Option = { value: string; label: string };
const KIND_OPTIONS = STORAGE_KINDS.map((k) => ({ value: k, label: LOCATION_KIND_LABELS[k] }));
// How the location's air is held: its microclimate (lib/collection/locations microclimateOf).
const MICROCLIMATE_OPTIONS = [
  { value: "open-shelf", label: "Open to the room" },
  { value: "desiccant", label: "Desiccant" },
  { value: "saturated-salt", label: "Salt-buffered" },
  { value: "inert-gas", label: "Inert gas" },
  { value: "vacuum", label: "Vacuum" },
  { value: "other", label: "None / other" },
];

/** A new storage location; desiccant and salt details are edited on its chamber page like any chamber's. */
export function NewLocationForm({ parents, members }: { parents: Option[]; members: Option[] }) {
  const [state, action] = useActionState(createLocationAction, undefined);
  return (
    <form action={action} className="grid gap-3 sm:grid-cols-2" noValidate>
      <Field name="name" label="Name" state={state} hint="e.g. Store 2, Cabinet B, Drawer 3, Box 14" />
      <SelectField name="locationKind" label="Kind of place" state={state} options={KIND_OPTIONS} defaultValue="cabinet" />
      <SelectField name="parentId" label="Inside" state={state} options={[{ value: "", label: "— top level —" }, ...parents]} defaultValue="" />
      <SelectField name="kind" label="Microclimate" state={state} options={MICROCLIMATE_OPTIONS} defaultValue="open-shelf" />
      <Field name="setpointRhPercent" label="Target RH (%RH)" state={state} type="text" />
      <Field name="toleranceRhPercent" label="Tolerance (± %RH)" state={state} type="text" hint="2 %RH when left empty" />
      <Field name="nominalTempC" label="Usual temperature (°C)" state={state} type="text" defaultValue="18" />
      <SelectField name="keeperId" label="Keeper" state={state} options={[{ value: "", label: "— none —" }, ...members]} defaultValue="" />
      <Field name="alertAfterHours" label="Alert after (h out of rule)" type="number" step="0.5" min={0.5} max={720} state={state} defaultValue={6}
        hint="The keeper (or the keeper of the place it sits in) gets an e-mail once the location has been out of its storage rule this long." />
      <SelectField name="desiccantKind" label="Desiccant (desiccant microclimate)" state={state}
        options={[{ value: "", label: "—" }, ...Object.values(DESICCANTS).map((d) => ({ value: d.kind, label: d.displayName }))]} defaultValue="" />
      <Field name="desiccantMassG" label="Desiccant mass (g)" state={state} type="text" />
      <SelectField name="saltId" label="Salt (salt-buffered)" state={state} options={[{ value: "", label: "—" }, ...Object.values(SALTS).map((x) => ({ value: x.id, label: x.displayName }))]} defaultValue="" />
      <div className="sm:col-span-2"><TextArea name="notes" label="Notes" state={state} rows={2} /></div>
      <div className="sm:col-span-2 flex items-center gap-3"><SubmitButton pendingText="Adding…">Add location</SubmitButton><FormMessage state={state} /></div>
    </form>
  );
}

export function MoveObjectForm({ objects, locations }: { objects: Option[]; locations: Option[] }) {
  const [state, action] = useActionState(moveObjectAction, undefined);
  return (
    <form action={action} className="grid gap-3 sm:grid-cols-2" noValidate>
      <input type="hidden" name="timeZone" value={typeof Intl === "undefined" ? "UTC" : Intl.DateTimeFormat().resolvedOptions().timeZone} />
      <SelectField name="specimenId" label="Object" state={state} options={[{ value: "", label: "— choose —" }, ...objects]} defaultValue="" />
      <SelectField name="locationId" label="To" state={state} options={[{ value: "", label: "— choose —" }, ...locations]} defaultValue="" />
      <Field name="at" label="When" type="datetime-local" state={state} />
      <Field name="reason" label="Reason" state={state} hint="optional, e.g. rehousing, survey" />
      <div className="sm:col-span-2 flex items-center gap-3"><SubmitButton pendingText="Recording…">Record move</SubmitButton><FormMessage state={state} /></div>
    </form>
  );
}

/** Put a location (with everything in it) inside another one, or at the top level. */
export function ReparentLocationForm({ locations }: { locations: Option[] }) {
  const [state, action] = useActionState(reparentLocationAction, undefined);
  return (
    <form action={action} className="grid gap-3 sm:grid-cols-2" noValidate>
      <SelectField idPrefix="tree" name="locationId" label="Location" state={state} options={[{ value: "", label: "— choose —" }, ...locations]} defaultValue="" />
      <SelectField idPrefix="tree" name="parentId" label="Now inside" state={state} options={[{ value: "", label: "— top level —" }, ...locations]} defaultValue="" />
      <div className="sm:col-span-2 flex items-center gap-3"><SubmitButton pendingText="Moving…">Move location</SubmitButton><FormMessage state={state} /></div>
    </form>
  );
}

export type LocationSettings = { id: string; name: string; locationKind: string; keeperId: string | null; alertAfterHours: number };

/** A storage location's name, kind of place, keeper and alert delay, prefilled with the current values. */
export function LocationSettingsForm({ location, members }: { location: LocationSettings; members: Option[] }) {
  const [state, action] = useActionState(updateLocationAction, undefined);
  return (
    <form action={action} className="grid gap-3 sm:grid-cols-2" noValidate aria-label="Location settings">
      <input type="hidden" name="locationId" value={location.id} />
      <Field idPrefix="loc" name="name" label="Name" state={state} defaultValue={location.name} />
      <SelectField idPrefix="loc" name="locationKind" label="Kind" state={state} options={KIND_OPTIONS} defaultValue={location.locationKind} />
      <SelectField idPrefix="loc" name="keeperId" label="Keeper" state={state} options={[{ value: "", label: "— none —" }, ...members]} defaultValue={location.keeperId ?? ""} />
      <Field idPrefix="loc" name="alertAfterHours" label="E-mail the keeper after out of rule for (hours)" type="number" step="0.5" min={0.5} max={720} state={state}
        defaultValue={location.alertAfterHours} hint="With no keeper here, the keeper of the place it sits in gets the e-mail." />
      <div className="sm:col-span-2 flex items-center gap-3"><SubmitButton pendingText="Saving…">Save location</SubmitButton><FormMessage state={state} /></div>
    </form>
  );
}
