// How well the chamber held its band over the chosen period (lib/climate/band-stats on the
// corrected readings): time in band, mean, worst excursion, settling after the last disturbance.
import type { ChamberSeries } from "@/db/queries/readings-series";
import { formatDateTime, formatNumber } from "@/lib/format";

export function formatMinutes(min: number): string {
  if (min < 90) return `${Math.round(min)} min`;
  if (min < 48 * 60) return `${(min / 60).toFixed(1)} h`;
  return `${(min / 1440).toFixed(1)} days`;
}

export function ClimateSummary({ series }: { series: ChamberSeries }) {
  const s = series.stats;
  const worst = s.worstExcursion;
  return (
    <div className="space-y-3 text-sm">
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
        <dt className="muted">Target band</dt><dd>{formatNumber(series.band.minRh, 1)}–{formatNumber(series.band.maxRh, 1)} %RH</dd>
        <dt className="muted">Time in band</dt>
        <dd data-testid="time-in-band">{s.fractionInBand == null ? "not enough data" : `${(100 * s.fractionInBand).toFixed(1)} % of ${formatMinutes(s.countedMinutes)} counted`}</dd>
        <dt className="muted">Mean RH (time-weighted)</dt><dd>{formatNumber(s.meanRhPercent, 1, "%RH")}</dd>
        <dt className="muted">Lowest / highest</dt><dd>{formatNumber(s.minRhPercent, 1)} / {formatNumber(s.maxRhPercent, 1)} %RH</dd>
        <dt className="muted">Excursions</dt><dd>{s.excursions.length}</dd>
        <dt className="muted">Worst excursion</dt>
        <dd>
          {worst ? (
            <>{worst.direction === "above" ? "up to" : "down to"} {formatNumber(worst.worstRhPercent, 1, "%RH")} for {formatMinutes(worst.durationMinutes)}{worst.openEnded ? " (data ended or a gap began before it was back in band)" : ""}, from {formatDateTime(worst.start)}</>
          ) : "none"}
        </dd>
        {series.settle.map((e) => (
          <div key={e.label} className="contents">
            <dt className="muted">Settled after {e.label}</dt>
            <dd>{!e.hasData ? `no readings after ${formatDateTime(e.at)}` : e.minutes == null ? `not back in band (held 1 h) since ${formatDateTime(e.at)}` : `${formatMinutes(e.minutes)} after ${formatDateTime(e.at)}`}</dd>
          </div>
        ))}
      </dl>
      <p className="text-xs muted">
        Each reading holds until the next; gaps over {formatMinutes(series.maxGapMinutes)} are not counted. {series.count.toLocaleString("en")} readings in this period
        {series.points.length < series.count ? `, charted as ${series.points.length.toLocaleString("en")} points (lowest and highest of each stretch kept)` : ""}.
        Dew point is computed from RH and temperature (over water).
      </p>
      {series.offsets.length > 0 && (
        <p className="text-xs">Corrected by hygrometer checks: {series.offsets.map((o) => `${o.instrument} ${o.offsetPercent >= 0 ? "−" : "+"}${Math.abs(o.offsetPercent).toFixed(2)} %RH${o.slope != null ? ` and slope ${o.slope.toFixed(3)}` : ""} checked ${formatDateTime(o.from)} (${o.saltId})`).join("; ")}. Between two checks of an instrument the correction drifts linearly from one to the other; before the first and after the last the nearest is held. Logged values are unchanged.</p>
      )}
    </div>
  );
}
