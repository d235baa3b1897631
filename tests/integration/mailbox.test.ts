// The demo mailbox, tried by people who should not read other labs' mail: the lead of a lab just
// signed up, a technician, and an operator who turned demo mode off. Invitation links are the prize.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/client";
import { inviteMember } from "@/app/_actions/settings";
import { listMessages } from "@/lib/mail-store";
import { createTestLab, TEST_PASSWORD, uniqueEmail, type TestLab } from "../support/db";
import { signedInClient } from "../support/http";
import { ensureMailFake, type MailFake } from "../support/mail";
import { freePort, spawnService } from "../support/s3";

let mail: MailFake;
let victim: TestLab;
let intruder: TestLab;
let invitee: string;
let inviteLink: string;

beforeAll(async () => {
  mail = await ensureMailFake();
  victim = await createTestLab("Mailbox victim");
  intruder = await createTestLab("Mailbox intruder");
  invitee = uniqueEmail("invitee");
  expect((await inviteMember.withIdentity(victim.as("lead"), { email: invitee, role: "researcher" })).ok).toBe(true);
  const until = Date.now() + 10_000;
  while (Date.now() < until && !(await listMessages(mail.mailDir, { to: invitee })).length) await new Promise((r) => setTimeout(r, 100));
  const [msg] = await listMessages(mail.mailDir, { to: invitee });
  inviteLink = /https?:\/\/\S+\/invite\/[A-Za-z0-9_-]+/.exec(msg.text)![0];
}, 60_000);
afterAll(async () => {
  await mail.stop();
  await closeDb();
});

describe("demo mailbox", () => {
  it("the invitation mail carries the lab it is about", async () => {
    const [msg] = await listMessages(mail.mailDir, { to: invitee });
    expect(msg.labId).toBe(victim.labId);
  });

  it("the lead of another lab sees none of this lab's mail, even asking for the address", async () => {
    const other = await signedInClient(intruder.users.lead.email, TEST_PASSWORD);
    const all = await other.fetch("/mailbox");
    expect(all.status).toBe(200);
    const html = await all.text();
    expect(html).not.toContain(invitee);
    expect(html).not.toContain("/invite/");
    // Asking for the address only echoes it in the filter field; no message comes with it.
    const asked = await other.fetch(`/mailbox?to=${encodeURIComponent(invitee)}`);
    expect(asked.status).toBe(200);
    const filtered = await asked.text();
    expect(filtered).not.toContain("/invite/");
    expect(filtered).not.toContain("Invitation to Mailbox victim");
    expect(filtered).toContain("No mail yet.");
  });

  it("a lab signed up a moment ago sees no demo-lab mail either", async () => {
    const lead = await signedInClient(intruder.users.lead.email, TEST_PASSWORD);
    const html = await (await lead.fetch("/mailbox?to=technician@tarrow.example")).text();
    expect(html).not.toMatch(/Inspection tomorrow|Overdue inspection|Invitation to Tarrow/);
  });

  it("the inviting lab's lead reads the invitation, link included", async () => {
    const lead = await signedInClient(victim.users.lead.email, TEST_PASSWORD);
    const html = await (await lead.fetch("/mailbox")).text();
    expect(html).toContain(invitee);
    expect(html).toContain(inviteLink);
  });

  for (const role of ["researcher", "technician", "observer"] as const) {
    it(`a ${role} of the same lab is refused (403)`, async () => {
      const member = await signedInClient(victim.users[role].email, TEST_PASSWORD);
      const res = await member.fetch("/mailbox");
      expect(res.status).toBe(403);
      expect(await res.text()).not.toContain(invitee);
    });
  }

  it("is off (404) on a server started with DEMO_MODE=0", async () => {
    const port = await freePort();
    const base = `http://localhost:${port}`;
    const server = await spawnService("scripts/serve.mjs", {
      ...process.env, DEMO_MODE: "0", PORT: String(port), WEB_CONCURRENCY: "1", NEXTAUTH_URL: base, APP_URL: base,
      NEXTAUTH_SECRET: "mailbox-test-secret-of-forty-characters!",
    }, "app process");
    try {
      const until = Date.now() + 60_000;
      while (Date.now() < until) {
        const ok = await fetch(`${base}/sign-in`).then((r) => r.status < 500, () => false);
        if (ok) break;
        await new Promise((r) => setTimeout(r, 300));
      }
      const lead = await signedInClient(victim.users.lead.email, TEST_PASSWORD, base);
      const res = await lead.fetch("/mailbox");
      expect(res.status).toBe(404);
      expect(await res.text()).not.toContain(invitee);
    } finally {
      await server.stop();
    }
  }, 90_000);
});
