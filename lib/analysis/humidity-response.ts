// From a trial's first-rust intervals to the humidity a material should be kept below: an
// interval-censored Weibull (accelerated failure time) fit of time to first rust against each jar's
// measured mean RH, with material class, treatment and (when trials are pooled) trial as covariates;
// the predicted time until p % of specimens rust at each RH with a pointwise 95 % band (delta
// method); and the storage threshold where that time meets a horizon. Pure: the caller loads the
// rows (db/queries/humidity-response.ts).
import { coxRegression } from "@/lib/stats/cox";
import { Z_975 } from "@/lib/stats/distributions";
import {
  lognormalIntervalRegression, weibullIntervalRegression, type IntervalRegressionFit,
} from "@/lib/stats/interval-regression";
import { survivalCurveFromTurnbull, turnbull } from "@/lib/stats/turnbull";
import { MATERIAL_LABELS } from "./groups";
import { covariateDesign, type CovariateDesign } from "./humidity-covariates";
import {
  DEFAULT_RESPONSE_OPTIONS, MIN_HUMIDITY_LEVELS, type ComboResult, type HumidityResponse, type LevelCheck, type ResponseOptions, type ResponseRow, type Threshold,
} from "./humidity-result";
import { fmtRh, formatHorizon, thresholdSentence, whoOf } from "./humidity-sentences";

/** Jars whose target RH is within this many %RH count as one humidity level. */
const LEVEL_ROUNDING_RH = 1;

// The horizon may reach this many times past the longest observation before the threshold is
// flagged as an extrapolation (trade practice: a factor of a few, not an order of magnitude).
const EXTRAPOLATION_FACTOR = 3;

interface Design {
  names: string[];
  materials: string[];
  treatments: { id: string; name: string; kind: string }[];
  trials: string[];
  row(rh: number, material: string, treatmentId: string, trialId: string, covariates?: readonly number[]): number[];
  /** The design row of a response row, with its own covariate values. */
  of(r: ResponseRow, rh?: number): number[];
}

/** Dummy coding with the most common material, the control (or first) treatment and the first trial as references. */
function buildDesign(rows: readonly ResponseRow[], referenceTrialId: string, cov: CovariateDesign): Design {
  const countBy = (key: (r: ResponseRow) => string) => {
    const m = new Map<string, number>();
    for (const r of rows) m.set(key(r), (m.get(key(r)) ?? 0) + 1);
    return m;
  };
  const materialCounts = countBy((r) => r.materialClass);
  const materials = [...materialCounts.keys()].sort((a, b) => (materialCounts.get(b)! - materialCounts.get(a)!) || a.localeCompare(b));
  const treatmentMap = new Map<string, { id: string; name: string; kind: string }>();
  for (const r of rows) treatmentMap.set(r.treatmentId, { id: r.treatmentId, name: r.treatmentName, kind: r.treatmentKind });
  const treatments = [...treatmentMap.values()].sort((a, b) =>
    (a.kind === "control" ? 0 : 1) - (b.kind === "control" ? 0 : 1) || a.name.localeCompare(b.name));
  const trials = [...new Set(rows.map((r) => r.trialId))].sort((a, b) => (a === referenceTrialId ? -1 : b === referenceTrialId ? 1 : a.localeCompare(b)));
  const names = [
    "RH (%RH)",
    ...materials.slice(1).map((m) => `${MATERIAL_LABELS[m] ?? m} (vs ${MATERIAL_LABELS[materials[0]] ?? materials[0]})`),
    ...treatments.slice(1).map((t) => `${t.name} (vs ${treatments[0].name})`),
    ...trials.slice(1).map((_, i) => `Trial ${i + 2} (vs this trial)`),
    ...cov.names,
  ];
  const row = (rh: number, material: string, treatmentId: string, trialId: string, covariates: readonly number[] = cov.reference) => [
    rh,
    ...materials.slice(1).map((m) => (m === material ? 1 : 0)),
    ...treatments.slice(1).map((t) => (t.id === treatmentId ? 1 : 0)),
    ...trials.slice(1).map((t) => (t === trialId ? 1 : 0)),
    ...covariates,
  ];
  return {
    names, materials, treatments, trials, row,
    of: (r, rh = r.measuredRhPercent) => row(rh, r.materialClass, r.treatmentId, r.trialId, cov.values(r)),
  };
}

