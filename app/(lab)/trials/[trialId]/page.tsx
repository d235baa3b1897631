import Link from "next/link";
import { listTrialInspections } from "@/db/queries/inspections";
import { hasAllocation, listArms, listPeopleChoices, listTrialMembers, listTrialNotes } from "@/db/queries/trials";
import { trialPage } from "@/lib/auth/page";
import { blockText } from "@/lib/allocation/allocate";
import { can } from "@/lib/auth/permissions";
import { teamRights } from "@/lib/trials/team";
import { designWarnings } from "@/lib/trials/design-checks";
import { formatDateTime } from "@/lib/format";
import { GEOMETRIC_RULE_TEXT, planDays, type InspectionPlan } from "@/lib/schedule/plans";
import { PRIMARY_OUTCOMES, SCORE_RULES, type PrimaryOutcome } from "@/lib/validation/trials";
import { ConcludeForm, NoteForm, StartForm } from "@/components/trials/lifecycle-forms";
import { ProtocolForm, ScorersForm, TechniciansForm } from "@/components/trials/team-forms";
import { EmptyState } from "@/components/ui/empty-state";
import { DesignWarnings } from "@/components/trials/design-warnings";

export const metadata = { title: "Trial" };

function planText(plan: InspectionPlan) {
  const days = planDays(plan);
  if (plan.kind === "fixed") return `Every ${plan.intervalDays} days, ${plan.count} inspections (days 0–${days[days.length - 1]})`;
  if (plan.kind === "geometric") return `Geometric, ${plan.count} inspections: ${GEOMETRIC_RULE_TEXT}`;
  return `Custom days: ${days.join(", ")}`;
}

