// Sign in from a server action: the sign-in form and finishing a sign-up set next-auth's own session cookie.
import { cookies } from "next/headers";
import { encode } from "./jwt";
import { SESSION_MAX_AGE_S, sessionClaims } from "./options";

/** next-auth 4's session cookie name: "__Secure-" in front when the app is served over https. */
export function sessionCookieName(): string {
  return `${process.env.NEXTAUTH_URL?.startsWith("https://") ? "__Secure-" : ""}next-auth.session-token`;
}

/**
 * Sign in from a server action (the sign-in form, finishing a sign-up): the same token next-auth's
 * credentials endpoint would issue (lib/auth/options sessionClaims), set as next-auth's own cookie.
 */
export async function startSession(user: { id: string; email: string; name: string }) {
  const token = await encode({ token: await sessionClaims(user), secret: process.env.NEXTAUTH_SECRET!, maxAge: SESSION_MAX_AGE_S });
  (await cookies()).set(sessionCookieName(), token, {
    httpOnly: true,
    sameSite: "lax",
    path: "/",
    secure: sessionCookieName().startsWith("__Secure-"),
    maxAge: SESSION_MAX_AGE_S,
  });
}
