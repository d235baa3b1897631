"use server";
import { addHistoryEntry } from "@/db/queries/specimen-history";
import { deleteHistoryEntry, updateHistoryEntry } from "@/db/queries/specimen-history-edit";
import { labAction, revalidate } from "@/lib/auth/action";
import { historyEntryDeleteSchema, historyEntryEditSchema, historyEntrySchema } from "@/lib/validation/specimen-history";

// The actions let staff in (history.record); each entry's kind then decides (historyPermission in the queries).

export const addSpecimenHistoryAction = labAction("history.record", historyEntrySchema, async (ctx, data) => {
  const r = await addHistoryEntry({ actor: ctx, input: data });
  revalidate(`/specimens/${data.specimenId}`);
  return { message: `${r.name} of ${r.specimenLabel} saved.`, data: { id: r.id } };
});

export const updateSpecimenHistoryAction = labAction("history.record", historyEntryEditSchema, async (ctx, data) => {
  const r = await updateHistoryEntry({ actor: ctx, input: data });
  revalidate(`/specimens/${data.specimenId}`);
  return { message: `${r.name} of ${r.specimenLabel} corrected.`, data: { id: r.id } };
});

export const deleteSpecimenHistoryAction = labAction("history.record", historyEntryDeleteSchema, async (ctx, data) => {
  const r = await deleteHistoryEntry({ actor: ctx, input: data });
  revalidate(`/specimens/${data.specimenId}`);
  return { message: `${r.name} of ${r.specimenLabel} deleted.`, data: { id: r.id } };
});
