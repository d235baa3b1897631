import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { getTrial } from "@/db/queries/trials";
import { getLabContext } from "@/lib/auth/context";
import { formatDate } from "@/lib/format";
import { StatusBadge } from "@/components/trials/status-badge";
import { TrialTabs } from "@/components/trials/trial-tabs";

// Every page of a trial (also the photo, scoring and analysis pages) sits under this header and tabs.
export default async function TrialLayout({ children, params }: { children: React.ReactNode; params: Promise<{ trialId: string }> }) {
  const { trialId } = await params;
  const ctx = await getLabContext();
  if (!ctx) redirect("/sign-in");
  const trial = await getTrial({ labId: ctx.labId, trialId });
  if (!trial) notFound();
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
          {trial.status === "concluded" && trial.concludedAt && `concluded ${formatDate(trial.concludedAt)}; only notes can be added`}
        </span>
      </div>
      <TrialTabs trialId={trial.id} />
      <div>{children}</div>
    </div>
  );
}
