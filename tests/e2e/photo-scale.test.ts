// Browser: a technician ticks a protocol point and uploads a generated photo with a 10 mm scale bar
// drawn at a known 20 px/mm, records the other protocol points and the bar's two ends (a zero-length scale is refused at the field
// first), scores it with a face outline, and finds the rusted area in mm² in the grid and the report.
import { randomBytes } from "node:crypto";
import { and, eq, inArray, like } from "drizzle-orm";
import sharp from "sharp";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { renderSpecimenFace } from "@/lib/demo-images/specimen-face";
import { rustedAreaDetail, type Mark } from "@/lib/scoring/geometry";
import { formatMm2 } from "@/components/photos/area-mm2";
import { deleteKeys } from "@/storage/objects";
import { signedInClient } from "../support/http";
import { APP_URL, axeViolations, launch, screenshot, signIn, streamed } from "./support/browser";

const PX_PER_MM = 20;
const tag = randomBytes(3).toString("hex");
const PHOTOS_TEST_LABELS = ["TV-M-001", "TV-M-002", "TV-S-003"];
let browser: Browser;
let trial: typeof s.trials.$inferSelect;
let inspection: typeof s.inspections.$inferSelect;
let specimen: { id: string; label: string };
let savedScore: typeof s.scores.$inferSelect;

beforeAll(async () => {
  browser = await launch();
  const [lab] = await db.select().from(s.labs).where(eq(s.labs.name, "Tarrow Valley Natural History Collection"));
  [trial] = await db.select().from(s.trials).where(eq(s.trials.labId, lab.id));
  const done = (await db.select().from(s.inspections).where(eq(s.inspections.trialId, trial.id))).filter((i) => i.doneAt).sort((a, b) => b.dayNumber - a.dayNumber);
  inspection = done[0];
  // A specimen the photo test does not use, with the technician's (primary scorer's) score of record here.
  const rows = await db.select({ score: s.scores, label: s.specimens.label }).from(s.scores).innerJoin(s.specimens, eq(s.specimens.id, s.scores.specimenId))
    .where(and(eq(s.scores.inspectionId, inspection.id), eq(s.scores.isRecord, true)));
  const pick = rows.filter((r) => !PHOTOS_TEST_LABELS.includes(r.label)).sort((a, b) => a.label.localeCompare(b.label))[0];
  specimen = { id: pick.score.specimenId, label: pick.label };
  savedScore = pick.score;
});

afterAll(async () => {
  await browser?.close();
  // Leave the demo lab as it was: the score of record back as seeded, our marks and photo gone.
  const mine = await db.select().from(s.photos).where(like(s.photos.filename, `%scale-e2e-${tag}%`));
  if (mine.length) {
    const ids = mine.map((p) => p.id);
    await db.delete(s.marks).where(inArray(s.marks.photoId, ids));
    await db.update(s.scores).set({ ...savedScore }).where(eq(s.scores.id, savedScore.id));
    await db.delete(s.photos).where(inArray(s.photos.id, ids));
    await deleteKeys(mine.flatMap((p) => [p.objectKey, ...Object.values(p.derivatives)])).catch(() => undefined);
  }
  await closeDb();
});

