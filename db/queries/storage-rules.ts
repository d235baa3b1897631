import "server-only";
import { and, asc, desc, eq, isNull, max, sql } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { formatHorizon } from "@/lib/analysis/humidity-sentences";
import { assertResultsVisible } from "@/lib/trials/access";
import { MATERIAL_LABELS } from "@/lib/analysis/groups";
import { ANY_TREATMENT, responseOptions, type AcceptRuleInput, type EnterRuleInput } from "@/lib/validation/storage-rules";
import { recordAudit } from "../audit";
import { db } from "../client";
import { storageRules, treatments, users } from "../schema";
import { loadHumidityResponse } from "./humidity-response";
import { assertAllowed, type Actor } from "./specimens";
import { blindTrialIds, getTrialAccess } from "./trial-access";

export type StorageRule = typeof storageRules.$inferSelect;

export const RULE_METHOD =
  "Interval-censored Weibull (accelerated failure time) fit of time to first rust against each jar's measured time-weighted mean RH, with material class, treatment and trial as covariates; 95 % limits where the pointwise delta-method band of the predicted time meets the horizon.";

/**
 * Accept the threshold of one material class and treatment as the lab's storage rule. The threshold
 * is computed again here from the same data and choices (never taken from the form), and becomes a
 * new version; the rule it replaces is kept, marked superseded.
 */
export async function acceptStorageRule({ actor, input }: { actor: Actor; input: AcceptRuleInput }) {
  assertAllowed(actor, "storageRules.accept");
  const { trial, access } = await getTrialAccess({ labId: actor.labId, trialId: input.trialId, userId: actor.userId });
  assertResultsVisible(access);
  const blind = await blindTrialIds(actor);
  if (input.pool.some((id) => blind.has(id))) throw new AppError("forbidden", "One of the pooled trials is one you score blind.");
  const options = responseOptions(input);
  const { response, trials } = await loadHumidityResponse({ labId: actor.labId, trial, poolTrialIds: input.pool, options });
  if (!response.fit) throw new AppError("invalid", response.reason ?? "The humidity response could not be fitted.");
  const combo = response.combos.find((c) => c.materialClass === input.materialClass && c.treatmentId === input.treatmentId);
  if (!combo) throw new AppError("invalid", "That material class and treatment are not in this analysis.", { materialClass: ["Not in this analysis."] });
  const t = combo.threshold;
  if (t.status !== "found" || t.rhPercent === null) throw new AppError("invalid", `No threshold to accept: ${combo.sentence}`);

  const rule = await saveRuleVersion({
    actor, trialId: trial.id,
    values: {
      materialClass: combo.materialClass, treatmentId: combo.treatmentId, treatmentName: combo.treatmentName,
      thresholdRhPercent: t.rhPercent!, lower95RhPercent: t.lower95, upper95RhPercent: t.upper95,
      shareRusted: options.p, horizonDays: options.horizonDays, method: RULE_METHOD, statement: combo.sentence,
      sourceTrialIds: trials.map((x) => x.id), note: input.note, origin: "trial",
    },
    summary: (v) => `Storage rule accepted: ${combo.materialLabel}, ${combo.treatmentName} below ${Math.round(t.rhPercent!)} %RH (version ${v}, ${formatHorizon(options.horizonDays)})`,
  });
  return rule;
}

/**
 * Enter a rule by hand, from a publication, a standard or the lab's own decision, with that source
 * and its date. It becomes a new version of the rule for that material and treatment, as an accepted
 * one does.
 */
