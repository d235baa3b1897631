// Resolve who is calling and in which lab, and check one permission. Every server action and
// route handler goes through requireLab (via labAction / labRoute); nothing trusts the UI.
import { cache } from "react";
import { listUserLabs } from "@/db/queries/memberships";
import { AppError } from "./errors";
import { can, type Permission, type Role } from "./permissions";
import { readSessionIdentity, type SessionIdentity } from "./session";

export type { SessionIdentity };
export type LabContext = { userId: string; labId: string; role: Role; labName: string };

// Per request (React cache): the layout and the page both ask, but the session is decoded once.
export const currentIdentity = cache(readSessionIdentity);

// Read fresh from the database on every request (a changed role applies at once), but once per request:
// the lab layout lists the viewer's labs, and the membership checked below is one of them.
export const labsOfUser = cache((userId: string) => listUserLabs({ userId }));

/** The viewer's membership of one lab (one of labsOfUser), or null when they are not a member of it. */
export async function membershipOf(userId: string, labId: string) {
  return (await labsOfUser(userId)).find((l) => l.labId === labId) ?? null;
}

/** Session → membership (read fresh from the database) → permission. */
export async function requireLab(identity: SessionIdentity, permission: Permission): Promise<LabContext> {
  if (!identity) throw new AppError("unauthenticated", "Please sign in.");
  if (!identity.labId) throw new AppError("forbidden", "You are not a member of any lab yet.");
  const m = await membershipOf(identity.userId, identity.labId);
  if (!m) throw new AppError("forbidden", "You are no longer a member of this lab.");
  if (!can(m.role, permission)) {
    throw new AppError("forbidden", `Your role (${m.role}) does not allow this.`);
  }
  return { userId: identity.userId, labId: identity.labId, role: m.role, labName: m.labName };
}
