import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { db } from "../client";
import { invitations, labs, memberships, users } from "../schema";

export async function getMembership({ userId, labId }: { userId: string; labId: string }) {
  const rows = await db
    .select({ role: memberships.role, labName: labs.name })
    .from(memberships)
    .innerJoin(labs, eq(labs.id, memberships.labId))
    .where(and(eq(memberships.userId, userId), eq(memberships.labId, labId)))
    .limit(1);
  return rows[0] ?? null;
}

export async function listUserLabs({ userId }: { userId: string }) {
  return db
    .select({ labId: labs.id, labName: labs.name, role: memberships.role })
    .from(memberships)
    .innerJoin(labs, eq(labs.id, memberships.labId))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(memberships.createdAt));
}

export async function listMembers({ labId }: { labId: string }) {
  return db
    .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role, since: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.labId, labId))
    .orderBy(asc(users.name));
}

/** Addresses a lab writes to: its members and the people it invited (the demo mailbox shows mail to these only). */
export async function listMailRecipients({ labId }: { labId: string }): Promise<string[]> {
  const [members, invited] = await Promise.all([
    db.select({ email: users.email }).from(memberships).innerJoin(users, eq(users.id, memberships.userId)).where(eq(memberships.labId, labId)),
    db.select({ email: invitations.email }).from(invitations).where(eq(invitations.labId, labId)),
  ]);
  return [...new Set([...members, ...invited].map((r) => r.email))];
}
