import Link from "next/link";
import { listTrialsForAnalysis } from "@/db/queries/analysis";
import { loadHumidityResponse } from "@/db/queries/humidity-response";
import { listStorageRules } from "@/db/queries/storage-rules";
import { blindTrialIds } from "@/db/queries/trial-access";
import { trialPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { MIN_HUMIDITY_LEVELS, type Threshold } from "@/lib/analysis/humidity-result";
import { formatHorizon } from "@/lib/analysis/humidity-sentences";
import { responseOptions, responsePageQuery } from "@/lib/validation/storage-rules";
import { COVARIATE_LABELS, RESPONSE_COVARIATES } from "@/lib/analysis/humidity-covariates";
import { AcceptRuleForm } from "@/components/analysis/accept-rule-form";
import { modelCheckSpec, responseSpec } from "@/components/analysis/humidity-specs";
import { fmtStat } from "@/components/analysis/format";
import { VegaChart } from "@/components/analysis/vega-chart";
import { TrialRules } from "@/components/analysis/trial-rules";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Humidity response" };

const rh = (v: number | null) => (v === null ? "—" : `${v.toFixed(0)} %RH`);

function thresholdCell(t: Threshold): string {
  if (t.status !== "found") return t.status === "no-trend" ? "no trend with RH" : t.status === "above-range" ? "above 100 %RH" : "below 0 %RH";
  const lo = t.lower95 === null ? "…" : t.lower95.toFixed(0);
  const hi = t.upper95 === null ? "…" : t.upper95.toFixed(0);
  return `${rh(t.rhPercent)} (${lo}–${hi})`;
}

export default async function HumidityPage({ params, searchParams }: { params: Promise<{ trialId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const [{ trialId }, raw] = await Promise.all([params, searchParams]);
  const { ctx, trial } = await trialPage("/trials/[trialId]/humidity", trialId);
  const { query: q, problems } = responsePageQuery(raw);
  const [candidates, blind] = await Promise.all([listTrialsForAnalysis({ labId: ctx.labId }), blindTrialIds(ctx)]);
  // Trials that can be pooled: the lab's others with scores, except those the viewer scores blind.
  const poolable = candidates.filter((t) => t.id !== trial.id && t.recordScores > 0 && !blind.has(t.id));
  const pool = q.pool.filter((id) => poolable.some((t) => t.id === id));
  // History covariates are for reading the models; a storage rule is accepted from the model without them.
  const options = { ...responseOptions(q), covariates: q.cov };
  const [{ response: r, jars, trials, movedLeftOut }, rules] = await Promise.all([
    loadHumidityResponse({ labId: ctx.labId, trial, poolTrialIds: pool, options }),
    listStorageRules({ labId: ctx.labId, userId: ctx.userId, trialId: trial.id }),
  ]);
  const mayAccept = can(ctx.role, "storageRules.accept") && q.cov.length === 0;
  const pct = `${+(options.p * 100).toFixed(1)} %`;
  const horizon = formatHorizon(options.horizonDays);

  return (
    <div className="space-y-5">
      <div className="space-y-1">
        <h1 className="text-2xl font-semibold">Humidity response</h1>
        <p className="text-sm muted max-w-3xl">
          How the time to first rust depends on the humidity each jar actually held, and the highest humidity at which
          fewer than {pct} of specimens rust within {horizon}: the threshold a lab can adopt as its storage rule.
        </p>
      </div>

      <form method="get" className="panel p-4 flex flex-wrap items-end gap-4" aria-label="Threshold choices">
        <div className="space-y-1">
          <label htmlFor="share" className="block text-sm font-medium">Share rusted (%)</label>
          <input id="share" name="share" type="number" min={1} max={50} step="any" defaultValue={q.share} className="field w-28" />
        </div>
        <div className="space-y-1">
          <label htmlFor="horizon" className="block text-sm font-medium">Horizon (years)</label>
          <input id="horizon" name="horizon" type="number" min={0.1} max={100} step="any" defaultValue={q.horizon} className="field w-28" />
        </div>
        {poolable.length > 0 && (
          <fieldset className="space-y-1">
            <legend className="text-sm font-medium">Pool with other trials (a trial term is added)</legend>
            <div className="flex flex-wrap gap-3">
              {poolable.map((t) => (
                <label key={t.id} className="flex items-center gap-1 text-sm">
                  <input type="checkbox" name="pool" value={t.id} defaultChecked={pool.includes(t.id)} /> {t.title}
                </label>
              ))}
            </div>
          </fieldset>
        )}
        <fieldset className="space-y-1">
          <legend className="text-sm font-medium">Specimen history in the models</legend>
          <div className="flex flex-wrap gap-3">
            {RESPONSE_COVARIATES.map((c) => (
              <label key={c} className="flex items-center gap-1 text-sm">
                <input type="checkbox" name="cov" value={c} defaultChecked={q.cov.includes(c)} /> {COVARIATE_LABELS[c]}
              </label>
            ))}
          </div>
          {q.cov.length > 0 && <p className="text-xs muted max-w-md">Curves and thresholds are drawn for specimens without chloride found and of mean initial mass. Storage rules are accepted from the model without these covariates.</p>}
        </fieldset>
        <button type="submit" className="btn">Update</button>
      </form>

      {problems.length > 0 && (
        <div role="alert" className="rounded-md bg-rust-50 text-rust-800 px-3 py-2 text-sm">
          {problems.map((p) => <p key={p}>{p}</p>)}
        </div>
      )}

      {!r.fit ? (
        <EmptyState
          text={`${r.reason} A storage threshold needs time to first rust at ${MIN_HUMIDITY_LEVELS} or more humidity levels with some rust seen; pooling with another trial of the lab can supply the missing levels.`}
          action={{ href: `/trials/${trial.id}/compare`, label: "Open the comparison" }}
        />
      ) : (
        <>
          {r.warnings.length > 0 && (
            <div role="note" className="rounded-md border border-rust-300 bg-rust-50 text-rust-900 p-3 text-sm space-y-1">
              <p className="font-medium">Read the threshold with care</p>
              <ul className="list-disc pl-5">{r.warnings.map((w) => <li key={w}>{w}</li>)}</ul>
            </div>
          )}

          <section className="panel p-4 space-y-3" aria-labelledby="thresholds-h">
            <h2 id="thresholds-h" className="font-semibold">Storage thresholds</h2>
            <ul className="space-y-1 text-sm" data-testid="threshold-sentences">
              {r.combos.map((c) => <li key={c.key}>{c.sentence}</li>)}
            </ul>
            <div className="overflow-x-auto">
              <table className="data">
                <caption className="text-left text-sm font-medium pb-1">Highest RH with fewer than {pct} rusted within {horizon} (95 % CI)</caption>
                <thead>
                  <tr>
                    <th scope="col">Material class</th><th scope="col">Treatment</th><th scope="col" className="text-right!">specimens</th>
                    <th scope="col">Weibull threshold</th><th scope="col">Lognormal check</th>{mayAccept && <th scope="col">Storage rule</th>}
                  </tr>
                </thead>
                <tbody>
                  {r.combos.map((c) => (
                    <tr key={c.key}>
                      <th scope="row" className="font-medium! text-left text-(color:--ink)!">{c.materialLabel}</th>
                      <td>{c.treatmentName}</td>
                      <td className="text-right tabular-nums">{c.n}</td>
                      <td className="tabular-nums">{thresholdCell(c.threshold)}</td>
                      <td className="tabular-nums">{c.lognormalThreshold ? thresholdCell(c.lognormalThreshold) : "did not fit"}</td>
                      {mayAccept && (
                        <td>
                          {c.threshold.status === "found"
                            ? <AcceptRuleForm trialId={trial.id} materialClass={c.materialClass} treatmentId={c.treatmentId} share={q.share} horizon={q.horizon} pool={pool} label={`${c.materialLabel}, ${c.treatmentName}`} />
                            : <span className="text-xs muted">nothing to accept</span>}
                        </td>
                      )}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
            <p className="text-xs muted max-w-3xl">
              The lognormal column fits the same data with another distribution: where it differs much from the Weibull
              threshold, the answer leans on the shape of the model more than on the data.
            </p>
          </section>

          <section className="panel p-4 space-y-2 break-inside-avoid-page" aria-labelledby="curve-h">
            <h2 id="curve-h" className="font-semibold">Predicted time until {pct} have rusted</h2>
            <VegaChart testId="response-chart" spec={responseSpec(r)} label={`Days until ${pct} of specimens rust, against relative humidity, one line per material class and treatment, with 95 % bands; a dashed line marks the ${horizon} horizon.`} />
            <p className="text-xs muted max-w-3xl">
              Lines: the Weibull fit; shaded: pointwise 95 % band by the delta method on the fitted parameters. The threshold is
              where a line meets the horizon; its limits are where the band&apos;s edges meet it. Longest observation: {Math.round(r.longestObservationDays)} days.
            </p>
          </section>

          <section className="panel p-4 space-y-2 break-inside-avoid-page" aria-labelledby="check-h">
            <h2 id="check-h" className="font-semibold">Model check</h2>
            <VegaChart testId="model-check-chart" spec={modelCheckSpec(r)} label="Share of specimens rusted against days, per humidity level: steps are the Turnbull estimate of the data, dashed lines the fitted model." />
            <p className="text-xs muted max-w-3xl">
              Steps: Turnbull&apos;s estimate per humidity level (no model). Dashed: the Weibull fit averaged over the level&apos;s
              specimens. Where they part, the model does not describe that level well and the threshold deserves doubt.
            </p>
          </section>

          <div className="grid gap-5 lg:grid-cols-2">
            <section className="panel p-4 space-y-2" aria-labelledby="coef-h">
              <h2 id="coef-h" className="font-semibold">Weibull model</h2>
              <table className="data">
                <caption className="text-left text-sm pb-1 muted">log(time to first rust, days) = linear predictor + scale × extreme-value error; n = {r.fit.n}, rusted = {r.fit.events}</caption>
                <thead><tr><th scope="col">Term</th><th scope="col" className="text-right!">estimate</th><th scope="col" className="text-right!">std. error</th></tr></thead>
                <tbody>
                  {r.fit.coefficients.map((c) => (
                    <tr key={c.name}><th scope="row" className="font-medium! text-left text-(color:--ink)!">{c.name}</th><td className="text-right tabular-nums">{fmtStat(c.estimate, 3)}</td><td className="text-right tabular-nums">{fmtStat(c.standardError, 3)}</td></tr>
                  ))}
                  <tr><th scope="row" className="font-medium! text-left text-(color:--ink)!">Scale</th><td className="text-right tabular-nums">{fmtStat(r.fit.scale, 3)}</td><td /></tr>
                </tbody>
              </table>
              <p className="text-xs muted">Log-likelihood: Weibull {fmtStat(r.fit.logLik, 2)}{r.fit.lognormalLogLik !== null && <>, lognormal {fmtStat(r.fit.lognormalLogLik, 2)} (higher fits better)</>}.</p>
            </section>

            <section className="panel p-4 space-y-2" aria-labelledby="cox-h">
              <h2 id="cox-h" className="font-semibold">Hazard ratios (Cox model)</h2>
              {r.cox ? (
                <>
                  <table className="data">
                    <thead><tr><th scope="col">Covariate</th><th scope="col" className="text-right!">hazard ratio</th><th scope="col">95 % CI</th></tr></thead>
                    <tbody>
                      {r.cox.hazardRatios.map((h) => (
                        <tr key={h.name}><th scope="row" className="font-medium! text-left text-(color:--ink)!">{h.name}</th><td className="text-right tabular-nums">{fmtStat(h.hazardRatio, 2)}</td><td className="tabular-nums">{fmtStat(h.lower95, 2)}–{fmtStat(h.upper95, 2)}</td></tr>
                      ))}
                    </tbody>
                  </table>
                  <p className="text-xs muted">{r.cox.note}</p>
                </>
              ) : <p className="text-sm muted">The Cox model could not be fitted: {r.coxError}</p>}
            </section>
          </div>
        </>
      )}

      <section className="panel p-4 space-y-2" aria-labelledby="jars-h">
        <h2 id="jars-h" className="font-semibold">Humidity each jar measured</h2>
        <table className="data">
          <thead><tr><th scope="col">Jar</th>{trials.length > 1 && <th scope="col">Trial</th>}<th scope="col" className="text-right!">target</th><th scope="col" className="text-right!">measured mean</th><th scope="col" className="text-right!">specimens</th></tr></thead>
          <tbody>
            {jars.map((j) => (
              <tr key={`${j.trialTitle}|${j.chamberId}`}>
                <th scope="row" className="font-medium! text-left text-(color:--ink)!"><Link className="link" href={`/chambers/${j.chamberId}`}>{j.chamberName}</Link></th>
                {trials.length > 1 && <td>{j.trialTitle}</td>}
                <td className="text-right tabular-nums">{j.targetRhPercent.toFixed(1)} %RH</td>
                <td className="text-right tabular-nums">{j.measuredRhPercent === null ? "no readings" : `${j.measuredRhPercent.toFixed(1)} %RH`}</td>
                <td className="text-right tabular-nums">{j.specimens}{j.withoutReadings > 0 && <span className="muted"> ({j.withoutReadings} on target RH: no readings)</span>}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <p className="text-xs muted max-w-3xl">
          Each specimen is placed at the time-weighted mean RH its jar logged from its placement until the inspection that
          closed its interval (hygrometer corrections applied, gaps over the logger&apos;s usual spacing left out); a jar without
          readings stands at its target. Specimens moved to another jar count in their first jar, right-censored at the move
          {movedLeftOut > 0 ? ` (${movedLeftOut} later placement${movedLeftOut === 1 ? "" : "s"} left out)` : ""}.
        </p>
      </section>

      <section className="panel p-4 space-y-2" aria-labelledby="rules-h">
        <h2 id="rules-h" className="font-semibold">Storage rules from this trial</h2>
        <TrialRules rules={rules} empty={`None accepted yet. ${mayAccept ? "Accept a threshold above to make it the lab's rule." : "The lab lead accepts thresholds as rules."}`} />
      </section>
    </div>
  );
}
