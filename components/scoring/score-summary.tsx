// Saved scores and first-rust intervals as text (server-rendered; no interactivity).
import { formatAstm, formatIso, type AstmDistributionLetter, type IsoRustDegree } from "@/lib/scoring/grades";
import type { FirstRust } from "@/db/queries/scores";

type Scoreish = { spotCount: number; areaPercent: number; astmGrade: number | null; astmLetter: string | null; isoDegree: number | null; weeping: boolean; silicateChange: string };

export function astmText(s: Pick<Scoreish, "astmGrade" | "astmLetter">): string {
  if (s.astmGrade == null) return "—";
  return s.astmLetter ? formatAstm(s.astmGrade, s.astmLetter as AstmDistributionLetter) : String(s.astmGrade);
}

export function isoText(s: Pick<Scoreish, "isoDegree">): string {
  return s.isoDegree == null ? "—" : formatIso(s.isoDegree as IsoRustDegree);
}

/** "0.42 % · 3 spots · ASTM D610 6-S · ISO 4628-3 Ri 2 · weeping" */
export function ScoreLine({ score }: { score: Scoreish }) {
  return (
    <span>
      <strong className="tabular-nums">{score.areaPercent} %</strong> rusted · {score.spotCount} spot{score.spotCount === 1 ? "" : "s"} ·
      ASTM D610 <strong>{astmText(score)}</strong> · ISO 4628-3 <strong>{isoText(score)}</strong>
      {score.weeping ? " · weeping" : ""}{score.silicateChange !== "none" ? ` · ${score.silicateChange} silicate discoloration` : ""}
    </span>
  );
}

export function FirstRustNote({ firstRust }: { firstRust: FirstRust }) {
  const i = firstRust.interval;
  let text: string;
  if (!i) text = "Not scored yet: no score of record for this specimen in this trial.";
  else if (i.upper === Infinity) text = `No rust yet: clean at every scored inspection through day ${i.lower} (censored there).`;
  else if (i.lower === i.upper) text = `Rust at the first inspection, day ${i.upper}.`;
  else text = `First rust appeared between day ${i.lower} and day ${i.upper}: the interval (${i.lower}, ${i.upper}] days.`;
  return (
    <p className="text-sm" data-testid="first-rust">
      <span className="font-medium">Time to first rust: </span>{text}
      <span className="muted"> Derived from the scores of record ({firstRust.scoredInspections} scored inspection{firstRust.scoredInspections === 1 ? "" : "s"}); a correction moves it.</span>
    </p>
  );
}
