// Browser: a primary scorer scores by eye (distribution letter, weeping, silicate), saves, and the
// form still shows what was saved, also after a reload; "Save and next" is reachable by Tab and by
// its shortcut and opens the next photo of the inspection they have not scored; the Layers controls
// hide the spot marks and set the estimate mask's opacity; the Scoring tab is the highlighted one.
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
const photos: MadePhoto[] = [];

beforeAll(async () => {
  s3 = await ensureS3Fake();
  browser = await launch();
  lab = await createTestLab("Scoring bench e2e");
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id, specimens: 3, days: [0, 7] });
  await db.insert(s.trialMembers).values({ labId: lab.labId, trialId: t.trialId, userId: lab.users.technician.id, role: "scorer", blind: false });
  for (const i of [0, 1, 2]) photos[i] = await createReadyPhoto({ labId: lab.labId, trialId: t.trialId, inspectionId: t.inspectionIds[1], specimenId: t.specimenIds[i], uploadedBy: lab.users.technician.id, width: 800, height: 600 });
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
  await s3?.stop();
});

const scorePage = (i: number) => `${APP_URL}/trials/${t.trialId}/inspections/${t.inspectionIds[1]}/score/${t.specimenIds[i]}?photo=${photos[i].photoId}`;

async function expectSavedFields(page: Page) {
  await expect(page.getByLabel("P — pinpoint").isChecked()).resolves.toBe(true);
  await expect(page.getByLabel(/^Weeping droplets/).isChecked()).resolves.toBe(true);
  await expect(page.getByLabel("Silicate discoloration").inputValue()).resolves.toBe("marked");
  await expect(page.getByLabel("Rusted area (% of face)").inputValue()).resolves.toBe("2.5");
}

describe("scoring at the bench", () => {
  it("keeps the saved values in the form, saves and goes to the next unscored photo by Tab and by shortcut", async () => {
    const context = await browser.newContext({ viewport: { width: 1500, height: 1000 } });
    const page = await context.newPage();
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await signIn(page, lab.users.technician.email, TEST_PASSWORD);
    await page.goto(scorePage(0));
    await page.getByRole("heading", { name: /^Score SC-/ }).waitFor();
    // The score page belongs to the Scoring tab.
    await expect(page.getByRole("navigation", { name: "Trial sections" }).locator("[aria-current=page]").innerText()).resolves.toBe("Scoring");

    await page.getByLabel("Rusted area (% of face)").fill("2.5");
    await page.getByLabel("P — pinpoint").check();
    await page.getByLabel(/^Weeping droplets/).check();
    await page.getByLabel("Silicate discoloration").selectOption("marked");
    await page.getByRole("button", { name: "Save score", exact: true }).click();
    await page.getByRole("status").filter({ hasText: "Score saved" }).waitFor({ timeout: 20_000 });
    // ASTM D610 Table 1: >1–3 % is grade 5 (from memory).
    await expect(page.getByTestId("saved-score").innerText()).resolves.toContain("5-P");
    await expectSavedFields(page);
    const [row] = await db.select().from(s.scores).where(and(eq(s.scores.specimenId, t.specimenIds[0]), eq(s.scores.scorerId, lab.users.technician.id)));
    expect(row).toMatchObject({ astmLetter: "P", weeping: true, silicateChange: "marked", areaPercent: 2.5 });
    await page.reload();
    await page.getByRole("heading", { name: /^Score SC-/ }).waitFor();
    await expectSavedFields(page);

    // Save and next: one Tab from "Save score", with its shortcut announced.
    await page.getByRole("button", { name: "Save score", exact: true }).focus();
    await page.keyboard.press("Tab");
    const focused = await page.evaluate(() => ({ text: document.activeElement?.textContent, keys: document.activeElement?.getAttribute("aria-keyshortcuts") }));
    expect(focused).toEqual({ text: "Save and next", keys: "Control+Enter Meta+Enter" });
    await page.getByText("Shortcut: Ctrl+Enter").waitFor();
    await page.keyboard.press("Enter");
    await page.waitForURL((u) => u.pathname.endsWith(`/score/${t.specimenIds[1]}`), { timeout: 20_000 });
    await page.getByLabel("Rusted area (% of face)").waitFor();
    // The shortcut from anywhere on the page: saves specimen 2 and opens specimen 3, the last unscored one.
    await page.getByLabel("Rusted area (% of face)").fill("0");
    await page.keyboard.press("Control+Enter");
    await page.waitForURL((u) => u.pathname.endsWith(`/score/${t.specimenIds[2]}`), { timeout: 20_000 });
    const mine = await db.select({ specimenId: s.scores.specimenId }).from(s.scores).where(eq(s.scores.scorerId, lab.users.technician.id));
    expect(mine.map((r) => r.specimenId).sort()).toEqual([t.specimenIds[0], t.specimenIds[1]].sort());
    // Every other photo is scored now: no "Save and next", and the page says so.
    await page.getByText("Every other photo of this inspection has your score.").waitFor();
    await expect(page.getByRole("button", { name: "Save and next" }).count()).resolves.toBe(0);
    expect(errors).toEqual([]);
    await context.close();
  }, 120_000);

  it("toggles the spot marks and the estimate mask and sets the mask's opacity", async () => {
    const context = await browser.newContext({ viewport: { width: 1500, height: 1000 } });
    const page = await context.newPage();
    await signIn(page, lab.users.technician.email, TEST_PASSWORD);
    await page.goto(scorePage(2));
    const canvas = page.getByTestId("annotation-canvas");
    await canvas.waitFor();
    await canvas.scrollIntoViewIfNeeded();
    const at = (x: number, y: number) => canvas.evaluate((svg, p) => {
      const q = new DOMPoint(p.x, p.y).matrixTransform((svg as SVGSVGElement).getScreenCTM()!);
      return { x: q.x, y: q.y };
    }, { x, y });
    for (const [x, y] of [[100, 100], [700, 100], [700, 500], [100, 500], [100, 100]] as const) {
      const p = await at(x, y);
      await page.mouse.click(p.x, p.y);
    }
    await page.getByRole("button", { name: /Circle spot/ }).click();
    const a = await at(300, 300);
    const b = await at(330, 300);
    await page.mouse.move(a.x, a.y);
    await page.mouse.down();
    await page.mouse.move(b.x, b.y, { steps: 4 });
    await page.mouse.up();
    await page.getByText("1 spot mark · face outlined").waitFor();

    const layers = page.getByRole("group", { name: "Layers" });
    await expect(layers.getByLabel("Estimate mask (cyan)").isDisabled()).resolves.toBe(true);
    const spots = canvas.locator("mask");
    await expect(spots.count()).resolves.toBe(1);
    await layers.getByLabel("Spot marks (orange)").uncheck();
    await expect(spots.count()).resolves.toBe(0);
    await layers.getByLabel("Spot marks (orange)").check();
    await expect(spots.count()).resolves.toBe(1);

    await page.getByRole("button", { name: "Run the colour estimate" }).click();
    await page.getByTestId("estimate-percent").waitFor({ timeout: 30_000 });
    const mask = page.getByTestId("estimate-mask");
    await expect(mask.getAttribute("opacity")).resolves.toBe("0.7");
    await layers.getByLabel("Mask opacity").fill("40");
    await expect.poll(() => mask.getAttribute("opacity")).toBe("0.4");
    await screenshot(page, "scoring-layers");
    await layers.getByLabel("Estimate mask (cyan)").uncheck();
    await expect(mask.count()).resolves.toBe(0);
    expect(await axeViolations(page)).toEqual([]);
    await context.close();
  }, 120_000);
});
