// next-auth (v4) with e-mail + password and JWT sessions carrying the active lab.
import type { NextAuthOptions } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { eq } from "drizzle-orm";
import { db } from "@/db/client";
import { users } from "@/db/schema";
import { getMembership, listUserLabs } from "@/db/queries/memberships";
import { decode, encode } from "./jwt";
import { verifyPassword } from "./password";

export const MAX_FAILED_SIGN_INS = 5;
export const LOCKOUT_MINUTES = 15;

export async function checkCredentials(emailRaw: string, password: string) {
  const email = emailRaw.trim().toLowerCase();
  const [user] = await db.select().from(users).where(eq(users.email, email)).limit(1);
  if (!user) return { ok: false as const, reason: "Wrong e-mail or password." };
  if (user.lockedUntil && user.lockedUntil > new Date()) {
    return { ok: false as const, reason: `Too many failed sign-ins. This account is locked until ${user.lockedUntil.toISOString().slice(11, 16)} UTC.` };
  }
  if (!(await verifyPassword(user.passwordHash, password))) {
    const failed = user.failedSignIns + 1;
    const lock = failed >= MAX_FAILED_SIGN_INS ? new Date(Date.now() + LOCKOUT_MINUTES * 60_000) : null;
    await db.update(users).set({ failedSignIns: lock ? 0 : failed, lockedUntil: lock }).where(eq(users.id, user.id));
    return { ok: false as const, reason: lock ? `Too many failed sign-ins. This account is locked for ${LOCKOUT_MINUTES} minutes.` : "Wrong e-mail or password." };
  }
  if (user.failedSignIns > 0 || user.lockedUntil) {
    await db.update(users).set({ failedSignIns: 0, lockedUntil: null }).where(eq(users.id, user.id));
  }
  return { ok: true as const, user };
}

export const authOptions: NextAuthOptions = {
  session: { strategy: "jwt", maxAge: 7 * 24 * 3600 },
  jwt: { encode, decode },
  pages: { signIn: "/sign-in" },
  secret: process.env.NEXTAUTH_SECRET,
  providers: [
    Credentials({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(credentials) {
        const r = await checkCredentials(credentials?.email ?? "", credentials?.password ?? "");
        if (!r.ok) throw new Error(r.reason);
        return { id: r.user.id, email: r.user.email, name: r.user.name };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user, trigger, session }) {
      if (user) {
        token.userId = user.id;
        const labsOfUser = await listUserLabs({ userId: user.id });
        token.labId = labsOfUser[0]?.labId ?? null;
        token.role = labsOfUser[0]?.role ?? null;
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
