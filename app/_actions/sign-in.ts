"use server";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import type { ActionState } from "@/lib/auth/action";
import { appOrigin, safeCallbackPath } from "@/lib/auth/callback-url";
import { checkCredentials } from "@/lib/auth/credentials";
import { startSession } from "@/lib/auth/start-session";
import { CLIENT_ADDRESS_HEADER } from "@/lib/auth/throttle";

// Sign-in is a plain form post to this action, so it works before (or without) JavaScript. Throttling and
// the one answer for every refusal are in checkCredentials; the destination is only ever a path of this app.
export async function signInWithPassword(_prev: ActionState | undefined, fd: FormData): Promise<ActionState> {
  const email = String(fd.get("email") ?? "");
  const password = String(fd.get("password") ?? "");
  const r = await checkCredentials(email, password, (await headers()).get(CLIENT_ADDRESS_HEADER));
  if (!r.ok) return { ok: false, message: r.reason, values: { email } };
  await startSession(r.user);
  redirect(safeCallbackPath(String(fd.get("callbackUrl") ?? ""), appOrigin()));
}
