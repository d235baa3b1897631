// Headless Chromium (Debian's package) driven by playwright-core, against the app that
// scripts/test.mjs started on APP_URL with the seeded demo lab.
import fs from "node:fs";
import path from "node:path";
import { chromium, type Browser, type Page } from "playwright-core";

export const APP_URL = process.env.APP_URL ?? "http://localhost:3210";
export const DEMO_PASSWORD = "rustline-demo-1";
const shotDir = path.resolve(__dirname, "..", "screenshots");

export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run", "--disable-quic"],
  });
}

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto(`${APP_URL}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((u) => !u.pathname.startsWith("/sign-in"), { timeout: 20_000 });
}

/**
 * Wait until React has put every streamed part of the page in place: until then a streamed part sits
 * in a hidden container (id "S:n") beside what it replaces, and a locator can match both.
 */
export async function streamed(page: Page) {
  await page.waitForFunction(() => !document.querySelector('div[hidden][id^="S:"]'), undefined, { timeout: 30_000 });
}

export async function screenshot(page: Page, name: string) {
  fs.mkdirSync(shotDir, { recursive: true });
  await page.screenshot({ path: path.join(shotDir, `${name}.png`), fullPage: true });
}

/** Run axe-core in the page and return serious/critical violations. */
export async function axeViolations(page: Page) {
  // Next streams the metadata (the <title>) of dynamic pages after the first bytes: check the finished page.
  await page.waitForLoadState("load");
  await page.waitForFunction(() => document.title.trim() !== "", undefined, { timeout: 10_000 }).catch(() => undefined);
  const source = fs.readFileSync(require.resolve("axe-core/axe.min.js"), "utf8");
  await page.addScriptTag({ content: source });
  const result = await page.evaluate(async () => {
    // @ts-expect-error axe is injected above
    const r = await window.axe.run(document, { resultTypes: ["violations"] });
    return r.violations.map((v: { id: string; impact: string; nodes: { target: string[] }[] }) => ({ id: v.id, impact: v.impact, targets: v.nodes.slice(0, 3).map((n) => n.target.join(" ")) }));
  });
  return (result as { id: string; impact: string; targets: string[] }[]).filter((v) => v.impact === "serious" || v.impact === "critical");
}
