// Browser: a researcher reads the demo trial's comparison as the bench-work issue describes it: who
// rusted soonest when chambers tie, each grouping's own noun, scores at an inspection not marked done
// (left out, said so, linked), and charts and tables that can be read (colours with dash patterns,
// small multiples for 12 arms, whole-day headers, plain titles on interval notation).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { and, asc, eq, inArray, isNull } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { demoTrial } from "@/experiments/demo-lab";
import { APP_URL, axeViolations, launch, screenshot, signIn } from "./support/browser";

let browser: Browser;
let page: Page;
let trialId: string;
let compareUrl: string;

beforeAll(async () => {
  const [trial] = await db.select().from(s.trials).where(eq(s.trials.title, demoTrial.title));
  trialId = trial.id;
  compareUrl = `${APP_URL}/trials/${trialId}/compare`;
  browser = await launch();
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  page = await context.newPage();
  await signIn(page, "researcher@tarrow.example");
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

const summaryText = () => page.getByTestId("plain-summary").textContent().then((t) => t ?? "");

/** Rows of the median table: group name → the Turnbull cell ("(7.0, 14.0]" or words). */
async function turnbullMedians(): Promise<Map<string, string>> {
  const rows = page.getByRole("table").filter({ hasText: "Median time to first rust" }).locator("tbody tr");
  const out = new Map<string, string>();
  for (const r of await rows.all()) out.set((await r.locator("th").textContent())!.trim(), (await r.locator("td").nth(2).textContent())!.trim());
  return out;
}

describe("reading the comparison", () => {
  it("grouped by chamber, names every chamber tied for the soonest median and says what soonest is judged by", async () => {
    await page.goto(`${compareUrl}?groupBy=chamber&outcome=first-rust&method=turnbull`);
    const text = await summaryText();
    expect(text).toMatch(/24 specimens in 4 chambers/);
    expect(text).toMatch(/The chambers differ in time to first rust/);
    expect(text).toMatch(/Soonest is judged by the median time to first rust/);
    const soonest = /The chambers differ in time to first rust at the 0\.05 level; (.+?) rusted soonest/.exec(text)![1];
    const medians = await turnbullMedians();
    const intervals = [...medians].filter(([, cell]) => cell.startsWith("("));
    const upper = (cell: string) => Number(/, ([\d.]+)\]/.exec(cell)![1]);
    const least = Math.min(...intervals.map(([, c]) => upper(c)));
    const first = intervals.find(([, c]) => upper(c) === least)![1];
    const tied = intervals.filter(([, c]) => c === first).map(([name]) => name);
    // Every chamber whose median equals the soonest one is named; none other is.
    for (const name of tied) expect(soonest).toContain(name);
    for (const name of [...medians.keys()].filter((n) => !tied.includes(n))) expect(soonest).not.toContain(name);
    if (tied.length > 1) expect(text).toMatch(/tied on the median .*; tied chambers are all named, not ranked by list order/);
    // The interval notation says what it means.
    const cell = page.getByRole("table").filter({ hasText: "Median time to first rust" }).locator("abbr").first();
    await expect(cell.getAttribute("title")).resolves.toMatch(/^The median time to first rust lies between day [\d.]+ and day [\d.]+ \(Turnbull's estimate\)$/);
    await page.locator("[data-testid=survival-chart] svg").first().waitFor({ timeout: 30_000 });
    await screenshot(page, "compare-chamber-soonest");
  });

  it("grouped by material class, speaks of material classes, not treatments", async () => {
    await page.getByRole("group", { name: "Group by" }).getByRole("link", { name: "Material class", exact: true }).click();
    await page.waitForURL(/groupBy=material/);
    const text = await summaryText();
    expect(text).toMatch(/24 specimens in 2 material classes/);
    expect(text).toMatch(/across the 2 material classes/);
    expect(text).not.toMatch(/treatments perform the same|\bgroups\b/);
    await page.locator("[data-testid=survival-chart] svg").first().waitFor({ timeout: 30_000 });
    await screenshot(page, "compare-material");
  });

  it("draws treatments in distinct colours and dash patterns, with whole-day headers and plain interval titles", async () => {
    await page.goto(`${compareUrl}?groupBy=treatment&outcome=first-rust&method=turnbull`);
    const svg = page.locator("[data-testid=survival-chart] svg").first();
    await svg.waitFor({ timeout: 30_000 });
    const styles = await svg.locator("path").evaluateAll((ps) => ps
      .filter((p) => p.getAttribute("stroke")?.startsWith("#") && (p.getAttribute("fill") ?? "none") === "none" && p.closest(".role-legend") === null)
      .map((p) => `${p.getAttribute("stroke")}|${p.getAttribute("stroke-dasharray") ?? ""}`));
    const lines = [...new Set(styles)];
    expect(new Set(lines.map((l) => l.split("|")[0])).size).toBe(3);
    expect(new Set(lines.map((l) => l.split("|")[1])).size).toBe(3);
    const heads = await page.getByRole("table").filter({ hasText: "Numbers at risk" }).locator("thead th").allTextContents();
    expect(heads.slice(1).length).toBeGreaterThan(2);
    for (const h of heads.slice(1)) expect(h).toMatch(/^day \d+$/);
    await page.getByText(/^Per-specimen outcomes/).click();
    const interval = page.getByRole("table").filter({ hasText: "First rust (days)" }).locator("abbr").first();
    await expect(interval.getAttribute("title")).resolves.toMatch(/^Rust first seen between day [\d.]+ \(last clean look\) and day [\d.]+$/);
    expect(await axeViolations(page)).toEqual([]);
    await screenshot(page, "compare-treatment-dashes");
  });

  it("draws 12 chamber × treatment arms as small multiples, one panel per arm", async () => {
    await page.goto(`${compareUrl}?groupBy=arm&outcome=first-rust&method=turnbull`);
    await expect(summaryText()).resolves.toMatch(/24 specimens in 12 chamber × treatment arms/);
    const svg = page.locator("[data-testid=survival-chart] svg").first();
    await svg.waitFor({ timeout: 30_000 });
    const headers = await svg.locator("text").allTextContents();
    const armNames = await page.getByRole("table").filter({ hasText: "Numbers at risk" }).locator("tbody th").allTextContents();
    expect(armNames).toHaveLength(12);
    // Each panel is headed with its arm's whole name: the chamber, then the treatment on a second line.
    const lines = await svg.locator("text tspan, text").evaluateAll((ts) => ts.map((t) => t.childElementCount ? "" : (t.textContent ?? "")));
    for (const arm of armNames) for (const part of arm.trim().split(" / ")) expect(lines, arm).toContain(part);
    expect(headers.length).toBeGreaterThan(12);
    await expect(svg.locator(".role-legend").count()).resolves.toBe(0);
    await expect(page.locator("[data-testid=survival-chart] .vega-embed").first().getAttribute("aria-label")).resolves.toMatch(/each in its own panel with the other chamber × treatment arms faint behind it/);
    await screenshot(page, "compare-arms-small-multiples");
  });
});

describe("scores at an inspection not marked done", () => {
  let inspection: { id: string; dayNumber: number };
  const added: string[] = [];

  beforeAll(async () => {
    // A technician has scored two specimens at the next inspection but not marked it done yet.
    const [next] = await db.select().from(s.inspections).where(and(eq(s.inspections.trialId, trialId), isNull(s.inspections.doneAt))).orderBy(asc(s.inspections.plannedAt)).limit(1);
    inspection = next;
    const [trial] = await db.select().from(s.trials).where(eq(s.trials.id, trialId));
    const placed = await db.select().from(s.placements).where(eq(s.placements.trialId, trialId)).orderBy(asc(s.placements.createdAt), asc(s.placements.id)).limit(2);
    const rows = await db.insert(s.scores).values(placed.map((p) => ({
      labId: trial.labId, trialId, inspectionId: next.id, specimenId: p.specimenId, scorerId: trial.primaryScorerId, spotCount: 2, areaPercent: 0.4, isRecord: true,
    }))).returning({ id: s.scores.id });
    added.push(...rows.map((r) => r.id));
  });
  afterAll(async () => {
    if (added.length) await db.delete(s.scores).where(inArray(s.scores.id, added));
  });

  it("the comparison says which scores are left out and why, and links to the inspection to mark it done", async () => {
    await page.goto(`${compareUrl}?groupBy=treatment&outcome=first-rust&method=turnbull`);
    const note = page.getByTestId("left-out-scores");
    const text = (await note.textContent())!;
    expect(text).toMatch(/^2 of the \d+ scores of record are left out of this comparison, because an inspection counts only once it is marked done/);
    expect(text).toContain(`2 scores at the day-${inspection.dayNumber} inspection, which is not marked done.`);
    await expect(page.getByText(/\d+ scores of record, \d+ of them at done inspections\./).count()).resolves.toBe(1);
    await page.locator("[data-testid=survival-chart] svg").first().waitFor({ timeout: 30_000 });
    await screenshot(page, "compare-left-out-scores");
    await note.getByRole("link", { name: `day-${inspection.dayNumber} inspection` }).click();
    await page.waitForURL(new RegExp(`/inspections/${inspection.id}$`));
    await page.getByRole("heading", { name: `Inspection day ${inspection.dayNumber}`, level: 1 }).waitFor();
  });

  it("the report says the same, and the analysis endpoint lists the counts", async () => {
    await page.goto(`${APP_URL}/trials/${trialId}/report?groupBy=chamber&outcome=first-rust&method=turnbull`);
    await expect(page.getByTestId("left-out-scores").textContent()).resolves.toContain(`2 scores at the day-${inspection.dayNumber} inspection, which is not marked done.`);
    await expect(summaryText()).resolves.toMatch(/Soonest is judged by the median time to first rust/);
    expect(await axeViolations(page)).toEqual([]);
    await page.locator("[data-testid=survival-chart] svg").first().waitFor({ timeout: 30_000 });
    await screenshot(page, "report-left-out-scores");
    const res = await page.context().request.get(`${APP_URL}/api/trials/${trialId}/analysis?groupBy=treatment`);
    expect(res.status()).toBe(200);
    const body = await res.json();
    expect(body.leftOutScores).toEqual([{ inspectionId: inspection.id, dayNumber: inspection.dayNumber, scores: 2 }]);
  });
});
