// The Planning panel of the design form: the events and specimens needed follow the hazard ratio,
// a bad input is refused at its field, and the design warnings follow the chambers picked; the
// draft trial's page repeats the warnings.
import crypto from "node:crypto";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { APP_URL, axeViolations, launch, screenshot, signIn } from "./support/browser";

let browser: Browser;
let page: Page;
const tag = crypto.randomBytes(3).toString("hex").toUpperCase();

beforeAll(async () => {
  browser = await launch();
  page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
  await signIn(page, "researcher@tarrow.example");
}, 120_000);
afterAll(async () => {
  await browser?.close();
});

const text = (selector: string) => page.locator(selector).textContent();

describe("trial planning in the browser", () => {
  it("shows events and specimens for the hazard ratio, and refuses a ratio of 1 at the field", async () => {
    await page.goto(`${APP_URL}/trials/new`);
    // Defaults: HR 0.5, power 0.8, two-sided α 0.05, half rusting by the end.
    // R 4.2.2: ev <- function(hr, a, pw) (qnorm(1 - a/2) + qnorm(pw))^2 / (0.25 * log(hr)^2)
    // ev(0.5, 0.05, 0.8) = 65.3457 → 66 events; ceiling(65.3457 / 0.5) = 131 specimens, 66 per arm.
    await expect.poll(() => text("#planning-events")).toContain("66 specimens with first rust");
    expect(await text("#planning-specimens")).toContain("131 specimens, 66 per arm");
    await page.getByLabel("Hazard ratio to detect").fill("0.7");
    // R 4.2.2: ev(0.7, 0.05, 0.8) = 246.787 → 247 events; ceiling(246.787 / 0.5) = 494 specimens, 247 per arm.
    await expect.poll(() => text("#planning-events")).toContain("247 specimens with first rust");
    expect(await text("#planning-specimens")).toContain("494 specimens, 247 per arm");
    await page.getByLabel("Hazard ratio to detect").fill("1");
    await expect.poll(() => text("#plan-hazardRatio-err")).toContain("A hazard ratio of 1 means no difference");
    expect(await page.locator("#plan-hazardRatio").getAttribute("aria-invalid")).toBe("true");
    expect(await page.locator("#planning-events").count()).toBe(0);
    await page.getByLabel("Hazard ratio to detect").fill("0.5");
    await expect.poll(() => text("#planning-events")).toContain("66 specimens with first rust");
  }, 60_000);

  it("warns of one jar per humidity level as chambers are picked, and compares with the design", async () => {
    await page.getByLabel(/^Jar A · molecular sieve 4A/).check();
    await page.getByLabel(/^Jar B · saturated MgCl2/).check();
    await page.getByLabel(/^Uncoated control/).check();
    await page.getByLabel("Replicates per arm (specimens)").fill("3");
    await expect.poll(() => text("#design-warnings")).toContain("one jar per humidity level");
    // Demo lab: Jar A is set to 2 %RH, Jar B to 33 %RH, both with the control: two levels, one jar each.
    const warnings = page.locator("#design-warnings li");
    expect(await warnings.evaluateAll((els) => els.map((e) => e.getAttribute("data-warning")))).toEqual(["one-jar-per-humidity", "few-humidity-levels"]);
    expect(await text("#design-warnings")).toContain("2 %RH (Jar A · molecular sieve 4A) and 33 %RH (Jar B · saturated MgCl2)");
    // 2 arms × 3 = 6 specimens; 66 per arm needed (above), so 63 short per arm, 132 in all.
    expect(await text("#planning-comparison")).toContain("2 arms × 3 replicates = 6 specimens");
    expect(await text("#planning-comparison")).toContain("63 specimens per arm short; 66 per arm would make 132 specimens in all");
    // Taking the control away adds the control warning.
    await page.getByLabel(/^Uncoated control/).uncheck();
    await page.getByLabel(/^Microcrystalline wax/).check();
    await expect.poll(() => text("#design-warnings")).toContain("No jar has the control treatment");
    await page.getByLabel(/^Microcrystalline wax/).uncheck();
    await page.getByLabel(/^Uncoated control/).check();
    await expect.poll(() => page.locator("#design-warnings li").count()).toBe(2);
    expect(await axeViolations(page)).toEqual([]);
    await screenshot(page, "trial-planning");
  }, 60_000);

  it("repeats the warnings on the draft trial's page", async () => {
    await page.getByLabel("Title").fill(`E2E planning ${tag}`);
    await page.getByLabel("Question the trial answers").fill("Does bare cut iron rust sooner at 33 %RH than over molecular sieve?");
    await page.getByRole("button", { name: "Create draft trial" }).click();
    await page.waitForURL(/\/trials\/[0-9a-f-]{36}\/allocation$/, { timeout: 30_000 });
    await page.goto(page.url().replace(/\/allocation$/, ""));
    await expect.poll(() => text("#design-warnings")).toContain("one jar per humidity level");
    expect(await page.locator("#design-warnings li").count()).toBe(2);
  }, 60_000);
});
