// A trial from scratch in the browser: import specimens, design (2 demo chambers × 2 treatments, 1
// replicate, fixed schedule), allocate, start with the first inspection tomorrow, see it on the due
// page, then send the day-before reminder and read it in the demo mailbox.
import crypto from "node:crypto";
import { and, eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { claimDueReminders, sendReminder } from "@/db/jobs/reminders";
import { APP_URL, axeViolations, launch, screenshot, signIn } from "./support/browser";

let browser: Browser;
let page: Page;
const tag = crypto.randomBytes(3).toString("hex").toUpperCase();
const title = `E2E humidity trial ${tag}`;

beforeAll(async () => {
  browser = await launch();
  page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
  await signIn(page, "researcher@tarrow.example");
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

/** Tomorrow 09:00 UTC as a datetime-local value (every page works in UTC). */
function tomorrowNine() {
  const d = new Date();
  d.setUTCDate(d.getUTCDate() + 1);
  d.setUTCHours(9, 0, 0, 0);
  return d;
}

describe("trials in the browser", () => {
  let trialUrl = "";

  it("imports four fresh specimens from a CSV (preview, then all at once)", async () => {
    await page.goto(`${APP_URL}/specimens/import`);
    const csv = ["label,material_class,find_name,mass_g", ...[1, 2, 3, 4].map((i) => `E2E-${tag}-${i},${i % 2 ? "iron meteorite" : "stony-iron"},Esker Holloway,${10 + i}`)].join("\n");
    await page.setInputFiles("#csv-file", { name: "slices.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
    await expect.poll(() => page.getByRole("status").first().textContent()).toContain("4 rows: 4 valid, 0 problems");
    await page.getByRole("button", { name: "Import 4 specimens" }).click();
    await page.getByText("Imported 4 specimens.").waitFor({ timeout: 20_000 });
  }, 60_000);

  it("designs the trial: 2 chambers × 2 treatments, 1 replicate, fixed plan, a technician", async () => {
    await page.goto(`${APP_URL}/trials/new`);
    await page.getByLabel("Title").fill(title);
    await page.getByLabel("Question the trial answers").fill("Does a wax film delay first rust on cut iron at 33 %RH compared with bare slices?");
    await page.getByLabel(/^Jar A · molecular sieve 4A/).check();
    await page.getByLabel(/^Jar B · saturated MgCl2/).check();
    await page.getByLabel(/^Uncoated control/).check();
    await page.getByLabel(/^Microcrystalline wax/).check();
    await page.getByLabel("Replicates per arm (specimens)").fill("1");
    await expect.poll(() => page.getByText(/4 arms; 4 specimens needed/).count()).toBe(1);
    await page.getByLabel(/Priya Castell/).check();
    await page.getByLabel("Fixed interval").check();
    await page.getByLabel("Every (days)").fill("7");
    await page.getByLabel("Number of inspections").fill("4");
    await expect.poll(() => page.locator("#plan-preview").textContent()).toContain("day 21");
    expect(await axeViolations(page)).toEqual([]);
    await page.getByRole("button", { name: "Create draft trial" }).click();
    await page.waitForURL(/\/trials\/[0-9a-f-]{36}\/allocation$/, { timeout: 30_000 });
    trialUrl = page.url().replace(/\/allocation$/, "");
  }, 90_000);

  it("allocates the four specimens with a seed and shows the printable table", async () => {
    await page.getByLabel("Label or find name").fill(`E2E-${tag}`);
    await page.getByRole("button", { name: "Select all shown" }).click();
    await expect.poll(() => page.getByText(/4 chosen/).count()).toBe(1);
    await page.getByLabel("Seed").fill(`e2e-${tag}`);
    await page.getByRole("button", { name: "Allocate", exact: true }).click();
    await page.getByText(`Allocated 4 specimens with seed "e2e-${tag}".`).waitFor({ timeout: 20_000 });
    const table = page.locator("#allocation-print");
    await expect.poll(() => table.locator("tbody tr").count()).toBe(4);
    expect(await table.textContent()).toContain(`Seed e2e-${tag}`);
    expect(await axeViolations(page)).toEqual([]);
    await screenshot(page, "trials-allocation");
  }, 60_000);

  it("starts the trial with day 0 tomorrow; the schedule has four inspections", async () => {
    await page.goto(trialUrl);
    await page.getByLabel("Start of exposure (UTC)").fill(tomorrowNine().toISOString().slice(0, 16));
    await page.getByRole("button", { name: "Start the trial" }).click();
    // The page re-renders as a running trial: the start form gives way to the inspection count.
    await page.getByText("0 of 4 done").waitFor({ timeout: 20_000 });
    expect(await page.getByText("running", { exact: true }).count()).toBe(1);
    await page.goto(`${trialUrl}/schedule`);
    await expect.poll(() => page.locator("tbody tr").count()).toBe(4);
    expect(await page.locator("tbody").textContent()).toContain(tomorrowNine().toISOString().slice(0, 16).replace("T", " "));
  }, 60_000);

  it("lists the first inspection on the due page", async () => {
    await page.goto(`${APP_URL}/due`);
    const link = page.getByRole("link", { name: `${title} · day 0` });
    await link.waitFor({ timeout: 20_000 });
    expect(await axeViolations(page)).toEqual([]);
    await link.click();
    await page.waitForURL(/\/inspections\/[0-9a-f-]{36}$/);
    await expect.poll(() => page.locator("tbody tr").count()).toBe(4);
    await screenshot(page, "trials-inspection");
  }, 60_000);

  it("sends the day-before reminder to the trial's technician, readable in the demo mailbox", async () => {
    const trialId = trialUrl.split("/").pop()!;
    const [first] = await db.select().from(s.inspections).where(eq(s.inspections.trialId, trialId)).orderBy(s.inspections.plannedAt).limit(1);
    // The worker scans with the real clock; here the scan runs as if it were 12 h before day 0, so
    // the reminder is due whatever the time of day the test runs. (If the worker already sent it, the
    // claim finds nothing new and the mail is there anyway.)
    const jobs = await claimDueReminders(new Date(first.plannedAt.getTime() - 12 * 3_600_000));
    for (const job of jobs) {
      if (job.inspectionId === first.id) await sendReminder(job);
      // Claims for other trials at this simulated time are released for the worker's real-time scan.
      else await db.delete(s.reminderLog).where(and(eq(s.reminderLog.inspectionId, job.inspectionId), eq(s.reminderLog.userId, job.userId), eq(s.reminderLog.kind, job.kind)));
    }
    const subject = `Inspection tomorrow: ${title}, day 0`;
    // The demo mailbox is for the lab's leads.
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const lead = await context.newPage();
    await signIn(lead, "lead@tarrow.example");
    await expect.poll(async () => {
      await lead.goto(`${APP_URL}/mailbox?to=technician@tarrow.example`);
      return lead.getByText(subject).count();
    }, { timeout: 30_000, interval: 1000 }).toBeGreaterThan(0);
    await lead.getByText(subject).first().click();
    // Whoever sent it (this test or the worker), the mail links to the inspection page.
    await lead.locator(`a[href$="/trials/${trialId}/inspections/${first.id}"]`).first().waitFor();
    await context.close();
  }, 90_000);
});
