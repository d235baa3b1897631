// Blinding, generated from the route tree: a scorer who is blind for a running trial requests every
// page under /trials/[trialId], every page and API route of the trial's specimens and photos, home,
// the audit trail and every GET route of the trial, in the demo and in a fresh lab. A response fails
// when it puts a specimen (label or id) or a photo next to an arm (chamber, treatment or arm name or
// id), when a result (comparison, report, analysis, outcomes, data package, agreement) answers 200,
// or when another scorer's score or the allocation seed shows. After the trial is concluded the same
// user sees everything.
import { and, asc, eq, isNotNull } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { saveScore } from "@/db/queries/scores";
import { createTrial } from "@/db/queries/trials";
import { allocateTrial } from "@/db/queries/trials-allocation";
import { concludeTrial, moveSpecimen, startTrial } from "@/db/queries/trials-lifecycle";
import { PAGE_ROUTES, type PageRoute } from "@/lib/auth/page-routes";
import { can, type Permission, type Role } from "@/lib/auth/permissions";
import { hashPassword } from "@/lib/auth/password";
import { BLIND_HIDDEN, RESULTS_HIDDEN } from "@/lib/trials/access";
import { saveScoreSchema } from "@/lib/validation/scores";
import { trialDesignSchema } from "@/lib/validation/trials";
import { createTestLab, TEST_PASSWORD, uniqueEmail, type TestLab } from "../support/db";
import { signedInClient, type Client } from "../support/http";
import { fillRoute, listLabPages } from "../support/pages";
import { listRoutes, type RouteEntry } from "../support/registry";
import { createReadyPhoto } from "./scoring-fixtures";

type Scene = {
  name: string;
  client: Client;
  trialId: string;
  specimens: { id: string; label: string }[];
  photoIds: string[];
  inspectionId: string;
  /** Names and ids of the trial's arms, chambers and treatments. */
  armTokens: string[];
  /** Texts only other scorers' work would show (their score summaries in the audit trail). */
  othersWork: string[];
  seed: string;
  /** The blind scorer's role in the lab: pages and routes it lacks the permission for answer 403. */
  role: Role;
};

const RESULT_ROUTES = new Set(["/api/trials/[trialId]/analysis", "/api/trials/[trialId]/export/outcomes.csv", "/api/trials/[trialId]/export/datapackage.zip"]);
const WINDOW = 300;
let routes: RouteEntry[];
const scenes: Scene[] = [];
let fresh: { lab: TestLab; scene: Scene };

async function armTokensOf(trialId: string) {
  const arms = await db.select({ id: s.trialArms.id, label: s.trialArms.label, chamberId: s.chambers.id, chamber: s.chambers.name, treatmentId: s.treatments.id, treatment: s.treatments.name })
    .from(s.trialArms).innerJoin(s.chambers, eq(s.chambers.id, s.trialArms.chamberId)).innerJoin(s.treatments, eq(s.treatments.id, s.trialArms.treatmentId))
    .where(eq(s.trialArms.trialId, trialId));
  return [...new Set(arms.flatMap((a) => [a.id, a.label, a.chamberId, a.chamber, a.treatmentId, a.treatment]))];
}

async function sceneOf(name: string, client: Client, trialId: string, othersWork: string[], email: string): Promise<Scene> {
  const [trial] = await db.select().from(s.trials).where(eq(s.trials.id, trialId));
  const [member] = await db.select({ role: s.memberships.role }).from(s.memberships).innerJoin(s.users, eq(s.users.id, s.memberships.userId))
    .where(and(eq(s.users.email, email), eq(s.memberships.labId, trial.labId)));
  const specimens = await db.selectDistinct({ id: s.specimens.id, label: s.specimens.label }).from(s.placements)
    .innerJoin(s.specimens, eq(s.specimens.id, s.placements.specimenId)).where(eq(s.placements.trialId, trialId));
  const [insp] = await db.select().from(s.inspections).where(and(eq(s.inspections.trialId, trialId), isNotNull(s.inspections.doneAt))).orderBy(asc(s.inspections.plannedAt)).limit(1);
  const photos = await db.select({ id: s.photos.id }).from(s.photos).where(eq(s.photos.trialId, trialId)).limit(6);
  return { name, client, trialId, specimens, photoIds: photos.map((p) => p.id), inspectionId: insp.id, armTokens: await armTokensOf(trialId), othersWork, seed: trial.allocationSeed ?? "", role: member.role };
}

