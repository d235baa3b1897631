"use server";
// Accepting a humidity threshold as the lab's storage rule (db/queries/storage-rules recomputes it).
import { acceptStorageRule } from "@/db/queries/storage-rules";
import { labAction, revalidate } from "@/lib/auth/action";
import { acceptRuleSchema } from "@/lib/validation/storage-rules";

export const acceptStorageRuleAction = labAction("storageRules.accept", acceptRuleSchema, async (ctx, input) => {
  const rule = await acceptStorageRule({ actor: ctx, input });
  revalidate("/storage-rules");
  revalidate(`/trials/${input.trialId}/humidity`);
  revalidate(`/trials/${input.trialId}/report`);
  return { message: `Accepted as storage rule version ${rule.version}: ${rule.statement}`, data: { id: rule.id, version: rule.version } };
});
