// Browser: bench work without friction. A researcher imports a logger file written with 12-hour
// times and a zone in its header, sees what is wrong with a bad line and when the chosen zone
// disagrees with the file, sees two instruments in the product's colours, reads the audit trail as
// "field: before → after" lines, and meets only invented example names.
import crypto from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { CATEGORY_PALETTE } from "@/components/ui/chart-palette";
import { APP_URL, axeViolations, launch, screenshot, signIn } from "./support/browser";

let browser: Browser;
let context: BrowserContext;
let page: Page;
let chamberUrl = "";
const chamberName = `E2E bench jar ${crypto.randomBytes(3).toString("hex")}`;

beforeAll(async () => {
  browser = await launch();
  context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  page = await context.newPage();
  await signIn(page, "researcher@tarrow.example");
}, 60_000);
afterAll(async () => {
  await browser?.close();
});

const header = '"#","Date Time, GMT+01:00","Temp, °C","RH, %"';
const loggerFile = (rows: string[]) => ["Plot Title: bench jar", header, ...rows].join("\r\n");

async function chooseFile(name: string, text: string) {
  await page.getByLabel("Logger file (CSV or tab-separated text)").setInputFiles({ name, mimeType: "text/csv", buffer: Buffer.from(text, "utf8") });
  await page.getByRole("heading", { name: "First lines as read" }).waitFor();
}

describe("logger files with 12-hour times and a zone in the header", () => {
  it("a researcher defines a jar to import into", async () => {
    await page.goto(`${APP_URL}/chambers/new`);
    await page.getByLabel("Name").fill(chamberName);
    await page.getByLabel("Kind").selectOption("saturated-salt");
    await page.getByLabel("Salt", { exact: true }).selectOption("NaCl");
    await page.getByLabel("Nominal temperature (°C)").fill("22");
    await page.getByRole("button", { name: "Save chamber" }).click();
    await page.waitForURL(/\/chambers\/[0-9a-f-]{36}/, { timeout: 20_000 });
    const saved = new URL(page.url());
    chamberUrl = `${saved.origin}${saved.pathname}`;
  }, 60_000);

  it("names the line, column and token of a time that cannot be read", async () => {
    await page.goto(`${chamberUrl}/import`);
    await chooseFile("jar-logger.csv", loggerFile(['1,"11/18/2026 12:00:00 AM",20.5,44.0', '2,"11/18/2026 13:00:00 PM",20.7,45.5']));
    // The header's zone is shown and taken as the zone; a day above 12 in second place settles month/day order.
    await expect(page.getByTestId("stated-zone").innerText()).resolves.toMatch(/GMT\+01:00/);
    await expect(page.getByLabel("Logger time zone").inputValue()).resolves.toBe("+01:00");
    await expect(page.getByLabel("Date order").inputValue()).resolves.toBe("mdy");
    await page.getByRole("button", { name: "Check the file" }).click();
    const problems = page.getByRole("heading", { name: /row\(s\) need fixing/ });
    await problems.waitFor();
    await expect(page.getByText('Line 4, column "Date Time, GMT+01:00": "13:00:00 PM" — hour 13 with PM; expected 1–12 before AM/PM').count()).resolves.toBe(1);
    await expect(page.getByRole("button", { name: /^Import/ }).isDisabled()).resolves.toBe(true);
  }, 60_000);

  it("warns when the chosen zone disagrees with the header, then imports in the header's zone", async () => {
    await chooseFile("jar-logger.csv", loggerFile(['1,"11/18/2026 12:00:00 AM",20.5,44.0', '2,"11/18/2026 1:05 PM",20.7,45.5', '3,"11/18/2026 12:00:00 PM",20.6,45.0']));
    const zone = page.getByLabel("Logger time zone");
    await zone.fill("Europe/London");
    const warning = page.getByTestId("zone-warning");
    // London keeps GMT (UTC+0) in November (UK Summer Time Order 2002): an hour behind the header's GMT+01:00.
    await expect.poll(() => warning.innerText()).toMatch(/header states GMT\+01:00 .* Europe\/London, is UTC±00:00 .* 1 h later/);
    await page.getByRole("button", { name: "Check the file" }).click();
    await expect.poll(() => warning.innerText()).toMatch(/^Line 3: /);
    await screenshot(page, "import-zone-warning");
    expect(await axeViolations(page)).toEqual([]);

    await zone.fill("+01:00");
    await expect.poll(() => warning.count()).toBe(0);
    await page.getByLabel("Instrument").fill("logger A");
    await page.getByRole("button", { name: "Check the file" }).click();
    // 12:00 AM, 12:00 PM and 1:05 PM at UTC+01:00 are 23:00 (17 Nov), 11:00 and 12:05 UTC
    await expect.poll(() => page.getByRole("status").filter({ hasText: "readings from" }).innerText()).toMatch(/^3 readings from 2026-11-17 23:00 to 2026-11-18 12:05 UTC/);
    await page.getByRole("button", { name: "Import 3 readings" }).click();
    await expect.poll(() => page.getByRole("status").filter({ hasText: "Imported" }).innerText(), { timeout: 30_000 }).toMatch(/Imported 3 readings/);

    await page.goto(chamberUrl);
    const recent = page.locator("table.data tbody tr").filter({ hasText: "logger A" });
    await expect(recent.allInnerTexts()).resolves.toEqual(expect.arrayContaining([expect.stringMatching(/2026-11-17 23:00 UTC/), expect.stringMatching(/2026-11-18 12:05 UTC/)]));
  }, 120_000);

  it("colours a second instrument from the product palette, not the chart library's", async () => {
    await page.goto(`${chamberUrl}/import`);
    await chooseFile("jar-logger-b.csv", loggerFile(['1,"11/18/2026 2:00 AM",20.1,47.0', '2,"11/18/2026 3:00 PM",20.2,46.0']));
    await page.getByLabel("Instrument").fill("logger B");
    await page.getByRole("button", { name: "Check the file" }).click();
    await page.getByRole("button", { name: "Import 2 readings" }).click();
    await expect.poll(() => page.getByRole("status").filter({ hasText: "Imported" }).innerText(), { timeout: 30_000 }).toMatch(/Imported 2 readings/);

    await page.goto(`${chamberUrl}?period=all`);
    const chart = page.getByTestId("climate-chart");
    await chart.locator("svg").first().waitFor({ timeout: 30_000 });
    const legend = await chart.evaluate((el) => {
      for (const group of el.querySelectorAll("g.role-legend")) {
        if (group.querySelector(".role-legend-title text")?.textContent !== "Instrument") continue;
        const labels = [...group.querySelectorAll(".role-legend-label text")].map((t) => t.textContent);
        const colours = [...group.querySelectorAll(".role-legend-symbol path")].map((p) => (p.getAttribute("stroke") ?? p.getAttribute("fill") ?? "").toLowerCase());
        return { labels, colours };
      }
      return null;
    });
    // The first two colours of the product palette (verdigris, rust); vega's default scheme would start #4c78a8, #f58518.
    expect(legend).toEqual({ labels: ["logger A", "logger B"], colours: [CATEGORY_PALETTE[0], CATEGORY_PALETTE[1]] });
    await screenshot(page, "chamber-two-instruments");
  }, 120_000);
});