/** log of the p-quantile at x, and its standard error by the delta method on (intercept, β, log σ). */
function logQuantile(fit: IntervalRegressionFit, p: number, x: readonly number[]): { value: number; se: number } {
  const value = Math.log(fit.quantile(p, [...x]));
  const linear = fit.intercept + x.reduce((s, xi, i) => s + xi * fit.coefficients[i], 0);
  // log t_p = intercept + x'β + σ·w_p, so ∂/∂log σ = σ·w_p = value − linear.
  const gradient = [1, ...x, value - linear];
  let variance = 0;
  for (let i = 0; i < gradient.length; i++) {
    for (let j = 0; j < gradient.length; j++) variance += gradient[i] * fit.covariance[i][j] * gradient[j];
  }
  return { value, se: Math.sqrt(Math.max(0, variance)) };
}

const RH_GRID = Array.from({ length: 101 }, (_, i) => i);

/** The highest RH in [0, 100] where f(rh) ≥ target, for f decreasing in rh; bisection on a 1 %RH bracket. */
function crossing(f: (rh: number) => number, target: number): number | "all" | "none" {
  if (f(100) >= target) return "all";
  if (f(0) < target) return "none";
  let lo = 0;
  for (const rh of RH_GRID) {
    if (f(rh) >= target) lo = rh;
    else break;
  }
  let hi = Math.min(100, lo + 1);
  for (let i = 0; i < 50; i++) {
    const mid = (lo + hi) / 2;
    if (f(mid) >= target) lo = mid;
    else hi = mid;
  }
  return lo;
}

/**
 * The threshold and its interval from the pointwise band: the limits are where the band's edges meet
 * the horizon (an inverse-prediction interval in the spirit of Fieller's, read off the same band the
 * chart shows). Needs the fitted time to fall with RH.
 */
function thresholdOf(fit: IntervalRegressionFit, p: number, horizonDays: number, x: (rh: number) => number[]): Threshold {
  const slope = fit.coefficients[0];
  if (!(slope < 0)) return { rhPercent: null, lower95: null, upper95: null, status: "no-trend" };
  const target = Math.log(horizonDays);
  const at = (rh: number) => logQuantile(fit, p, x(rh));
  const point = crossing((rh) => at(rh).value, target);
  const low = crossing((rh) => { const q = at(rh); return q.value - Z_975 * q.se; }, target);
  const high = crossing((rh) => { const q = at(rh); return q.value + Z_975 * q.se; }, target);
  const num = (v: number | "all" | "none") => (typeof v === "number" ? v : null);
  if (point === "all") return { rhPercent: null, lower95: num(low), upper95: null, status: "above-range" };
  if (point === "none") return { rhPercent: null, lower95: null, upper95: num(high), status: "below-range" };
  return { rhPercent: point, lower95: low === "none" ? 0 : num(low), upper95: high === "all" ? null : num(high), status: "found" };
}

function weibullShare(fit: IntervalRegressionFit, day: number, x: readonly number[]): number {
  if (day <= 0) return 0;
  const linear = fit.intercept + x.reduce((s, xi, i) => s + xi * fit.coefficients[i], 0);
  return 1 - Math.exp(-Math.exp((Math.log(day) - linear) / fit.scale));
}

const levelOf = (targetRhPercent: number) => Math.round(targetRhPercent / LEVEL_ROUNDING_RH) * LEVEL_ROUNDING_RH;

/** How many humidity levels these jar targets make (jars within 1 %RH are one level). */
export function humidityLevelCount(targetRhPercents: readonly number[]): number {
  return new Set(targetRhPercents.map(levelOf)).size;
}

