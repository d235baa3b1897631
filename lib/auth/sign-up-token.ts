// The link that finishes a sign-up: what was typed (the password only as its argon2 hash), sealed with a
// key derived from NEXTAUTH_SECRET (A256GCM, separate from the session key) and valid for a day. Nothing is
// stored until the link is followed, so sign-up answers the same whether or not the address has an account.
import { EncryptJWT, jwtDecrypt } from "jose";
import { derivedKey } from "./jwt";

export const SIGN_UP_LINK_HOURS = 24;
const SALT = "rustline sign-up";

export type PendingSignUp = { name: string; email: string; labName: string; passwordHash: string };

export async function sealSignUp(p: PendingSignUp, secret = process.env.NEXTAUTH_SECRET!): Promise<string> {
  return new EncryptJWT({ ...p }).setProtectedHeader({ alg: "dir", enc: "A256GCM" }).setIssuedAt()
    .setExpirationTime(`${SIGN_UP_LINK_HOURS}h`).encrypt(derivedKey(secret, SALT));
}

/** The pending sign-up, or null when the token is not ours, was altered or has expired. */
export async function openSignUp(token: string, secret = process.env.NEXTAUTH_SECRET!): Promise<PendingSignUp | null> {
  try {
    const { payload } = await jwtDecrypt(token, derivedKey(secret, SALT));
    const { name, email, labName, passwordHash } = payload as Partial<PendingSignUp>;
    if ([name, email, labName, passwordHash].every((v) => typeof v === "string")) return { name: name!, email: email!, labName: labName!, passwordHash: passwordHash! };
    return null;
  } catch {
    return null;
  }
}
