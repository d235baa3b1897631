"use client";
// Lead-only forms: who scores this trial (blind or not), and how the score of record is chosen.
import { useActionState } from "react";
import { assignScorerAction, removeScorerAction, setScoreRuleAction } from "@/app/_actions/scorers";
import { FormMessage, SelectField, SubmitButton } from "@/components/ui/form";

type Member = { userId: string; name: string; role: string };
type Scorer = { userId: string; name: string; email: string; blind: boolean };

export function AssignScorerForm({ trialId, candidates }: { trialId: string; candidates: Member[] }) {
  const [state, action] = useActionState(assignScorerAction, undefined);
  if (candidates.length === 0) return <p className="text-sm muted">Every lead, researcher and technician of the lab is already a scorer here.</p>;
  return (
    <form action={action} className="space-y-3" noValidate>
      <input type="hidden" name="trialId" value={trialId} />
      <SelectField name="userId" label="Member" state={state} options={candidates.map((m) => ({ value: m.userId, label: `${m.name} (${m.role})` }))} />
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" name="blind" defaultChecked /> Blind: sees shuffled photos without specimen, treatment, chamber or earlier scores
      </label>
      <FormMessage state={state} />
      <SubmitButton pendingText="Assigning…">Assign scorer</SubmitButton>
    </form>
  );
}

export function ScorerRow({ trialId, scorer, isPrimary }: { trialId: string; scorer: Scorer; isPrimary: boolean }) {
  const [flagState, flagAction] = useActionState(assignScorerAction, undefined);
  const [removeState, removeAction] = useActionState(removeScorerAction, undefined);
  const msg = removeState?.message ?? flagState?.message;
  const ok = (removeState ?? flagState)?.ok;
  return (
    <tr>
      <td>{scorer.name}{isPrimary ? <span className="ml-2 text-xs rounded-full border border-[var(--line)] px-2">primary</span> : null}<div className="text-xs muted">{scorer.email}</div></td>
      <td>{scorer.blind ? "blind" : "open"}</td>
      <td className="space-x-2 whitespace-nowrap">
        <form action={flagAction} className="inline">
          <input type="hidden" name="trialId" value={trialId} />
          <input type="hidden" name="userId" value={scorer.userId} />
          {!scorer.blind && <input type="hidden" name="blind" value="on" />}
          <SubmitButton pendingText="…">{scorer.blind ? "Make open" : "Make blind"}</SubmitButton>
        </form>
        <form action={removeAction} className="inline">
          <input type="hidden" name="trialId" value={trialId} />
          <input type="hidden" name="userId" value={scorer.userId} />
          <SubmitButton pendingText="…">Remove</SubmitButton>
        </form>
        {msg && <span role={ok ? "status" : "alert"} className={`text-xs ${ok ? "" : "text-rust-600"}`}>{msg}</span>}
      </td>
    </tr>
  );
}

export function ScoreRuleForm({ trialId, rule, primaryScorerId, members }: { trialId: string; rule: string; primaryScorerId: string | null; members: Member[] }) {
  const [state, action] = useActionState(setScoreRuleAction, undefined);
  return (
    <form action={action} className="space-y-3" noValidate>
      <input type="hidden" name="trialId" value={trialId} />
      <SelectField name="scoreRule" label="Score of record" state={state} defaultValue={rule}
        options={[{ value: "primary-scorer", label: "The primary scorer's score" }, { value: "consensus", label: "A consensus score recorded after discussion" }]} />
      <SelectField name="primaryScorerId" label="Primary scorer" state={state} defaultValue={primaryScorerId ?? ""}
        hint="Under the consensus rule the primary scorer's score stands in until a consensus score is recorded."
        options={[{ value: "", label: "— none —" }, ...members.map((m) => ({ value: m.userId, label: `${m.name} (${m.role})` }))]} />
      <FormMessage state={state} />
      <SubmitButton pendingText="Saving…">Save rule</SubmitButton>
    </form>
  );
}
