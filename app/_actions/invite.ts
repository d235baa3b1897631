"use server";
import { redirect } from "next/navigation";
import { z } from "zod";
import { acceptInvitation } from "@/db/queries/accounts";
import { formToObject, type ActionState } from "@/lib/auth/action";
import { toAppError } from "@/lib/auth/errors";
import { acceptInviteSchema, passwordField } from "@/lib/validation/auth";

export async function acceptInvite(_prev: ActionState | undefined, fd: FormData): Promise<ActionState> {
  const input = formToObject(fd);
  const values = { name: String(input.name ?? "") };
  const parsed = acceptInviteSchema.safeParse(input);
  if (!parsed.success) return { ok: false, message: "Please correct the highlighted fields.", errors: z.flattenError(parsed.error).fieldErrors, values };
  // A new account must meet the password rule; an existing one just proves it is theirs.
  if (input.newAccount === "1") {
    const pw = passwordField.safeParse(parsed.data.password);
    if (!pw.success) return { ok: false, message: "Please correct the highlighted fields.", errors: { password: pw.error.issues.map((i) => i.message) }, values };
  }
  let email: string;
  try {
    ({ email } = await acceptInvitation(parsed.data));
  } catch (err) {
    const e = toAppError(err);
    return { ok: false, message: e.message, errors: e.fieldErrors, values };
  }
  redirect(`/sign-in?joined=1&email=${encodeURIComponent(email)}`);
}
