"use client";
// Choose specimens (filter by class or text), a seed and blocking, then allocate. Re-rolling is the
// same form with a new seed; the server keeps the record of every allocation in the audit trail.
import { useActionState, useMemo, useState } from "react";
import { allocateAction } from "@/app/_actions/trials";
import { FormMessage } from "@/components/ui/form";
import { PendingButton, useFormSubmit } from "./use-form-submit";
import { MATERIAL_CLASS_LABELS, MATERIAL_CLASSES, type MaterialClass } from "@/lib/validation/specimens";

export type SpecimenChoice = { id: string; label: string; materialClass: MaterialClass; findName: string; busyIn: string | null };
const SHOW_MAX = 400;

function randomSeed() {
  const a = new Uint32Array(1);
  crypto.getRandomValues(a);
  return `seed-${(a[0] % 1_000_000).toString().padStart(6, "0")}`;
}

export function AllocationForm({ trialId, specimens, initialSelected, seed, blockByMaterial, blockFactors, needed, allocated }: {
  trialId: string; specimens: SpecimenChoice[]; initialSelected: string[]; seed: string; blockByMaterial: boolean; blockFactors: string[]; needed: number; allocated: boolean;
}) {
  const [state, dispatch, pending] = useActionState(allocateAction, undefined);
  const onSubmit = useFormSubmit(dispatch);
  const [selected, setSelected] = useState<Set<string>>(new Set(initialSelected));
  const [cls, setCls] = useState<"" | MaterialClass>("");
  const [q, setQ] = useState("");
  const [seedValue, setSeedValue] = useState(seed);
  const shown = useMemo(() => specimens.filter((s) => (!cls || s.materialClass === cls) && (!q || `${s.label} ${s.findName}`.toLowerCase().includes(q.toLowerCase()))), [specimens, cls, q]);
  const toggle = (id: string, on: boolean) => setSelected((prev) => {
    const next = new Set(prev);
    if (on) next.add(id);
    else next.delete(id);
    return next;
  });
  const byClass = MATERIAL_CLASSES.map((c) => [c, specimens.filter((s) => selected.has(s.id) && s.materialClass === c).length] as const).filter(([, n]) => n > 0);
  const busyChosen = specimens.filter((s) => selected.has(s.id) && s.busyIn);

  return (
    <form onSubmit={onSubmit} className="space-y-4" noValidate>
      <input type="hidden" name="trialId" value={trialId} />
      {[...selected].map((id) => <input key={id} type="hidden" name="specimenIds[]" value={id} />)}
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium">Specimens</legend>
        <div className="flex flex-wrap items-end gap-3">
          <label className="text-sm">Material class
            <select className="field" value={cls} onChange={(e) => setCls(e.target.value as MaterialClass | "")}>
              <option value="">All classes</option>
              {MATERIAL_CLASSES.map((c) => <option key={c} value={c}>{MATERIAL_CLASS_LABELS[c]}</option>)}
            </select>
          </label>
          <label className="text-sm">Label or find name<input className="field" value={q} onChange={(e) => setQ(e.target.value)} /></label>
          <button type="button" className="btn-quiet" onClick={() => setSelected((p) => new Set([...p, ...shown.filter((s) => !s.busyIn).map((s) => s.id)]))}>Select all shown</button>
          <button type="button" className="btn-quiet" onClick={() => setSelected((p) => new Set([...p].filter((id) => !shown.some((s) => s.id === id))))}>Clear shown</button>
        </div>
        <p className="text-sm" role="status" aria-live="polite">
          {selected.size} chosen{byClass.length > 0 && <> ({byClass.map(([c, n]) => `${n} ${MATERIAL_CLASS_LABELS[c].toLowerCase()}`).join(", ")})</>}; {needed} needed.
          {selected.size > needed && " The extra specimens are left over at random (reported, not placed)."}
          {selected.size < needed && <span className="text-rust-700"> Choose {needed - selected.size} more.</span>}
        </p>
        {busyChosen.length > 0 && <p className="text-sm text-rust-700">{busyChosen.length} chosen specimen(s) still sit in a running trial; the trial cannot start until they are moved out.</p>}
        <div className="panel max-h-80 overflow-auto">
          <table className="data">
            <caption className="sr-only">Specimens to choose from</caption>
            <thead><tr><th scope="col">Use</th><th scope="col">Label</th><th scope="col">Material class</th><th scope="col">Find name</th><th scope="col">Now in</th></tr></thead>
            <tbody>
              {shown.slice(0, SHOW_MAX).map((s) => (
                <tr key={s.id}>
                  <td><input type="checkbox" aria-label={`Use ${s.label}`} checked={selected.has(s.id)} onChange={(e) => toggle(s.id, e.target.checked)} /></td>
                  <td>{s.label}</td><td>{MATERIAL_CLASS_LABELS[s.materialClass]}</td><td>{s.findName}</td>
                  <td>{s.busyIn ? <span className="text-rust-700">{s.busyIn}</span> : <span className="muted">free</span>}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {shown.length > SHOW_MAX && <p className="text-xs muted p-2">Showing {SHOW_MAX} of {shown.length}; narrow the filter to see the rest.</p>}
          {shown.length === 0 && <p className="text-sm muted p-2">No specimen matches. Add specimens on the Specimens page.</p>}
        </div>
        {state?.errors?.specimenIds && <p role="alert" className="text-sm text-rust-600">{state.errors.specimenIds.join(" ")}</p>}
      </fieldset>
      <div className="flex flex-wrap items-end gap-4">
        <div>
          <label htmlFor="f-seed" className="block text-sm font-medium">Seed</label>
          <div className="flex gap-2">
            <input id="f-seed" name="seed" className="field font-mono" style={{ width: "16rem" }} value={seedValue} onChange={(e) => setSeedValue(e.target.value)}
              aria-invalid={state?.errors?.seed ? true : undefined} aria-describedby="seed-hint" />
            <button type="button" className="btn-quiet" onClick={() => setSeedValue(randomSeed())}>New seed</button>
          </div>
          <p id="seed-hint" className="text-xs muted">The same seed and specimens always give the same allocation; it is printed with the table.</p>
          {state?.errors?.seed && <p role="alert" className="text-sm text-rust-600">{state.errors.seed.join(" ")}</p>}
        </div>
        <label className="inline-flex items-center gap-2 text-sm">
          <input type="checkbox" name="blockByMaterial" defaultChecked={blockByMaterial} /> Block by material class (balance each class across the arms)
        </label>
        <label className="inline-flex items-center gap-2 text-sm">
          <input type="checkbox" name="blockFactors[]" value="parentPiece" defaultChecked={blockFactors.includes("parentPiece")} /> and by parent piece (slices of one piece spread over the arms)
        </label>
        <label className="inline-flex items-center gap-2 text-sm">
          <input type="checkbox" name="blockFactors[]" value="chlorideState" defaultChecked={blockFactors.includes("chlorideState")} /> and by chloride test result (latest test on each specimen&apos;s page)
        </label>
        {state?.errors?.blockFactors && <p role="alert" className="text-sm text-rust-600">{state.errors.blockFactors.join(" ")}</p>}
      </div>
      <FormMessage state={state} />
      <PendingButton pending={pending} pendingText="Allocating…">{allocated ? "Re-roll allocation" : "Allocate"}</PendingButton>
    </form>
  );
}
