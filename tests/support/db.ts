// Fixtures on the real test database: a fresh lab with one user per role, unique per call.
import crypto from "node:crypto";
import { db } from "@/db/client";
import * as s from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/auth/permissions";

export const TEST_PASSWORD = "test-password-42";
let cachedHash: string | null = null;

export type TestLab = {
  labId: string;
  users: Record<Role, { id: string; email: string }>;
  as: (role: Role) => { userId: string; labId: string };
};

export async function createTestLab(name = "Test lab"): Promise<TestLab> {
  cachedHash ??= await hashPassword(TEST_PASSWORD);
  const tag = crypto.randomBytes(4).toString("hex");
  const [lab] = await db.insert(s.labs).values({ name: `${name} ${tag}` }).returning();
  const users = {} as TestLab["users"];
  for (const role of ["lead", "researcher", "technician", "observer"] as Role[]) {
    const email = `${role}-${tag}@test.example`;
    const [u] = await db.insert(s.users).values({ name: `${role} ${tag}`, email, passwordHash: cachedHash }).returning();
    await db.insert(s.memberships).values({ userId: u.id, labId: lab.id, role });
    users[role] = { id: u.id, email };
  }
  return { labId: lab.id, users, as: (role) => ({ userId: users[role].id, labId: lab.id }) };
}

export function uniqueEmail(prefix = "user") {
  return `${prefix}-${crypto.randomBytes(5).toString("hex")}@test.example`;
}