export default async function TrialOverviewPage({ params }: { params: Promise<{ trialId: string }> }) {
  const { trialId } = await params;
  const { ctx, trial, access } = await trialPage("/trials/[trialId]", trialId);
  const [arms, members, notes, inspections, allocated, people] = await Promise.all([
    listArms({ labId: ctx.labId, trialId }), listTrialMembers({ labId: ctx.labId, trialId }), listTrialNotes({ labId: ctx.labId, trialId }),
    listTrialInspections({ labId: ctx.labId, trialId }), hasAllocation({ labId: ctx.labId, trialId }), listPeopleChoices({ labId: ctx.labId }),
  ]);
  const open = !access.locked;
  const design = can(ctx.role, "trials.write");
  const team = teamRights(ctx.role);
  const technicians = members.filter((m) => m.role === "technician");
  const scorers = members.filter((m) => m.role === "scorer");
  const primary = scorers.find((s) => s.userId === trial.primaryScorerId);
  const done = inspections.filter((i) => i.doneAt).length;
  const next = inspections.find((i) => !i.doneAt);
  const base = `/trials/${trial.id}`;
  // While the design can still change; once running, the design is fixed and the warnings are moot.
  const warnings = trial.status === "draft" ? designWarnings({ arms, replicatesPerArm: trial.replicatesPerArm }) : [];

  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-start gap-3">
        <h1 className="text-2xl font-semibold mr-auto max-w-4xl">{trial.title}</h1>
        {design && trial.status === "draft" && <Link className="btn-quiet" href={`${base}/edit`}>Edit design</Link>}
      </div>
      <dl className="grid gap-4 md:grid-cols-3 panel p-4">
        <div className="md:col-span-2"><dt className="text-xs muted">Question</dt><dd className="whitespace-pre-wrap">{trial.question}</dd></div>
        <div><dt className="text-xs muted">Primary outcome</dt><dd>{PRIMARY_OUTCOMES[trial.primaryOutcome as PrimaryOutcome] ?? trial.primaryOutcome}</dd></div>
        {trial.hypothesis && <div className="md:col-span-3"><dt className="text-xs muted">Hypothesis</dt><dd className="whitespace-pre-wrap">{trial.hypothesis}</dd></div>}
        <div><dt className="text-xs muted">Arms</dt><dd>{arms.length} (chambers × treatments) × {trial.replicatesPerArm} replicate{trial.replicatesPerArm === 1 ? "" : "s"}</dd></div>
        <div><dt className="text-xs muted">Allocation</dt><dd>{allocated || trial.allocationSeed ? <>{access.blind ? "seed hidden from blind scorers" : <>seed <span className="font-mono">{trial.allocationSeed}</span></>}{trial.blockByMaterial || trial.blockFactors.length ? `, ${blockText(trial)}` : ""}</> : "not yet"} · <Link className="link" href={`${base}/allocation`}>table</Link></dd></div>
        <div><dt className="text-xs muted">Inspection plan</dt><dd>{planText(trial.schedulePlan)}</dd></div>
        {trial.status !== "draft" && <div><dt className="text-xs muted">Inspections</dt><dd>{done} of {inspections.length} done{next ? <> · next: <Link className="link" href={`${base}/inspections/${next.id}`}>day {next.dayNumber}, {formatDateTime(next.plannedAt)}</Link> ({next.status})</> : ""}</dd></div>}
      </dl>

      <section className="panel p-4 space-y-2" aria-labelledby="arms-h">
        <h2 id="arms-h" className="font-semibold">Arms</h2>
        <ul className="grid gap-1 md:grid-cols-2 text-sm">
          {arms.map((a) => <li key={a.id} className="rounded border border-[var(--line)] px-2 py-1">{a.chamberName} <span className="muted">({a.setpointRhPercent} %RH, {a.nominalTempC} °C)</span> / {a.treatmentName}</li>)}
        </ul>
      </section>

      {trial.status === "draft" && warnings.length > 0 && (
        <section className="panel p-4 space-y-2" aria-labelledby="checks-h">
          <h2 id="checks-h" className="font-semibold">Design checks</h2>
          <DesignWarnings warnings={warnings} id="design-warnings" />
          {design && <p className="text-xs"><Link className="link" href={`${base}/edit`}>Edit the design</Link> to address them, or start anyway if the trial is a pilot.</p>}
        </section>
      )}

      {trial.status === "draft" && design && (
        <section className="panel p-4 space-y-3" aria-labelledby="start-h">
          <h2 id="start-h" className="font-semibold">Start the trial</h2>
          {allocated ? <StartForm trialId={trial.id} firstDays={planDays(trial.schedulePlan)} />
            : <EmptyState text="Allocate specimens to the arms first; the start places them and plans the inspections." action={{ href: `${base}/allocation`, label: "Allocate specimens" }} />}
        </section>
      )}

      <div className="grid gap-6 lg:grid-cols-2">
        <section className="panel p-4 space-y-3" aria-labelledby="team-h">
          <h2 id="team-h" className="font-semibold">Team</h2>
          <p className="text-sm"><span className="muted">Technicians (get reminders): </span>{technicians.map((t) => t.name).join(", ") || <span className="text-rust-700">none yet — nobody gets reminders</span>}</p>
          <p className="text-sm"><span className="muted">Scorers: </span>{scorers.map((s) => `${s.name}${s.blind ? " (blind)" : ""}`).join(", ") || "none yet"}</p>
          <p className="text-sm"><span className="muted">Score of record: </span>{SCORE_RULES[trial.scoreRule]}{trial.scoreRule === "primary-scorer" ? ` — ${primary?.name ?? "not chosen yet"}` : ""}</p>
          {open && team.technicianIds && <details><summary className="cursor-pointer text-sm underline underline-offset-2 text-[var(--accent)]">Change technicians</summary><div className="pt-3"><TechniciansForm trialId={trial.id} people={people} initial={technicians.map((t) => t.userId)} /></div></details>}
          {trial.status !== "draft" && <p className="text-sm"><Link className="link" href={`${base}/scoring`}>Scorers and the score-of-record rule are managed on the Scoring tab</Link></p>}
          {trial.status === "draft" && team.scorers && (
            <details><summary className="cursor-pointer text-sm underline underline-offset-2 text-[var(--accent)]">Assign scorers</summary><div className="pt-3">
              <ScorersForm trialId={trial.id} people={people} initial={scorers.map((s) => ({ userId: s.userId, blind: s.blind }))} scoreRule={trial.scoreRule} primaryScorerId={trial.primaryScorerId} />
            </div></details>
          )}
        </section>
        <section className="panel p-4 space-y-3" aria-labelledby="protocol-h">
          <h2 id="protocol-h" className="font-semibold">Photo protocol</h2>
          {trial.photoProtocol.length === 0 ? <p className="text-sm muted">No checklist.</p> : <ol className="list-decimal pl-5 text-sm space-y-1">{trial.photoProtocol.map((l, i) => <li key={i}>{l}</li>)}</ol>}
          {open && team.photoProtocol && <details><summary className="cursor-pointer text-sm underline underline-offset-2 text-[var(--accent)]">Edit the checklist</summary><div className="pt-3"><ProtocolForm trialId={trial.id} initial={trial.photoProtocol} /></div></details>}
        </section>
      </div>

      <section className="panel p-4 space-y-3" aria-labelledby="notes-h">
        <h2 id="notes-h" className="font-semibold">Notes</h2>
        {notes.length === 0 ? <p className="text-sm muted">No notes yet. Notes are appended, never edited, and can be added after the trial is concluded.</p> : (
          <ul className="space-y-2">
            {notes.map((n) => <li key={n.id} className="text-sm"><p className="whitespace-pre-wrap">{n.body}</p><p className="text-xs muted">{n.author ?? "—"} · {formatDateTime(n.createdAt)}</p></li>)}
          </ul>
        )}
        {can(ctx.role, "trials.notes") && <NoteForm trialId={trial.id} />}
        <p className="text-xs"><Link className="link" href="/audit?entity=trial">Audit trail of trials</Link></p>
      </section>

      {trial.status === "running" && can(ctx.role, "trials.conclude") && (
        <section className="panel p-4 space-y-3" aria-labelledby="conclude-h">
          <h2 id="conclude-h" className="font-semibold">Conclude the trial</h2>
          <ConcludeForm trialId={trial.id} />
        </section>
      )}
      {access.locked && <p className="text-sm rounded-md px-3 py-2 bg-iron-100 text-iron-800">Concluded {trial.concludedAt ? formatDateTime(trial.concludedAt) : ""}. The record is locked: design, allocation, placements, inspections, photos and scores no longer change. Notes can still be appended.</p>}
      <p className="text-xs muted max-w-3xl">Trial results guide storage decisions; they do not replace a conservator&apos;s judgement of each object.</p>
    </div>
  );
}