/** Every URL a blind scorer might open for this trial, from the route tree. */
function urlsOf(scene: Scene) {
  const ids = { trialId: scene.trialId, inspectionId: scene.inspectionId, photoId: scene.photoIds[0], specimenId: scene.specimens[0].id };
  const pages = listLabPages().map((p) => p.route as PageRoute);
  const out: { url: string; results: boolean; permission?: Permission }[] = [];
  for (const route of pages.filter((r) => r.startsWith("/trials/[trialId]"))) {
    const permission: Permission = PAGE_ROUTES[route].permission;
    if (route.includes("[specimenId]")) for (const sp of scene.specimens) out.push({ url: fillRoute(route, { ...ids, specimenId: sp.id }), results: false, permission });
    else if (route.includes("[photoId]")) for (const photoId of scene.photoIds) out.push({ url: fillRoute(route, { ...ids, photoId }), results: false, permission });
    else out.push({ url: fillRoute(route, ids), results: "results" in PAGE_ROUTES[route], permission });
  }
  for (const route of pages.filter((r) => r.startsWith("/specimens/[specimenId]"))) {
    for (const sp of scene.specimens) out.push({ url: fillRoute(route, { specimenId: sp.id }), results: false, permission: PAGE_ROUTES[route].permission });
  }
  out.push({ url: "/", results: false }, { url: "/audit", results: false }, { url: `/audit?entity=trial`, results: false }, { url: "/collection", results: false }, { url: "/collection/overview", results: false }, { url: "/collection/report", results: false });
  for (const r of routes.filter((x) => x.method === "GET" && x.permission)) {
    const permission = r.permission as Permission;
    if (r.route.includes("[trialId]") || r.route.includes("[inspectionId]")) out.push({ url: fillRoute(r.route, ids), results: RESULT_ROUTES.has(r.route), permission });
    else if (r.route.includes("[specimenId]")) for (const sp of scene.specimens) out.push({ url: fillRoute(r.route, { specimenId: sp.id }), results: false, permission });
    else if (r.route.includes("[photoId]")) for (const photoId of scene.photoIds) out.push({ url: fillRoute(r.route, { photoId }) + (r.route.endsWith("/file") ? "?format=json" : ""), results: false, permission });
    else if (!r.route.includes("[")) out.push({ url: `${r.route}?trialId=${scene.trialId}`, results: false, permission });
  }
  return out;
}

function pairings(body: string, subjects: string[], arms: string[]): string[] {
  const found: string[] = [];
  for (const subject of subjects) {
    let i = body.indexOf(subject);
    while (i >= 0 && found.length < 3) {
      const near = body.slice(Math.max(0, i - WINDOW), i + subject.length + WINDOW);
      const arm = arms.find((a) => near.includes(a));
      if (arm) found.push(`${subject} … ${arm}`);
      i = body.indexOf(subject, i + subject.length);
    }
  }
  return found;
}

