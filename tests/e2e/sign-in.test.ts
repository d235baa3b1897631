// Sign-in as a visitor without JavaScript would do it (the form is in the server's HTML and posts to a
// server action), and as the target of a phishing link whose callbackUrl points off-site.
import type { Browser, BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { APP_URL, DEMO_PASSWORD, launch } from "./support/browser";

let browser: Browser;
let noScript: BrowserContext;

beforeAll(async () => {
  browser = await launch();
}, 120_000);
afterAll(async () => {
  await browser?.close();
});

async function signInWithoutScript(query: string, password = DEMO_PASSWORD) {
  noScript = await browser.newContext({ javaScriptEnabled: false });
  const page = await noScript.newPage();
  await page.goto(`${APP_URL}/sign-in${query}`);
  await page.getByLabel("E-mail").fill("observer@tarrow.example");
  await page.getByLabel("Password").fill(password);
  await Promise.all([page.waitForLoadState("load"), page.getByRole("button", { name: "Sign in" }).click()]);
  await page.waitForLoadState("load");
  return page;
}

describe("sign-in without JavaScript", () => {
  it("the sign-in page's HTML holds the form", async () => {
    const html = await (await fetch(`${APP_URL}/sign-in?email=observer%40tarrow.example`)).text();
    expect(html).toMatch(/<form[^>]*>/);
    expect(html).toMatch(/name="password"/);
    expect(html).toContain('value="observer@tarrow.example"');
  });

  it("signs in with scripts off and lands on the lab home", async () => {
    const page = await signInWithoutScript("");
    expect(new URL(page.url()).pathname).toBe("/");
    await page.getByRole("heading", { name: "Tarrow Valley Natural History Collection" }).waitFor();
    await noScript.close();
  }, 60_000);

  it("a wrong password with scripts off shows the answer next to the form", async () => {
    const page = await signInWithoutScript("", "not-the-password");
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await expect(page.locator("#signin-error").textContent()).resolves.toMatch(/Wrong e-mail or password/);
    await noScript.close();
  }, 60_000);
});

describe("where sign-in leads afterwards", () => {
  for (const evil of ["//example.org", "/\\example.org", "https://example.org/"]) {
    it(`callbackUrl=${evil} stays on this app`, async () => {
      const page = await signInWithoutScript(`?callbackUrl=${encodeURIComponent(evil)}`);
      expect(new URL(page.url()).origin).toBe(new URL(APP_URL).origin);
      expect(new URL(page.url()).pathname).toBe("/");
      await noScript.close();
    }, 60_000);
  }

  it("a path of this app is kept", async () => {
    const page = await signInWithoutScript(`?callbackUrl=${encodeURIComponent("/due")}`);
    expect(new URL(page.url()).pathname).toBe("/due");
    await noScript.close();
  }, 60_000);
});
