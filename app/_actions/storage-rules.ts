"use server";
// Storage rules: accepting a trial's humidity threshold (db/queries/storage-rules recomputes it), or entering one by hand with its source.
import { acceptStorageRule, enterStorageRule } from "@/db/queries/storage-rules";
import { labAction, revalidate } from "@/lib/auth/action";
import { acceptRuleSchema, enterRuleSchema } from "@/lib/validation/storage-rules";

export const acceptStorageRuleAction = labAction("storageRules.accept", acceptRuleSchema, async (ctx, input) => {
  const rule = await acceptStorageRule({ actor: ctx, input });
  revalidate("/storage-rules");
  revalidate(`/trials/${input.trialId}/humidity`);
  revalidate(`/trials/${input.trialId}/report`);
  return { message: `Accepted as storage rule version ${rule.version}: ${rule.statement}`, data: { id: rule.id, version: rule.version } };
});

export const enterStorageRuleAction = labAction("storageRules.accept", enterRuleSchema, async (ctx, input) => {
  const rule = await enterStorageRule({ actor: ctx, input });
  revalidate("/storage-rules");
  return { message: `Entered as storage rule version ${rule.version}: ${rule.statement}`, data: { id: rule.id, version: rule.version } };
});
