"use server";
import { addHistoryEntry } from "@/db/queries/specimen-history";
import { labAction, revalidate } from "@/lib/auth/action";
import { historyEntrySchema } from "@/lib/validation/specimen-history";

const SAVED = { chloride: "Chloride test", akaganeite: "Akaganeite check", treatment: "Treatment", mass: "Weighing" } as const;

export const addSpecimenHistoryAction = labAction("specimens.write", historyEntrySchema, async (ctx, data) => {
  const r = await addHistoryEntry({ actor: ctx, input: data });
  revalidate(`/specimens/${data.specimenId}`);
  return { message: `${SAVED[data.kind]} of ${r.specimenLabel} saved.`, data: { id: r.id } };
});
