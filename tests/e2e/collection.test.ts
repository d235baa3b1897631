// The collection page in a browser: the demo store's tree, a move recorded through the form (the
// register row follows), and field errors for a move to where the object already is and a tree cycle.
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/client";
import { APP_URL, launch, signIn } from "./support/browser";

let browser: Browser;
let page: Page;

beforeAll(async () => {
  browser = await launch();
  page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
  await signIn(page, "researcher@tarrow.example");
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

const row = (label: string) => page.locator("tr", { has: page.locator(`a:text-is("${label}")`) });

describe("collection page", () => {
  it("shows the demo store as a tree with microclimates and object counts", async () => {
    await page.goto(`${APP_URL}/collection`);
    const tree = page.getByTestId("location-tree");
    await expect(tree.locator("li").first().textContent()).resolves.toMatch(/^Store 2 \(basement\) Room · Open to the room · 45 ± 10 %RH · keeper Priya Castell · 0 objects$/);
    await expect(tree.locator("li").nth(1).textContent()).resolves.toContain("Display case 3 Case · Salt-buffered");
    await expect(tree.locator("li", { hasText: "Sealed box 14" }).textContent()).resolves.toMatch(/Sealed box · Desiccant · 15 ± 5 %RH · keeper Tomasz Ridley · 2 objects/);
    await expect(row("TV-A-130").locator("td").nth(4).textContent()).resolves.toMatch(/^Store 2 \(basement\) \/ Metals cabinet M1 \/ Drawer M1-2 \(since/);
  });

  it("records a move and refuses one to where the object already is, at the field", async () => {
    const form = page.locator("form", { has: page.getByRole("button", { name: "Record move" }) });
    const move = async (to: string) => {
      await form.getByLabel("Object").selectOption({ label: "TV-A-130 (TAR.1988.7.1)" });
      await form.getByLabel("To").selectOption({ label: to });
      // A minute ago on the browser's wall clock (the form sends the browser's zone with it).
      const local = await page.evaluate(() => { const d = new Date(Date.now() - 60_000); d.setMinutes(d.getMinutes() - d.getTimezoneOffset()); return d.toISOString().slice(0, 16); });
      await form.getByLabel("When").fill(local);
      await form.getByRole("button", { name: "Record move" }).click();
    };
    await move("Store 2 (basement) / Metals cabinet M1 / Drawer M1-2 / Sealed box 15 (silica gel)");
    await expect(form.getByRole("status").textContent()).resolves.toBe("Move recorded.");
    await page.reload();
    await expect(row("TV-A-130").locator("td").nth(4).textContent()).resolves.toContain("Sealed box 15 (silica gel)");
    await move("Store 2 (basement) / Metals cabinet M1 / Drawer M1-2 / Sealed box 15 (silica gel)");
    await expect(form.locator("#f-locationId-err").textContent()).resolves.toBe("The object is already there.");
  });

  it("refuses putting a location inside one it holds, with the error at the parent field", async () => {
    await page.goto(`${APP_URL}/collection`);
    const form = page.locator("form", { has: page.getByRole("button", { name: "Move location" }) });
    await form.getByLabel("Location", { exact: true }).selectOption({ label: "Store 2 (basement) / Metals cabinet M1" });
    await form.getByLabel("Now inside").selectOption({ label: "Store 2 (basement) / Metals cabinet M1 / Drawer M1-1" });
    await form.getByRole("button", { name: "Move location" }).click();
    await expect(form.locator("#tree-parentId-err").textContent()).resolves.toBe("Choose a location that is not this one or inside it.");
  });
});
