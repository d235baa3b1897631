// The humidity response's choices (share rusted, horizon, pooled trials) and accepting a storage
// rule: one schema each, for the page's URL, the form and the JSON API alike.
import { z } from "zod";
import { DEFAULT_RESPONSE_OPTIONS, type ResponseOptions } from "@/lib/analysis/humidity-result";
import { RESPONSE_COVARIATES } from "@/lib/analysis/humidity-covariates";
import { latestToday } from "@/lib/specimens/history";
import { MATERIAL_CLASSES } from "./specimens";

const YEAR_DAYS = 365.25;

const sharePercent = z.coerce.number({ error: "Enter the share of specimens rusted, in %." })
  .min(1, "The share rusted must be at least 1 %.").max(50, "The share rusted must be at most 50 %.");
const horizonYears = z.coerce.number({ error: "Enter the horizon in years." })
  .min(0.1, "The horizon must be at least 0.1 years.").max(100, "The horizon must be at most 100 years.");
const pool = z.preprocess(
  (v) => (typeof v === "string" ? v.split(",").filter(Boolean) : v ?? []),
  z.array(z.uuid({ error: "Pick trials from the list." })).max(10, "Pool at most 10 trials."),
);

/** Specimen-history covariates for the page's models (never part of an accepted storage rule). */
const covariates = z.preprocess(
  (v) => { const list = typeof v === "string" ? v.split(",").filter(Boolean) : v ?? []; return Array.isArray(list) ? [...new Set(list)] : list; },
  z.array(z.enum(RESPONSE_COVARIATES, { error: `Covariates are ${RESPONSE_COVARIATES.join(" and ")}.` })).max(RESPONSE_COVARIATES.length),
);

export const responseQuerySchema = z.object({
  share: sharePercent.default(DEFAULT_RESPONSE_OPTIONS.p * 100),
  horizon: horizonYears.default(DEFAULT_RESPONSE_OPTIONS.horizonDays / YEAR_DAYS),
  pool,
  cov: covariates,
});
export type ResponseQuery = z.infer<typeof responseQuerySchema>;

export function responseOptions(q: Pick<ResponseQuery, "share" | "horizon">): ResponseOptions {
  return { p: q.share / 100, horizonDays: q.horizon * YEAR_DAYS };
}

/**
 * For the page: a bad value falls back to its default, and `problems` says which and why, so the page
 * can tell the reader what it used instead of what was asked.
 */
export function responsePageQuery(raw: Record<string, string | string[] | undefined>): { query: ResponseQuery; problems: string[] } {
  const one = (k: string) => (typeof raw[k] === "string" && raw[k] !== "" ? raw[k] : undefined);
  const query = responseQuerySchema.parse({});
  const problems: string[] = [];
  const share = one("share") === undefined ? null : sharePercent.safeParse(one("share"));
  if (share?.success) query.share = share.data;
  else if (share) problems.push(`${share.error.issues[0].message} Showing ${query.share} %.`);
  const horizon = one("horizon") === undefined ? null : horizonYears.safeParse(one("horizon"));
  if (horizon?.success) query.horizon = horizon.data;
  else if (horizon) problems.push(`${horizon.error.issues[0].message} Showing ${+query.horizon.toFixed(2)} years.`);
  const p = pool.safeParse(raw.pool === undefined ? [] : Array.isArray(raw.pool) ? raw.pool : one("pool"));
  if (p.success) query.pool = p.data;
  else problems.push(`${p.error.issues[0].message} No trials are pooled.`);
  const c = covariates.safeParse(raw.cov === undefined ? [] : Array.isArray(raw.cov) ? raw.cov : one("cov"));
  if (c.success) query.cov = c.data;
  else problems.push(`${c.error.issues[0].message} No history covariates are used.`);
  return { query, problems };
}

export const acceptRuleSchema = z.object({
  trialId: z.uuid(),
  materialClass: z.string().min(1, "Pick a material class.").max(60),
  treatmentId: z.uuid({ error: "Pick a treatment." }),
  share: sharePercent,
  horizon: horizonYears,
  pool,
  note: z.string().trim().max(2000, "Keep the note under 2,000 characters.").default(""),
});
export type AcceptRuleInput = z.infer<typeof acceptRuleSchema>;

/** What an entered rule's treatment is called when it holds for the material under any treatment. */
export const ANY_TREATMENT = "Any treatment";

/**
 * A rule entered by hand: from a publication, a standard or the lab's own decision. The source and
 * its date are required, so every rule in force can say where it comes from.
 */
export const enterRuleSchema = z.object({
  materialClass: z.enum(MATERIAL_CLASSES, "Pick a material class."),
  treatmentId: z.preprocess((v) => (v === "" || v === "any" ? null : v), z.uuid({ error: "Pick a treatment from the list." }).nullable()),
  thresholdRhPercent: z.coerce.number({ error: "Enter the RH to keep below, in %." })
    .gt(0, "The threshold must be above 0 %RH.").max(100, "The threshold must be at most 100 %RH."),
  source: z.string().trim().min(3, "Name the source: a publication, a standard or the lab's own decision.").max(500, "Keep the source under 500 characters."),
  sourceDate: z.iso.date({ error: "Enter the source's date as YYYY-MM-DD." }),
  note: z.string().trim().max(2000, "Keep the note under 2,000 characters.").default(""),
}).superRefine((v, ctx) => {
  if (v.sourceDate > latestToday()) ctx.addIssue({ code: "custom", path: ["sourceDate"], message: "The source's date cannot be in the future." });
});
export type EnterRuleInput = z.infer<typeof enterRuleSchema>;
