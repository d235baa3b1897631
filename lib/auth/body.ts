// Request bodies are read here, and only here, with their size limit enforced while the bytes arrive:
// a declared Content-Length over the limit is refused before anything is read, and a body that runs
// past the limit is cut off at that point (413), so an oversized upload never sits whole in memory.
// Large imports also take one of a few slots per app process, so a burst of them cannot exhaust it.
import { AppError } from "./errors";

export const MB = 1024 * 1024;

/** The body's bytes, at most `maxBytes`; AppError("too-large", message) as soon as it is longer. */
export async function readBodyBytes(req: Request, maxBytes: number, message: string): Promise<Uint8Array<ArrayBuffer>> {
  const declared = Number(req.headers.get("content-length") ?? Number.NaN);
  if (Number.isFinite(declared) && declared > maxBytes) {
    await req.body?.cancel().catch(() => undefined);
    throw new AppError("too-large", message);
  }
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > maxBytes) {
      await reader.cancel().catch(() => undefined);
      throw new AppError("too-large", message);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** The body as UTF-8 text (a leading byte-order mark is kept for the caller to strip). */
export async function readBodyText(req: Request, maxBytes: number, message: string): Promise<string> {
  return new TextDecoder("utf-8", { ignoreBOM: true }).decode(await readBodyBytes(req, maxBytes, message));
}

/** A multipart or urlencoded form, its whole body at most `maxBytes`. */
export async function readBodyForm(req: Request, maxBytes: number, message: string): Promise<FormData> {
  const bytes = await readBodyBytes(req, maxBytes, message);
  const type = req.headers.get("content-type") ?? "";
  try {
    return await new Response(bytes, { headers: { "content-type": type } }).formData();
  } catch {
    throw new AppError("invalid", "Send the file as multipart/form-data.");
  }
}

/** At most `size` holders at once in this process; the rest are refused, not queued. */
export function createSlots(size: number) {
  let busy = 0;
  /** Takes a slot, or throws AppError("unavailable") when all are taken; call the result to give it back. */
  const take = (busyMessage: string): (() => void) => {
    if (busy >= size) throw new AppError("unavailable", busyMessage);
    busy++;
    let held = true;
    return () => {
      if (held) busy--;
      held = false;
    };
  };
  return {
    get busy() {
      return busy;
    },
    take,
    /** Runs `work` in a slot (see take). */
    async run<T>(work: () => Promise<T>, busyMessage: string): Promise<T> {
      const release = take(busyMessage);
      try {
        return await work();
      } finally {
        release();
      }
    },
  };
}

// Specimen and logger-file imports: each holds its body and what is parsed from it in memory.
export const LARGE_IMPORT_SLOTS = 2;
export const largeImports = createSlots(LARGE_IMPORT_SLOTS);
export const IMPORT_BUSY_MESSAGE = "Other large imports are running on the server right now; try again in a minute.";
