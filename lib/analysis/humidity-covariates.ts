// Specimen-history covariates offered in the humidity-response models (lib/analysis/humidity-response.ts):
// whether chloride was found before the trial, and the specimen's first weighing. They enter the
// Weibull and Cox models as extra columns after RH, material, treatment and trial; curves and
// thresholds are drawn at the reference (no chloride found) and at the mean initial mass.
import type { ResponseRow } from "./humidity-result";

export const RESPONSE_COVARIATES = ["chloride", "initialMass"] as const;
export type ResponseCovariate = (typeof RESPONSE_COVARIATES)[number];

export const COVARIATE_LABELS: Record<ResponseCovariate, string> = {
  chloride: "Chloride found before the trial (vs not found or not tested)",
  initialMass: "Initial mass (per g, centred on the mean)",
};

export type CovariateDesign = {
  covariates: ResponseCovariate[];
  /** Rows the fit can use: those with every chosen covariate known. */
  kept: ResponseRow[];
  /** Rows left out for want of a covariate value (an initial mass). */
  leftOut: number;
  names: string[];
  /** The covariate columns of one row. */
  values(row: ResponseRow): number[];
  /** The covariate columns at the reference the curves are drawn for. */
  reference: number[];
};

/** The chosen covariates (in RESPONSE_COVARIATES order, each once) and the rows that carry them. */
export function covariateDesign(rows: readonly ResponseRow[], chosen: readonly ResponseCovariate[] = []): CovariateDesign {
  const covariates = RESPONSE_COVARIATES.filter((c) => chosen.includes(c));
  const kept = rows.filter((r) => !covariates.includes("initialMass") || (r.initialMassG != null && Number.isFinite(r.initialMassG)));
  const meanMass = kept.length ? kept.reduce((s, r) => s + (r.initialMassG ?? 0), 0) / kept.length : 0;
  return {
    covariates, kept, leftOut: rows.length - kept.length,
    names: covariates.map((c) => COVARIATE_LABELS[c]),
    values: (r) => covariates.map((c) => (c === "chloride" ? (r.chloridePresent ? 1 : 0) : (r.initialMassG as number) - meanMass)),
    reference: covariates.map(() => 0),
  };
}
