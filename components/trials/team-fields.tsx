"use client";
// Technicians (who get the reminders) and, for a lead, scorers with a blind flag each, the
// score-of-record rule and the primary scorer. Who may be picked and who may change a field come from
// lib/trials/team; a disabled fieldset is not submitted, so the server sees no change to it.
import { useState } from "react";
import type { Role } from "@/lib/auth/permissions";
import { canServeAs } from "@/lib/trials/team";
import { SCORE_RULES } from "@/lib/validation/trials";

export type Person = { userId: string; name: string; role: string };
export type ScorerPick = { userId: string; blind: boolean };

function Err({ id, error }: { id: string; error?: string[] }) {
  return error ? <p id={id} role="alert" className="text-sm text-rust-600">{error.join(" ")}</p> : null;
}

export function TechnicianFields({ people, initial, error, disabled }: { people: Person[]; initial: string[]; error?: string[]; disabled?: boolean }) {
  const staff = people.filter((p) => canServeAs("technicianIds", p.role as Role));
  return (
    <fieldset className="space-y-2" disabled={disabled} aria-describedby={error ? "tech-err" : "tech-hint"}>
      <legend className="text-sm font-medium">Technicians</legend>
      <p id="tech-hint" className="text-xs muted">They do the inspections and get the e-mail reminders (the day before, and when overdue).</p>
      <div className="flex flex-wrap gap-x-5 gap-y-1">
        {staff.map((p) => (
          <label key={p.userId} className="inline-flex items-center gap-1.5 text-sm">
            <input type="checkbox" name="technicianIds[]" value={p.userId} defaultChecked={initial.includes(p.userId)} /> {p.name} <span className="muted text-xs">({p.role})</span>
          </label>
        ))}
      </div>
      <Err id="tech-err" error={error} />
    </fieldset>
  );
}

export function ScorerFields({ people, initial, scoreRule, primaryScorerId, errors }: {
  people: Person[]; initial: ScorerPick[]; scoreRule: string; primaryScorerId: string | null; errors?: Record<string, string[] | undefined>;
}) {
  const staff = people.filter((p) => canServeAs("scorers", p.role as Role));
  const [picked, setPicked] = useState<Record<string, boolean>>(Object.fromEntries(initial.map((s) => [s.userId, true])));
  const [rule, setRule] = useState(scoreRule);
  const chosen = staff.filter((p) => picked[p.userId]);
  return (
    <fieldset className="space-y-3" aria-describedby={errors?.scorers ? "scorers-err" : "scorers-hint"}>
      <legend className="text-sm font-medium">Scorers</legend>
      <input type="hidden" name="scorersIncluded" value="1" />
      <p id="scorers-hint" className="text-xs muted">A blind scorer does not see which chamber or treatment a specimen is in while scoring.</p>
      <table className="data max-w-xl">
        <thead><tr><th scope="col">Person</th><th scope="col">Scores</th><th scope="col">Blind</th></tr></thead>
        <tbody>
          {staff.map((p) => (
            <tr key={p.userId}>
              <td>{p.name} <span className="muted text-xs">({p.role})</span></td>
              <td><input type="checkbox" aria-label={`${p.name} scores`} name="scorerIds[]" value={p.userId} checked={!!picked[p.userId]} onChange={(e) => setPicked((x) => ({ ...x, [p.userId]: e.target.checked }))} /></td>
              <td><input type="checkbox" aria-label={`${p.name} scores blind`} name="blindScorerIds[]" value={p.userId} disabled={!picked[p.userId]} defaultChecked={initial.find((s) => s.userId === p.userId)?.blind ?? true} /></td>
            </tr>
          ))}
        </tbody>
      </table>
      <Err id="scorers-err" error={errors?.scorers} />
      <div className="flex flex-wrap gap-4">
        {Object.entries(SCORE_RULES).map(([value, label]) => (
          <label key={value} className="inline-flex items-center gap-1.5 text-sm">
            <input type="radio" name="scoreRule" value={value} checked={rule === value} onChange={() => setRule(value)} /> {label}
          </label>
        ))}
      </div>
      {rule === "primary-scorer" && (
        <div className="space-y-1">
          <label htmlFor="f-primaryScorerId" className="block text-sm font-medium">Primary scorer</label>
          <select id="f-primaryScorerId" name="primaryScorerId" className="field max-w-sm" defaultValue={primaryScorerId ?? ""} key={chosen.map((c) => c.userId).join()}
            aria-invalid={errors?.primaryScorerId ? true : undefined} aria-describedby={errors?.primaryScorerId ? "primary-err" : undefined}>
            <option value="">— choose one of the scorers —</option>
            {chosen.filter((p) => canServeAs("primaryScorerId", p.role as Role)).map((p) => <option key={p.userId} value={p.userId}>{p.name}</option>)}
          </select>
          <Err id="primary-err" error={errors?.primaryScorerId} />
        </div>
      )}
    </fieldset>
  );
}
