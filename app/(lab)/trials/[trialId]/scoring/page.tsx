import Link from "next/link";
import { listMembers } from "@/db/queries/memberships";
import { listTrialScorers } from "@/db/queries/scores-agreement";
import { listScoringQueue } from "@/db/queries/scores-queue";
import { trialPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { canServeAs, teamRights } from "@/lib/trials/team";
import { queueQuerySchema } from "@/lib/validation/scores";
import { AssignScorerForm, ScoreRuleForm, ScorerRow } from "@/components/scoring/assign-scorers";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Scoring queue" };


export default async function ScoringQueuePage({ params, searchParams }: { params: Promise<{ trialId: string }>; searchParams: Promise<Record<string, string | undefined>> }) {
  const { trialId } = await params;
  const { ctx, trial, access } = await trialPage("/trials/[trialId]/scoring", trialId);
  const sp = await searchParams;
  const q = queueQuerySchema.safeParse({ trialId, page: sp.page, show: sp.show });
  const { page, show } = q.success ? q.data : { page: 1, show: "todo" as const };
  const canScore = can(ctx.role, "scores.write");
  const lead = teamRights(ctx.role).scorers;
  const [queue, scorers, members] = await Promise.all([
    canScore ? listScoringQueue({ labId: ctx.labId, userId: ctx.userId, trialId, page, show }) : Promise.resolve(null),
    lead ? listTrialScorers({ labId: ctx.labId, trialId }) : Promise.resolve([]),
    lead ? listMembers({ labId: ctx.labId }) : Promise.resolve([]),
  ]);
  const staff = members.filter((m) => canServeAs("scorers", m.role));
  const qs = (extra: Record<string, string | number>) => `?${new URLSearchParams({ show, page: String(page), ...Object.fromEntries(Object.entries(extra).map(([k, v]) => [k, String(v)])) })}`;

  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-semibold">Scoring queue</h1>
      {queue?.blind && (
        <p className="panel p-3 text-sm" role="note">
          You score this trial <strong>blind</strong>: photos come in an order shuffled for you, without specimen label, treatment,
          chamber, inspection day or anyone&apos;s earlier scores. Your scores are kept apart from the other scorers&apos;.
        </p>
      )}
      {!canScore && <p className="text-sm">Your role reads scores but does not score. The <Link className="link" href={`/trials/${trialId}/agreement`}>agreement page</Link> compares the scorers.</p>}

      {queue && (
        <section aria-labelledby="queue-h" className="space-y-3">
          <div className="flex flex-wrap items-baseline gap-4">
            <h2 id="queue-h" className="font-semibold">Photos to score</h2>
            <p className="text-sm muted">{queue.todo} of {queue.total} still to score by you.</p>
            <nav aria-label="Filter" className="flex gap-2 text-sm">
              <Link className="link" aria-current={show === "todo" ? "page" : undefined} href={`?show=todo`}>To score</Link>
              <Link className="link" aria-current={show === "all" ? "page" : undefined} href={`?show=all`}>All</Link>
            </nav>
          </div>
          {queue.items.length === 0 ? (
            <EmptyState text={queue.total === 0 ? "No processed photo in this trial yet. Photos appear here once they are uploaded at an inspection and processed." : "Nothing left to score. Show all photos to revisit a score."}
              action={queue.total === 0 ? undefined : { href: "?show=all", label: "Show all photos" }} />
          ) : (
            <ul className="grid gap-3 grid-cols-2 sm:grid-cols-3 lg:grid-cols-6" data-testid="queue">
              {queue.items.map((item) => {
                const href = queue.blind ? `/trials/${trialId}/scoring/${item.photoId}`
                  : `/trials/${trialId}/inspections/${"inspectionId" in item ? item.inspectionId : ""}/score/${"specimenId" in item ? item.specimenId : ""}?photo=${item.photoId}`;
                const title = "specimenLabel" in item ? `${item.specimenLabel} · day ${item.dayNumber}` : `Photo ${item.position}`;
                return (
                  <li key={item.photoId} className="panel overflow-hidden">
                    <Link href={href} className="block focus-visible:outline-2">
                      {item.thumbUrl
                        // eslint-disable-next-line @next/next/no-img-element -- signed storage URL, not a static asset
                        ? <img src={item.thumbUrl} alt={title} className="aspect-[4/3] w-full object-cover bg-iron-900" loading="lazy" />
                        : <div className="aspect-[4/3] bg-iron-800" />}
                      <div className="p-2 text-sm">
                        <div className="font-medium">{title}</div>
                        {"treatment" in item && <div className="text-xs muted">{item.treatment} · {item.chamber}</div>}
                        <div className="text-xs">{item.scored ? ("myAreaPercent" in item && item.myAreaPercent != null ? `scored · ${item.myAreaPercent} %` : "scored") : "to score"}</div>
                      </div>
                    </Link>
                  </li>
                );
              })}
            </ul>
          )}
          {queue.pages > 1 && (
            <nav aria-label="Pages" className="flex items-center gap-3 text-sm">
              {queue.page > 1 && <Link className="link" href={qs({ page: queue.page - 1 })}>Previous</Link>}
              <span>Page {queue.page} of {queue.pages}</span>
              {queue.page < queue.pages && <Link className="link" href={qs({ page: queue.page + 1 })}>Next</Link>}
            </nav>
          )}
        </section>
      )}

      {lead && (
        <div className="grid gap-6 lg:grid-cols-2">
          <section className="panel p-4 space-y-3" aria-labelledby="scorers-h">
            <h2 id="scorers-h" className="font-semibold">Scorers of this trial</h2>
            {scorers.length === 0 ? <EmptyState text="No scorer assigned yet. Assign at least two to measure agreement; make the second blind." /> : (
              <table className="data">
                <thead><tr><th scope="col">Scorer</th><th scope="col">Mode</th><th scope="col">Change</th></tr></thead>
                <tbody>{scorers.map((s) => <ScorerRow key={s.userId} trialId={trialId} scorer={s} isPrimary={s.userId === trial.primaryScorerId} />)}</tbody>
              </table>
            )}
            {!access.locked && <AssignScorerForm trialId={trialId} candidates={staff.filter((m) => !scorers.some((s) => s.userId === m.userId))} />}
          </section>
          <section className="panel p-4 space-y-3" aria-labelledby="rule-h">
            <h2 id="rule-h" className="font-semibold">Score of record</h2>
            <p className="text-sm muted">Analysis uses one score per specimen and inspection. Changing the rule re-derives it for every score already made.</p>
            {access.locked ? <p className="text-sm">The trial is concluded; the rule is fixed.</p>
              : <ScoreRuleForm trialId={trialId} rule={trial.scoreRule} primaryScorerId={trial.primaryScorerId} members={staff.filter((m) => scorers.some((s) => s.userId === m.userId))} />}
          </section>
        </div>
      )}
    </div>
  );
}
