"use server";
import { redirect } from "next/navigation";
import { z } from "zod";
import { accountExists, createUserWithLab } from "@/db/queries/accounts";
import type { ActionState } from "@/lib/auth/action";
import { formToObject } from "@/lib/auth/action";
import { toAppError } from "@/lib/auth/errors";
import { hashPassword } from "@/lib/auth/password";
import { openSignUp, sealSignUp, SIGN_UP_LINK_HOURS } from "@/lib/auth/sign-up-token";
import { startSession } from "@/lib/auth/start-session";
import { appUrl, sendMail } from "@/lib/mail/send";
import { signUpSchema } from "@/lib/validation/auth";

// Sign-up is the one action without a lab. It answers the same whether or not the address already has an
// account: both get a mail (a link that creates the lab, or a note that the account exists), and the same
// work is done either way. The lab is created only when the link is followed (confirmSignUp).
export async function signUp(_prev: ActionState | undefined, fd: FormData): Promise<ActionState> {
  const input = formToObject(fd);
  const values = { name: String(input.name ?? ""), email: String(input.email ?? ""), labName: String(input.labName ?? "") };
  const parsed = signUpSchema.safeParse(input);
  if (!parsed.success) {
    return { ok: false, message: "Please correct the highlighted fields.", errors: z.flattenError(parsed.error).fieldErrors, values };
  }
  const { name, email, labName, password } = parsed.data;
  try {
    const passwordHash = await hashPassword(password);
    if (await accountExists({ email })) {
      await sendMail({
        to: email,
        subject: "Your Rustline account",
        text: `Someone (perhaps you) tried to create a lab on Rustline with this address, which already has an account. No new lab was made.\n\nSign in here: ${appUrl("/sign-in")}\n\nIf it was not you, you can ignore this mail.`,
      });
    } else {
      const link = appUrl(`/sign-up/confirm?token=${await sealSignUp({ name, email, labName, passwordHash })}`);
      await sendMail({
        to: email,
        subject: `Finish creating ${labName} on Rustline`,
        text: `Hello ${name},\n\nFollow this link within ${SIGN_UP_LINK_HOURS} hours to create the lab "${labName}" with you as its lead:\n${link}\n\nIf you did not sign up, ignore this mail; nothing is created without the link.`,
      });
    }
  } catch (err) {
    console.error("[mail] sign-up mail not sent:", err);
    return { ok: false, message: "The e-mail could not be sent right now. Nothing was created; try again in a moment.", values };
  }
  return { ok: true, message: `We sent a mail to ${email}. Follow its link to finish creating your lab.`, values };
}

/** The sign-up link's button: create the user and the lab, sign in, go to the lab home. */
export async function confirmSignUp(_prev: ActionState | undefined, fd: FormData): Promise<ActionState> {
  const pending = await openSignUp(String(fd.get("token") ?? ""));
  if (!pending) return { ok: false, message: "This link is not valid or has expired. Sign up again to get a new one." };
  let user: { id: string; email: string; name: string };
  try {
    ({ user } = await createUserWithLab(pending));
  } catch (err) {
    return { ok: false, message: toAppError(err).message };
  }
  await startSession(user);
  redirect("/");
}
