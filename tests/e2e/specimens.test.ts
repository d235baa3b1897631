// The specimen table pages and sorts through /api/specimens without rendering the page again, keeps
// the state in the URL (back/forward work), and says so when a page of rows cannot be loaded.
import { and, asc, eq } from "drizzle-orm";
import type { Browser, Page, Request } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { APP_URL, launch, signIn } from "./support/browser";

let browser: Browser;
let page: Page;
let labels: string[] = [];
const requests: string[] = [];

beforeAll(async () => {
  browser = await launch();
  page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
  await signIn(page, "lead@tarrow.example");
  const [lab] = await db.select({ id: s.labs.id }).from(s.labs).where(eq(s.labs.name, "Tarrow Valley Natural History Collection"));
  // PostgreSQL's own order is the reference for the table's (label, then id).
  labels = (await db.select({ label: s.specimens.label }).from(s.specimens).where(and(eq(s.specimens.labId, lab.id))).orderBy(asc(s.specimens.label), asc(s.specimens.id))).map((r) => r.label);
  page.on("request", (r: Request) => {
    const h = r.headers();
    if (!h["next-router-prefetch"] && (r.url().includes("/api/specimens") || (h.rsc && r.url().includes("/specimens?")))) requests.push(r.url().replace(APP_URL, ""));
  });
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

const firstLabel = () => page.locator("table.data tbody tr td:first-child").first().textContent();
const status = () => page.locator("nav[aria-label='Specimens pages'] [role=status]").textContent();

describe("specimen table", () => {
  it("flips pages with one JSON request and the URL follows", async () => {
    expect(labels.length).toBeGreaterThan(10);
    await page.goto(`${APP_URL}/specimens?pageSize=10`);
    await expect(firstLabel()).resolves.toBe(labels[0]);
    requests.length = 0;
    await page.getByRole("link", { name: "Next" }).click();
    await page.waitForFunction(() => document.querySelector("nav[aria-label='Specimens pages'] [role=status]")?.textContent?.startsWith("11–"));
    expect(new URL(page.url()).searchParams.get("page")).toBe("2");
    await expect(firstLabel()).resolves.toBe(labels[10]);
    expect(requests).toEqual(["/api/specimens?page=2&pageSize=10"]); // parameters in sorted order
  });

  it("sorts by label descending on a second click, then goes back", async () => {
    await page.getByRole("link", { name: /^Label/ }).click();
    await page.waitForURL((u) => u.searchParams.get("dir") === "desc");
    await expect.poll(firstLabel).toBe([...labels].reverse()[0]);
    await expect(page.locator("th[aria-sort=descending]").textContent()).resolves.toMatch(/Label/);
    await page.goBack();
    await page.waitForURL((u) => u.searchParams.get("page") === "2" && !u.searchParams.has("dir"));
    await expect.poll(firstLabel).toBe(labels[10]);
    await expect(status()).resolves.toMatch(new RegExp(`^11–20 of ${labels.length}$`));
  });

  it("shows the server's message and keeps the rows when a page cannot be loaded", async () => {
    await page.route("**/api/specimens?**", (route) =>
      route.fulfill({ status: 503, contentType: "application/json", body: JSON.stringify({ error: { code: "unavailable", message: "The database is not reachable right now." } }) }));
    await page.getByRole("link", { name: "Previous" }).click();
    await page.getByRole("alert").filter({ hasText: "Could not load these rows" }).waitFor();
    await expect(page.getByRole("alert").filter({ hasText: "Could not load" }).textContent()).resolves.toMatch(/database is not reachable/);
    await expect(firstLabel()).resolves.toBe(labels[10]);
    await page.unroute("**/api/specimens?**");
    await page.getByRole("button", { name: "Try again" }).click();
    await expect.poll(firstLabel).toBe(labels[0]);
    await expect(page.getByRole("alert").filter({ hasText: "Could not load" }).count()).resolves.toBe(0);
  });

  it("shows the rows of the URL after Back from a specimen page", async () => {
    await page.getByRole("link", { name: "Next" }).click();
    await expect.poll(firstLabel).toBe(labels[10]);
    await page.getByRole("link", { name: labels[10], exact: true }).click();
    await page.waitForURL((u) => /\/specimens\/[0-9a-f-]{36}$/.test(u.pathname));
    await page.goBack();
    await page.waitForURL((u) => u.pathname === "/specimens" && u.searchParams.get("page") === "2");
    await expect.poll(firstLabel).toBe(labels[10]);
    await expect.poll(status).toMatch(/^11–20 of /);
  });
});
