import type { RecordScore } from "@/db/queries/photos";

/** "1.25 % rusted · ASTM D610 7-S · weeping", or why there is no score to show. */
export function scoreText(score: RecordScore | null, hidden = false): string {
  if (hidden) return "Score hidden (you score this trial blind)";
  if (!score) return "Not scored yet";
  const parts = [`${score.areaPercent.toFixed(score.areaPercent < 1 ? 2 : 1)} % rusted`];
  if (score.astmGrade != null) parts.push(`ASTM D610 ${score.astmGrade}${score.astmLetter ? `-${score.astmLetter}` : ""}`);
  parts.push(score.weeping ? "weeping" : "no weeping");
  return parts.join(" · ");
}

export function ScoreSummary({ score, hidden = false }: { score: RecordScore | null; hidden?: boolean }) {
  return <p className={`text-xs ${score && !hidden ? "" : "muted"}`} data-score={score?.areaPercent ?? ""}>{scoreText(score, hidden)}</p>;
}
