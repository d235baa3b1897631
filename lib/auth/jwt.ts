// The session token's encode/decode, identical in format to next-auth's own (a JWE, "dir" + A256GCM, key
// derived from NEXTAUTH_SECRET by HKDF-SHA256 with next-auth's info string) but with the derived key
// kept in memory: next-auth derives it again on every call, which was the largest single cost of
// reading a session. tests/unit/auth-jwt.test.ts checks both directions against next-auth's functions.
import { hkdfSync, randomUUID } from "node:crypto";
import { EncryptJWT, jwtDecrypt } from "jose";
import type { JWT, JWTDecodeParams, JWTEncodeParams } from "next-auth/jwt";

const DEFAULT_MAX_AGE = 30 * 24 * 60 * 60;
const keys = new Map<string, Uint8Array>();

/** next-auth 4's key: HKDF-SHA256(secret, salt, "NextAuth.js Generated Encryption Key[ (salt)]", 32 bytes). */
export function derivedKey(secret: string | Buffer, salt = ""): Uint8Array {
  const id = `${typeof secret === "string" ? secret : secret.toString("base64")}\u0000${salt}`;
  let key = keys.get(id);
  if (!key) {
    const info = `NextAuth.js Generated Encryption Key${salt ? ` (${salt})` : ""}`;
    key = new Uint8Array(hkdfSync("sha256", secret, salt, info, 32));
    keys.set(id, key);
  }
  return key;
}

export async function encode({ token = {}, secret, maxAge = DEFAULT_MAX_AGE, salt = "" }: JWTEncodeParams): Promise<string> {
  const now = (Date.now() / 1000) | 0;
  return new EncryptJWT(token).setProtectedHeader({ alg: "dir", enc: "A256GCM" }).setIssuedAt()
    .setExpirationTime(now + maxAge).setJti(randomUUID()).encrypt(derivedKey(secret, salt));
}

export async function decode({ token, secret, salt = "" }: JWTDecodeParams): Promise<JWT | null> {
  if (!token) return null;
  const { payload } = await jwtDecrypt(token, derivedKey(secret, salt), { clockTolerance: 15 });
  return payload as JWT;
}
