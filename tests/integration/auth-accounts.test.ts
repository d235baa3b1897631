// Sign-up, invitations, roles and sign-in throttling on the real database and the real SMTP fake.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { count, eq } from "drizzle-orm";
import { db, closeDb } from "@/db/client";
import * as s from "@/db/schema";
import { signUp } from "@/app/_actions/sign-up";
import { changeMemberRole, changeOwnPassword, inviteMember } from "@/app/_actions/settings";
import { acceptInvitation, createUserWithLab, findOpenInvitation, hashToken } from "@/db/queries/accounts";
import { checkCredentials } from "@/lib/auth/credentials";
import { openSignUp } from "@/lib/auth/sign-up-token";
import { ACCOUNT_THROTTLE, SIGN_IN_REFUSED } from "@/lib/auth/throttle";
import { listMessages } from "@/lib/mail-store";
import { createTestLab, TEST_PASSWORD, uniqueEmail, type TestLab } from "../support/db";
import { ensureMailFake, type MailFake } from "../support/mail";

let lab: TestLab;
let mail: MailFake;

function form(values: Record<string, string>) {
  const fd = new FormData();
  for (const [k, v] of Object.entries(values)) fd.set(k, v);
  return fd;
}

async function userCount() {
  const [{ n }] = await db.select({ n: count() }).from(s.users);
  return n;
}

