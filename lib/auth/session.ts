// Who is calling: the session cookie decoded directly (next-auth's getToken with our cached-key decode).
// getServerSession would run next-auth's whole session endpoint and re-encrypt a fresh cookie that a
// Server Component cannot even set; the cookie is refreshed by the browser's own /api/auth/session calls.
import { cookies, headers } from "next/headers";
import { getToken } from "next-auth/jwt";
import { decode } from "./jwt";

export type SessionIdentity = { userId: string; labId: string | null } | null;

export async function readSessionIdentity(): Promise<SessionIdentity> {
  const [h, c] = await Promise.all([headers(), cookies()]);
  // Only the cookie counts: getToken would also take a session token from an Authorization header.
  const { authorization: _ignored, ...rest } = Object.fromEntries(h);
  const token = await getToken({
    req: { headers: rest, cookies: Object.fromEntries(c.getAll().map((x) => [x.name, x.value])) } as never,
    secret: process.env.NEXTAUTH_SECRET,
    decode,
  });
  if (!token || typeof token.userId !== "string") return null;
  return { userId: token.userId, labId: typeof token.labId === "string" ? token.labId : null };
}
