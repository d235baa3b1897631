// Browser: a technician drops three generated photos on a demo inspection (file names carry the
// specimen labels), watches them upload straight to storage, sees the capture-time warning on the
// one taken days earlier, and finds the photos on the specimen timeline, which steps by keyboard.
import { createHash, randomBytes } from "node:crypto";
import { and, eq, inArray, like } from "drizzle-orm";
import sharp from "sharp";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { deleteKeys } from "@/storage/objects";
import { anonymous, signedInClient } from "../support/http";
import { APP_URL, axeViolations, launch, screenshot, signIn, streamed } from "./support/browser";

let browser: Browser;
const tag = randomBytes(3).toString("hex");
const labels = ["TV-M-001", "TV-M-002", "TV-S-003"];
let trialId = "";
let inspection: typeof s.inspections.$inferSelect;
const specimenIds: Record<string, string> = {};

/** Local EXIF text at UTC+01:00 for an instant. */
function exifLocal(at: Date): string {
  const t = new Date(at.getTime() + 3_600_000).toISOString();
  return `${t.slice(0, 10).replace(/-/g, ":")} ${t.slice(11, 19)}`;
}

async function photo(shotAt: Date, colour: { r: number; g: number; b: number }) {
  return sharp({ create: { width: 640, height: 480, channels: 3, background: colour } })
    .jpeg({ quality: 80 })
    .withExif({ IFD0: { Make: "Demo Optics", Model: "E2E" }, IFD2: { DateTimeOriginal: exifLocal(shotAt), OffsetTimeOriginal: "+01:00" } })
    .toBuffer();
}

beforeAll(async () => {
  browser = await launch();
  const [lab] = await db.select().from(s.labs).where(eq(s.labs.name, "Tarrow Valley Natural History Collection"));
  const [trial] = await db.select().from(s.trials).where(eq(s.trials.labId, lab.id));
  trialId = trial.id;
  const done = (await db.select().from(s.inspections).where(eq(s.inspections.trialId, trial.id))).filter((i) => i.doneAt).sort((a, b) => b.dayNumber - a.dayNumber);
  inspection = done[0];
  for (const sp of await db.select().from(s.specimens).where(and(eq(s.specimens.labId, lab.id), inArray(s.specimens.label, labels)))) specimenIds[sp.label] = sp.id;
});

afterAll(async () => {
  await browser?.close();
  // Leave the demo lab as it was for other tests.
  const mine = await db.select().from(s.photos).where(like(s.photos.filename, `%e2e-${tag}%`));
  if (mine.length) {
    await db.delete(s.photos).where(inArray(s.photos.id, mine.map((p) => p.id)));
    await deleteKeys(mine.flatMap((p) => [p.objectKey, ...Object.values(p.derivatives)])).catch(() => undefined);
  }
  await closeDb();
});

async function waitForReadyPreview(page: Page, filename: string) {
  const card = page.locator("figure", { hasText: filename });
  for (let i = 0; i < 30; i++) {
    if ((await card.getAttribute("data-status").catch(() => null)) === "ready") break;
    await page.waitForTimeout(1500);
    await page.reload();
    await streamed(page);
  }
  const img = card.locator("img");
  await img.waitFor();
  await img.scrollIntoViewIfNeeded(); // previews load lazily
  // A loaded preview means the signed-URL redirect and the private bucket both answered.
  await expect.poll(() => img.evaluate((el) => ((el as HTMLImageElement).complete ? (el as HTMLImageElement).naturalWidth : 0)), { timeout: 15_000 }).toBe(320);
}

