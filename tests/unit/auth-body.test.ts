// Request bodies are read with their limit enforced while they stream (OWASP Denial of Service
// cheat sheet: "limit request size"; RFC 9110 §15.5.14 413 Content Too Large), and large imports
// take one of a few slots. Written as a client that keeps sending or lies about its size.
import { describe, expect, it } from "vitest";
import { createSlots, readBodyBytes, readBodyForm, readBodyText } from "@/lib/auth/body";
import { AppError } from "@/lib/auth/errors";

const KB = 1024;

/** A body that never ends on its own: 16 KB chunks, counting how many bytes the reader pulled. */
function endless() {
  const seen = { pulled: 0, cancelled: false };
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      seen.pulled += 16 * KB;
      controller.enqueue(new Uint8Array(16 * KB).fill(0x41));
    },
    cancel() {
      seen.cancelled = true;
    },
  }, { highWaterMark: 0 });
  return { body, seen };
}

const post = (body: BodyInit | ReadableStream<Uint8Array>, headers: Record<string, string> = {}) =>
  new Request("http://localhost/api/x", { method: "POST", body, headers, duplex: "half" } as RequestInit);

async function tooLarge(p: Promise<unknown>) {
  const err = await p.then(() => null, (e: unknown) => e);
  expect(err).toBeInstanceOf(AppError);
  expect((err as AppError).code).toBe("too-large");
}

describe("reading a request body", () => {
  it("stops an endless body just past the limit and cancels it, instead of reading it all", async () => {
    const { body, seen } = endless();
    await tooLarge(readBodyBytes(post(body), 100 * KB, "too big"));
    expect(seen.pulled).toBeLessThanOrEqual(100 * KB + 3 * 16 * KB);
    expect(seen.cancelled).toBe(true);
  });

  it("refuses a declared Content-Length over the limit before reading a byte", async () => {
    const { body, seen } = endless();
    await tooLarge(readBodyBytes(post(body, { "content-length": String(50 * 1024 * KB) }), 100 * KB, "too big"));
    expect(seen.pulled).toBeLessThanOrEqual(16 * KB); // at most what the stream buffered on its own
  });

  it("does not trust a small Content-Length: the bytes that arrive are counted", async () => {
    const { body, seen } = endless();
    await tooLarge(readBodyBytes(post(body, { "content-length": "10" }), 100 * KB, "too big"));
    expect(seen.pulled).toBeLessThanOrEqual(100 * KB + 3 * 16 * KB);
  });

  it("reads a body at the limit whole, as text or as a form", async () => {
    const text = "é".repeat(50 * KB); // 2 bytes each in UTF-8: exactly 100 KB
    expect(await readBodyText(post(text), 100 * KB, "too big")).toBe(text);
    await tooLarge(readBodyText(post(`${text}!`), 100 * KB, "too big"));
    const form = new FormData();
    form.set("options", "{}");
    form.set("file", new File(["time,rh\n"], "log.csv", { type: "text/csv" }));
    const req = new Request("http://localhost/api/x", { method: "POST", body: form });
    const read = await readBodyForm(req, 100 * KB, "too big");
    expect(await (read.get("file") as File).text()).toBe("time,rh\n");
  });
});

describe("slots for large imports", () => {
  it("refuses the one past the cap with 'unavailable' and frees a slot when a holder finishes", async () => {
    const slots = createSlots(2);
    const a = slots.take("busy");
    const b = slots.take("busy");
    expect(() => slots.take("busy")).toThrowError(AppError);
    a();
    a(); // giving back twice frees one slot only
    const c = slots.take("busy");
    expect(() => slots.take("busy")).toThrowError(/busy/);
    b();
    c();
    expect(slots.busy).toBe(0);
  });

  it("frees the slot when the work fails", async () => {
    const slots = createSlots(1);
    await expect(slots.run(async () => { throw new Error("parse failed"); }, "busy")).rejects.toThrow("parse failed");
    expect(await slots.run(async () => "done", "busy")).toBe("done");
  });
});