/** Humidity levels: jars grouped by target RH (rounded); their measured means averaged over specimens. */
export function humidityLevels(rows: readonly ResponseRow[]) {
  const byLevel = new Map<number, ResponseRow[]>();
  for (const r of rows) {
    const key = levelOf(r.targetRhPercent);
    byLevel.set(key, [...(byLevel.get(key) ?? []), r]);
  }
  return [...byLevel.entries()].sort(([a], [b]) => a - b).map(([target, members]) => ({
    label: `${target} %RH target`,
    targetRhPercent: target,
    measuredRhPercent: members.reduce((s, m) => s + m.measuredRhPercent, 0) / members.length,
    jars: new Set(members.map((m) => m.chamberId)).size,
    n: members.length,
    events: members.filter((m) => Number.isFinite(m.upper)).length,
    members,
  }));
}

export function humidityResponse(
  allRows: readonly ResponseRow[],
  options: ResponseOptions = DEFAULT_RESPONSE_OPTIONS,
  referenceTrialId: string = allRows[0]?.trialId ?? "",
): HumidityResponse {
  const cov = covariateDesign(allRows, options.covariates);
  const rows = cov.kept;
  if (!(options.p > 0 && options.p < 1)) throw new RangeError("The share rusted must be between 0 and 100 % (exclusive).");
  if (!(options.horizonDays > 0) || !Number.isFinite(options.horizonDays)) throw new RangeError("The horizon must be a positive number of days.");
  const levels = humidityLevels(rows);
  const longest = rows.reduce((m, r) => Math.max(m, Number.isFinite(r.upper) ? r.upper : r.lower), 0);
  const base: HumidityResponse = {
    options,
    levels: levels.map(({ members: _m, ...l }) => l),
    fit: null, reason: null, combos: [], check: [], cox: null, coxError: null,
    longestObservationDays: longest,
    warnings: cov.leftOut ? [`${cov.leftOut} specimen${cov.leftOut === 1 ? " has" : "s have"} no weighing before the trial and ${cov.leftOut === 1 ? "is" : "are"} left out of the models with initial mass.`] : [],
  };
  const events = rows.filter((r) => Number.isFinite(r.upper)).length;
  if (levels.length < MIN_HUMIDITY_LEVELS) {
    return { ...base, reason: `A humidity response needs specimens at ${MIN_HUMIDITY_LEVELS} or more humidity levels; this analysis has ${levels.length}.` };
  }
  if (events === 0) return { ...base, reason: "No specimen has rusted yet: there is no time to first rust to model." };

  const design = buildDesign(rows, referenceTrialId, cov);
  const fitRows = rows.map((r) => ({ lower: r.lower, upper: r.upper, x: design.of(r) }));
  let fit: IntervalRegressionFit;
  try {
    fit = weibullIntervalRegression(fitRows);
  } catch (err) {
    return { ...base, reason: `The model could not be fitted: ${err instanceof Error ? err.message : String(err)}` };
  }
  let lognormal: IntervalRegressionFit | null = null;
  try {
    lognormal = lognormalIntervalRegression(fitRows);
  } catch {
    lognormal = null;
  }

  const combos: ComboResult[] = [];
  for (const material of design.materials) {
    for (const treatment of design.treatments) {
      const members = rows.filter((r) => r.materialClass === material && r.treatmentId === treatment.id);
      if (members.length === 0) continue;
      const x = (rh: number) => design.row(rh, material, treatment.id, design.trials[0]);
      const curve = RH_GRID.filter((rh) => rh % 2 === 0).map((rh) => {
        const q = logQuantile(fit, options.p, x(rh));
        return { rhPercent: rh, days: Math.exp(q.value), lower95: Math.exp(q.value - Z_975 * q.se), upper95: Math.exp(q.value + Z_975 * q.se) };
      });
      const threshold = thresholdOf(fit, options.p, options.horizonDays, x);
      const materialLabel = MATERIAL_LABELS[material] ?? material;
      combos.push({
        key: `${material}|${treatment.id}`,
        materialClass: material, materialLabel, treatmentId: treatment.id, treatmentName: treatment.name,
        n: members.length, curve, threshold,
        lognormalThreshold: lognormal ? thresholdOf(lognormal, options.p, options.horizonDays, x) : null,
        sentence: thresholdSentence(threshold, whoOf(materialLabel, treatment), options),
      });
    }
  }

  // Model check: the Turnbull estimate per level against the fit averaged over the level's specimens.
  const days = [...new Set(rows.flatMap((r) => [r.lower, r.upper]).filter((d) => Number.isFinite(d) && d > 0))].sort((a, b) => a - b);
  const check: LevelCheck[] = levels.map((level) => {
    const steps = survivalCurveFromTurnbull(turnbull(level.members.map((m) => ({ lower: m.lower, upper: m.upper }))));
    const xs = level.members.map((m) => design.of(m));
    const grid = [0, ...days];
    return {
      label: level.label,
      meanRhPercent: level.measuredRhPercent,
      n: level.n,
      events: level.events,
      observed: [{ day: 0, rustedShare: 0 }, ...steps.map((s) => ({ day: s.time, rustedShare: 1 - s.survival }))],
      fitted: grid.map((day) => ({ day, rustedShare: xs.reduce((s, x) => s + weibullShare(fit, day, x), 0) / xs.length })),
    };
  });

  // Cox on the same covariates, RH per 10 %RH; rust counted at the inspection it was seen (right end).
  let cox: HumidityResponse["cox"] = null;
  let coxError: string | null = null;
  try {
    const c = coxRegression(rows.map((r) => ({
      time: Number.isFinite(r.upper) ? Math.max(r.upper, 1e-6) : Math.max(r.lower, 1e-6),
      event: Number.isFinite(r.upper),
      x: design.of(r, r.measuredRhPercent / 10),
    })));
    cox = {
      hazardRatios: design.names.map((name, i) => ({
        name: i === 0 ? "RH (per 10 %RH)" : name,
        hazardRatio: c.hazardRatios[i], lower95: c.lower95[i], upper95: c.upper95[i],
      })),
      note: "Cox model on the same covariates, with rust counted at the inspection where it was first seen (Efron ties); a hazard ratio above 1 means rust comes sooner.",
    };
  } catch (err) {
    coxError = err instanceof Error ? err.message : String(err);
  }

  const warnings: string[] = [...base.warnings];
  if (options.horizonDays > EXTRAPOLATION_FACTOR * longest) {
    warnings.push(`The horizon (${formatHorizon(options.horizonDays)}) lies far beyond the longest observation (${Math.round(longest)} days): the threshold extrapolates the fitted model and is only as good as its shape. Re-check it as the trial runs on.`);
  }
  const measured = rows.map((r) => r.measuredRhPercent);
  const [minRh, maxRh] = [Math.min(...measured), Math.max(...measured)];
  for (const c of combos) {
    const t = c.threshold.rhPercent;
    if (t !== null && (t < minRh || t > maxRh)) {
      warnings.push(`${c.materialLabel}, ${c.treatmentName}: the threshold (${fmtRh(t)}) lies outside the humidities measured (${Math.round(minRh)}–${fmtRh(maxRh)}).`);
    }
  }
  const perLevelJars = levels.filter((l) => l.jars === 1).length;
  if (perLevelJars > 0) {
    warnings.push(`${perLevelJars} humidity level${perLevelJars === 1 ? " has" : "s have"} a single jar: effects of that jar cannot be told apart from effects of humidity.`);
  }
  if (events < 2 * design.names.length + 2) {
    warnings.push(`Only ${events} specimens have rusted for ${design.names.length + 2} model parameters: treat the threshold as a first estimate.`);
  }

  return {
    ...base,
    fit: {
      distribution: "weibull",
      n: rows.length,
      events,
      coefficients: [
        { name: "Intercept", estimate: fit.intercept, standardError: fit.standardErrors[0] },
        ...design.names.map((name, i) => ({ name, estimate: fit.coefficients[i], standardError: fit.standardErrors[i + 1] })),
      ],
      scale: fit.scale,
      logLik: fit.logLik,
      lognormalLogLik: lognormal?.logLik ?? null,
    },
    combos,
    check,
    cox,
    coxError,
    warnings,
  };
}
