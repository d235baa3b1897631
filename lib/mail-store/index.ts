// Reads the messages the local mail fake (scripts/mail-fake.mjs) stored, for the demo inbox and tests.
// Plain file reading: one <id>.json per message, written atomically by the fake.
import fs from "node:fs/promises";
import path from "node:path";

export interface StoredMail {
  id: string;
  /** ISO 8601 time the fake received the message. */
  receivedAt: string;
  from: string;
  /** Envelope recipients (who it was delivered to, Bcc included). */
  to: string[];
  subject: string;
  text: string;
  html: string;
  /** The lab the mail is about (the app's X-Rustline-Lab header), or null (sign-up mail, older mail). */
  labId: string | null;
}

// Ids are file names the fake made; anything else is refused so an id cannot walk out of the folder.
const ID_PATTERN = /^[0-9A-Za-z-]{1,80}$/;

function asStoredMail(value: unknown): StoredMail | null {
  if (typeof value !== "object" || value === null) return null;
  const v = value as Record<string, unknown>;
  if (typeof v.id !== "string" || typeof v.receivedAt !== "string") return null;
  return {
    id: v.id,
    receivedAt: v.receivedAt,
    from: typeof v.from === "string" ? v.from : "",
    to: Array.isArray(v.to) ? v.to.filter((t): t is string => typeof t === "string") : [],
    subject: typeof v.subject === "string" ? v.subject : "",
    text: typeof v.text === "string" ? v.text : "",
    html: typeof v.html === "string" ? v.html : "",
    labId: typeof v.labId === "string" ? v.labId : null,
  };
}

async function readJson(file: string): Promise<StoredMail | null> {
  try {
    return asStoredMail(JSON.parse(await fs.readFile(file, "utf8")));
  } catch {
    return null; // removed meanwhile, or not one of ours
  }
}

function newestFirst(a: StoredMail, b: StoredMail): number {
  if (a.receivedAt !== b.receivedAt) return a.receivedAt < b.receivedAt ? 1 : -1;
  return a.id < b.id ? 1 : a.id > b.id ? -1 : 0;
}

/**
 * Messages in `dir`, newest first; `to` keeps those delivered to that address (case-insensitive).
 * `labId` keeps mail about that lab whose every recipient is in `recipients` (the demo mailbox).
 */
export async function listMessages(
  dir: string,
  { to, limit, labId, recipients }: { to?: string; limit?: number; labId?: string; recipients?: string[] } = {},
): Promise<StoredMail[]> {
  let names: string[];
  try {
    names = await fs.readdir(dir);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === "ENOENT") return [];
    throw err;
  }
  const ids = names.filter((n) => n.endsWith(".json")).map((n) => n.slice(0, -".json".length)).filter((id) => ID_PATTERN.test(id));
  const all = (await Promise.all(ids.map((id) => readJson(path.join(dir, `${id}.json`))))).filter(
    (m): m is StoredMail => m !== null,
  );
  const wanted = to?.trim().toLowerCase();
  const allowed = recipients && new Set(recipients.map((r) => r.toLowerCase()));
  const matching = all.filter((m) =>
    (!wanted || m.to.some((t) => t.toLowerCase() === wanted))
    && (labId === undefined || m.labId === labId)
    && (!allowed || (m.to.length > 0 && m.to.every((t) => allowed.has(t.toLowerCase())))));
  matching.sort(newestFirst);
  return limit !== undefined ? matching.slice(0, Math.max(0, limit)) : matching;
}

/** One message by id, or null when there is none (or the id is not a valid message id). */
export async function readMessage(dir: string, id: string): Promise<StoredMail | null> {
  if (!ID_PATTERN.test(id)) return null;
  return readJson(path.join(dir, `${id}.json`));
}

/** The raw RFC 5322 message (.eml) as received, or null. */
export async function readRawMessage(dir: string, id: string): Promise<Buffer | null> {
  if (!ID_PATTERN.test(id)) return null;
  try {
    return await fs.readFile(path.join(dir, `${id}.eml`));
  } catch {
    return null;
  }
}
