"use server";
import { createTreatment, updateTreatment } from "@/db/queries/treatments";
import { labAction, revalidate } from "@/lib/auth/action";
import { treatmentEditFormSchema, treatmentSchema } from "@/lib/validation/treatments";

export const createTreatmentAction = labAction("treatments.write", treatmentSchema, async (ctx, data) => {
  const row = await createTreatment({ actor: ctx, input: data });
  revalidate("/treatments");
  return { message: `Treatment "${row.name}" added.`, data: { id: row.id } };
});

export const updateTreatmentAction = labAction("treatments.write", treatmentEditFormSchema, async (ctx, { treatmentId, ...input }) => {
  const row = await updateTreatment({ actor: ctx, treatmentId, input });
  revalidate("/treatments");
  return { message: `Treatment "${row.name}" saved.`, data: { id: row.id } };
});
