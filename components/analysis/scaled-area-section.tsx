// The report's section on photo scale and protocol: growth in mm² per day and spots by size class per
// placement, and the scored photos taken without every point of the trial's photo protocol.
import type { SpecimenOutcome } from "@/lib/analysis/derive";
import { areaKey, type OutcomeAreas } from "@/lib/scoring/scaled-areas";
import { SPOT_SIZE_CLASSES } from "@/lib/scoring/scale";
import type { ScaledRecord } from "@/db/queries/photo-evidence";
import { formatMm2 } from "@/components/photos/area-mm2";
import { fmtDay, fmtPercent } from "./format";

type Props = { outcomes: readonly SpecimenOutcome[]; areas: ReadonlyMap<string, OutcomeAreas>; records: readonly ScaledRecord[]; protocol: readonly string[] };

export function ScaledAreaSection({ outcomes, areas, records, protocol }: Props) {
  const byKey = new Map(records.map((r) => [areaKey(r.inspectionId, r.specimenId), r]));
  const label = new Map(outcomes.map((o) => [o.specimenId, o.specimenLabel]));
  const scaled = records.filter((r) => r.areaMm2 != null).length;
  const flagged = protocol.length ? records.filter((r) => r.photoId && (r.protocolMissing == null || r.protocolMissing.length > 0)) : [];
  return (
    <section className="panel p-4 space-y-3" aria-labelledby="scaled-h">
      <h2 id="scaled-h" className="font-semibold">Rusted area in mm² and photo protocol</h2>
      <p className="text-sm muted">
        {scaled} of {records.length} scores of record have a photo scale and a face outline, so their area is also given in mm² (the scored % of the outlined face,
        divided by the square of the pixels per mm). Growth is the least-squares slope of mm² on days since the start.
      </p>
      <div className="overflow-x-auto">
        <table className="data">
          <thead>
            <tr>
              <th scope="col">Specimen</th><th scope="col" className="text-right!">final area</th><th scope="col" className="text-right!">final area (mm²)</th>
              <th scope="col" className="text-right!">growth (mm²/day)</th>
              {SPOT_SIZE_CLASSES.map((c) => <th key={c.key} scope="col" className="text-right!">spots {c.label}</th>)}
            </tr>
          </thead>
          <tbody>
            {outcomes.map((o) => {
              const a = areas.get(o.placementId);
              const last = o.observations[o.observations.length - 1];
              const classes = last ? byKey.get(areaKey(last.inspectionId, o.specimenId))?.sizeClasses : null;
              return (
                <tr key={o.placementId} data-specimen={o.specimenLabel}>
                  <th scope="row" className="font-medium! text-left text-(color:--ink)!">{o.specimenLabel}{o.entry > 0 ? <span className="block text-xs muted">from day {fmtDay(o.entry)}</span> : null}</th>
                  <td className="text-right tabular-nums">{fmtPercent(o.finalAreaPercent)}</td>
                  <td className="text-right tabular-nums" data-area-mm2={a?.finalAreaMm2 ?? ""}>{a?.finalAreaMm2 == null ? "—" : formatMm2(a.finalAreaMm2)}</td>
                  <td className="text-right tabular-nums">{a?.growthMm2PerDay == null ? "—" : a.growthMm2PerDay.toFixed(3)}</td>
                  {SPOT_SIZE_CLASSES.map((c) => <td key={c.key} className="text-right tabular-nums">{classes ? classes[c.key] : "—"}</td>)}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {protocol.length > 0 && (flagged.length === 0 ? <p className="text-sm">Every scored photo was recorded with every point of the photo protocol.</p> : (
        <details className="text-sm" open={flagged.length <= 8}>
          <summary className="cursor-pointer" data-protocol-flagged={flagged.length}>⚑ {flagged.length} scored photo{flagged.length === 1 ? " was" : "s were"} taken without every point of the photo protocol (or without a protocol record)</summary>
          <ul className="list-disc pl-5 pt-1">
            {flagged.map((r) => (
              <li key={`${r.inspectionId}|${r.specimenId}`}>{label.get(r.specimenId) ?? "specimen"}, day {r.dayNumber}: {r.protocolMissing == null ? "no protocol record" : r.protocolMissing.join("; ")}</li>
            ))}
          </ul>
        </details>
      ))}
    </section>
  );
}
