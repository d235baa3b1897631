import Link from "next/link";
import { listTrialsForAnalysis } from "@/db/queries/analysis";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { EmptyState } from "@/components/ui/empty-state";
import { formatDate } from "@/lib/format";

export const metadata = { title: "Analysis" };

const STATUS_LABELS = { draft: "Draft", running: "Running", concluded: "Concluded" } as const;

export default async function AnalysisPage() {
  const ctx = await labPage("/analysis");
  const trials = await listTrialsForAnalysis({ labId: ctx.labId });
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-semibold">Analysis</h1>
        <p className="muted text-sm">Compare time to first rust, rust growth and final state between treatments, chambers or materials, and export the data.</p>
      </div>
      {trials.length === 0 ? (
        <EmptyState
          text="There are no trials to analyse yet. Design a trial, start it and score its first inspections; the comparison appears here."
          action={can(ctx.role, "trials.write") ? { href: "/trials/new", label: "Design a trial" } : undefined}
        />
      ) : (
        <section className="panel p-4" aria-labelledby="trials-h">
          <h2 id="trials-h" className="font-semibold mb-2">Trials</h2>
          <div className="overflow-x-auto">
            <table className="data">
              <thead>
                <tr>
                  <th scope="col">Trial</th><th scope="col">Status</th><th scope="col">Started</th>
                  <th scope="col" className="text-right!">Specimens</th><th scope="col" className="text-right!">Inspections done</th>
                  <th scope="col" className="text-right!">Scores of record</th><th scope="col">Open</th>
                </tr>
              </thead>
              <tbody>
                {trials.map((t) => (
                  <tr key={t.id}>
                    <th scope="row" className="font-medium! text-left text-(color:--ink)!">{t.title}</th>
                    <td>{STATUS_LABELS[t.status]}</td>
                    <td>{t.startedAt ? formatDate(t.startedAt) : "not started"}</td>
                    <td className="text-right tabular-nums">{t.specimens}</td>
                    <td className="text-right tabular-nums">{t.doneInspections}</td>
                    <td className="text-right tabular-nums">{t.recordScores}</td>
                    <td className="whitespace-nowrap">
                      {t.recordScores > 0 ? (
                        <>
                          <Link className="link" href={`/trials/${t.id}/compare`} aria-label={`Compare outcomes of ${t.title}`}>Compare outcomes</Link>
                          {" · "}
                          <Link className="link" href={`/trials/${t.id}/report`} aria-label={`Report of ${t.title}`}>Report</Link>
                        </>
                      ) : (
                        <span className="text-sm muted">Nothing scored yet — <Link className="link" href={`/trials/${t.id}`}>open the trial</Link></span>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </section>
      )}
    </div>
  );
}
