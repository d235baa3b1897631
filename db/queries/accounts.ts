import "server-only";
import crypto from "node:crypto";
import { and, desc, eq, gt, isNull } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import { hashPassword, verifyPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/auth/permissions";
import { recordAudit } from "../audit";
import { db } from "../client";
import { invitations, labs, memberships, users } from "../schema";

export const INVITE_DAYS = 7;

export function hashToken(token: string) {
  return crypto.createHash("sha256").update(token).digest("hex");
}

export async function accountExists({ email }: { email: string }) {
  const rows = await db.select({ id: users.id }).from(users).where(eq(users.email, email)).limit(1);
  return rows.length > 0;
}

/** Only from a followed sign-up link (app/(auth)/sign-up): the address proved to be the caller's. */
export async function createUserWithLab(input: { name: string; email: string; passwordHash: string; labName: string }) {
  const { passwordHash } = input;
  return db.transaction(async (tx) => {
    const existing = await tx.select({ id: users.id }).from(users).where(eq(users.email, input.email)).limit(1);
    if (existing.length) throw new AppError("conflict", "An account with this e-mail already exists. Sign in instead.");
    const [user] = await tx.insert(users).values({ name: input.name, email: input.email, passwordHash }).returning();
    const [lab] = await tx.insert(labs).values({ name: input.labName }).returning();
    await tx.insert(memberships).values({ userId: user.id, labId: lab.id, role: "lead" });
    await recordAudit(tx, { labId: lab.id, userId: user.id, entity: "lab", entityId: lab.id, action: "create", summary: `Lab "${lab.name}" created`, after: lab });
    await recordAudit(tx, { labId: lab.id, userId: user.id, entity: "membership", entityId: user.id, action: "create", summary: `${user.email} joined as lead`, after: { role: "lead" } });
    return { user, lab };
  });
}

export async function createInvitation(input: { labId: string; invitedBy: string; email: string; role: Role }) {
  const token = crypto.randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + INVITE_DAYS * 86_400_000);
  const inv = await db.transaction(async (tx) => {
    const already = await tx
      .select({ userId: memberships.userId })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.labId, input.labId), eq(users.email, input.email)));
    if (already.length) throw new AppError("conflict", "That person is already a member.", { email: ["Already a member of this lab."] });
    const [row] = await tx.insert(invitations).values({ labId: input.labId, email: input.email, role: input.role, tokenHash: hashToken(token), expiresAt, invitedBy: input.invitedBy }).returning();
    await recordAudit(tx, { labId: input.labId, userId: input.invitedBy, entity: "invitation", entityId: row.id, action: "create", summary: `Invited ${input.email} as ${input.role}`, after: row });
    return row;
  });
  return { invitation: inv, token };
}

export async function findOpenInvitation({ token }: { token: string }) {
  const [row] = await db
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, labId: invitations.labId, labName: labs.name, expiresAt: invitations.expiresAt, acceptedAt: invitations.acceptedAt, revokedAt: invitations.revokedAt })
    .from(invitations)
    .innerJoin(labs, eq(labs.id, invitations.labId))
    .where(eq(invitations.tokenHash, hashToken(token)))
    .limit(1);
  if (!row) return { state: "unknown" as const };
  if (row.acceptedAt) return { state: "used" as const, row };
  if (row.revokedAt) return { state: "revoked" as const, row };
  if (row.expiresAt <= new Date()) return { state: "expired" as const, row };
  const [account] = await db.select({ id: users.id }).from(users).where(eq(users.email, row.email)).limit(1);
  return { state: "open" as const, row, hasAccount: !!account };
}

/** Accept once: the conditional update makes a second use (or a race) fail. */
export async function acceptInvitation(input: { token: string; name?: string; password: string }) {
  const found = await findOpenInvitation({ token: input.token });
  if (found.state !== "open") {
    const msg = { unknown: "This invitation link is not valid.", used: "This invitation has already been used.", revoked: "This invitation was withdrawn.", expired: "This invitation has expired; ask the lab lead for a new one." }[found.state];
    throw new AppError("invalid", msg);
  }
  const inv = found.row;
  const [existing] = await db.select().from(users).where(eq(users.email, inv.email)).limit(1);
  if (existing && !(await verifyPassword(existing.passwordHash, input.password))) {
    throw new AppError("invalid", "Wrong password for the existing account.", { password: ["Wrong password for the existing account with this e-mail."] });
  }
  const newHash = existing ? null : await hashPassword(input.password);
  return db.transaction(async (tx) => {
    const claimed = await tx
      .update(invitations)
      .set({ acceptedAt: new Date() })
      .where(and(eq(invitations.id, inv.id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
      .returning({ id: invitations.id });
    if (!claimed.length) throw new AppError("invalid", "This invitation has already been used.");
    let userId = existing?.id;
    if (!userId) {
      if (!input.name) throw new AppError("invalid", "Enter your name.", { name: ["Enter your name."] });
      const [u] = await tx.insert(users).values({ email: inv.email, name: input.name, passwordHash: newHash! }).returning();
      userId = u.id;
    }
    await tx.insert(memberships).values({ userId, labId: inv.labId, role: inv.role }).onConflictDoNothing();
    await recordAudit(tx, { labId: inv.labId, userId, entity: "membership", entityId: userId, action: "create", summary: `${inv.email} joined as ${inv.role}`, after: { role: inv.role } });
    return { userId, labId: inv.labId, email: inv.email };
  });
}

export async function listInvitations({ labId }: { labId: string }) {
  return db.select().from(invitations).where(eq(invitations.labId, labId)).orderBy(desc(invitations.createdAt)).limit(50);
}

export async function changePassword(input: { userId: string; labId: string | null; currentPassword: string; newPassword: string }) {
  const [u] = await db.select().from(users).where(eq(users.id, input.userId)).limit(1);
  if (!u || !(await verifyPassword(u.passwordHash, input.currentPassword))) {
    throw new AppError("invalid", "The current password is wrong.", { currentPassword: ["The current password is wrong."] });
  }
  const passwordHash = await hashPassword(input.newPassword);
  await db.transaction(async (tx) => {
    await tx.update(users).set({ passwordHash }).where(eq(users.id, u.id));
    if (input.labId) await recordAudit(tx, { labId: input.labId, userId: u.id, entity: "user", entityId: u.id, action: "update", summary: "Password changed" });
  });
}

export async function setMemberRole(input: { labId: string; actorId: string; userId: string; role: Role }) {
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(memberships).where(and(eq(memberships.labId, input.labId), eq(memberships.userId, input.userId)));
    if (!before) throw new AppError("not-found", "No such member.");
    if (before.role === "lead" && input.role !== "lead") {
      const leads = await tx.select().from(memberships).where(and(eq(memberships.labId, input.labId), eq(memberships.role, "lead")));
      if (leads.length <= 1) throw new AppError("conflict", "A lab needs at least one lead.");
    }
    const [after] = await tx.update(memberships).set({ role: input.role }).where(and(eq(memberships.labId, input.labId), eq(memberships.userId, input.userId))).returning();
    await recordAudit(tx, { labId: input.labId, userId: input.actorId, entity: "membership", entityId: input.userId, action: "update", summary: `Role changed to ${input.role}`, before, after });
  });
}
