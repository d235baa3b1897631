"use server";
import { createSpecimen, importSpecimens, updateSpecimen } from "@/db/queries/specimens";
import { labAction, revalidate } from "@/lib/auth/action";
import type { CsvRowError } from "@/lib/validation/specimens";
import { importSchema, specimenEditFormSchema, specimenFormSchema } from "@/lib/validation/specimens";

export const createSpecimenAction = labAction("specimens.write", specimenFormSchema, async (ctx, data) => {
  const row = await createSpecimen({ actor: ctx, input: data });
  revalidate("/specimens");
  return { message: `Specimen ${row.label} added.`, data: { id: row.id } };
});

export const updateSpecimenAction = labAction("specimens.write", specimenEditFormSchema, async (ctx, { specimenId, ...input }) => {
  // The form always sends every field, so an empty mass means "no mass" rather than "unchanged".
  const row = await updateSpecimen({ actor: ctx, specimenId, input: { ...input, massG: input.massG ?? null, accessionNumber: input.accessionNumber ?? null } });
  revalidate("/specimens");
  revalidate(`/specimens/${specimenId}`);
  return { message: `Specimen ${row.label} saved.`, data: { id: row.id } };
});

export type ImportState = { errors?: CsvRowError[]; created?: number };

export const importSpecimensAction = labAction<typeof importSchema, ImportState>("specimens.write", importSchema, async (ctx, { csv }) => {
  const r = await importSpecimens({ actor: ctx, csv });
  if (!r.ok) {
    return { ok: false, message: `Nothing was imported: ${r.errors.length} problem${r.errors.length === 1 ? "" : "s"} to fix (listed by line).`, data: { errors: r.errors } };
  }
  revalidate("/specimens");
  return { message: `Imported ${r.created} specimens.`, data: { created: r.created } };
});
