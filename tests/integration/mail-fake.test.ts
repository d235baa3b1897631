// The local SMTP fake: mail sent the way the app sends it (nodemailer over SMTP_URL) lands in
// MAIL_DIR and reads back through lib/mail-store.
import { randomUUID } from "node:crypto";
import nodemailer from "nodemailer";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listMessages, readMessage, readRawMessage } from "@/lib/mail-store";
import { ensureMailFake, type MailFake } from "../support/mail";

let mail: MailFake;

beforeAll(async () => {
  mail = await ensureMailFake();
});

afterAll(async () => {
  await mail?.stop();
});

async function waitForMessage(to: string, subject: string, timeoutMs = 5000) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const found = (await listMessages(mail.mailDir, { to })).find((m) => m.subject === subject);
    if (found) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no message "${subject}" for ${to} in ${mail.mailDir} (is MAIL_DIR the folder the fake writes to?)`);
}

describe("mail fake", () => {
  it("stores a message sent with nodemailer, readable with subject, recipients and text", async () => {
    const transport = nodemailer.createTransport(mail.smtpUrl);
    const token = randomUUID();
    const to = `tech-${token.slice(0, 8)}@example.test`;
    const subject = `Inspection due: jar J-07 (${token})`;
    const text = "Specimen M-12 is due for its 48 h inspection.\nPhotograph the cut face under the ring light.";
    try {
      await transport.sendMail({
        from: "Rustline <no-reply@rustline.local>",
        to,
        bcc: "lead@example.test",
        subject,
        text,
        html: `<p>Specimen M-12 is due for its <strong>48 h</strong> inspection.</p>`,
      });
    } finally {
      transport.close();
    }

    const listed = await waitForMessage(to, subject);
    expect(listed.to).toContain(to);
    // Bcc recipients receive the message too, so they are in the envelope list.
    expect(listed.to).toContain("lead@example.test");
    expect(listed.from).toContain("no-reply@rustline.local");
    expect(listed.text.trim()).toBe(text);
    expect(listed.html).toContain("<strong>48 h</strong>");
    expect(Number.isNaN(Date.parse(listed.receivedAt))).toBe(false);

    const read = await readMessage(mail.mailDir, listed.id);
    expect(read).toEqual(listed);
    const raw = await readRawMessage(mail.mailDir, listed.id);
    expect(raw?.toString("utf8")).toContain("Subject: Inspection due: jar J-07");
  });

  it("lists newest first, filters by recipient case-insensitively and honours the limit", async () => {
    const transport = nodemailer.createTransport(mail.smtpUrl);
    const to = `order-${randomUUID().slice(0, 8)}@example.test`;
    try {
      for (const n of [1, 2, 3]) {
        await transport.sendMail({ from: "no-reply@rustline.local", to, subject: `reminder ${n}`, text: `n=${n}` });
      }
    } finally {
      transport.close();
    }
    await waitForMessage(to, "reminder 3");
    const all = await listMessages(mail.mailDir, { to: to.toUpperCase() });
    expect(all.map((m) => m.subject)).toEqual(["reminder 3", "reminder 2", "reminder 1"]);
    const latest = await listMessages(mail.mailDir, { to, limit: 1 });
    expect(latest.map((m) => m.subject)).toEqual(["reminder 3"]);
  });

  it("refuses ids that are not message ids instead of reading other files", async () => {
    expect(await readMessage(mail.mailDir, "../../package")).toBeNull();
    expect(await readMessage(mail.mailDir, "no-such-message")).toBeNull();
    expect(await listMessages("/nonexistent/rustline-mail")).toEqual([]);
  });
});
