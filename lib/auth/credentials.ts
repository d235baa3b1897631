// E-mail and password check, shared by the sign-in form's server action and next-auth's credentials endpoint.
// Order matters: the attempt is counted (per client address, then per account) before the password is
// checked, and an unknown account costs the same argon2 work as a known one and answers the same.
import { eq } from "drizzle-orm";
import { db } from "@/db/client";
import { users } from "@/db/schema";
import { clearSignInFailures, forgiveSignInAttempt, reserveSignInAttempt } from "@/db/queries/sign-in-throttle";
import { hashPassword, verifyPassword } from "./password";
import { ACCOUNT_THROTTLE, accountKey, ADDRESS_THROTTLE, addressKey, SIGN_IN_REFUSED } from "./throttle";

export type SignedInUser = { id: string; email: string; name: string };
export type CredentialsResult = { ok: true; user: SignedInUser } | { ok: false; reason: string };

let unknownAccountHash: Promise<string> | null = null;

/** `clientAddress`: the caller's address as the server saw it (CLIENT_ADDRESS_HEADER); null when unknown. */
export async function checkCredentials(emailRaw: string, password: string, clientAddress?: string | null): Promise<CredentialsResult> {
  const email = emailRaw.trim().toLowerCase();
  const refused = { ok: false as const, reason: SIGN_IN_REFUSED };
  const address = clientAddress ? addressKey(clientAddress) : null;
  if (address && !(await reserveSignInAttempt(address, ADDRESS_THROTTLE))) return refused;
  const account = accountKey(email);
  if (!(await reserveSignInAttempt(account, ACCOUNT_THROTTLE))) return refused;
  const [user] = email ? await db.select({ id: users.id, email: users.email, name: users.name, passwordHash: users.passwordHash }).from(users).where(eq(users.email, email)).limit(1) : [];
  unknownAccountHash ??= hashPassword("no account has this password");
  const matches = await verifyPassword(user?.passwordHash ?? (await unknownAccountHash), password);
  if (!user || !matches) return refused;
  await clearSignInFailures(account);
  if (address) await forgiveSignInAttempt(address);
  return { ok: true, user: { id: user.id, email: user.email, name: user.name } };
}
