// Browser: a technician places two control points on a specimen's first photo, is told at the field
// that one point is not enough on the next photo, places the second, and finds the series lined up on
// the timeline with the rust new since the previous inspection painted and measured. The later photo's
// points are where a known similarity (built here from scale, angle and shift) puts the first ones.
import { and, eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { saveScoreAction } from "@/app/_actions/scores";
import { createTestLab, TEST_PASSWORD, type TestLab } from "../support/db";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { createReadyPhoto, createScoringTrial, squareFace, type MadePhoto, type ScoringTrial } from "../integration/scoring-fixtures";
import { APP_URL, axeViolations, launch, screenshot, signIn } from "./support/browser";

let browser: Browser;
let s3: S3Fake;
let lab: TestLab;
let t: ScoringTrial;
const photos: MadePhoto[] = [];

// Later photo → first photo: 5 % closer, turned 4°, shifted. Its points are the first ones mapped back.
const rad = (4 * Math.PI) / 180;
const move = { a: 1.05 * Math.cos(rad), b: -1.05 * Math.sin(rad), c: -12, d: 1.05 * Math.sin(rad), e: 1.05 * Math.cos(rad), f: 9 };
const back = (p: { x: number; y: number }) => {
  const det = move.a * move.e - move.b * move.d;
  const u = p.x - move.c;
  const v = p.y - move.f;
  return { x: (move.e * u - move.b * v) / det, y: (-move.d * u + move.a * v) / det };
};
const firstPoints = [{ x: 80, y: 60 }, { x: 320, y: 230 }];

beforeAll(async () => {
  s3 = await ensureS3Fake();
  browser = await launch();
  lab = await createTestLab("Photo align e2e");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id, specimens: 1, days: [0, 7] });
  for (const inspectionId of t.inspectionIds) {
    photos.push(await createReadyPhoto({ labId: lab.labId, trialId: t.trialId, inspectionId, specimenId: t.specimenIds[0], uploadedBy: lab.users.technician.id, width: 400, height: 300, spots: 2 }));
  }
  // Scores of record with one spot (first frame: centre (200, 150), r = 20 then 35).
  for (const [k, p] of photos.entries()) {
    const to = k === 0 ? (q: { x: number; y: number }) => q : back;
    const c = to({ x: 200, y: 150 });
    const r = await saveScoreAction.withIdentity(lab.as("technician"), {
      trialId: t.trialId, photoId: p.photoId, spotCount: "1", areaPercent: "1", astmLetter: "S", silicateChange: "none", notes: "", areaSource: "manual",
      face: JSON.stringify(squareFace(50, 50, 300).map(to)), marks: JSON.stringify([{ kind: "circle", cx: c.x, cy: c.y, r: (k === 0 ? 20 : 35) / (k === 0 ? 1 : 1.05) }]),
    });
    if (!r.ok) throw new Error(`score not saved: ${r.message}`);
  }
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
  await s3?.stop();
});

async function clickAt(page: Page, p: { x: number; y: number }) {
  const svg = page.getByRole("img", { name: /click to place point/ });
  const box = (await svg.boundingBox())!;
  await page.mouse.click(box.x + (p.x / 400) * box.width, box.y + (p.y / 300) * box.height);
}

describe("aligning a specimen's photos", () => {
  it("places points on the first and a later photo, refusing one point, and shows the lined-up series", async () => {
    const context = await browser.newContext({ viewport: { width: 1300, height: 1000 } });
    const page = await context.newPage();
    await signIn(page, lab.users.technician.email, TEST_PASSWORD);

    await page.goto(`${APP_URL}/trials/${t.trialId}/align/${photos[0].photoId}`);
    await page.getByText("This is the first photo of the specimen in this trial").waitFor();
    for (const p of firstPoints) await clickAt(page, p);
    await page.getByText("Point 2:").waitFor();
    expect(await axeViolations(page)).toEqual([]);
    await page.getByRole("button", { name: "Save points" }).click();
    await page.getByText("2 control points saved on the first photo").waitFor();

    await page.goto(`${APP_URL}/trials/${t.trialId}/align/${photos[1].photoId}`);
    await page.getByRole("heading", { name: /First photo/ }).waitFor();
    await clickAt(page, back(firstPoints[0]));
    await page.getByRole("button", { name: "Save points" }).click();
    await page.getByRole("alert").filter({ hasText: "Place at least 2 control points (1 placed)" }).first().waitFor();
    const none = await db.select().from(s.photoControlPoints).where(and(eq(s.photoControlPoints.labId, lab.labId), eq(s.photoControlPoints.photoId, photos[1].photoId)));
    expect(none).toEqual([]);
    await clickAt(page, back(firstPoints[1]));
    await page.getByRole("button", { name: "Save points" }).click();
    await page.getByText("the photo now lines up with the first one").waitFor();
    await screenshot(page, "photo-align-page");

    await page.goto(`${APP_URL}/specimens/${t.specimenIds[0]}/timeline`);
    const series = page.getByRole("list", { name: "Photos lined up with the first photo" });
    await series.waitFor();
    await expect(series.locator("li[data-align-status]").evaluateAll((els) => els.map((e) => e.getAttribute("data-align-status")))).resolves.toEqual(["reference", "aligned"]);
    // The later photo is drawn through the fitted matrix (SVG matrix(a d b e c f)); the clicks are rounded to 0.1 px of the photo.
    const transform = await series.locator("li").nth(1).locator("image").getAttribute("transform");
    const [a, d, , , c, f] = transform!.replace(/^matrix\(|\)$/g, "").split(" ").map(Number);
    expect(Math.abs(a - move.a)).toBeLessThan(0.01);
    expect(Math.abs(d - move.d)).toBeLessThan(0.01);
    expect(Math.abs(c - move.c)).toBeLessThan(2);
    expect(Math.abs(f - move.f)).toBeLessThan(2);
    // New since day 0: the annulus π(35² − 20²) ≈ 2592 px², measured in the first photo's frame.
    const text = await series.locator("li").nth(1).innerText();
    const newPx2 = Number(/New since Day 0: ([\d,]+) px²/.exec(text)![1].replace(/,/g, ""));
    expect(Math.abs(newPx2 - Math.PI * (35 ** 2 - 20 ** 2)) / (Math.PI * (35 ** 2 - 20 ** 2))).toBeLessThan(0.05);
    expect(await axeViolations(page)).toEqual([]);
    await screenshot(page, "photo-align-timeline");
    await context.close();
  });
});
