// Scores of record the comparison does not use (their inspection is not marked done), with a link to
// each such inspection so it can be marked done. Shown on the comparison and in the report.
import Link from "next/link";
import { leftOutScoresText, type LeftOutScores } from "@/lib/analysis/sentences";

export function LeftOutScoresNote({ trialId, leftOut, recordScores }: { trialId: string; leftOut: readonly LeftOutScores[]; recordScores: number }) {
  const t = leftOutScoresText(leftOut, recordScores);
  if (!t) return null;
  return (
    <div className="panel p-3 text-sm space-y-1" role="note" data-testid="left-out-scores">
      <p>{t.lead}</p>
      <ul className="list-disc pl-5">
        {t.items.map((i) => (
          <li key={i.inspectionId}>
            {i.before}<Link className="link" href={`/trials/${trialId}/inspections/${i.inspectionId}`}>{i.name}</Link>{i.after}.
          </li>
        ))}
      </ul>
      <p className="muted">{t.close}</p>
    </div>
  );
}