async function waitForMail(to: string, ms = 10_000) {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    const found = await listMessages(mail.mailDir, { to });
    if (found.length) return found[0];
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no mail for ${to}`);
}

beforeAll(async () => {
  mail = await ensureMailFake();
  lab = await createTestLab("Accounts");
});
afterAll(async () => {
  await mail.stop();
  await closeDb();
});

describe("sign-up", () => {
  it("mails a link; following it creates a user, a lab with the user as lead, and audit events", async () => {
    const email = uniqueEmail("founder");
    const r = await signUp(undefined, form({ name: "Ada Founder", email, password: "iron-and-salt-9", labName: "Founders' store" }));
    expect(r.ok).toBe(true);
    expect(await db.select().from(s.users).where(eq(s.users.email, email))).toHaveLength(0); // nothing before the link
    const msg = await waitForMail(email);
    const token = /\/sign-up\/confirm\?token=(\S+)/.exec(msg.text)![1];
    const pending = await openSignUp(token);
    expect(pending).toMatchObject({ name: "Ada Founder", email, labName: "Founders' store" });
    expect(pending!.passwordHash).not.toContain("iron-and-salt-9");
    // What the link's button does (confirmSignUp) before it signs the new lead in.
    await createUserWithLab(pending!);
    expect((await checkCredentials(email, "iron-and-salt-9")).ok).toBe(true);
    const [u] = await db.select().from(s.users).where(eq(s.users.email, email));
    const [m] = await db.select().from(s.memberships).where(eq(s.memberships.userId, u.id));
    expect(m.role).toBe("lead");
    const events = await db.select().from(s.auditEvents).where(eq(s.auditEvents.labId, m.labId));
    expect(events.map((e) => e.entity).sort()).toEqual(["lab", "membership"]);
  });

  it("answers a taken e-mail exactly like a new one and tells the owner by mail; refuses a weak password and a malformed address", async () => {
    const before = await userCount();
    const fresh = uniqueEmail("fresh");
    const taken = await signUp(undefined, form({ name: "X", email: lab.users.lead.email, password: "iron-and-salt-9", labName: "Dup lab" }));
    const untaken = await signUp(undefined, form({ name: "X", email: fresh, password: "iron-and-salt-9", labName: "Dup lab" }));
    expect(taken).toEqual({ ...untaken, message: untaken.message!.replace(fresh, lab.users.lead.email), values: { ...untaken.values, email: lab.users.lead.email } });
    expect(taken.ok).toBe(true);
    const note = await waitForMail(lab.users.lead.email);
    expect(note.text).toMatch(/already has an account/);
    expect(note.text).not.toMatch(/sign-up\/confirm/);
    const weak = await signUp(undefined, form({ name: "X", email: uniqueEmail(), password: "short", labName: "Weak lab" }));
    expect(weak.errors?.password?.[0]).toMatch(/at least 10/);
    const bad = await signUp(undefined, form({ name: "X", email: "not-an-address", password: "iron-and-salt-9", labName: "Bad lab" }));
    expect(bad.errors?.email?.[0]).toMatch(/valid e-mail/);
    expect(bad.values?.labName).toBe("Bad lab"); // what the user typed comes back
    expect(await userCount()).toBe(before);
  });
});

describe("invitations", () => {
  it("mails a link that works once, fixes the role, and is refused a second time", async () => {
    const email = uniqueEmail("invitee");
    const r = await inviteMember.withIdentity(lab.as("lead"), { email, role: "technician" });
    expect(r.ok).toBe(true);
    const msg = await waitForMail(email);
    const token = /\/invite\/([A-Za-z0-9_-]+)/.exec(msg.text)?.[1];
    expect(token).toBeTruthy();
    expect((await findOpenInvitation({ token: token! })).state).toBe("open");
    const accepted = await acceptInvitation({ token: token!, name: "New Tech", password: "rusty-jar-2026" });
    const [m] = await db.select().from(s.memberships).where(eq(s.memberships.userId, accepted.userId));
    expect(m).toMatchObject({ labId: lab.labId, role: "technician" });
    await expect(acceptInvitation({ token: token!, name: "Again", password: "rusty-jar-2026" })).rejects.toThrow(/already been used/);
  });

  it("refuses an expired invitation", async () => {
    const email = uniqueEmail("late");
    await inviteMember.withIdentity(lab.as("lead"), { email, role: "observer" });
    const msg = await waitForMail(email);
    const token = /\/invite\/([A-Za-z0-9_-]+)/.exec(msg.text)![1];
    await db.update(s.invitations).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(s.invitations.tokenHash, hashToken(token)));
    expect((await findOpenInvitation({ token })).state).toBe("expired");
    await expect(acceptInvitation({ token, name: "Late", password: "rusty-jar-2026" })).rejects.toThrow(/expired/);
    const rows = await db.select().from(s.users).where(eq(s.users.email, email));
    expect(rows).toHaveLength(0);
  });

  it("only a lead may invite", async () => {
    for (const role of ["researcher", "technician", "observer"] as const) {
      const r = await inviteMember.withIdentity(lab.as(role), { email: uniqueEmail(), role: "observer" });
      expect(r.ok).toBe(false);
      expect(r.message).toMatch(/does not allow/);
    }
  });
});

describe("roles, passwords and lock-out", () => {
  it("a lead changes a member's role, audited; the last lead cannot be demoted", async () => {
    const r = await changeMemberRole.withIdentity(lab.as("lead"), { userId: lab.users.observer.id, role: "technician" });
    expect(r.ok).toBe(true);
    const events = await db.select().from(s.auditEvents).where(eq(s.auditEvents.entityId, lab.users.observer.id));
    expect(events.some((e) => e.summary === "Role changed to technician")).toBe(true);
    const solo = await createTestLab("Solo");
    const demote = await changeMemberRole.withIdentity(solo.as("lead"), { userId: solo.users.lead.id, role: "observer" });
    expect(demote.ok).toBe(false);
    expect(demote.message).toMatch(/at least one lead/);
  });

  it("changing a password needs the current one", async () => {
    const wrong = await changeOwnPassword.withIdentity(lab.as("researcher"), { currentPassword: "nope-nope-1", newPassword: "another-pass-77" });
    expect(wrong.errors?.currentPassword?.[0]).toMatch(/wrong/);
    const ok = await changeOwnPassword.withIdentity(lab.as("researcher"), { currentPassword: TEST_PASSWORD, newPassword: "another-pass-77" });
    expect(ok.ok).toBe(true);
    expect((await checkCredentials(lab.users.researcher.email, "another-pass-77")).ok).toBe(true);
  });

  it("after the free failures the next attempt waits, even with the right password, and says no more than a wrong one", async () => {
    const email = lab.users.technician.email;
    for (let i = 0; i <= ACCOUNT_THROTTLE.free; i++) expect(await checkCredentials(email, "wrong-password-1")).toEqual({ ok: false, reason: SIGN_IN_REFUSED });
    expect(await checkCredentials(email, TEST_PASSWORD)).toEqual({ ok: false, reason: SIGN_IN_REFUSED });
  });
});
