import Link from "next/link";
import { labPage } from "@/lib/auth/page";
import { formatDate } from "@/lib/format";
import { StatusBadge } from "@/components/trials/status-badge";
import { TrialTabs } from "@/components/trials/trial-tabs";

// Every page of a trial (also the photo, scoring and analysis pages) sits under this header and tabs.
export default async function TrialLayout({ children, params }: { children: React.ReactNode; params: Promise<{ trialId: string }> }) {
  const { trialId } = await params;
  const ctx = await labPage("/trials/[trialId]");
  const { trial, access } = await ctx.trial(trialId);
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm">
        <Link className="link" href="/trials">Trials</Link>
        <span aria-hidden="true">/</span>
        <Link className="font-medium hover:underline" href={`/trials/${trial.id}`}>{trial.title}</Link>
        <StatusBadge status={trial.status} />
        <span className="muted">
          {trial.status === "draft" && "not started"}
          {trial.status === "running" && trial.startedAt && `started ${formatDate(trial.startedAt)}`}
          {access.locked && trial.concludedAt && `concluded ${formatDate(trial.concludedAt)}; only notes can be added`}
        </span>
        {access.blind && <span className="text-xs rounded-full border border-[var(--line)] px-2 py-0.5">you score blind: arms and results hidden until it is concluded</span>}
      </div>
      <TrialTabs trialId={trial.id} resultsHidden={access.blind} />
      <div>{children}</div>
    </div>
  );
}