describe("the audit trail", () => {
  it("shows an edit as 'field: before → after' lines with the raw record behind a toggle", async () => {
    await page.goto(`${chamberUrl}/edit`);
    await page.getByLabel("Tolerance (± %RH)").fill("3");
    await page.getByRole("button", { name: "Save changes" }).click();
    await page.waitForURL((u) => !u.pathname.endsWith("/edit"), { timeout: 20_000 });

    await page.goto(`${APP_URL}/audit?entity=chamber`);
    const row = page.locator("table.data tbody tr").filter({ hasText: `Chamber "${chamberName}" edited` });
    const changes = row.getByTestId("audit-changes");
    await expect(changes.locator("li").allInnerTexts()).resolves.toEqual(["Tolerance RH (%): 2 → 3"]);
    const raw = row.getByText("Record after");
    await expect(raw.isVisible()).resolves.toBe(false);
    await row.getByText("Raw record").click();
    await expect(row.getByLabel("Record after").innerText()).resolves.toMatch(/"toleranceRhPercent": 3/);

    await page.goto(`${APP_URL}/audit?entity=reading-import`);
    const imported = page.locator("table.data tbody tr").filter({ hasText: `into "${chamberName}"` }).filter({ hasText: "jar-logger.csv" });
    await expect(imported.getByTestId("audit-changes").innerText()).resolves.toMatch(/Options › time zone: \+01:00/);
    expect(await axeViolations(page)).toEqual([]);
    await screenshot(page, "audit-changes");
  }, 90_000);
});

describe("example names", () => {
  it("are invented ones: the sign-up hint and the demo find names", async () => {
    const guest = await browser.newPage();
    await guest.goto(`${APP_URL}/sign-up`);
    await expect(guest.getByText("For example: Stellbrack Museum meteorite store").count()).resolves.toBe(1);
    await guest.close();

    await page.goto(`${APP_URL}/specimens`);
    const search = page.getByLabel("Label or find name");
    await expect(search.getAttribute("placeholder")).resolves.toBe("e.g. TV-M or Corvenlow");
    await search.fill("Corvenlow");
    await page.getByRole("button", { name: "Filter" }).click();
    await page.waitForURL(/q=Corvenlow/);
    const rows = await page.locator("table.data tbody tr").allInnerTexts();
    // experiments/demo-lab.ts gives every sixth of the 24 demo specimens this find.
    expect(rows.filter((r) => /^TV-/.test(r))).toHaveLength(4);
    expect(rows.every((r) => r.includes("Corvenlow Tarn"))).toBe(true);
  }, 60_000);
});
