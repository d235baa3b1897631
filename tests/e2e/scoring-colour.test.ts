// Browser: a scorer marks the colour card's grey patch on a photo taken under a warm lamp; a patch
// drawn on rust is refused at the patch panel with no estimate; the grey one normalises the estimate,
// which says so, is accepted and saved with its basis; the specimen's next photo starts from the patch.
import { and, eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { createTestLab, TEST_PASSWORD, type TestLab } from "../support/db";
import { ensureS3Fake, type S3Fake } from "../support/s3";
import { createReadyPhoto, createScoringTrial, type MadePhoto, type ScoringTrial } from "../integration/scoring-fixtures";
import { APP_URL, axeViolations, launch, screenshot, signIn } from "./support/browser";

let browser: Browser;
let s3: S3Fake;
let lab: TestLab;
let t: ScoringTrial;
let first: MadePhoto;
let second: MadePhoto;
// The generator's lamp: gains in linear light; the patch's gains should undo it.
const LIGHT: [number, number, number] = [1.18, 1.0, 0.72];

beforeAll(async () => {
  s3 = await ensureS3Fake();
  browser = await launch();
  lab = await createTestLab("Scoring colour e2e");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id, specimens: 1 });
  const base = {
    labId: lab.labId, trialId: t.trialId, specimenId: t.specimenIds[0], uploadedBy: lab.users.technician.id, width: 800, height: 600,
    greyPatch: { x: 12, y: 12, width: 60, height: 45, lightness: 50 }, lighting: { gains: LIGHT },
    rustSpots: [{ x: 400, y: 300, r: 60 }, { x: 250, y: 250, r: 25 }],
  };
  first = await createReadyPhoto({ ...base, inspectionId: t.inspectionIds[1], seed: "colour-e2e-1" });
  second = await createReadyPhoto({ ...base, inspectionId: t.inspectionIds[2], seed: "colour-e2e-2" });
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
  await s3?.stop();
});

const scorePage = (inspection: number, photo: MadePhoto) =>
  `${APP_URL}/trials/${t.trialId}/inspections/${t.inspectionIds[inspection]}/score/${t.specimenIds[0]}?photo=${photo.photoId}`;

async function canvasTools(page: Page) {
  const canvas = page.getByTestId("annotation-canvas");
  await canvas.waitFor();
  await canvas.scrollIntoViewIfNeeded();
  // Clicking a panel button below the canvas scrolls the page; centre the canvas again first, or a
  // point near the photo's top edge lies above the viewport and the mouse misses it.
  const at = (x: number, y: number) => canvas.evaluate((svg, p) => {
    svg.scrollIntoView({ block: "center" });
    const q = new DOMPoint(p.x, p.y).matrixTransform((svg as SVGSVGElement).getScreenCTM()!);
    return { x: q.x, y: q.y };
  }, { x, y });
  const drag = async (x0: number, y0: number, x1: number, y1: number) => {
    const a = await at(x0, y0);
    const b = await at(x1, y1);
    await page.mouse.move(a.x, a.y);
    await page.mouse.down();
    await page.mouse.move(b.x, b.y, { steps: 5 });
    await page.mouse.up();
  };
  return { at, drag };
}

describe("the grey patch on the scoring screen", () => {
  it("refuses a patch on rust, normalises with the grey one, and saves the estimate's basis", async () => {
    const context = await browser.newContext({ viewport: { width: 1500, height: 1000 } });
    const page = await context.newPage();
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await signIn(page, lab.users.technician.email, TEST_PASSWORD);
    await page.goto(scorePage(1, first));
    const { at, drag } = await canvasTools(page);
    for (const [x, y] of [[100, 100], [700, 100], [700, 500], [100, 500], [100, 100]] as const) {
      const p = await at(x, y);
      await page.mouse.click(p.x, p.y);
    }
    await expect(page.getByTestId("patch-status").innerText()).resolves.toContain("No grey patch");

    // On the big rust spot: not neutral, refused, no estimate.
    await page.getByRole("button", { name: "Mark the grey patch" }).click();
    await drag(385, 290, 415, 310);
    await page.getByRole("button", { name: "Run the colour estimate" }).click();
    const refusal = page.getByRole("alert").filter({ hasText: "not neutral grey" });
    await refusal.waitFor({ timeout: 30_000 });
    await expect(page.getByTestId("estimate-percent").count()).resolves.toBe(0);
    await screenshot(page, "scoring-patch-refused");

    // On the card's grey patch: normalised.
    await page.getByRole("button", { name: "Mark it again" }).click();
    await drag(20, 20, 64, 50);
    await page.getByRole("button", { name: "Run the colour estimate" }).click();
    await page.getByTestId("estimate-percent").waitFor({ timeout: 30_000 });
    await expect(refusal.count()).resolves.toBe(0);
    await expect(page.getByTestId("estimate-normalised").innerText()).resolves.toContain("White balance and exposure normalised from the grey patch");
    await page.getByRole("button", { name: "Accept", exact: true }).click();
    await page.getByLabel("S — spot").check(); // the score form asks how the rust is distributed
    await page.getByRole("button", { name: "Save score", exact: true }).click();
    await page.getByRole("status").filter({ hasText: "Score saved" }).waitFor({ timeout: 20_000 });
    await expect(page.getByTestId("saved-estimate").innerText()).resolves.toContain("normalised from the grey patch");
    await screenshot(page, "scoring-patch-normalised");

    const [row] = await db.select().from(s.scores).where(and(eq(s.scores.labId, lab.labId), eq(s.scores.photoId, first.photoId)));
    const basis = row.autoEstimateColour;
    if (!basis?.normalised) throw new Error("the saved estimate should be normalised");
    // Read on the half-size JPEG display copy: the gains undo the lamp to within 0.05.
    basis.gains.forEach((g, c) => expect(Math.abs(g * LIGHT[c] - 1)).toBeLessThan(0.05));
    const [patch] = await db.select().from(s.photoColourPatches).where(eq(s.photoColourPatches.photoId, first.photoId));
    expect(patch).toMatchObject({ x: 20, y: 20, width: 44, height: 30, patchLightness: 50 });
    expect(await axeViolations(page)).toEqual([]);

    // The specimen's next photo starts from this patch.
    await page.goto(scorePage(2, second));
    await page.getByTestId("patch-status").waitFor();
    await expect(page.getByTestId("patch-status").innerText()).resolves.toContain("previous photo");
    await expect(page.getByTestId("grey-patch").count()).resolves.toBe(1);
    expect(errors).toEqual([]);
    await context.close();
  }, 180_000);
});
