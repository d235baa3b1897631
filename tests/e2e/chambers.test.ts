// Browser: define a saturated-salt chamber and see its target humidity; open a demo chamber's
// climate record and see the chart render.
import crypto from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { APP_URL, axeViolations, launch, screenshot, signIn } from "./support/browser";

let browser: Browser;

beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe("chambers", () => {
  it("a researcher defines a saturated NaCl chamber at 22 °C, sees about 75.4 %RH, saves it and finds it in the list", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, "researcher@tarrow.example");
    await page.goto(`${APP_URL}/chambers/new`);
    const name = `E2E NaCl jar ${crypto.randomBytes(3).toString("hex")}`;
    await page.getByLabel("Name").fill(name);
    await page.getByLabel("Kind").selectOption("saturated-salt");
    await page.getByLabel("Salt", { exact: true }).selectOption("NaCl");
    await page.getByLabel("Nominal temperature (°C)").fill("22");
    // Greenspan 1977 fit for NaCl at 22 °C: 75.41 %RH, ± 0.12 (25 °C table uncertainty)
    const shown = page.getByTestId("salt-equilibrium");
    await expect.poll(() => shown.innerText()).toMatch(/75\.4 ± 0\.12 %RH/);
    await expect(page.getByLabel("Target RH (%RH)").inputValue()).resolves.toBe("75.4");
    await page.locator("svg").filter({ has: page.locator("path") }).first().waitFor({ timeout: 20_000 }); // the salt's RH curve
    expect(await axeViolations(page)).toEqual([]);
    await screenshot(page, "chamber-new-nacl");

    // Out of the fit range: a field error, and the page stays on the form with the input kept.
    await page.getByLabel("Nominal temperature (°C)").fill("95");
    await page.getByRole("button", { name: "Save chamber" }).click();
    await expect.poll(() => page.locator("#f-nominalTempC-err").innerText()).toMatch(/0–80 °C/);
    expect(page.url()).toMatch(/\/chambers\/new$/);
    await expect(page.getByLabel("Name").inputValue()).resolves.toBe(name);

    await page.getByLabel("Nominal temperature (°C)").fill("22");
    await page.getByRole("button", { name: "Save chamber" }).click();
    await page.waitForURL(/\/chambers\/[0-9a-f-]{36}/, { timeout: 20_000 });
    await expect(page.getByTestId("chamber-target").innerText()).resolves.toMatch(/75\.4 ± 2 %RH at 22 °C/);
    await page.goto(`${APP_URL}/chambers?q=${encodeURIComponent(name)}`);
    await expect(page.getByRole("link", { name }).count()).resolves.toBe(1);
    await context.close();
  });

  it("a researcher defines a calcium chloride desiccant jar and is warned about its chloride brine, on the form and on the saved chamber", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, "researcher@tarrow.example");
    await page.goto(`${APP_URL}/chambers/new`);
    const name = `E2E CaCl2 jar ${crypto.randomBytes(3).toString("hex")}`;
    await page.getByLabel("Name").fill(name);
    await page.getByLabel("Kind").selectOption("desiccant");
    await page.locator('select[name="desiccantKind"]').selectOption("calcium-chloride");
    // Conservation practice (from memory): CaCl2 deliquesces into a chloride brine; chloride drives akaganeite and weeping on iron
    const cautions = page.getByTestId("hazard-cautions");
    await expect.poll(() => cautions.innerText()).toMatch(/deliquesces/);
    await expect(cautions.innerText()).resolves.toMatch(/akaganeite and weeping on iron/);
    // Calcium chloride takes no colour indicator, so the form offers none.
    await expect(page.locator('select[name="desiccantIndicator"]').count()).resolves.toBe(0);
    await page.getByLabel("Nominal temperature (°C)").fill("20");
    await page.getByLabel("Mass (g)").fill("250");
    await page.getByLabel("Target RH (%RH)").fill("20");
    expect(await axeViolations(page)).toEqual([]);
    await page.getByRole("button", { name: "Save chamber" }).click();
    await page.waitForURL(/\/chambers\/[0-9a-f-]{36}/, { timeout: 20_000 });
    await expect(page.getByTestId("hazard-cautions").innerText()).resolves.toMatch(/chloride brine .* never place it where the brine or its dust can reach a specimen/);
    await screenshot(page, "chamber-view-calcium-chloride");
    await context.close();
  });

  it("shows a demo chamber's climate record as a chart with the band statistics", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signIn(page, "technician@tarrow.example");
    await page.goto(`${APP_URL}/chambers`);
    await page.getByRole("link", { name: "Jar C · saturated NaCl" }).click();
    await page.waitForURL(/\/chambers\/[0-9a-f-]{36}/);
    const chart = page.getByTestId("climate-chart").locator("svg, canvas").first();
    await chart.waitFor({ timeout: 30_000 });
    expect(await chart.boundingBox()).toMatchObject({ width: expect.any(Number) });
    await expect(page.getByTestId("time-in-band").innerText()).resolves.toMatch(/% of .* counted/);
    await page.getByRole("link", { name: "7 days" }).click();
    await page.waitForURL(/period=7d/);
    await page.getByTestId("climate-chart").locator("svg, canvas").first().waitFor({ timeout: 30_000 });
    expect(await axeViolations(page)).toEqual([]);
    await screenshot(page, "chamber-view-nacl");
    await context.close();
  });
});
