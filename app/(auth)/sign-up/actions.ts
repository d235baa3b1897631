"use server";
import { z } from "zod";
import { createUserWithLab } from "@/db/queries/accounts";
import type { ActionState } from "@/lib/auth/action";
import { formToObject } from "@/lib/auth/action";
import { toAppError } from "@/lib/auth/errors";
import { signUpSchema } from "@/lib/validation/auth";

// Sign-up is the one action without a lab: it creates the lab, with the new user as its lead.
export async function signUp(_prev: ActionState | undefined, fd: FormData): Promise<ActionState> {
  const input = formToObject(fd);
  const values = { name: String(input.name ?? ""), email: String(input.email ?? ""), labName: String(input.labName ?? "") };
  const parsed = signUpSchema.safeParse(input);
  if (!parsed.success) {
    return { ok: false, message: "Please correct the highlighted fields.", errors: z.flattenError(parsed.error).fieldErrors, values };
  }
  try {
    await createUserWithLab(parsed.data);
    return { ok: true, message: "Lab created. Signing you in…", values };
  } catch (err) {
    const e = toAppError(err);
    return { ok: false, message: e.message, errors: e.fieldErrors, values };
  }
}