async function walk(scene: Scene) {
  const checked: string[] = [];
  for (const { url, results, permission } of urlsOf(scene)) {
    const res = await scene.client.fetch(url);
    const body = await res.text();
    if (permission && !can(scene.role, permission)) {
      // The role lacks the permission: a 403 that shows nothing of the trial.
      expect({ url, status: res.status }).toEqual({ url, status: 403 });
      continue;
    }
    if (results) {
      expect({ url, status: res.status }).toEqual({ url, status: 403 });
      expect(body.replace(/&#x27;|&apos;/g, "'")).toContain(RESULTS_HIDDEN);
      continue;
    }
    expect({ url, status: res.status < 500 && res.status !== 403 && res.status !== 404 }).toEqual({ url, status: true });
    const subjects = [...scene.specimens.flatMap((sp) => [sp.label, sp.id]), ...scene.photoIds];
    expect({ url, pairs: pairings(body, subjects, scene.armTokens) }).toEqual({ url, pairs: [] });
    expect({ url, seed: scene.seed && body.includes(`"${scene.seed}"`) }).toEqual({ url, seed: false });
    for (const w of scene.othersWork) expect({ url, leaks: body.includes(w) ? w : null }).toEqual({ url, leaks: null });
    checked.push(url);
  }
  return checked;
}

beforeAll(async () => {
  routes = await listRoutes();
  // The demo: scorer@ scores the running demo trial blind.
  const [demo] = await db.select({ id: s.trials.id }).from(s.trials).innerJoin(s.labs, eq(s.labs.id, s.trials.labId))
    .where(and(eq(s.labs.name, "Tarrow Valley Natural History Collection"), eq(s.trials.status, "running")));
  scenes.push(await sceneOf("demo", await signedInClient("scorer@tarrow.example", "rustline-demo-1"), demo.id, [], "scorer@tarrow.example"));

  // A fresh lab: two jars × two treatments, allocated, started, photographed, scored by the primary
  // scorer and one specimen moved, all through the product's own functions (so audit events exist).
  const lab = await createTestLab("Blinding");
  const email = uniqueEmail("blind");
  const [blindUser] = await db.insert(s.users).values({ name: "Blind scorer", email, passwordHash: await hashPassword(TEST_PASSWORD) }).returning();
  await db.insert(s.memberships).values({ userId: blindUser.id, labId: lab.labId, role: "technician" });
  const chambers = await db.insert(s.chambers).values(["Jar Kestrel", "Jar Plover"].map((name, i) => ({ labId: lab.labId, name, kind: "water" as const, nominalTempC: 21, setpointRhPercent: 60 + i * 30, toleranceRhPercent: 4 }))).returning();
  const treatments = await db.insert(s.treatments).values(["Bare heron", "Waxed linnet"].map((name) => ({ labId: lab.labId, name, kind: "control" as const }))).returning();
  const specimens = await db.insert(s.specimens).values(Array.from({ length: 8 }, (_, i) => ({ labId: lab.labId, label: `BL-${String(i + 1).padStart(2, "0")}`, materialClass: "iron-meteorite" as const }))).returning();
  const lead = { ...lab.as("lead"), role: "lead" as const };
  const researcher = { ...lab.as("researcher"), role: "researcher" as const };
  const trial = await createTrial({ actor: lead, input: trialDesignSchema.parse({
    title: "Blinding check", question: "Which jar rusts first?", chamberIds: chambers.map((c) => c.id), treatmentIds: treatments.map((t) => t.id),
    replicatesPerArm: 2, plan: { kind: "custom", days: [0, 7] }, technicianIds: [lab.users.technician.id],
    scorers: [{ userId: lab.users.technician.id, blind: false }, { userId: blindUser.id, blind: true }], scoreRule: "primary-scorer", primaryScorerId: lab.users.technician.id,
  }) });
  await allocateTrial({ actor: researcher, trialId: trial.id, specimenIds: specimens.map((x) => x.id), seed: "kestrel-plover-7", blockByMaterial: true });
  await startTrial({ actor: researcher, trialId: trial.id, startAt: new Date(Date.now() - 10 * 86_400_000) });
  const inspections = await db.select().from(s.inspections).where(eq(s.inspections.trialId, trial.id)).orderBy(asc(s.inspections.dayNumber));
  await db.update(s.inspections).set({ doneAt: new Date(Date.now() - 10 * 86_400_000 + 3_600_000) }).where(eq(s.inspections.id, inspections[0].id));
  for (const sp of specimens.slice(0, 3)) {
    const photo = await createReadyPhoto({ labId: lab.labId, trialId: trial.id, inspectionId: inspections[0].id, specimenId: sp.id, uploadedBy: lab.users.technician.id, filename: `${sp.label}-day0.jpg`, width: 320, height: 240 });
    await saveScore({ labId: lab.labId, userId: lab.users.technician.id }, saveScoreSchema.parse({ trialId: trial.id, inspectionId: inspections[0].id, specimenId: sp.id, photoId: photo.photoId, spotCount: "2", areaPercent: "0.37", astmLetter: "S", silicateChange: "none" }));
  }
  const arms = await db.select().from(s.trialArms).where(eq(s.trialArms.trialId, trial.id));
  const [placed] = await db.select().from(s.placements).where(and(eq(s.placements.trialId, trial.id), eq(s.placements.specimenId, specimens[0].id)));
  await moveSpecimen({ actor: researcher, trialId: trial.id, specimenId: specimens[0].id, armId: arms.find((a) => a.id !== placed.armId)!.id, reason: "Stand cracked in the first jar" });
  const client = await signedInClient(email, TEST_PASSWORD);
  fresh = { lab, scene: await sceneOf("fresh lab", client, trial.id, ["rust score at day 0: 0.37 %", "-day0.jpg", "Stand cracked"], email) };
  scenes.push(fresh.scene);
}, 180_000);
afterAll(() => closeDb());

describe("a blind scorer of a running trial", () => {
  it("learns no arm, result, seed or other scorer's score from any page, route or export (demo)", async () => {
    expect((await walk(scenes[0])).length).toBeGreaterThan(60);
  }, 600_000);

  it("learns none of them in a fresh lab either, and the audit trail says what is hidden", async () => {
    const { scene } = fresh;
    expect((await walk(scene)).length).toBeGreaterThan(30);
    const audit = await (await scene.client.fetch("/audit")).text();
    expect(audit).toContain(BLIND_HIDDEN);
    const allocation = (await (await scene.client.fetch(`/api/trials/${scene.trialId}/allocation`)).json()) as { seed: string | null; items: { label: string }[] };
    expect(allocation.seed).toBeNull();
    const labels = allocation.items.map((x) => x.label);
    expect(labels).toEqual([...labels].sort());
  }, 600_000);

  it("sees everything once the trial is concluded", async () => {
    const { scene, lab } = fresh;
    await concludeTrial({ actor: { ...lab.as("lead"), role: "lead" }, trialId: scene.trialId });
    for (const path of ["analysis", "export/outcomes.csv", "export/datapackage.zip"]) {
      expect({ path, status: (await scene.client.fetch(`/api/trials/${scene.trialId}/${path}`)).status }).toEqual({ path, status: 200 });
    }
    for (const page of ["compare", "report", "agreement"]) {
      expect({ page, status: (await scene.client.fetch(`/trials/${scene.trialId}/${page}`)).status }).toEqual({ page, status: 200 });
    }
    const allocation = (await (await scene.client.fetch(`/api/trials/${scene.trialId}/allocation`)).json()) as { seed: string; items: { armLabel: string | null }[] };
    expect(allocation.seed).toBe("kestrel-plover-7");
    expect(allocation.items.every((x) => x.armLabel)).toBe(true);
    const audit = await (await scene.client.fetch("/audit")).text();
    expect(audit).toContain("rust score at day 0: 0.37 %");
    expect(audit).toContain("Stand cracked");
    const report = await (await scene.client.fetch(`/trials/${scene.trialId}/report`)).text();
    expect(report).toMatch(/Scoring ended when the trial was concluded/);
    expect(report).toContain("Specimen history"); // the report's history table, results-gated with the rest
  }, 120_000);
});
