// What each specimen's jar measured over its placement, and the re-analysis without jars that spent
// too long out of band. Server component: the choices are a plain GET form, so each view has a URL.
import type { TrialExposure } from "@/db/queries/analysis";
import { exposureKeep } from "@/lib/analysis/exposure-params";
import { CONDENSATION_MARGIN_C } from "@/lib/climate/exposure";
import type { AnalysisQuery } from "@/lib/analysis/params";
import { formatDateTime } from "@/lib/format";

const hours = (minutes: number) => (minutes / 60).toFixed(1);
const pct = (share: number | null) => (share == null ? "—" : `${(share * 100).toFixed(1)}\u202f%`);

/** How the figures are made: shown beside the table on the page and in the report. */
export const EXPOSURE_METHOD =
  `Figures come from the jar's logged readings over each placement, corrected by the applied hygrometer checks of each instrument: ` +
  `between two checks the correction drifts linearly in time from one to the other; before the first check and after the last one the nearest check is held. ` +
  `Each reading holds until the next; gaps longer than the chamber page's gap limit are not counted. Condensation risk is time with the dew point ` +
  `(the frost point below 0 °C) within ${CONDENSATION_MARGIN_C} °C of the air temperature, judged only while a temperature was logged. ` +
  `Default thresholds: 25 %RH, where corrosion of chloride-bearing iron becomes appreciable (Watkinson & Lewis 2005), and 60 %RH, from where it is rapid (Watkinson, Rimmer & Emmerson 2019).`;

export function ExposureExclusionNote({ exposure }: { exposure: TrialExposure }) {
  const max = exposure.query.maxOutOfBandPercent;
  if (max == null) return null;
  const n = exposure.excluded.length;
  return (
    <p className="text-sm panel p-3" data-testid="exposure-excluded" role="status">
      Re-analysis: {n === 0 ? "no specimen was" : `${n} specimen${n === 1 ? " was" : "s were"}`} left out because a jar it sat in was out of its band
      more than {max} % of the placement&apos;s logged time{n === 0 ? "." : ": "}
      {exposure.excluded.map((e, i) => (
        <span key={e.specimenId}>{i > 0 ? "; " : ""}{e.specimenLabel} ({e.chamberName}, {e.outOfBandPercent.toFixed(1)} % out of band)</span>
      ))}
      {n > 0 ? ". The per-specimen table still lists them." : null}
    </p>
  );
}

export function ExposureForm({ base, q, exposure, errors }: { base: string; q: AnalysisQuery; exposure: TrialExposure; errors: Record<string, string[]> }) {
  const keep = exposureKeep(exposure.query);
  return (
    <form method="get" action={base} className="flex flex-wrap items-end gap-4 no-print" aria-label="Exposure choices">
      <input type="hidden" name="groupBy" value={q.groupBy} />
      <input type="hidden" name="outcome" value={q.outcome} />
      <input type="hidden" name="method" value={q.method} />
      <div className="space-y-1">
        <label htmlFor="ex-above" className="block text-sm font-medium">Time above (%RH, comma-separated)</label>
        <input id="ex-above" name="above" className="field" defaultValue={exposure.query.thresholdsRhPercent.join(",")} aria-invalid={errors.above ? true : undefined} aria-describedby={errors.above ? "ex-above-error" : undefined} />
        {errors.above && <p id="ex-above-error" className="text-sm text-rust-600" role="alert">{errors.above[0]}</p>}
      </div>
      <div className="space-y-1">
        <label htmlFor="ex-oob" className="block text-sm font-medium">Leave out specimens whose jar was out of band more than (%)</label>
        <input id="ex-oob" name="outOfBandMax" className="field" inputMode="decimal" defaultValue={keep.outOfBandMax ?? ""} placeholder="keep all"
          aria-invalid={errors.outOfBandMax ? true : undefined} aria-describedby={errors.outOfBandMax ? "ex-oob-error" : undefined} />
        {errors.outOfBandMax && <p id="ex-oob-error" className="text-sm text-rust-600" role="alert">{errors.outOfBandMax[0]}</p>}
      </div>
      <button type="submit" className="btn-quiet">Recompute</button>
    </form>
  );
}

export function ExposureTable({ exposure }: { exposure: TrialExposure }) {
  const thresholds = exposure.query.thresholdsRhPercent;
  if (exposure.placements.length === 0) return <p className="text-sm muted">No placement has a start time yet: exposure appears once the trial has started.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="data" data-testid="exposure-table">
        <thead>
          <tr>
            <th>Specimen</th><th>Jar (band)</th><th>From – to</th><th>Readings</th><th>Logged h</th><th>Mean RH</th><th>Out of band</th>
            {thresholds.map((t) => <th key={t}>h above {t} %RH</th>)}
            <th>h condensation risk (of h with temp.)</th>
          </tr>
        </thead>
        <tbody>
          {exposure.placements.map((p) => (
            <tr key={p.placementId}>
              <td>{p.specimenLabel}</td>
              <td>{p.chamberName} ({p.band.minRh}–{p.band.maxRh} %RH)</td>
              <td className="whitespace-nowrap">{formatDateTime(p.fromAt)} – {p.open ? "now" : formatDateTime(p.toAt)}</td>
              <td>{p.exposure.readings}</td>
              <td>{hours(p.exposure.countedMinutes)}</td>
              <td>{p.exposure.meanRhPercent == null ? "—" : `${p.exposure.meanRhPercent.toFixed(1)} %RH`}{p.exposure.corrected ? " *" : ""}</td>
              <td>{pct(p.exposure.outOfBandShare)}</td>
              {p.exposure.above.map((a) => <td key={a.thresholdRhPercent}>{hours(a.minutes)}</td>)}
              <td>{hours(p.exposure.condensationMinutes)} ({hours(p.exposure.minutesWithTemp)})</td>
            </tr>
          ))}
        </tbody>
      </table>
      {exposure.placements.some((p) => p.exposure.corrected) && <p className="text-xs muted mt-1">* corrected by hygrometer checks.</p>}
    </div>
  );
}

export function ExposureSection({ base, q, exposure, errors }: { base: string; q: AnalysisQuery; exposure: TrialExposure; errors: Record<string, string[]> }) {
  return (
    <details className="panel p-4" open={Object.keys(errors).length > 0 || exposure.query.maxOutOfBandPercent != null} data-testid="exposure-section">
      <summary className="font-semibold cursor-pointer">Chamber exposure: what each specimen&apos;s jar measured ({exposure.placements.length} placements)</summary>
      <div className="mt-3 space-y-3">
        <p className="text-sm muted">{EXPOSURE_METHOD}</p>
        <ExposureForm base={base} q={q} exposure={exposure} errors={errors} />
        <ExposureTable exposure={exposure} />
      </div>
    </details>
  );
}
