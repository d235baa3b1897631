// Browser: each demo role signs in and sees what its role allows; sign-up shows field errors and keeps input.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { listMessages } from "@/lib/mail-store";
import { APP_URL, axeViolations, launch, screenshot, signIn } from "./support/browser";

let browser: Browser;

beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

const roles = [
  { email: "lead@tarrow.example", badge: "Lead", canInvite: true },
  { email: "researcher@tarrow.example", badge: "Researcher", canInvite: false },
  { email: "technician@tarrow.example", badge: "Technician", canInvite: false },
  { email: "observer@tarrow.example", badge: "Observer", canInvite: false },
];

describe("demo roles", () => {
  for (const r of roles) {
    it(`${r.badge} signs in, sees the lab home, and ${r.canInvite ? "can" : "cannot"} invite members`, async () => {
      const context = await browser.newContext();
      const page = await context.newPage();
      await signIn(page, r.email);
      await expect(page.getByRole("heading", { name: "Tarrow Valley Natural History Collection" }).isVisible()).resolves.toBe(true);
      await expect(page.getByText(r.badge, { exact: true }).first().isVisible()).resolves.toBe(true);
      await expect(page.getByRole("heading", { name: "Running trials" }).isVisible()).resolves.toBe(true);
      if (r.badge === "Lead") await screenshot(page, "home-lead");
      await page.goto(`${APP_URL}/settings`);
      await page.getByRole("heading", { name: "Lab settings" }).waitFor();
      await expect(page.getByRole("heading", { name: "Invite someone" }).count()).resolves.toBe(r.canInvite ? 1 : 0);
      await context.close();
    });
  }

  it("the lab home and settings have no serious accessibility violations", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, "lead@tarrow.example");
    expect(await axeViolations(page)).toEqual([]);
    await page.goto(`${APP_URL}/settings`);
    expect(await axeViolations(page)).toEqual([]);
    await context.close();
  });

  it("a signed-out visitor is sent to sign-in, and a wrong password says so", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await page.goto(`${APP_URL}/audit`);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await page.getByLabel("E-mail").fill("lead@tarrow.example");
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.locator("#signin-error").waitFor();
    await expect(page.locator("#signin-error").textContent()).resolves.toMatch(/Wrong e-mail or password/);
    await context.close();
  });
});

describe("sign-up", () => {
  it("shows field errors next to the fields and keeps what was typed", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await page.goto(`${APP_URL}/sign-up`);
    await page.getByLabel("Your name").fill("Rhea Quarry");
    await page.getByLabel("E-mail").fill("not-an-address");
    await page.getByLabel("Password", { exact: true }).fill("short");
    await page.getByLabel("Lab or collection name").fill("Quarry Hill store");
    await page.getByRole("button", { name: "Create lab" }).click();
    await page.getByText("Enter a valid e-mail address", { exact: false }).waitFor();
    await expect(page.getByText("Use at least 10 characters.").isVisible()).resolves.toBe(true);
    await expect(page.getByLabel("Lab or collection name").inputValue()).resolves.toBe("Quarry Hill store");
    await screenshot(page, "sign-up-errors");
    await context.close();
  });

  it("mails a link; following it creates the lab and lands on its home", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    const email = `founder-${Date.now()}@test.example`;
    await page.goto(`${APP_URL}/sign-up`);
    await page.getByLabel("Your name").fill("Rhea Quarry");
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password", { exact: true }).fill("quarry-hill-2026");
    await page.getByLabel("Lab or collection name").fill("Quarry Hill store");
    await page.getByRole("button", { name: "Create lab" }).click();
    await page.getByRole("heading", { name: "Check your e-mail" }).waitFor({ timeout: 20_000 });
    let link: string | undefined;
    await expect.poll(async () => {
      const [msg] = await listMessages(process.env.MAIL_DIR ?? ".data/mail", { to: email });
      link = msg && /https?:\/\/\S+\/sign-up\/confirm\?token=\S+/.exec(msg.text)?.[0];
      return !!link;
    }, { timeout: 20_000 }).toBe(true);
    await page.goto(link!);
    await page.getByRole("button", { name: "Create the lab" }).click();
    await page.waitForURL((u) => u.pathname === "/", { timeout: 20_000 });
    await page.getByRole("heading", { name: "Quarry Hill store", exact: true }).waitFor({ timeout: 20_000 });
    await page.getByText("No trial is running.").waitFor({ timeout: 20_000 });
    await context.close();
  });
});