describe("inspection photos", () => {
  it("uploads three photos through presigned URLs, assigns them by file name and shows them on the timeline", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, "technician@tarrow.example");
    await page.goto(`${APP_URL}/trials/${trialId}/inspections/${inspection.id}/photos`);
    await streamed(page);
    await page.getByRole("heading", { name: `Photos · day ${inspection.dayNumber}` }).waitFor();
    await expect(page.getByRole("group", { name: "Photo protocol" }).isVisible()).resolves.toBe(true);

    const doneAt = inspection.doneAt!;
    const files = [
      { name: `${labels[0]}_e2e-${tag}.jpg`, mimeType: "image/jpeg", buffer: await photo(new Date(doneAt.getTime() - 10 * 60_000), { r: 150, g: 150, b: 150 }) },
      { name: `${labels[1]}_e2e-${tag}.jpg`, mimeType: "image/jpeg", buffer: await photo(new Date(doneAt.getTime() - 5 * 60_000), { r: 160, g: 140, b: 120 }) },
      // Three days before the inspection: the wrong card.
      { name: `${labels[2].toLowerCase().replace(/-/g, "_")}_e2e-${tag}.jpg`, mimeType: "image/jpeg", buffer: await photo(new Date(doneAt.getTime() - 3 * 86_400_000), { r: 120, g: 130, b: 90 }) },
    ];
    await page.getByLabel("Choose photos").setInputFiles(files);
    const rows = page.locator("li[data-upload-state]");
    await expect.poll(() => rows.count()).toBe(3);
    // Each file was matched to its specimen from the name alone.
    for (const [i, f] of files.entries()) {
      await expect(rows.nth(i).getByLabel("Specimen").inputValue()).resolves.toBe(specimenIds[labels[i]]);
      expect(await rows.nth(i).getAttribute("data-filename")).toBe(f.name);
    }
    await page.getByRole("button", { name: "Upload 3 photos" }).click();
    await expect.poll(() => page.locator('li[data-upload-state="done"]').count(), { timeout: 60_000 }).toBe(3);
    await expect(rows.nth(0).textContent()).resolves.toContain(`Recorded for ${labels[0]}`);
    await expect(rows.nth(2).textContent()).resolves.toMatch(/3 days before the inspection's done time.*Wrong card or wrong day\?/);
    await expect(rows.nth(0).textContent()).resolves.not.toContain("Wrong card");
    await screenshot(page, "photos-upload");
    expect(await axeViolations(page)).toEqual([]);

    // The recorded list below picks the new photos up.
    await expect.poll(async () => (await page.locator("#recorded-h").locator("xpath=../..").textContent()) ?? "", { timeout: 20_000 }).toContain(files[2].name);

    for (const [i, f] of files.entries()) {
      await page.goto(`${APP_URL}/specimens/${specimenIds[labels[i]]}/timeline`);
      await page.getByRole("heading", { name: `${labels[i]} · photo timeline` }).waitFor();
      await waitForReadyPreview(page, f.name);
    }
    await screenshot(page, "photos-timeline");
    expect(await axeViolations(page)).toEqual([]);
    await context.close();
  }, 180_000);

  it("cancels an upload in flight without recording anything, then retries it", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, "technician@tarrow.example");
    await page.goto(`${APP_URL}/trials/${trialId}/inspections/${inspection.id}/photos`);
    await streamed(page);
    await page.getByLabel("Choose photos").waitFor();
    // A noisy 1000 × 750 JPEG (~0.5 MB) over a throttled uplink stays in flight long enough to cancel.
    const noisy = await sharp({ create: { width: 1000, height: 750, channels: 3, background: { r: 128, g: 128, b: 128 }, noise: { type: "gaussian", mean: 128, sigma: 60 } } })
      .jpeg({ quality: 95 }).withExif({ IFD2: { DateTimeOriginal: exifLocal(inspection.doneAt!), OffsetTimeOriginal: "+01:00" } }).toBuffer();
    const name = `${labels[0]}_cancel_e2e-${tag}.jpg`;
    const cdp = await context.newCDPSession(page);
    await cdp.send("Network.enable");
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: 40 * 1024 });
    await page.getByLabel("Choose photos").setInputFiles([{ name, mimeType: "image/jpeg", buffer: noisy }]);
    await page.getByRole("button", { name: "Upload 1 photo" }).click();
    const row = page.locator(`li[data-filename="${name}"]`);
    await expect.poll(() => row.getAttribute("data-upload-state"), { timeout: 20_000 }).toBe("uploading");
    await page.getByRole("button", { name: `Cancel upload of ${name}` }).click();
    await expect.poll(() => row.getAttribute("data-upload-state")).toBe("cancelled");
    const recorded = async () => (await db.select({ id: s.photos.id }).from(s.photos).where(eq(s.photos.filename, name))).length;
    expect(await recorded()).toBe(0);
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
    await page.getByRole("button", { name: `Retry upload of ${name}` }).click();
    await expect.poll(() => row.getAttribute("data-upload-state"), { timeout: 30_000 }).toBe("done");
    expect(await recorded()).toBe(1);
    await context.close();
  }, 90_000);

  it("steps through the dates of a specimen with the arrow keys and switches to the slider overlay", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, "technician@tarrow.example");
    await page.goto(`${APP_URL}/specimens/${specimenIds[labels[0]]}/timeline`);
    const right = page.getByLabel("Right / over");
    const before = await right.inputValue();
    await page.getByRole("group", { name: /against/ }).focus();
    await page.keyboard.press("ArrowLeft");
    await expect.poll(() => right.inputValue()).toBe(String(Number(before) - 1));
    await page.keyboard.press("ArrowRight");
    await expect.poll(() => right.inputValue()).toBe(before);
    await page.getByLabel("Slider overlay").check();
    const divider = page.getByLabel("Divider position (% from the left)");
    await divider.fill("30");
    await expect(divider.inputValue()).resolves.toBe("30");
    await expect(page.getByRole("group", { name: /against/ }).locator("img").count()).resolves.toBe(2);
    await context.close();
  }, 90_000);

  it("an observer sees photos and the grid but no upload form and no locations", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, "observer@tarrow.example");
    await page.goto(`${APP_URL}/trials/${trialId}/inspections/${inspection.id}/photos`);
    await streamed(page);
    await page.getByRole("heading", { name: `Photos · day ${inspection.dayNumber}` }).waitFor();
    await expect(page.getByLabel("Choose photos").count()).resolves.toBe(0);
    await expect(page.getByText("recorded; hidden for your role").first().count()).resolves.toBe(1);
    await expect(page.getByText(/54\.0000\d, -3\.5000\d/).count()).resolves.toBe(0);
    await page.goto(`${APP_URL}/trials/${trialId}/grid?inspection=${inspection.id}`);
    await page.getByRole("heading", { name: `Photo grid · day ${inspection.dayNumber}` }).waitFor();
    await expect(page.locator("li[data-specimen]").count()).resolves.toBe(24);
    expect(await axeViolations(page)).toEqual([]);
    await context.close();
  }, 90_000);

  it("the photo API applies the same checks over HTTP: sign-in, role, origin, type, size, idempotent finalize, signed redirects", async () => {
    const tech = await signedInClient("technician@tarrow.example", "rustline-demo-1");
    const observer = await signedInClient("observer@tarrow.example", "rustline-demo-1");
    const json = (body: unknown, extra: Record<string, string> = {}) => ({ method: "POST", headers: { "content-type": "application/json", ...extra }, body: JSON.stringify(body) });
    const bytes = await photo(inspection.doneAt!, { r: 90, g: 90, b: 90 });
    const body = { inspectionId: inspection.id, specimenId: specimenIds[labels[0]], filename: `${labels[0]}_api_e2e-${tag}.jpg`, contentType: "image/jpeg", sizeBytes: bytes.byteLength, sha256: createHash("sha256").update(bytes).digest("hex") };

    expect((await anonymous.fetch("/api/photos/presign", json(body))).status).toBe(401);
    expect((await observer.fetch("/api/photos/presign", json(body))).status).toBe(403);
    expect((await tech.fetch("/api/photos/presign", json(body, { origin: "http://evil.example" }))).status).toBe(403);
    const gif = await tech.fetch("/api/photos/presign", json({ ...body, contentType: "image/gif" }));
    expect(gif.status).toBe(422);
    expect((await gif.json()).error.fields.contentType[0]).toMatch(/not accepted/);
    expect((await tech.fetch("/api/photos/presign", json({ ...body, sizeBytes: 41 * 1024 * 1024 }))).status).toBe(413);

    const pre = await tech.fetch("/api/photos/presign", json(body));
    expect(pre.status).toBe(200);
    const { upload, token } = (await pre.json()) as { upload: { url: string; headers: Record<string, string> }; token: string };
    expect((await fetch(upload.url, { method: "PUT", headers: upload.headers, body: new Uint8Array(bytes) })).status).toBe(200);
    const first = await tech.fetch("/api/photos/finalize", json({ token }));
    expect(first.status).toBe(201);
    const { photo: made } = (await first.json()) as { photo: { id: string } };
    const again = await tech.fetch("/api/photos/finalize", json({ token }));
    expect(again.status).toBe(200);
    expect((await again.json()).alreadyFinalized).toBe(true);

    const redirect = await tech.fetch(`/api/photos/${made.id}/file?variant=original`);
    expect(redirect.status).toBe(302);
    expect(redirect.headers.get("location")).toMatch(/X-Amz-Signature=/);
    expect((await observer.fetch(`/api/photos/${made.id}/file?variant=original`)).status).toBe(403);
    expect((await anonymous.fetch(`/api/photos/${made.id}/file?variant=thumb`)).status).toBe(401);
    expect((await tech.fetch("/api/photos/00000000-0000-4000-8000-000000000000/file?variant=thumb")).status).toBe(404);

    // A demo photo carries an (invented) location: the observer's record of it has none.
    const [demo] = await db.select({ id: s.photos.id }).from(s.photos).where(like(s.photos.filename, `${labels[0]}_day%`)).limit(1);
    const seen = (await (await observer.fetch(`/api/photos/${demo.id}`)).json()) as { photo: { gps: unknown; gpsHidden: boolean } };
    expect(seen.photo.gps).toBeNull();
    expect(seen.photo.gpsHidden).toBe(true);
    const seenByTech = (await (await tech.fetch(`/api/photos/${demo.id}`)).json()) as { photo: { gps: { lat: number } | null } };
    expect(seenByTech.photo.gps?.lat).toBe(54);
  }, 60_000);
});
