// rustline-mail-fake — an SMTP server on loopback that accepts every message and stores it
// under MAIL_DIR as <time>-<random>.json (parsed) plus the raw .eml, for the demo inbox page and tests.
// Run: node scripts/mail-fake.mjs   (env: MAIL_PORT default 2525, MAIL_DIR default .data/mail)
import { randomBytes } from "node:crypto";
import fs from "node:fs/promises";
import path from "node:path";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

const port = Number(process.env.MAIL_PORT ?? 2525);
const host = "127.0.0.1";
const mailDir = path.resolve(process.env.MAIL_DIR ?? ".data/mail");
const MAX_MESSAGE_BYTES = 25 * 1024 * 1024;

function fail(message) {
  console.error(`rustline-mail-fake: ${message}`);
  process.exit(1);
}

if (!Number.isInteger(port) || port < 1 || port > 65535) fail(`MAIL_PORT must be a port number (got "${process.env.MAIL_PORT}")`);
await fs.mkdir(mailDir, { recursive: true });

/** Sortable and file-name safe: 2025-01-02T03-04-05-678Z-<8 random hex>. */
function newId(date) {
  return `${date.toISOString().replace(/[:.]/g, "-")}-${randomBytes(4).toString("hex")}`;
}

function addressList(field) {
  if (!field) return [];
  const groups = Array.isArray(field) ? field : [field];
  return groups.flatMap((g) => g.value.flatMap((a) => (a.group ? a.group : [a]))).map((a) => a.address).filter(Boolean);
}

/** Write to a temporary name and rename, so a reader never sees half a file. */
async function writeAtomically(file, data) {
  const tmp = `${file}.${randomBytes(4).toString("hex")}.tmp`;
  await fs.writeFile(tmp, data);
  await fs.rename(tmp, file);
}

// Strictly increasing receive times keep "newest first" exact even for messages within one millisecond.
let lastReceivedMs = 0;

async function store(raw, session) {
  lastReceivedMs = Math.max(Date.now(), lastReceivedMs + 1);
  const receivedAt = new Date(lastReceivedMs);
  const id = newId(receivedAt);
  const parsed = await simpleParser(raw);
  // Envelope recipients are who the message was delivered to (they include Bcc).
  const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
  const record = {
    id,
    receivedAt: receivedAt.toISOString(),
    from: parsed.from?.text ?? session.envelope.mailFrom?.address ?? "",
    to: envelopeTo.length ? envelopeTo : addressList(parsed.to),
    subject: parsed.subject ?? "",
    // The lab the app says the mail is about (X-Rustline-Lab); the demo mailbox shows it to that lab only.
    labId: parsed.headers.get("x-rustline-lab") ?? null,
    text: parsed.text ?? "",
    html: typeof parsed.html === "string" ? parsed.html : "",
  };
  await writeAtomically(path.join(mailDir, `${id}.eml`), raw);
  // The .json is written last: its presence means the message is complete.
  await writeAtomically(path.join(mailDir, `${id}.json`), JSON.stringify(record, null, 2));
  return record;
}

const server = new SMTPServer({
  banner: "rustline-mail-fake (stores mail locally, delivers nothing)",
  authOptional: true,
  // Accept whatever login the app is configured with; this server is loopback-only.
  allowInsecureAuth: true,
  onAuth(auth, _session, callback) {
    callback(null, { user: auth.username ?? "local" });
  },
  disabledCommands: ["STARTTLS"],
  size: MAX_MESSAGE_BYTES,
  logger: false,
  onData(stream, session, callback) {
    const chunks = [];
    stream.on("data", (chunk) => chunks.push(chunk));
    stream.on("error", callback);
    stream.on("end", () => {
      if (stream.sizeExceeded) {
        const err = Object.assign(new Error("Message exceeds the size limit"), { responseCode: 552 });
        callback(err);
        return;
      }
      store(Buffer.concat(chunks), session).then(
        (record) => callback(null, `stored as ${record.id}`),
        (err) => {
          console.error("rustline-mail-fake: could not store a message:", err);
          callback(Object.assign(new Error("Could not store the message"), { responseCode: 451 }));
        },
      );
    });
  },
});

server.on("error", (err) => {
  if (err && err.code === "EADDRINUSE") fail(`port ${port} is taken by another program; set MAIL_PORT to a free port`);
  console.error("rustline-mail-fake:", err?.message ?? err);
});

server.listen(port, host, () => {
  console.log(`rustline-mail-fake ready on smtp://${host}:${port}`);
});

let closing = false;
function shutdown() {
  if (closing) return;
  closing = true;
  server.close(() => process.exit(0));
  setTimeout(() => process.exit(0), 3000).unref();
}
process.on("SIGTERM", shutdown);
process.on("SIGINT", shutdown);
