"use client";
// Planning on the design form: how many specimens a two-arm comparison of time to first rust needs
// (Schoenfeld's formula, lib/stats/sample-size) against what the design has, and the design warnings
// (lib/trials/design-checks), both recomputed as the user types. The inputs are not saved with the
// trial (no name attribute): they are a planning aid.
import { useMemo, useState } from "react";
import { planningInputErrors, specimensNeeded, type PlanningField, type SpecimenPlan } from "@/lib/stats/sample-size";
import { designWarnings, type DesignArm } from "@/lib/trials/design-checks";
import { DesignWarnings } from "./design-warnings";

type Inputs = Record<Exclude<PlanningField, "allocation">, string>;
const DEFAULTS: Inputs = { hazardRatio: "0.5", power: "0.8", alpha: "0.05", fractionRusting: "0.5" };
const FIELDS: { name: keyof Inputs; label: string; hint: string; step: string }[] = [
  { name: "hazardRatio", label: "Hazard ratio to detect", hint: "e.g. 0.5: one arm rusts at half the rate of the other.", step: "0.05" },
  { name: "power", label: "Power", hint: "Chance of detecting that ratio if it is real.", step: "0.05" },
  { name: "alpha", label: "Significance level α (two-sided)", hint: "Chance of a false alarm.", step: "0.01" },
  { name: "fractionRusting", label: "Expected fraction rusting", hint: "Share of specimens with first rust by the end of the trial.", step: "0.05" },
];

function parse(inputs: Inputs): { values?: Record<keyof Inputs, number>; errors: Partial<Record<keyof Inputs, string>> } {
  const errors: Partial<Record<keyof Inputs, string>> = {};
  const values = {} as Record<keyof Inputs, number>;
  for (const { name } of FIELDS) {
    const text = inputs[name].trim();
    const n = text === "" ? Number.NaN : Number(text);
    if (Number.isNaN(n)) errors[name] = "Enter a number, e.g. " + DEFAULTS[name] + ".";
    else values[name] = n;
  }
  Object.assign(errors, Object.fromEntries(Object.entries(planningInputErrors(values)).filter(([k]) => !errors[k as keyof Inputs])));
  return Object.keys(errors).length > 0 ? { errors } : { values, errors };
}

function Comparison({ plan, arms, replicates }: { plan: SpecimenPlan; arms: number; replicates: number }) {
  const needPerArm = Math.max(...plan.perArm);
  if (arms === 0) return <p>Pick chambers and treatments to compare the design with this.</p>;
  if (!(Number.isInteger(replicates) && replicates >= 1)) return <p>Enter the replicates per arm to compare the design with this.</p>;
  const current = arms * replicates;
  return (
    <p id="planning-comparison">
      This design: {arms} arm{arms === 1 ? "" : "s"} × {replicates} replicate{replicates === 1 ? "" : "s"} = <strong>{current} specimens</strong>, so two arms compared hold {2 * replicates}.{" "}
      {arms === 1 ? <span className="text-rust-700">With one arm there is nothing to compare.</span>
        : replicates >= needPerArm ? <span className="text-verdigris-800">That is enough for this comparison.</span>
          : <span className="text-rust-700">That is {needPerArm - replicates} specimen{needPerArm - replicates === 1 ? "" : "s"} per arm short; {needPerArm} per arm would make {needPerArm * arms} specimens in all.</span>}
    </p>
  );
}

export function PlanningPanel({ arms, replicatesPerArm }: { arms: DesignArm[]; replicatesPerArm: string }) {
  const [inputs, setInputs] = useState<Inputs>(DEFAULTS);
  const replicates = replicatesPerArm.trim() === "" ? Number.NaN : Number(replicatesPerArm);
  const { values, errors } = useMemo(() => parse(inputs), [inputs]);
  const plan = useMemo(() => (values ? specimensNeeded(values) : null), [values]);
  const warnings = useMemo(() => designWarnings({ arms, replicatesPerArm: replicates }), [arms, replicates]);
  const armCount = new Set(arms.map((a) => `${a.chamberId}/${a.treatmentId}`)).size;

  return (
    <section className="panel p-4 space-y-4" aria-labelledby="planning-h">
      <h2 id="planning-h" className="font-semibold">Planning</h2>
      <p className="text-sm muted max-w-3xl">How many specimens two arms need for the log-rank test to tell their times to first rust apart, and what in the design would stop it answering its question. Not saved with the trial.</p>
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        {FIELDS.map((f) => {
          const id = `plan-${f.name}`;
          const err = errors[f.name];
          return (
            <div key={f.name} className="space-y-1">
              <label htmlFor={id} className="block text-sm font-medium">{f.label}</label>
              <input id={id} type="number" inputMode="decimal" step={f.step} className="field" value={inputs[f.name]}
                onChange={(ev) => setInputs((prev) => ({ ...prev, [f.name]: ev.target.value }))}
                aria-invalid={err ? true : undefined} aria-describedby={`${id}-hint${err ? ` ${id}-err` : ""}`} />
              <p id={`${id}-hint`} className="text-xs muted">{f.hint}</p>
              {err && <p id={`${id}-err`} role="alert" className="text-sm text-rust-600">{err}</p>}
            </div>
          );
        })}
      </div>
      <div className="text-sm space-y-2" aria-live="polite">
        {plan ? (
          <>
            <dl className="grid gap-3 sm:grid-cols-2">
              <div><dt className="text-xs muted">Events needed</dt><dd id="planning-events"><strong>{plan.events}</strong> specimens with first rust <span className="muted">(d = {plan.eventsExact.toFixed(1)})</span></dd></div>
              <div><dt className="text-xs muted">Specimens needed in the two arms compared</dt><dd id="planning-specimens"><strong>{plan.total}</strong> specimens, <strong>{Math.max(...plan.perArm)}</strong> per arm</dd></div>
            </dl>
            <Comparison plan={plan} arms={armCount} replicates={replicates} />
          </>
        ) : <p className="text-rust-700">Correct the planning inputs above to see the numbers.</p>}
      </div>
      <p className="text-xs muted max-w-3xl">Schoenfeld&apos;s formula for the two-sided log-rank test: events d = (z₁₋α/₂ + z₁₋β)² ÷ (π(1−π)·(ln HR)²) with π = ½ for equal arms; specimens = d ÷ expected fraction rusting, rounded up. It assumes the hazard ratio stays the same throughout the trial.</p>
      <div className="space-y-2">
        <h3 className="text-sm font-medium">Design checks</h3>
        {armCount === 0 ? <p className="text-sm muted">Pick chambers and treatments to check the design.</p> : <DesignWarnings warnings={warnings} id="design-warnings" />}
      </div>
    </section>
  );
}
