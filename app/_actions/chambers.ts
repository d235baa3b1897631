"use server";
// Chamber create / edit / archive. Each runs through labAction (session → membership →
// chambers.write → zod) and writes its audit event in the same transaction as the change.
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { createChamber, setChamberArchived, updateChamber } from "@/db/queries/chambers";
import { labAction } from "@/lib/auth/action";
import { archiveSchema, chamberSchema, chamberUpdateSchema } from "@/lib/validation/chambers";

export const createChamberAction = labAction("chambers.write", chamberSchema, async (ctx, data) => {
  const row = await createChamber({ labId: ctx.labId, userId: ctx.userId, values: data });
  revalidatePath("/chambers");
  redirect(`/chambers/${row.id}?saved=created`);
});

export const updateChamberAction = labAction("chambers.write", chamberUpdateSchema, async (ctx, data) => {
  const { chamberId, ...values } = data;
  await updateChamber({ labId: ctx.labId, userId: ctx.userId, chamberId, values });
  revalidatePath("/chambers");
  revalidatePath(`/chambers/${chamberId}`);
  redirect(`/chambers/${chamberId}?saved=updated`);
});

export const archiveChamberAction = labAction("chambers.write", archiveSchema, async (ctx, data) => {
  await setChamberArchived({ labId: ctx.labId, userId: ctx.userId, chamberId: data.chamberId, archived: data.archive === "1" });
  revalidatePath("/chambers");
  revalidatePath(`/chambers/${data.chamberId}`);
  return { message: data.archive === "1" ? "Chamber archived. Its readings stay; it no longer accepts new ones." : "Chamber restored." };
});
