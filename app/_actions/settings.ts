"use server";
import { eq } from "drizzle-orm";
import { z } from "zod";
import { db } from "@/db/client";
import { users } from "@/db/schema";
import { changePassword, createInvitation, setMemberRole } from "@/db/queries/accounts";
import { labAction, revalidate } from "@/lib/auth/action";
import { appUrl, sendMail } from "@/lib/mail/send";
import { ROLE_LABELS } from "@/lib/auth/permissions";
import { changePasswordSchema, inviteSchema, memberRoleSchema } from "@/lib/validation/auth";
import { AppError } from "@/lib/auth/errors";

export const inviteMember = labAction("members.manage", inviteSchema, async (ctx, data) => {
  const { invitation, token } = await createInvitation({ labId: ctx.labId, invitedBy: ctx.userId, email: data.email, role: data.role });
  const link = appUrl(`/invite/${token}`);
  try {
    await sendMail({
      to: data.email,
      labId: ctx.labId,
      subject: `Invitation to ${ctx.labName} on Rustline`,
      text: `You are invited to join ${ctx.labName} on Rustline as ${ROLE_LABELS[data.role].name}.\n\nAccept within 7 days: ${link}\n\nThe link works once.`,
    });
  } catch (err) {
    console.error("[mail] invitation not sent:", err);
    throw new AppError("unavailable", `The invitation was saved but the e-mail could not be sent. Copy this link to ${data.email}: ${link}`);
  }
  revalidate("/settings");
  return { message: `Invitation sent to ${invitation.email}.` };
});

export const changeMemberRole = labAction("members.manage", memberRoleSchema, async (ctx, data) => {
  await setMemberRole({ labId: ctx.labId, actorId: ctx.userId, userId: data.userId, role: data.role });
  revalidate("/settings");
  return { message: "Role updated." };
});

export const changeOwnPassword = labAction("lab.read", changePasswordSchema, async (ctx, data) => {
  await changePassword({ userId: ctx.userId, labId: ctx.labId, currentPassword: data.currentPassword, newPassword: data.newPassword });
  return { message: "Password changed." };
});

export const setReminderPreference = labAction("lab.read", z.object({ optOut: z.enum(["0", "1"]) }), async (ctx, data) => {
  await db.update(users).set({ remindersOptOut: data.optOut === "1" }).where(eq(users.id, ctx.userId));
  revalidate("/settings");
  return { message: data.optOut === "1" ? "You will not get reminder e-mails." : "You will get reminder e-mails." };
});

export const setCollectionDigest = labAction("lab.read", z.object({ digest: z.enum(["0", "1"]) }), async (ctx, data) => {
  await db.update(users).set({ collectionDigest: data.digest === "1" }).where(eq(users.id, ctx.userId));
  revalidate("/settings");
  return { message: data.digest === "1" ? "Collection alerts will come as one e-mail a day." : "Collection alerts will come one e-mail per exceedance." };
});
