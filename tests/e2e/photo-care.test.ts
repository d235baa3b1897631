// Browser: a technician finds a photo flagged "wrong card or wrong day?", looks at its capture time
// (shown in UTC like every other time), acknowledges the warning with a note, moves a photo that was
// filed under the wrong specimen and then to the right day, and deletes a photo that was scored,
// reading first what happens to its score. Also: the preview of chosen files before upload, the due
// page's headings in its legend's words and the inspection page's breadcrumb.
import sharp from "sharp";
import { eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { createTestLab, TEST_PASSWORD, type TestLab } from "../support/db";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { createReadyPhoto, createScoringTrial, type MadePhoto, type ScoringTrial } from "../integration/scoring-fixtures";
import { APP_URL, axeViolations, launch, screenshot, signIn, streamed } from "./support/browser";

let browser: Browser;
let s3: S3Fake;
let lab: TestLab;
let t: ScoringTrial;
let labels: string[] = [];
let flagged: MadePhoto;
let misfiled: MadePhoto;
let scored: MadePhoto;
let trialTitle = "";

/** EXIF wall-clock text at UTC+01:00 for an instant (EXIF 2.32 "YYYY:MM:DD HH:MM:SS", from memory). */
function exifAtPlusOne(at: Date) {
  const x = new Date(at.getTime() + 3_600_000).toISOString();
  return `${x.slice(0, 10).replace(/-/g, ":")} ${x.slice(11, 19)}`;
}

beforeAll(async () => {
  s3 = await ensureS3Fake();
  browser = await launch();
  lab = await createTestLab("Photo care e2e");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id, specimens: 3, days: [0, 7, 14] });
  labels = (await db.select({ id: s.specimens.id, label: s.specimens.label }).from(s.specimens).where(eq(s.specimens.labId, lab.labId)))
    .sort((a, b) => t.specimenIds.indexOf(a.id) - t.specimenIds.indexOf(b.id)).map((r) => r.label);
  trialTitle = (await db.select().from(s.trials).where(eq(s.trials.id, t.trialId)))[0].title;
  const [insp] = await db.select().from(s.inspections).where(eq(s.inspections.id, t.inspectionIds[1]));
  const made = (specimen: number, filename: string) => createReadyPhoto({ labId: lab.labId, trialId: t.trialId, inspectionId: t.inspectionIds[1], specimenId: t.specimenIds[specimen], uploadedBy: lab.users.technician.id, width: 400, height: 300, filename });
  flagged = await made(0, "flagged-card.jpg");
  // Taken three days before the inspection's done time.
  await db.update(s.photos).set({ capturedAtRaw: exifAtPlusOne(new Date(insp.doneAt!.getTime() - 3 * 86_400_000)), capturedOffset: "+01:00", capturedAt: new Date(insp.doneAt!.getTime() - 3 * 86_400_000) }).where(eq(s.photos.id, flagged.photoId));
  misfiled = await made(1, "misfiled.jpg");
  scored = await made(2, "scored.jpg");
  await db.insert(s.scores).values({ labId: lab.labId, trialId: t.trialId, inspectionId: t.inspectionIds[1], specimenId: t.specimenIds[2], photoId: scored.photoId, scorerId: lab.users.technician.id, spotCount: 2, areaPercent: 0.5, astmGrade: 7, astmLetter: "S", isoDegree: 2, notes: "seen at the bench" });
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
  await s3?.stop();
});

async function openPhotos(page: Page) {
  await page.goto(`${APP_URL}/trials/${t.trialId}/inspections/${t.inspectionIds[1]}/photos`);
  await page.getByRole("heading", { name: "Photos · day 7" }).waitFor();
  await streamed(page);
}
const card = (page: Page, photoId: string) => page.locator(`figure[data-photo-id="${photoId}"]`);

