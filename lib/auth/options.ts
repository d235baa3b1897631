// next-auth (v4) with e-mail + password and JWT sessions carrying the active lab.
import type { NextAuthOptions } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { getMembership, listUserLabs } from "@/db/queries/memberships";
import { safeCallbackPath } from "./callback-url";
import { checkCredentials } from "./credentials";
import { decode, encode } from "./jwt";
import { CLIENT_ADDRESS_HEADER } from "./throttle";

export const SESSION_MAX_AGE_S = 7 * 24 * 3600;

/** What the session token carries for a user who just signed in: the first lab and the role there. */
export async function sessionClaims(user: { id: string; email: string; name: string }) {
  const labsOfUser = await listUserLabs({ userId: user.id });
  return { sub: user.id, name: user.name, email: user.email, userId: user.id, labId: labsOfUser[0]?.labId ?? null, role: labsOfUser[0]?.role ?? null };
}

export const authOptions: NextAuthOptions = {
  session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_S },
  jwt: { encode, decode },
  pages: { signIn: "/sign-in" },
  secret: process.env.NEXTAUTH_SECRET,
  providers: [
    Credentials({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(credentials, req) {
        const address = req?.headers?.[CLIENT_ADDRESS_HEADER];
        const r = await checkCredentials(credentials?.email ?? "", credentials?.password ?? "", typeof address === "string" ? address : null);
        if (!r.ok) throw new Error(r.reason);
        return { id: r.user.id, email: r.user.email, name: r.user.name };
      },
    }),
  ],
  callbacks: {
    // Only paths of this app after signing in or out (lib/auth/callback-url).
    async redirect({ url, baseUrl }) {
      return `${new URL(baseUrl).origin}${safeCallbackPath(url, baseUrl)}`;
    },
    async jwt({ token, user, trigger, session }) {
      if (user) {
        const claims = await sessionClaims({ id: user.id, email: user.email ?? "", name: user.name ?? "" });
        Object.assign(token, { userId: claims.userId, labId: claims.labId, role: claims.role });
      }
      if (trigger === "update" && session && typeof session.labId === "string" && token.userId) {
        const m = await getMembership({ userId: token.userId as string, labId: session.labId });
        if (m) {
          token.labId = session.labId;
          token.role = m.role;
        }
      }
      return token;
    },
    async session({ session, token }) {
      session.userId = (token.userId as string) ?? null;
      session.labId = (token.labId as string | null) ?? null;
      session.role = (token.role as string | null) ?? null;
      return session;
    },
  },
};
