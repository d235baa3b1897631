// Collection care in a browser, in a lab of its own: the location tree, an object moved into a room
// with a logger, a storage rule entered with its source, then the room's time in rule and exceedance
// on its page, the overview listing it by need, the printable condition report, and the room's keeper changed on its page.
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import { insertReadings, type NewReading } from "@/db/queries/readings";
import * as s from "@/db/schema";
import { createTestLab, TEST_PASSWORD, type TestLab } from "../support/db";
import { APP_URL, launch, screenshot, signIn } from "./support/browser";

const HOUR = 3_600_000;
let browser: Browser;
let page: Page;
let lab: TestLab;
let roomId: string;

beforeAll(async () => {
  lab = await createTestLab("Collection care walk");
  const [room] = await db.insert(s.chambers).values({
    labId: lab.labId, name: "Walk room", kind: "open-shelf", locationKind: "room", keeperId: lab.users.technician.id, nominalTempC: 18, setpointRhPercent: 40, toleranceRhPercent: 10,
  }).returning();
  const [box] = await db.insert(s.chambers).values({
    labId: lab.labId, name: "Walk box", kind: "open-shelf", locationKind: "sealed-box", parentId: room.id, nominalTempC: 18, setpointRhPercent: 40, toleranceRhPercent: 10,
  }).returning();
  roomId = room.id;
  const [o] = await db.insert(s.specimens).values({ labId: lab.labId, label: "WALK-1", accessionNumber: "W.1", materialClass: "archaeological-iron", findName: "Walk find" }).returning();
  await db.insert(s.objectLocations).values({ labId: lab.labId, specimenId: o.id, locationId: box.id, fromAt: new Date(Date.now() - 5 * 24 * HOUR) });
  // Hourly readings over 4 days at 15 %RH, with 10 hours at 30 %RH the day before yesterday.
  const rows: NewReading[] = [];
  const end = Math.floor(Date.now() / HOUR) * HOUR;
  for (let t = end - 96 * HOUR; t <= end; t += HOUR) {
    const hAgo = (end - t) / HOUR;
    rows.push({ takenAt: new Date(t), rhPercent: hAgo <= 50 && hAgo > 40 ? 30 : 15, tempC: 18, dewPointC: null, instrument: "" });
  }
  await insertReadings(db, { labId: lab.labId, chamberId: room.id, source: "csv", rows });
  browser = await launch();
  page = await browser.newPage({ viewport: { width: 1360, height: 900 } });
  await signIn(page, lab.users.lead.email, TEST_PASSWORD);
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

describe("collection care walk", () => {
  it("moves an object, enters a rule, and sees time in rule, the exceedance, the overview and the report", async () => {
    await page.goto(`${APP_URL}/collection`);
    await expect(page.getByTestId("location-tree").textContent()).resolves.toContain("Walk box");
    const form = page.locator("form", { has: page.getByRole("button", { name: "Record move" }) });
    await form.getByLabel("Object").selectOption({ label: "WALK-1 (W.1)" });
    await form.getByLabel("To").selectOption({ label: "Walk room" });
    const local = await page.evaluate(() => { const d = new Date(Date.now() - 60_000); d.setMinutes(d.getMinutes() - d.getTimezoneOffset()); return d.toISOString().slice(0, 16); });
    await form.getByLabel("When").fill(local);
    await form.getByRole("button", { name: "Record move" }).click();
    await expect(form.getByRole("status").textContent()).resolves.toBe("Move recorded.");

    // No rule yet: the room says so.
    await page.goto(`${APP_URL}/chambers/${roomId}`);
    await expect(page.getByTestId("location-rule").textContent()).resolves.toContain("has a storage rule for its material");

    // A rule without a source is refused at the field; with one it is saved.
    await page.goto(`${APP_URL}/storage-rules`);
    const rule = page.locator("form", { has: page.getByRole("button", { name: "Enter storage rule" }) });
    await rule.getByLabel("Material class").selectOption("archaeological-iron");
    await rule.getByLabel("Keep below (%RH)").fill("20");
    await rule.getByLabel("Date of the source").fill("2024-03-01");
    await rule.getByRole("button", { name: "Enter storage rule" }).click();
    await expect(rule.locator("#f-source-err").textContent()).resolves.toContain("Name the source");
    await rule.getByLabel("Source", { exact: true }).fill("Walk committee decision");
    await rule.getByRole("button", { name: "Enter storage rule" }).click();
    await expect(rule.getByRole("status").textContent()).resolves.toContain("Entered as storage rule version 1");

    // The room now takes the rule: 10 of 96 logged hours above 20 %RH, one exceedance with its peak.
    await page.goto(`${APP_URL}/chambers/${roomId}`);
    const section = page.getByTestId("location-rule");
    await expect(section.textContent()).resolves.toContain("Keep below 20.0 %RH");
    const seven = section.getByRole("table", { name: "Time in rule" }).locator("tr", { hasText: "7 days" });
    await expect(seven.locator("td").nth(0).textContent()).resolves.toBe(`${((86 / 96) * 100).toFixed(1)} %`);
    await expect(seven.locator("td").nth(1).textContent()).resolves.toBe("10.0 h");
    await section.getByText("Exceedances, last 365 days (1)").click();
    await expect(section.getByRole("table", { name: "Exceedances" }).locator("tbody tr td").nth(2).textContent()).resolves.toBe("30.0 %RH");
    await expect(section.textContent()).resolves.toContain("WALK-1");
    await screenshot(page, "collection-location-rule");

    // The overview lists the room as often out of rule (10 % of its 30 days > 5 %), and the report names the rule's source.
    await page.goto(`${APP_URL}/collection/overview`);
    const roomRow = page.locator("tr", { has: page.getByRole("link", { name: "Walk room", exact: true }) });
    await expect(roomRow.textContent()).resolves.toContain("Often out of rule (last 30 days)");
    await expect(page.locator("tbody tr").first().textContent()).resolves.toContain("Walk room");
    await expect(roomRow.locator("svg[role=img]").count()).resolves.toBe(1);
    await screenshot(page, "collection-overview");
    await page.goto(`${APP_URL}/collection/report`);
    await expect(page.getByRole("table", { name: "Storage rules used" }).textContent()).resolves.toContain("Walk committee decision (2024-03-01)");
    await expect(page.getByRole("table", { name: "Locations and their time in rule" }).textContent()).resolves.toContain("WALK-1");
    await screenshot(page, "collection-report");
  }, 120_000);

  it("changes the room's keeper on its page and sees it saved", async () => {
    await page.goto(`${APP_URL}/chambers/${roomId}`);
    const form = page.getByRole("form", { name: "Location settings" });
    await expect(form.getByLabel("Keeper", { exact: true }).inputValue()).resolves.toBe(lab.users.technician.id);
    await expect(form.getByLabel("E-mail the keeper after out of rule for (hours)").inputValue()).resolves.toBe("6");
    await form.getByLabel("Keeper", { exact: true }).selectOption(lab.users.researcher.id);
    await form.getByRole("button", { name: "Save location" }).click();
    await expect(form.getByRole("status").textContent()).resolves.toBe('Location "Walk room" saved.');
    await page.reload();
    await expect(page.getByTestId("location-settings").textContent()).resolves.toContain(`keeper researcher `);
    await expect(page.getByRole("form", { name: "Location settings" }).getByLabel("Keeper", { exact: true }).inputValue()).resolves.toBe(lab.users.researcher.id);
  }, 60_000);

  it("lists the first 20 objects at risk and every one on asking, under Collection in the menu", async () => {
    // 24 more objects under the same rule join the room: 25 at risk from the exceedance above.
    const more = await db.insert(s.specimens).values(Array.from({ length: 24 }, (_, i) => ({
      labId: lab.labId, label: `WALK-${i + 2}`, materialClass: "archaeological-iron" as const, findName: "Walk find",
    }))).returning({ id: s.specimens.id });
    await db.insert(s.objectLocations).values(more.map((o) => ({ labId: lab.labId, specimenId: o.id, locationId: roomId, fromAt: new Date(Date.now() - 5 * 24 * HOUR) })));
    await page.goto(`${APP_URL}/chambers/${roomId}`);
    // A storage location's page belongs to Collection in the main menu, though its address is a chamber's.
    const menu = page.getByRole("navigation", { name: "Main" });
    await expect.poll(() => menu.getByRole("link", { name: "Collection", exact: true }).getAttribute("aria-current")).toBe("page");
    await expect(menu.getByRole("link", { name: "Chambers", exact: true }).getAttribute("aria-current")).resolves.toBeNull();
    const section = page.getByTestId("location-rule");
    const list = section.getByRole("list", { name: "Objects at risk" });
    await expect(list.locator("li").count()).resolves.toBe(20);
    await expect(section.textContent()).resolves.toContain("20 of 25 objects at risk shown.");
    await section.getByRole("link", { name: "Show all" }).last().click();
    await page.waitForURL(/full=1/);
    await expect(page.getByTestId("location-rule").getByRole("list", { name: "Objects at risk" }).locator("li").count()).resolves.toBe(25);
    await expect(page.getByTestId("location-rule").textContent()).resolves.not.toContain("objects at risk shown");
  }, 60_000);
});
