// Makes the mail fake available to integration tests: reuse the one scripts/test.mjs started
// (SMTP_URL / MAIL_DIR from the env), or start a private one on a free port with a temporary folder.
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { freePort, repoRoot, spawnService } from "./s3"; // generic child-process helpers live there

export interface MailFake {
  smtpUrl: string;
  mailDir: string;
  startedHere: boolean;
  stop(): Promise<void>;
}

/** The SMTP greeting line on host:port, or "" when nothing answers. */
function readBanner(host: string, port: number, timeoutMs = 1500): Promise<string> {
  return new Promise((resolve) => {
    const socket = net.connect({ host, port });
    let text = "";
    const done = (value: string) => {
      socket.destroy();
      resolve(value);
    };
    socket.setTimeout(timeoutMs, () => done(text));
    socket.on("data", (d) => {
      text += d.toString();
      if (text.includes("\n")) done(text);
    });
    socket.on("error", () => done(""));
  });
}

export async function ensureMailFake(): Promise<MailFake> {
  const smtpUrl = process.env.SMTP_URL || `smtp://127.0.0.1:${process.env.MAIL_PORT || 2525}`;
  const mailDir = path.resolve(repoRoot, process.env.MAIL_DIR || ".data/mail");
  const url = new URL(smtpUrl);
  const banner = await readBanner(url.hostname, Number(url.port || 25));
  if (banner.includes("rustline-mail-fake")) {
    return { smtpUrl, mailDir, startedHere: false, stop: async () => {} };
  }

  const port = await freePort();
  const ownDir = fs.mkdtempSync(path.join(os.tmpdir(), "rustline-mail-test-"));
  const service = await spawnService(
    "scripts/mail-fake.mjs",
    { ...process.env, MAIL_PORT: String(port), MAIL_DIR: ownDir },
    "rustline-mail-fake ready",
  );
  return {
    smtpUrl: `smtp://127.0.0.1:${port}`,
    mailDir: ownDir,
    startedHere: true,
    async stop() {
      await service.stop();
      fs.rmSync(ownDir, { recursive: true, force: true });
    },
  };
}
