import Link from "next/link";
import { listTrialInspections } from "@/db/queries/inspections";
import { trialPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatDateTime } from "@/lib/format";
import { buildSchedule, planDays } from "@/lib/schedule/plans";
import { OVERDUE_GRACE_HOURS, STATUS_RULE_TEXT } from "@/lib/schedule/status";
import { RecordInspectionForm, RescheduleForm } from "@/components/trials/inspection-forms";
import { InspectionStatusTag } from "@/components/trials/inspection-status";

export const metadata = { title: "Inspection schedule" };

export default async function SchedulePage({ params }: { params: Promise<{ trialId: string }> }) {
  const { trialId } = await params;
  const { ctx, trial } = await trialPage("/trials/[trialId]/schedule", trialId);
  const base = `/trials/${trial.id}`;

  if (trial.status === "draft") {
    const start = new Date();
    start.setUTCHours(9, 0, 0, 0);
    const days = planDays(trial.schedulePlan);
    const dates = buildSchedule(trial.schedulePlan, start);
    return (
      <div className="space-y-4">
        <h1 className="text-2xl font-semibold">Inspection schedule</h1>
        <p className="text-sm">The inspections are created when the trial starts. If it started today at 09:00 UTC they would fall on:</p>
        <ol className="text-sm grid gap-1 md:grid-cols-3">{days.map((d, i) => <li key={d}>Day {d}: {formatDateTime(dates[i])}</li>)}</ol>
        <Link className="link text-sm" href={base}>Start it from the overview</Link>
      </div>
    );
  }

  const rows = await listTrialInspections({ labId: ctx.labId, trialId });
  const running = trial.status === "running";
  const record = running && can(ctx.role, "inspections.record");
  const reschedule = running && can(ctx.role, "inspections.reschedule");
  const counts = { done: 0, due: 0, overdue: 0, upcoming: 0 };
  for (const r of rows) counts[r.status]++;
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Inspection schedule</h1>
      <p className="text-sm">{counts.done} done · {counts.overdue} overdue · {counts.due} due · {counts.upcoming} upcoming</p>
      <p className="text-xs muted max-w-3xl">{STATUS_RULE_TEXT} Grace period: {OVERDUE_GRACE_HOURS} h. Times in UTC.</p>
      <div className="panel overflow-x-auto">
        <table className="data">
          <caption className="sr-only">Inspections of this trial</caption>
          <thead><tr><th scope="col">Day</th><th scope="col">Planned</th><th scope="col">Status</th><th scope="col">Done</th><th scope="col">Notes</th>{(record || reschedule) && <th scope="col">Actions</th>}</tr></thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id}>
                <td><Link className="link" href={`${base}/inspections/${r.id}`}>Day {r.dayNumber}</Link></td>
                <td className="whitespace-nowrap">{formatDateTime(r.plannedAt)}{r.rescheduleReason && <p className="text-xs muted">rescheduled: {r.rescheduleReason}</p>}</td>
                <td><InspectionStatusTag status={r.status} /></td>
                <td className="whitespace-nowrap">{r.doneAt ? <>{formatDateTime(r.doneAt)}<p className="text-xs muted">{r.doneBy ?? ""}</p></> : "—"}</td>
                <td className="text-sm max-w-xs">{r.notes}</td>
                {(record || reschedule) && (
                  <td className="min-w-56">
                    {!r.doneAt && record && <details><summary className="cursor-pointer text-sm underline underline-offset-2 text-[var(--accent)]">Mark done</summary><div className="pt-2"><RecordInspectionForm inspectionId={r.id} compact /></div></details>}
                    {!r.doneAt && reschedule && <details><summary className="cursor-pointer text-sm underline underline-offset-2 text-[var(--accent)]">Reschedule</summary><div className="pt-2"><RescheduleForm inspectionId={r.id} plannedAt={r.plannedAt.toISOString()} /></div></details>}
                  </td>
                )}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