describe("photo protocol and scale", () => {
  it("records protocol and scale with an uploaded photo and shows the area in mm² in the grid and the report", async () => {
    const img = renderSpecimenFace({ width: 640, height: 480, seed: `scale-${tag}`, kind: "iron", rustSpots: [{ x: 320, y: 240, r: 40 }], scaleBar: { pxPerMm: PX_PER_MM } });
    const bar = img.scaleBar!;
    const jpeg = await sharp(Buffer.from(img.data.buffer), { raw: { width: 640, height: 480, channels: 4 } }).jpeg({ quality: 92 }).toBuffer();
    const filename = `${specimen.label}_scale-e2e-${tag}.jpg`;

    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, "technician@tarrow.example");
    await page.goto(`${APP_URL}/trials/${trial.id}/inspections/${inspection.id}/photos`);
    await streamed(page);
    // One point ticked at the bench goes with the upload; the others are then missing.
    await page.getByRole("group", { name: "Photo protocol" }).getByLabel(trial.photoProtocol[0], { exact: true }).check();
    await page.getByLabel("Choose photos").setInputFiles([{ name: filename, mimeType: "image/jpeg", buffer: jpeg }]);
    await page.getByRole("button", { name: "Upload 1 photo" }).click();
    await expect.poll(() => page.locator('li[data-upload-state="done"]').count(), { timeout: 60_000 }).toBe(1);
    const [photo] = await db.select().from(s.photos).where(eq(s.photos.filename, filename));

    expect((await db.select().from(s.photoEvidence).where(eq(s.photoEvidence.photoId, photo.id)))[0]?.protocolConfirmed).toEqual([trial.photoProtocol[0]]);
    // The recorded list picks the photo up, flagged for the points not ticked.
    const card = page.locator("figure", { hasText: filename });
    await expect.poll(async () => { await page.reload(); await streamed(page); return card.count(); }, { timeout: 30_000 }).toBe(1);
    await expect(card.locator("[data-protocol-flag]").first().getAttribute("data-protocol-flag")).resolves.toBe(String(trial.photoProtocol.length - 1));
    await card.locator("summary", { hasText: "Protocol and scale" }).click();
    const form = page.getByRole("form", { name: `Protocol and scale of ${specimen.label} (${filename})` });
    for (const line of trial.photoProtocol) await form.getByLabel(line, { exact: true }).check();
    await form.getByLabel("Two points on the scale bar").check();
    // Both ends on the same point first: refused at the field, nothing saved.
    for (const [f, v] of [["End 1 x (px)", bar.a.x], ["End 1 y (px)", bar.a.y], ["End 2 x (px)", bar.a.x], ["End 2 y (px)", bar.a.y]] as const) await form.getByLabel(f).fill(String(v));
    await form.getByRole("button", { name: "Save protocol and scale" }).click();
    await expect(form.getByRole("alert").first().textContent()).resolves.toMatch(/same point/);
    expect((await db.select().from(s.photoEvidence).where(eq(s.photoEvidence.photoId, photo.id)))[0]?.pxPerMm).toBeNull();
    await expect(form.getByLabel("End 1 x (px)").getAttribute("aria-invalid")).resolves.toBe("true");

    await form.getByLabel("End 2 x (px)").fill(String(bar.b.x));
    await form.getByLabel("End 2 y (px)").fill(String(bar.b.y));
    await form.getByLabel("Length between (mm)").fill("10");
    await form.getByRole("button", { name: "Save protocol and scale" }).click();
    await expect.poll(async () => (await db.select().from(s.photoEvidence).where(eq(s.photoEvidence.photoId, photo.id)))[0]?.pxPerMm ?? null, { timeout: 15_000 }).toBe(PX_PER_MM);
    await expect.poll(() => card.locator("[data-px-per-mm]").getAttribute("data-px-per-mm"), { timeout: 15_000 }).toBe(String(PX_PER_MM));
    await expect(card.locator("[data-protocol-flag]").count()).resolves.toBe(0);
    await screenshot(page, "photo-scale-form");
    expect(await axeViolations(page)).toEqual([]);

    // Scored with the face outline the generator drew and one circle over the spot.
    const marks: Mark[] = [{ kind: "circle", cx: 320, cy: 240, r: 40 }];
    const detail = rustedAreaDetail(img.face, marks);
    const tech = await signedInClient("technician@tarrow.example", "rustline-demo-1");
    const res = await tech.fetch("/api/scores", {
      method: "POST", headers: { "content-type": "application/json" },
      body: JSON.stringify({ trialId: trial.id, photoId: photo.id, spotCount: 1, areaPercent: detail.percent, astmLetter: "S", silicateChange: "none", notes: "", areaSource: "marks", face: img.face, marks }),
    });
    expect(res.status).toBe(200);
    // Expected: the marked rust in px² over (20 px/mm)², a direct recomputation from the marks.
    const expected = formatMm2(detail.rustedAreaPx2 / PX_PER_MM ** 2);

    await page.goto(`${APP_URL}/trials/${trial.id}/grid?inspection=${inspection.id}`);
    const cell = page.locator(`li[data-specimen="${specimen.label}"]`);
    await expect(cell.locator("[data-area-mm2]").textContent()).resolves.toBe(`${expected} mm² rusted`);
    await screenshot(page, "photo-scale-grid");

    await page.goto(`${APP_URL}/trials/${trial.id}/report`);
    // A moved specimen has a row per placement; the last one ends at this inspection.
    const cells = page.locator(`#scaled-h ~ div tr[data-specimen="${specimen.label}"] [data-area-mm2]`);
    await expect(cells.allTextContents()).resolves.toContain(expected);
    await screenshot(page, "photo-scale-report");
    expect(await axeViolations(page)).toEqual([]);
    await context.close();
  }, 180_000);
});
