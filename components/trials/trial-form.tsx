"use client";
// Design a trial (or edit a draft): question, arms = chambers × treatments, replicates, team,
// photo protocol and inspection plan. Submitted without a form reset, so nothing typed is lost.
import { useActionState, useEffect, useMemo, useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { createTrialAction, updateTrialAction } from "@/app/_actions/trials";
import { Field, FormMessage, SelectField, TextArea } from "@/components/ui/form";
import type { InspectionPlan } from "@/lib/schedule/plans";
import type { TeamFieldName } from "@/lib/trials/team";
import { crossArms } from "@/lib/trials/design-checks";
import { PRIMARY_OUTCOMES } from "@/lib/validation/trials";
import { PlanFields } from "./plan-fields";
import { PlanningPanel } from "./planning-panel";
import { ProtocolLines } from "./protocol-lines";
import { ScorerFields, TechnicianFields, type Person, type ScorerPick } from "./team-fields";

export type ChamberChoice = { id: string; name: string; setpointRhPercent: number; nominalTempC: number };
export type TreatmentChoice = { id: string; name: string; kind: string };
export type TrialFormValues = {
  id: string; title: string; question: string; hypothesis: string; primaryOutcome: string; replicatesPerArm: number;
  chamberIds: string[]; treatmentIds: string[]; technicianIds: string[]; scorers: ScorerPick[]; scoreRule: string;
  primaryScorerId: string | null; photoProtocol: string[]; plan: InspectionPlan; allocated: boolean;
};

const outcomeOptions = Object.entries(PRIMARY_OUTCOMES).map(([value, label]) => ({ value, label }));

function Picker({ legend, name, items, selected, onChange, error, render }: {
  legend: string; name: string; items: { id: string }[]; selected: string[]; onChange: (ids: string[]) => void; error?: string[]; render: (item: never) => React.ReactNode;
}) {
  return (
    <fieldset className="space-y-1" aria-describedby={error ? `${name}-err` : undefined}>
      <legend className="text-sm font-medium">{legend}</legend>
      <div className="flex flex-col gap-1">
        {items.map((it) => (
          <label key={it.id} className="inline-flex items-center gap-1.5 text-sm">
            <input type="checkbox" name={`${name}[]`} value={it.id} checked={selected.includes(it.id)}
              onChange={(e) => onChange(e.target.checked ? [...selected, it.id] : selected.filter((x) => x !== it.id))} />
            {render(it as never)}
          </label>
        ))}
      </div>
      {error && <p id={`${name}-err`} role="alert" className="text-sm text-rust-600">{error.join(" ")}</p>}
    </fieldset>
  );
}

/** `team`: per team field, whether the viewer's role may change it (teamRights from lib/trials/team). */
export function TrialForm({ chambers, treatments, people, team, trial }: {
  chambers: ChamberChoice[]; treatments: TreatmentChoice[]; people: Person[]; team: Record<TeamFieldName, boolean>; trial?: TrialFormValues;
}) {
  const [state, dispatch, pending] = useActionState(trial ? updateTrialAction : createTrialAction, undefined);
  const [, startTransition] = useTransition();
  const router = useRouter();
  const [chamberIds, setChamberIds] = useState(trial?.chamberIds ?? []);
  const [treatmentIds, setTreatmentIds] = useState(trial?.treatmentIds ?? []);
  const [replicates, setReplicates] = useState(String(trial?.replicatesPerArm ?? 2));
  const id = (state?.data as { id?: string } | undefined)?.id;
  useEffect(() => {
    if (state?.ok && id) router.push(trial ? `/trials/${id}` : `/trials/${id}/allocation`);
  }, [state, id, trial, router]);
  const e = state?.errors ?? {};
  const arms = chamberIds.length * treatmentIds.length;
  const designArms = useMemo(
    () => crossArms(chambers.filter((c) => chamberIds.includes(c.id)), treatments.filter((t) => treatmentIds.includes(t.id))),
    [chambers, treatments, chamberIds, treatmentIds],
  );
  const needed = arms * (Number(replicates) || 0);

  return (
    <form className="space-y-6 max-w-4xl" noValidate onSubmit={(ev) => {
      ev.preventDefault();
      const fd = new FormData(ev.currentTarget);
      startTransition(() => dispatch(fd));
    }}>
      {trial && <input type="hidden" name="trialId" value={trial.id} />}
      <section className="panel p-4 space-y-4" aria-labelledby="q-h">
        <h2 id="q-h" className="font-semibold">Question</h2>
        <Field name="title" label="Title" defaultValue={trial?.title} state={{ errors: e }} />
        <TextArea name="question" label="Question the trial answers" defaultValue={trial?.question} state={{ errors: e }} hint="e.g. How long do cut iron slices stay rust-free at 33 and 75 %RH, bare or waxed?" />
        <TextArea name="hypothesis" label="Hypothesis (optional)" defaultValue={trial?.hypothesis} state={{ errors: e }} />
        <SelectField name="primaryOutcome" label="Primary outcome" options={outcomeOptions} defaultValue={trial?.primaryOutcome ?? "time-to-first-rust"} state={{ errors: e }} />
      </section>

      <section className="panel p-4 space-y-4" aria-labelledby="arms-h">
        <h2 id="arms-h" className="font-semibold">Arms: chambers × treatments</h2>
        {trial?.allocated && <p className="text-sm rounded-md px-3 py-2 bg-rust-50 text-rust-800">Changing chambers, treatments or replicates discards the current allocation.</p>}
        <div className="grid gap-6 md:grid-cols-2">
          <Picker legend="Chambers" name="chamberIds" items={chambers} selected={chamberIds} onChange={setChamberIds} error={e.chamberIds}
            render={(c: ChamberChoice) => <>{c.name} <span className="muted text-xs">({c.setpointRhPercent} %RH at {c.nominalTempC} °C)</span></>} />
          <Picker legend="Treatments" name="treatmentIds" items={treatments} selected={treatmentIds} onChange={setTreatmentIds} error={e.treatmentIds}
            render={(t: TreatmentChoice) => <>{t.name} <span className="muted text-xs">({t.kind})</span></>} />
        </div>
        <div className="max-w-xs">
          <label htmlFor="f-replicatesPerArm" className="block text-sm font-medium">Replicates per arm (specimens)</label>
          <input id="f-replicatesPerArm" name="replicatesPerArm" type="number" min={1} max={100} className="field" value={replicates} onChange={(ev) => setReplicates(ev.target.value)}
            aria-invalid={e.replicatesPerArm ? true : undefined} aria-describedby={e.replicatesPerArm ? "rep-err" : undefined} />
          {e.replicatesPerArm && <p id="rep-err" role="alert" className="text-sm text-rust-600">{e.replicatesPerArm.join(" ")}</p>}
        </div>
        <p className="text-sm" aria-live="polite">
          {arms === 0 ? "Pick chambers and treatments to form the arms." : <>{arms} arm{arms === 1 ? "" : "s"}; {needed} specimens needed for {replicates || 0} per arm.</>}
        </p>
        {arms > 0 && (
          <ul className="text-sm grid gap-1 md:grid-cols-2" aria-label="Arms">
            {chambers.filter((c) => chamberIds.includes(c.id)).flatMap((c) => treatments.filter((t) => treatmentIds.includes(t.id)).map((t) => (
              <li key={`${c.id}-${t.id}`} className="rounded border border-[var(--line)] px-2 py-1">{c.name} / {t.name}</li>
            )))}
          </ul>
        )}
      </section>

      <PlanningPanel arms={designArms} replicatesPerArm={replicates} />

      <section className="panel p-4 space-y-4" aria-labelledby="team-h">
        <h2 id="team-h" className="font-semibold">Team</h2>
        <TechnicianFields people={people} initial={trial?.technicianIds ?? []} error={e.technicianIds} disabled={!team.technicianIds} />
        {team.scorers && team.scoreRule && team.primaryScorerId ? (
          <ScorerFields people={people} initial={trial?.scorers ?? []} scoreRule={trial?.scoreRule ?? "primary-scorer"} primaryScorerId={trial?.primaryScorerId ?? null} errors={e} />
        ) : (
          <p className="text-sm muted">Scorers, their blind flag and the score-of-record rule are assigned by a lab lead on the trial page.</p>
        )}
      </section>

      <section className="panel p-4 space-y-4" aria-labelledby="photo-h">
        <h2 id="photo-h" className="font-semibold">Photos and schedule</h2>
        <ProtocolLines initial={trial?.photoProtocol} error={e.photoProtocol} disabled={!team.photoProtocol} />
        <PlanFields initial={trial?.plan} error={e.plan} />
      </section>

      <FormMessage state={state} />
      <button type="submit" className="btn" disabled={pending} aria-busy={pending}>{pending ? "Saving…" : trial ? "Save design" : "Create draft trial"}</button>
    </form>
  );
}
