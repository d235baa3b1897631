"use server";
import { assignScorer, removeScorer, setScoreRule } from "@/db/queries/scores-agreement";
import { labAction, revalidate } from "@/lib/auth/action";
import { TEAM_FIELDS } from "@/lib/trials/team";
import { assignScorerSchema, removeScorerSchema, scoreRuleSchema } from "@/lib/validation/scores";

export const assignScorerAction = labAction(TEAM_FIELDS.scorers.change, assignScorerSchema, async (ctx, data) => {
  await assignScorer({ labId: ctx.labId, userId: ctx.userId }, data);
  revalidate(`/trials/${data.trialId}/scoring`);
  return { message: data.blind ? "Assigned as a blind scorer." : "Assigned as a scorer." };
});

export const removeScorerAction = labAction(TEAM_FIELDS.scorers.change, removeScorerSchema, async (ctx, data) => {
  await removeScorer({ labId: ctx.labId, userId: ctx.userId }, data);
  revalidate(`/trials/${data.trialId}/scoring`);
  return { message: "Scorer removed; their scores stay on record." };
});

export const setScoreRuleAction = labAction(TEAM_FIELDS.scoreRule.change, scoreRuleSchema, async (ctx, data) => {
  await setScoreRule({ labId: ctx.labId, userId: ctx.userId }, data);
  revalidate(`/trials/${data.trialId}/scoring`);
  return { message: "Rule saved; every score of record in this trial was re-derived." };
});
