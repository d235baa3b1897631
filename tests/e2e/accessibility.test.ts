// axe-core on every main page (no serious or critical violation) and keyboard reachability of the navigation.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { like } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { APP_URL, axeViolations, launch, signIn } from "./support/browser";

let browser: Browser;
let page: Page;
let trialId: string;
let chamberId: string;
let specimenId: string;

beforeAll(async () => {
  browser = await launch();
  page = await (await browser.newContext()).newPage();
  await signIn(page, "lead@tarrow.example");
  [{ id: trialId }] = await db.select({ id: s.trials.id }).from(s.trials).where(like(s.trials.title, "Storage humidity%"));
  [{ id: chamberId }] = await db.select({ id: s.chambers.id }).from(s.chambers).where(like(s.chambers.name, "Jar C%"));
  [{ id: specimenId }] = await db.select({ id: s.specimens.id }).from(s.specimens).where(like(s.specimens.label, "TV-S-003"));
}, 60_000);
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

describe("accessibility", () => {
  it("main pages have no serious or critical axe violations", async () => {
    const pages = ["/", "/trials", "/due", "/chambers", "/collection", `/chambers/${chamberId}`, "/chambers/new", "/specimens", `/specimens/${specimenId}`, "/treatments",
      "/analysis", `/trials/${trialId}`, `/trials/${trialId}/compare`, "/audit", "/settings", "/mailbox"];
    const found: Record<string, unknown> = {};
    for (const p of pages) {
      const res = await page.goto(`${APP_URL}${p}`);
      expect({ page: p, status: res?.status() }).toEqual({ page: p, status: 200 });
      await page.waitForLoadState("networkidle");
      const v = await axeViolations(page);
      if (v.length) found[p] = v;
    }
    expect(found).toEqual({});
  }, 180_000);

  it("the main navigation is reachable and usable with the keyboard alone", async () => {
    await page.goto(`${APP_URL}/`);
    const reached: string[] = [];
    for (let i = 0; i < 25; i++) {
      await page.keyboard.press("Tab");
      const label = await page.evaluate(() => (document.activeElement as HTMLElement | null)?.textContent?.trim() ?? "");
      reached.push(label);
    }
    for (const link of ["Trials", "Chambers", "Specimens", "Analysis", "Audit trail", "Lab settings"]) expect(reached).toContain(link);
    // Focus "Chambers" by keyboard and follow it with Enter.
    await page.goto(`${APP_URL}/`);
    for (let i = 0; i < 25; i++) {
      await page.keyboard.press("Tab");
      if ((await page.evaluate(() => document.activeElement?.textContent?.trim())) === "Chambers") break;
    }
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/chambers$/);
    expect(new URL(page.url()).pathname).toBe("/chambers");
  }, 60_000);
});