describe("looking after recorded photos", () => {
  it("acknowledges a capture-time warning with a note, moves a misfiled photo, deletes a scored one after reading what happens", async () => {
    const context = await browser.newContext({ viewport: { width: 1300, height: 1000 } });
    const page = await context.newPage();
    await signIn(page, lab.users.technician.email, TEST_PASSWORD);
    await openPhotos(page);

    // The breadcrumb names the trial, the schedule and the inspection.
    const crumbs = page.getByRole("navigation", { name: "Breadcrumb" });
    await expect(crumbs.innerText()).resolves.toMatch(new RegExp(`${trialTitle} › Schedule › Inspection day 7 › Photos`));

    const f = card(page, flagged.photoId);
    await expect(f.innerText()).resolves.toMatch(/3 days before the inspection's done time.*Wrong card or wrong day\?/);
    // The capture time reads like every other time on the page, not as EXIF text.
    await f.getByText("File and camera details").click();
    const doneAt = (await db.select().from(s.inspections).where(eq(s.inspections.id, t.inspectionIds[1])))[0].doneAt!;
    const shot = new Date(doneAt.getTime() - 3 * 86_400_000).toISOString();
    await f.getByText(`${shot.slice(0, 10)} ${shot.slice(11, 16)} UTC (camera clock at UTC+01:00)`).waitFor();
    await expect(f.innerText()).resolves.not.toMatch(/\d{4}:\d{2}:\d{2} \d{2}:\d{2}/);

    // Acknowledge: an empty note is refused, a note is kept with who and when.
    await f.getByRole("button", { name: "Acknowledge" }).click();
    await f.getByRole("alert").filter({ hasText: "Say why the photo is right" }).waitFor();
    await f.getByLabel("Acknowledge with a note").fill("Camera clock was never set after the battery change; taken at the bench on the day.");
    await f.getByRole("button", { name: "Acknowledge" }).click();
    await f.locator("[data-acknowledged=true]").waitFor({ timeout: 15_000 });
    await expect(f.locator("[data-acknowledged=true]").innerText()).resolves.toMatch(/Acknowledged by technician \w+ on \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC:\s*.?Camera clock was never set/);
    const [ackRow] = await db.select().from(s.photos).where(eq(s.photos.id, flagged.photoId));
    expect(ackRow.checkAckBy).toBe(lab.users.technician.id);
    await screenshot(page, "photo-care-acknowledged");

    // Move: the misfiled photo shows specimen 1, not 2 — open "Move or delete" and refile it.
    const m = card(page, misfiled.photoId);
    await m.getByText("Move or delete").click();
    await m.getByLabel("Specimen").selectOption({ label: labels[0] });
    await m.getByRole("button", { name: "Move photo" }).click();
    await page.getByTestId("photo-notice").getByText(`Photo moved to ${labels[0]} at day 7.`).waitFor({ timeout: 15_000 });
    await expect.poll(async () => (await card(page, misfiled.photoId).locator("p.font-medium").first().innerText())).toBe(labels[0]);
    // …and to the day it was really taken: it leaves this inspection's list.
    const m2 = card(page, misfiled.photoId);
    if (!(await m2.getByLabel("Inspection").isVisible())) await m2.getByText("Move or delete").click();
    await m2.getByLabel("Inspection").selectOption(t.inspectionIds[2]);
    await m2.getByRole("button", { name: "Move photo" }).click();
    await expect.poll(() => card(page, misfiled.photoId).count(), { timeout: 15_000 }).toBe(0);
    const [moved] = await db.select().from(s.photos).where(eq(s.photos.id, misfiled.photoId));
    expect([moved.inspectionId, moved.specimenId]).toEqual([t.inspectionIds[2], t.specimenIds[0]]);

    // Delete the scored photo: the page says what happens to the score and asks first.
    const d = card(page, scored.photoId);
    await d.getByText("Move or delete").click();
    await expect(d.innerText()).resolves.toContain(`1 score was made on this photo. It stays recorded for ${labels[2]} at day 7 with its area, grades and notes, but no longer points to a photo`);
    await d.getByRole("button", { name: "Delete photo" }).click();
    await d.getByRole("alert").filter({ hasText: "Tick the box to confirm" }).first().waitFor();
    expect(await db.select().from(s.photos).where(eq(s.photos.id, scored.photoId))).toHaveLength(1);
    await d.getByLabel("I understand what happens to the scores and marks made on this photo").check();
    await d.getByRole("button", { name: "Delete photo" }).click();
    await page.getByTestId("photo-notice").getByText("Photo deleted. The score made on it stays recorded without the photo.").waitFor({ timeout: 15_000 });
    await expect.poll(() => card(page, scored.photoId).count()).toBe(0);
    const [score] = await db.select().from(s.scores).where(eq(s.scores.specimenId, t.specimenIds[2]));
    expect(score).toMatchObject({ photoId: null, areaPercent: 0.5, notes: "seen at the bench" });
    const events = await db.select().from(s.auditEvents).where(eq(s.auditEvents.labId, lab.labId));
    expect(events.filter((e) => e.entity === "photo").map((e) => e.action).sort()).toEqual(["delete", "update", "update", "update"]);
    expect(await axeViolations(page)).toEqual([]);
    await context.close();
  }, 120_000);

  it("shows thumbnails of the chosen files with name and size before anything is uploaded", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, lab.users.technician.email, TEST_PASSWORD);
    await openPhotos(page);
    // Noise keeps the JPEG above a few kilobytes, so its size reads in KB.
    const jpeg = await sharp({ create: { width: 320, height: 240, channels: 3, background: { r: 150, g: 90, b: 40 }, noise: { type: "gaussian", mean: 128, sigma: 50 } } }).jpeg({ quality: 90 }).toBuffer();
    expect(jpeg.byteLength).toBeGreaterThan(10 * 1024);
    const name = `${labels[1]}_preview.jpg`;
    await page.getByLabel("Choose photos").setInputFiles([{ name, mimeType: "image/jpeg", buffer: jpeg }]);
    const row = page.locator(`li[data-filename="${name}"]`);
    await expect(row.getAttribute("data-upload-state")).resolves.toBe("ready");
    const img = row.getByRole("img", { name: `Preview of ${name}` });
    await expect.poll(() => img.evaluate((el) => (el as HTMLImageElement).naturalWidth)).toBe(320);
    await expect(img.getAttribute("src")).resolves.toMatch(/^blob:/);
    await expect(row.innerText()).resolves.toContain(`${Math.round(jpeg.byteLength / 1024)} KB`);
    // Nothing was sent: no photo row with that name.
    expect(await db.select().from(s.photos).where(eq(s.photos.filename, name))).toHaveLength(0);
    await row.getByRole("button", { name: `Remove ${name} from the list` }).click();
    await expect.poll(() => row.count()).toBe(0);
    await context.close();
  }, 60_000);

  it("the due page's headings use its legend's words", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, lab.users.technician.email, TEST_PASSWORD);
    await page.goto(`${APP_URL}/due`);
    for (const word of ["Overdue", "Due", "Upcoming"]) await page.getByRole("heading", { name: new RegExp(`^${word} \\(\\d+\\)$`) }).waitFor();
    const legend = await page.getByText(/^Due: planned for today or tomorrow/).innerText();
    for (const word of ["Due:", "Overdue:", "Upcoming:"]) expect(legend).toContain(word);
    await expect(page.getByRole("heading", { name: /Today|seven days/ }).count()).resolves.toBe(0);
    await context.close();
  }, 60_000);
});
