// Per-specimen outcomes: the rows behind every curve and test, as in outcomes.csv. A moved specimen
// has one row per jar; a row after the specimen had already rusted is listed but marked not at risk.
import type { SpecimenOutcome } from "@/lib/analysis/derive";
import { MATERIAL_LABELS } from "@/lib/analysis/groups";
import type { OutcomeAreas } from "@/lib/scoring/scaled-areas";
import { formatMm2 } from "@/components/photos/area-mm2";
import { fmtDay, fmtPercent, intervalText } from "./format";

function Interval({ lower, upper, event }: { lower: number; upper: number; event: "rust" | "weeping" }) {
  const t = intervalText(lower, upper, event);
  return <abbr title={t.title} className="cursor-help">{t.text}</abbr>;
}

/** areas: mm² per placement; given, a column of final area in mm² stands beside the percentage. */
export function OutcomeTable({ outcomes, areas }: { outcomes: readonly SpecimenOutcome[]; areas?: ReadonlyMap<string, OutcomeAreas> }) {
  return (
    <div className="overflow-x-auto">
      <table className="data">
        <thead>
          <tr>
            <th scope="col">Specimen</th><th scope="col">Material</th><th scope="col">Chamber</th><th scope="col">Treatment</th>
            <th scope="col" className="text-right!">scored</th><th scope="col">First rust (days)</th><th scope="col">First weeping (days)</th><th scope="col" className="text-right!">final area</th>
            {areas && <th scope="col" className="text-right!">final area (mm²)</th>}
          </tr>
        </thead>
        <tbody>
          {outcomes.map((o) => (
            <tr key={o.placementId}>
              <th scope="row" className="font-medium! text-left text-(color:--ink)!">{o.specimenLabel}</th>
              <td>{MATERIAL_LABELS[o.materialClass] ?? o.materialClass}</td>
              <td>{o.chamberName}</td>
              <td>{o.treatmentName}</td>
              <td className="text-right tabular-nums">{o.observations.length}</td>
              <td className="tabular-nums">
                {o.entry > 0 && <span className="block text-xs muted">moved in on day {fmtDay(o.entry)}</span>}
                {o.rustedEarlier ? <span data-testid="rusted-earlier">rusted before the move: not at risk, left out of the curves and tests</span>
                  : !o.interval ? "not scored yet"
                  : o.interval.upper === null ? `clean through day ${fmtDay(o.interval.lower)}`
                  : <Interval lower={o.interval.lower} upper={o.interval.upper} event="rust" />}
              </td>
              <td className="tabular-nums">
                {o.weptEarlier ? "wept before the move"
                  : !o.weepingInterval ? "—"
                  : o.weepingInterval.upper === null ? "none seen"
                  : <Interval lower={o.weepingInterval.lower} upper={o.weepingInterval.upper} event="weeping" />}
              </td>
              <td className="text-right tabular-nums">{fmtPercent(o.finalAreaPercent)}</td>
              {areas && <td className="text-right tabular-nums" data-area-mm2={areas.get(o.placementId)?.finalAreaMm2 ?? ""}>{areas.get(o.placementId)?.finalAreaMm2 == null ? "—" : formatMm2(areas.get(o.placementId)!.finalAreaMm2!)}</td>}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
