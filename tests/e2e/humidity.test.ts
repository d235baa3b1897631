// Browser: the lead opens the humidity response of the demo's finished humidity ladder, reads the
// threshold sentence and the charts, accepts the bare iron-meteorite threshold as a storage rule,
// and finds the rule on the lab's storage-rules page and in the trial report.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { APP_URL, axeViolations, launch, screenshot, signIn } from "./support/browser";

let browser: Browser;
let page: Page;
let humidityUrl: string;

beforeAll(async () => {
  browser = await launch();
  page = await (await browser.newContext({ viewport: { width: 1280, height: 900 } })).newPage();
  await signIn(page, "lead@tarrow.example");
});
afterAll(async () => {
  await browser?.close();
});

describe("from the humidity response to a storage rule", () => {
  it("opens the ladder trial's humidity response from its comparison", async () => {
    await page.goto(`${APP_URL}/trials`);
    await page.getByRole("link", { name: /^Humidity ladder/ }).first().click();
    await page.waitForURL(/\/trials\/[0-9a-f-]+$/);
    await page.getByRole("navigation", { name: "Trial sections" }).getByRole("link", { name: "Compare" }).click();
    await page.waitForURL(/\/compare/);
    await page.getByRole("link", { name: "humidity response", exact: true }).click();
    await page.waitForURL(/\/humidity/);
    humidityUrl = page.url().split("?")[0];
    await page.getByRole("heading", { name: "Humidity response", level: 1 }).waitFor();
    const sentences = await page.getByTestId("threshold-sentences").textContent();
    expect(sentences).toMatch(/Keep iron meteorites \(uncoated control\) below \d+ %RH \(95 % CI/);
    await expect(page.getByText(/lies far beyond the longest observation/).count()).resolves.toBe(1);
    await page.locator("[data-testid=response-chart] svg").first().waitFor({ timeout: 30_000 });
    await page.locator("[data-testid=model-check-chart] svg").first().waitFor({ timeout: 30_000 });
    await expect(page.getByRole("cell", { name: "no readings" }).count()).resolves.toBe(0);
    await screenshot(page, "humidity-response");
  });

  it("has no serious accessibility violations", async () => {
    expect(await axeViolations(page)).toEqual([]);
  });

  it("changes the horizon and the share in the URL", async () => {
    await page.getByLabel("Horizon (years)").fill("5");
    await page.getByLabel("Share rusted (%)").fill("5");
    await page.getByRole("button", { name: "Update" }).click();
    await page.waitForURL(/horizon=5/);
    await expect(page.getByTestId("threshold-sentences").textContent()).resolves.toMatch(/fewer than 5 % rust within 5 years/);
    // A value out of range in the URL is named, and the page shows the default instead.
    await page.goto(`${humidityUrl}?share=500`);
    await expect(page.getByRole("alert").filter({ hasText: "share rusted" }).textContent()).resolves.toBe("The share rusted must be at most 50 %. Showing 10 %.");
    await expect(page.getByTestId("threshold-sentences").textContent()).resolves.toMatch(/fewer than 10 % rust within 10 years/);
    await page.goto(humidityUrl);
  });

  it("accepts the bare iron-meteorite threshold as a storage rule, versioned", async () => {
    const row = page.getByRole("row").filter({ has: page.getByRole("rowheader", { name: "Iron meteorite", exact: true }) }).filter({ hasText: "Uncoated control" });
    await row.getByRole("button", { name: "Accept as storage rule: Iron meteorite, Uncoated control", exact: true }).click();
    await row.getByLabel(/Note for the rule/).fill("Adopted for the meteorite store after the 2026 ladder.");
    await row.getByRole("button", { name: "Accept as storage rule" }).click();
    await expect(row.getByRole("status").textContent()).resolves.toMatch(/Accepted as storage rule version 1: Keep iron meteorites/);
    await page.reload();
    await expect(page.getByTestId("trial-rules").textContent()).resolves.toMatch(/Version 1 \(in force\)/);
  });

  it("lists the rule on the lab's storage-rules page", async () => {
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Storage rules" }).click();
    await page.waitForURL(/\/storage-rules$/);
    const current = page.getByRole("table");
    await expect(current.textContent()).resolves.toMatch(/(?<!Stony-)Iron meteoriteUncoated control\d+ %RH/i);
    await expect(current.textContent()).resolves.toContain("Adopted for the meteorite store");
    await screenshot(page, "storage-rules");
  });

  it("shows the rule in the trial report", async () => {
    await page.goto(humidityUrl.replace(/\/humidity$/, "/report"));
    await page.getByRole("heading", { name: "Storage rules from this trial" }).waitFor();
    await expect(page.getByTestId("trial-rules").textContent()).resolves.toMatch(/Keep iron meteorites \(uncoated control\) below \d+ %RH.*Version 1 \(in force\)/);
  });
});
