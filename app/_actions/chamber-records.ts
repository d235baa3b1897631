"use server";
// Writes on one chamber's record: typed readings, desiccant upkeep, hygrometer checks and logger
// tokens. Each names its permission; the queries load the chamber by id and lab (404 otherwise)
// and write the audit event in the same transaction.
import { revalidatePath } from "next/cache";
import { addDesiccantEvent, addHygrometerCheck, createChamberToken, revokeChamberToken, setHygrometerCheckApplied } from "@/db/queries/chambers";
import { addManualReading } from "@/db/queries/readings";
import { labAction, revalidate } from "@/lib/auth/action";
import { checkAppliedSchema, createTokenSchema, desiccantEventSchema, hygrometerCheckSchema, manualReadingSchema, revokeTokenSchema } from "@/lib/validation/chambers";

export const addReadingAction = labAction("readings.write", manualReadingSchema, async (ctx, data) => {
  await addManualReading({ labId: ctx.labId, userId: ctx.userId, chamberId: data.chamberId, reading: { takenAt: data.takenAt, rhPercent: data.rhPercent, tempC: data.tempC ?? null, instrument: data.instrument } });
  revalidatePath(`/chambers/${data.chamberId}`);
  return { message: `Reading saved: ${data.rhPercent} %RH.` };
});

export const addDesiccantEventAction = labAction("desiccant.write", desiccantEventSchema, async (ctx, data) => {
  await addDesiccantEvent({ labId: ctx.labId, userId: ctx.userId, chamberId: data.chamberId, kind: data.kind, at: data.at, massG: data.massG, notes: data.notes });
  revalidatePath(`/chambers/${data.chamberId}`);
  return { message: `Logged: desiccant ${data.kind}.` };
});

export const addHygrometerCheckAction = labAction("readings.write", hygrometerCheckSchema, async (ctx, data) => {
  const row = await addHygrometerCheck({ labId: ctx.labId, userId: ctx.userId, chamberId: data.chamberId, values: data });
  revalidate(`/chambers/${data.chamberId}`);
  const sign = row.offsetRhPercent >= 0 ? "+" : "−";
  const slope = row.slope != null ? ` and responds ${row.slope.toFixed(3)} %RH per %RH between ${row.saltId} and ${row.salt2Id}` : "";
  return { message: `Check saved: "${row.instrument}" reads ${sign}${Math.abs(row.offsetRhPercent).toFixed(2)} %RH against ${row.saltId}${slope}${row.applied ? "; the check now corrects its readings" : ""}.` };
});

export const setCheckAppliedAction = labAction("readings.write", checkAppliedSchema, async (ctx, data) => {
  await setHygrometerCheckApplied({ labId: ctx.labId, userId: ctx.userId, checkId: data.checkId, applied: data.applied === "1" });
  revalidatePath(`/chambers/${data.chamberId}`);
  return { message: data.applied === "1" ? "Offset applied." : "Offset no longer applied." };
});

export const createTokenAction = labAction("chambers.tokens", createTokenSchema, async (ctx, data) => {
  const { token, row } = await createChamberToken({ labId: ctx.labId, userId: ctx.userId, chamberId: data.chamberId, label: data.label });
  revalidatePath(`/chambers/${data.chamberId}/tokens`);
  return { message: `Token "${row.label}" created. Copy it now: it is shown only once.`, data: { token } };
});

export const revokeTokenAction = labAction("chambers.tokens", revokeTokenSchema, async (ctx, data) => {
  await revokeChamberToken({ labId: ctx.labId, userId: ctx.userId, chamberId: data.chamberId, tokenId: data.tokenId });
  revalidatePath(`/chambers/${data.chamberId}/tokens`);
  return { message: "Token revoked; loggers using it are now refused." };
});
