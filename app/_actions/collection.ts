"use server";
// Collection: storage locations (chamber rows with a place in the tree) and object moves. Each runs
// through labAction and writes its audit event in the same transaction as the change.
import { moveObject } from "@/db/queries/object-locations";
import { createLocation, updateLocation } from "@/db/queries/locations";
import { labAction, revalidate } from "@/lib/auth/action";
import { locationSchema, locationSettingsSchema, moveObjectSchema, reparentSchema } from "@/lib/validation/collection";

export const createLocationAction = labAction("chambers.write", locationSchema, async (ctx, data) => {
  const row = await createLocation({ labId: ctx.labId, userId: ctx.userId, values: data });
  revalidate("/collection");
  return { message: `Location "${row.name}" added.`, data: { id: row.id } };
});

export const reparentLocationAction = labAction("chambers.write", reparentSchema, async (ctx, data) => {
  const row = await updateLocation({ labId: ctx.labId, userId: ctx.userId, locationId: data.locationId, values: { parentId: data.parentId } });
  revalidate("/collection");
  return { message: `Location "${row.name}" moved.`, data: { id: row.id } };
});

/** Name, kind of place, keeper and alert delay of a storage location; its place in the tree stays. */
export const updateLocationAction = labAction("chambers.write", locationSettingsSchema, async (ctx, data) => {
  const { locationId, ...values } = data;
  const row = await updateLocation({ labId: ctx.labId, userId: ctx.userId, locationId, values });
  revalidate("/collection");
  revalidate(`/chambers/${locationId}`);
  return { message: `Location "${row.name}" saved.`, data: { id: row.id } };
});

export const moveObjectAction = labAction("collection.move", moveObjectSchema, async (ctx, data) => {
  const stay = await moveObject({ labId: ctx.labId, userId: ctx.userId, input: data });
  revalidate("/collection");
  revalidate(`/specimens/${data.specimenId}`);
  return { message: "Move recorded.", data: { id: stay.id } };
});
