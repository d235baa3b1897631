// Saved scores and first-rust intervals as text (server-rendered; no interactivity).
import { formatAstm, formatIso, type AstmDistributionLetter, type IsoRustDegree } from "@/lib/scoring/grades";
import type { SpecimenOutcome } from "@/lib/analysis/derive";
import type { EstimateColourBasis } from "@/lib/scoring/colour-normalise";

type Scoreish = {
  spotCount: number; areaPercent: number; astmGrade: number | null; astmLetter: string | null; isoDegree: number | null; weeping: boolean; silicateChange: string;
  autoEstimatePercent?: number | null; autoEstimateColour?: EstimateColourBasis | null;
};

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

/** The colour estimate kept with a score and whether it was read through the grey patch; nothing without one. */
export function EstimateNote({ score }: { score: Pick<Scoreish, "autoEstimatePercent" | "autoEstimateColour"> }) {
  if (score.autoEstimatePercent == null) return null;
  const basis = score.autoEstimateColour;
  const how = !basis ? "" : basis.normalised ? ", white balance and exposure normalised from the grey patch" : ", not normalised (no grey patch)";
  return <p className="text-xs muted" data-testid="saved-estimate">Colour estimate kept beside it: {score.autoEstimatePercent} %{how}.</p>;
}

function intervalText(i: SpecimenOutcome["interval"]): string {
  if (!i) return "not scored yet: no score of record at a done inspection.";
  if (i.upper === null) return `no rust yet: clean at every scored inspection through day ${i.lower} (censored there).`;
  if (i.lower === i.upper) return `rust at the first inspection, day ${i.upper}.`;
  return `first rust appeared between day ${i.lower} and day ${i.upper}: the interval (${i.lower}, ${i.upper}] days.`;
}

/** The comparison's outcomes for this specimen (one per placement), as the score page shows them. */
export function FirstRustNote({ outcomes, inspectionDone }: { outcomes: SpecimenOutcome[]; inspectionDone: boolean }) {
  const scored = outcomes.reduce((n, o) => n + o.observations.length, 0);
  return (
    <div className="text-sm space-y-0.5" data-testid="first-rust">
      {outcomes.length <= 1 ? (
        <p><span className="font-medium">Time to first rust: </span>{intervalText(outcomes[0]?.interval ?? null)}</p>
      ) : outcomes.map((o, i) => (
        <p key={i}><span className="font-medium">Time to first rust in {o.armLabel ?? `${o.chamberName} / ${o.treatmentName}`}: </span>{intervalText(o.interval)}</p>
      ))}
      <p className="muted text-xs">
        Derived from the scores of record at done inspections ({scored} scored), the same way as the comparison; a correction moves it.
        {!inspectionDone && " This inspection is not marked done yet, so its scores do not count until it is."}
      </p>
    </div>
  );
}