export async function enterStorageRule({ actor, input }: { actor: Actor; input: EnterRuleInput }) {
  assertAllowed(actor, "storageRules.accept");
  let treatmentName = ANY_TREATMENT;
  if (input.treatmentId) {
    const [t] = await db.select({ name: treatments.name }).from(treatments).where(and(eq(treatments.labId, actor.labId), eq(treatments.id, input.treatmentId)));
    if (!t) throw new AppError("invalid", "That treatment is not one of this lab's.", { treatmentId: ["Pick a treatment from the list."] });
    treatmentName = t.name;
  }
  const material = MATERIAL_LABELS[input.materialClass] ?? input.materialClass;
  const threshold = +input.thresholdRhPercent.toFixed(1);
  return saveRuleVersion({
    actor, trialId: null,
    values: {
      materialClass: input.materialClass, treatmentId: input.treatmentId, treatmentName,
      thresholdRhPercent: input.thresholdRhPercent, lower95RhPercent: null, upper95RhPercent: null, shareRusted: null, horizonDays: null,
      method: "Entered by hand from the source named.", origin: "entered", source: input.source, sourceDate: input.sourceDate,
      statement: `Keep ${material.toLowerCase()}, ${treatmentName.toLowerCase()}, below ${threshold} %RH (${input.source}, ${input.sourceDate}).`,
      sourceTrialIds: [], note: input.note,
    },
    summary: (v) => `Storage rule entered: ${material}, ${treatmentName} below ${threshold} %RH (version ${v}, source: ${input.source})`,
  });
}

type RuleValues = Omit<typeof storageRules.$inferInsert, "id" | "labId" | "version" | "acceptedBy" | "acceptedAt" | "supersededAt">;

/** The one place a rule version is written: under a lock per material and treatment, the previous version superseded, both audited. */
async function saveRuleVersion({ actor, trialId, values, summary }: { actor: Actor; trialId: string | null; values: RuleValues; summary: (version: number) => string }) {
  return db.transaction(async (tx) => {
    // One acceptance at a time per material and treatment: the version number and the current rule are decided under this lock.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`storage-rule|${actor.labId}|${values.materialClass}|${values.treatmentName}`}))`);
    const key = and(eq(storageRules.labId, actor.labId), eq(storageRules.materialClass, values.materialClass), eq(storageRules.treatmentName, values.treatmentName));
    const [{ last }] = await tx.select({ last: max(storageRules.version) }).from(storageRules).where(key);
    const [previous] = await tx.update(storageRules).set({ supersededAt: new Date() }).where(and(key, isNull(storageRules.supersededAt))).returning();
    const [rule] = await tx.insert(storageRules).values({ ...values, labId: actor.labId, version: (last ?? 0) + 1, acceptedBy: actor.userId }).returning();
    if (previous) {
      await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "storage_rule", entityId: previous.id, trialId, action: "update", summary: `Storage rule version ${previous.version} superseded`, before: { supersededAt: null }, after: { supersededAt: rule.acceptedAt } });
    }
    await recordAudit(tx, { labId: actor.labId, userId: actor.userId, entity: "storage_rule", entityId: rule.id, trialId, action: "create", summary: summary(rule.version), after: rule });
    return rule;
  });
}

/**
 * Rules of the lab with who accepted them, current first; rules resting on a trial the viewer scores
 * blind are withheld. userId null gives every rule (the stored location counts, which no viewer reads unfiltered).
 */
export async function listStorageRules({ labId, userId, trialId }: { labId: string; userId: string | null; trialId?: string }) {
  const [rows, blind] = await Promise.all([
    db.select({ rule: storageRules, acceptedByName: users.name }).from(storageRules)
      .leftJoin(users, eq(users.id, storageRules.acceptedBy))
      .where(and(eq(storageRules.labId, labId), trialId ? sql`${trialId}::uuid = any(${storageRules.sourceTrialIds})` : undefined))
      .orderBy(asc(storageRules.materialClass), asc(storageRules.treatmentName), desc(storageRules.version)),
    userId === null ? new Set<string>() : blindTrialIds({ labId, userId }),
  ]);
  return rows
    .filter((r) => !r.rule.sourceTrialIds.some((id) => blind.has(id)))
    .map((r) => ({ ...r.rule, acceptedByName: r.acceptedByName, current: r.rule.supersededAt === null }));
}
export type StorageRuleView = Awaited<ReturnType<typeof listStorageRules>>[number];
