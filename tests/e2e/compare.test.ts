// Browser: a researcher opens the comparison of the demo trial, reads the summary and the chart,
// switches grouping, downloads the outcomes CSV and the data package, and opens the printable report.
import fs from "node:fs";
import JSZip from "jszip";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { validateDataPackage } from "@/lib/export/datapackage";
import { profileProblems } from "../support/datapackage-profile";
import { APP_URL, axeViolations, launch, screenshot, signIn } from "./support/browser";

let browser: Browser;
let context: BrowserContext;
let page: Page;
let compareUrl: string;

beforeAll(async () => {
  browser = await launch();
  context = await browser.newContext({ acceptDownloads: true, viewport: { width: 1280, height: 900 } });
  page = await context.newPage();
  await signIn(page, "researcher@tarrow.example");
});
afterAll(async () => {
  await browser?.close();
});

describe("compare treatment outcomes", () => {
  it("opens the demo trial's comparison from Analysis and shows the summary and a chart", async () => {
    await page.goto(`${APP_URL}/analysis`);
    await page.getByRole("heading", { name: "Analysis", level: 1 }).waitFor();
    await page.getByRole("link", { name: /^Compare outcomes of Storage humidity/ }).click();
    await page.waitForURL(/\/trials\/[0-9a-f-]+\/compare/);
    compareUrl = page.url().split("?")[0];
    const summary = page.getByTestId("plain-summary");
    await expect(summary.textContent()).resolves.toMatch(/24 specimens in 3 treatments/);
    await expect(summary.textContent()).resolves.toMatch(/do not replace a conservator's judgement/);
    await page.locator("[data-testid=survival-chart] svg").first().waitFor({ timeout: 30_000 });
    await expect(page.locator("[data-testid=survival-chart] svg").first().textContent()).resolves.toContain("Uncoated control");
    await expect(page.getByRole("table").filter({ hasText: "Numbers at risk" }).count()).resolves.toBe(1);
    // The demo trial's primary outcome is time to first rust, so that is the view it opens on; the
    // page says how a moved specimen is grouped and timed, and that treatments are compared within chambers.
    await expect(page.getByTestId("primary-outcome").textContent()).resolves.toMatch(/primary outcome is time to first rust; it is the view shown/);
    await expect(page.getByTestId("moved-note").textContent()).resolves.toMatch(/at risk in the new jar only from the day of the move/);
    await expect(summary.textContent()).resolves.toMatch(/Log-rank test stratified by chamber of time to first rust/);
    await expect(summary.textContent()).resolves.toMatch(/rust \/ no-rust call/);
    await screenshot(page, "compare-treatment");
  });

  it("has no serious accessibility violations, and the chart has an accessible name", async () => {
    expect(await axeViolations(page)).toEqual([]);
    await expect(page.locator("[data-testid=survival-chart] .vega-embed").first().getAttribute("aria-label")).resolves.toMatch(/Rust-free fraction/);
  });

  it("switches grouping to chamber and keeps the choice in the URL", async () => {
    await page.getByRole("group", { name: "Group by" }).getByRole("link", { name: "Chamber", exact: true }).click();
    await page.waitForURL(/groupBy=chamber/);
    await expect(page.getByTestId("plain-summary").textContent()).resolves.toMatch(/24 specimens in 4 chambers/);
    await page.locator("[data-testid=survival-chart] svg").first().waitFor();
    await expect(page.locator("[data-testid=survival-chart] svg").first().textContent()).resolves.toContain("pure water");
    await page.getByRole("group", { name: "Outcome" }).getByRole("link", { name: "Rusted area over time" }).click();
    await page.waitForURL(/outcome=area/);
    expect(page.url()).toMatch(/groupBy=chamber/);
    await page.locator("[data-testid=area-chart] svg").first().waitFor({ timeout: 30_000 });
  });

  it("downloads the outcomes CSV with one row per specimen", async () => {
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Outcomes (CSV)" }).click()]);
    expect(download.suggestedFilename()).toMatch(/-outcomes\.csv$/);
    const text = fs.readFileSync((await download.path())!, "utf8");
    const lines = text.trimEnd().split("\r\n");
    expect(lines[0]).toBe(
      "placement_id,specimen_id,specimen_label,material_class,chamber,treatment,arm,inspections_scored,interval_lower_day," +
        "interval_upper_day,rusted,right_censored,final_area_percent,final_area_mm2,growth_mm2_per_day,final_day,weeping_seen,entry_day,rusted_earlier," +
        "weeping_lower_day,weeping_upper_day",
    );
    expect(lines).toHaveLength(25);
    expect(lines.filter((l) => l.includes(",TV-M-") || l.includes(",TV-S-"))).toHaveLength(24);
  });

  it("fetches the data package with the page's session and it validates", async () => {
    const res = await context.request.get(`${compareUrl.replace("/trials/", "/api/trials/").replace(/\/compare$/, "")}/export/datapackage.zip`);
    expect(res.status()).toBe(200);
    const zip = await JSZip.loadAsync(await res.body());
    const descriptor = JSON.parse(await zip.file("datapackage.json")!.async("string"));
    expect(validateDataPackage(descriptor)).toEqual([]);
    expect(profileProblems(descriptor)).toEqual([]); // Frictionless Data, Tabular Data Package profile v1
    for (const r of descriptor.resources) expect(zip.file(r.path), r.path).not.toBeNull();
  });

  it("shows the rust-call kappa as the headline on the agreement tab", async () => {
    await page.goto(compareUrl.replace(/\/compare$/, "/agreement"));
    await expect(page.getByTestId("agreement-headline").textContent()).resolves.toMatch(/rust \/ no-rust call .*Cohen's κ = \d\.\d\d/);
    await expect(page.getByTestId("agreement-headline").textContent()).resolves.toMatch(/Kappa on ASTM D610 grades/);
  });

  it("shows each placement's chamber exposure, names a bad share at its field, and re-analyses without out-of-band jars", async () => {
    await page.goto(`${compareUrl}?outOfBandMax=150`);
    const section = page.getByTestId("exposure-section");
    await expect(page.locator("#ex-oob-error").textContent()).resolves.toMatch(/from 0 to 100 %/);
    await expect(page.getByLabel(/Leave out specimens whose jar/).getAttribute("aria-invalid")).resolves.toBe("true");
    // 24 demo specimens, one placement each (moves add more).
    expect(await section.getByTestId("exposure-table").locator("tbody tr").count()).toBeGreaterThanOrEqual(24);
    await expect(section.getByTestId("exposure-table").textContent()).resolves.toMatch(/%RH/);
    await page.getByLabel(/Leave out specimens whose jar/).fill("100");
    await section.getByRole("button", { name: "Recompute" }).click();
    await page.waitForURL(/outOfBandMax=100/);
    await expect(page.getByTestId("exposure-excluded").textContent()).resolves.toMatch(/no specimen was left out .* more than 100 %/);
    await expect(page.getByTestId("plain-summary").textContent()).resolves.toMatch(/24 specimens/);
    // The report carries the choice along and shows the same table.
    await page.getByRole("link", { name: "Printable report" }).click();
    await page.waitForURL(/\/report.*outOfBandMax=100/);
    await expect(page.getByTestId("report-exposure").textContent()).resolves.toMatch(/Chamber exposure.*nearest check/);
    expect(await axeViolations(page)).toEqual([]);
  });

  it("opens the printable report with the summary, a chart and the method notes", async () => {
    await page.goto(compareUrl);
    await page.getByRole("link", { name: "Printable report" }).click();
    await page.waitForURL(/\/report/);
    await page.getByRole("button", { name: "Print / save as PDF" }).waitFor();
    await expect(page.getByTestId("plain-summary").textContent()).resolves.toMatch(/24 specimens/);
    await page.locator("[data-testid=survival-chart] svg").first().waitFor({ timeout: 30_000 });
    await expect(page.getByRole("heading", { name: "Method notes" }).isVisible()).resolves.toBe(true);
    await expect(page.locator("section[aria-labelledby=method-h]").textContent()).resolves.toMatch(/Moved specimens\..*at risk in the new jar only from the day of the move/);
    expect(await axeViolations(page)).toEqual([]);
    await page.emulateMedia({ media: "print" });
    await expect(page.getByRole("button", { name: "Print / save as PDF" }).isVisible()).resolves.toBe(false);
    await page.emulateMedia({ media: "screen" });
  });
});
