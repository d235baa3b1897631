// The authorization matrix: every server action and route handler × role (lead, researcher, technician,
// observer, signed out). The expectations are written by hand (tests/support/expected-access.ts for the
// role table, ENTRY_POINTS below for each entry point's permission and answer), never read from the
// permission map, so a changed permission in the code fails here. Also: HEAD and OPTIONS on every route,
// reads and writes with another lab's ids (404, nothing changes), server actions wherever "use server"
// is, and an id parameter this test does not know fails instead of being guessed.
// The table in DEVELOPERS.md is this test's output: `UPDATE_MATRIX=1 npx vitest run tests/integration/auth-matrix.test.ts`.
import fs from "node:fs";
import path from "node:path";
import crypto from "node:crypto";
import { eq, is } from "drizzle-orm";
import { PgTable } from "drizzle-orm/pg-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { PERMISSIONS, ROLES, type Permission, type Role } from "@/lib/auth/permissions";
import type { LabActionFn } from "@/lib/auth/action";
import { createTestLab, TEST_PASSWORD, type TestLab } from "../support/db";
import { anonymous, signedInClient, type Client } from "../support/http";
import { expectedRoles, ROLE_PERMISSIONS } from "../support/expected-access";
import { fillRoute } from "../support/pages";
import { inlineServerActions, listActions, listRoutes, matrixMarkdown, METHODS, type ActionEntry, type RouteEntry } from "../support/registry";
import { repoRoot } from "../support/s3";
import { ENTRY_POINTS, PUBLIC_ACTIONS, PUBLIC_ROUTES, type Fixture } from "./auth-matrix-entries";

let actions: ActionEntry[];
let routes: RouteEntry[];
let home: TestLab;
let foreign: TestLab;
let ids: Fixture;
let foreignIds: Fixture;
const clients = {} as Record<Role, Client>;

const actionKey = (a: ActionEntry) => `${a.file}#${a.name}`;
const routeKey = (r: RouteEntry) => `${r.method} ${r.route}`;

/** One row of every kind an entry point names by id, in the given lab. */
async function fixture(lab: TestLab, tag: string): Promise<Fixture> {
  const [chamber] = await db.insert(s.chambers).values({ labId: lab.labId, name: `${tag} jar`, kind: "water", nominalTempC: 20, setpointRhPercent: 95, toleranceRhPercent: 5 }).returning();
  const [treatment] = await db.insert(s.treatments).values({ labId: lab.labId, name: `${tag} treatment`, kind: "control" }).returning();
  const [specimen, other] = await db.insert(s.specimens).values([
    { labId: lab.labId, label: `${tag}-1`, materialClass: "steel-coupon" }, { labId: lab.labId, label: `${tag}-2`, materialClass: "steel-coupon" },
  ]).returning();
  const [trial] = await db.insert(s.trials).values({ labId: lab.labId, title: `${tag} trial`, question: "Who may touch this trial?", schedulePlan: { kind: "custom", days: [0] } }).returning();
  const [inspection] = await db.insert(s.inspections).values({ labId: lab.labId, trialId: trial.id, dayNumber: 0, plannedAt: new Date("2026-01-05T09:00:00Z") }).returning();
  const key = `labs/${lab.labId}/photos/x/${crypto.randomUUID()}`;
  const [photo] = await db.insert(s.photos).values({
    labId: lab.labId, trialId: trial.id, inspectionId: inspection.id, specimenId: specimen.id, objectKey: `${key}.jpg`, filename: `${tag}-1.jpg`,
    contentType: "image/jpeg", sizeBytes: 1, status: "ready", derivatives: { thumb: `${key}-thumb.webp`, display: `${key}-display.webp` },
  }).returning();
  const [token] = await db.insert(s.chamberTokens).values({ labId: lab.labId, chamberId: chamber.id, label: `${tag} logger`, tokenHash: crypto.randomBytes(32).toString("hex") }).returning();
  const [check] = await db.insert(s.hygrometerChecks).values({ labId: lab.labId, chamberId: chamber.id, instrument: `${tag} logger`, saltId: "NaCl", tempC: 20, readingRhPercent: 76, referenceRhPercent: 75.5, offsetRhPercent: 0.5, checkedAt: new Date("2026-01-05T09:00:00Z") }).returning();
  const [weighing] = await db.insert(s.massMeasurements).values({ labId: lab.labId, specimenId: specimen.id, measuredOn: "2026-01-04", massG: "12.3456" }).returning();
  return {
    chamberId: chamber.id, treatmentId: treatment.id, specimenId: specimen.id, otherSpecimenId: other.id, trialId: trial.id, inspectionId: inspection.id,
    photoId: photo.id, tokenId: token.id, checkId: check.id, weighingId: weighing.id, users: Object.fromEntries(ROLES.map((r) => [r, lab.users[r].id])) as Record<Role, string>,
  };
}

/** Every row of every lab-scoped table of a lab, to show that a refused write changed nothing. */
async function labSnapshot(labId: string) {
  const out: Record<string, string[]> = {};
  for (const [name, table] of Object.entries(s)) {
    if (!is(table, PgTable) || !("labId" in table)) continue;
    const rows = await db.select().from(table).where(eq((table as unknown as { labId: typeof s.trials.labId }).labId, labId));
    out[name] = rows.map((r) => JSON.stringify(r)).sort();
  }
  return out;
}

beforeAll(async () => {
  actions = await listActions();
  routes = await listRoutes();
  home = await createTestLab("Matrix");
  foreign = await createTestLab("Matrix elsewhere");
  ids = await fixture(home, `M${crypto.randomBytes(2).toString("hex")}`);
  foreignIds = await fixture(foreign, "FOREIGN");
  for (const role of ROLES) clients[role] = await signedInClient(home.users[role].email, TEST_PASSWORD);
}, 120_000);
afterAll(() => closeDb());

function isRedirect(err: unknown) {
  return !!err && typeof err === "object" && "digest" in err && String((err as { digest: unknown }).digest).startsWith("NEXT_REDIRECT");
}

describe("the hand-written tables", () => {
  it("the role × permission table matches the permission map, permission by permission", () => {
    const inCode = Object.fromEntries(Object.entries(PERMISSIONS).map(([p, roles]) => [p, [...roles].sort()]));
    const byHand = Object.fromEntries(Object.keys(PERMISSIONS).map((p) => [p, expectedRoles(p as Permission).sort()]));
    expect(byHand).toEqual(inCode);
    const named = new Set(Object.values(ROLE_PERMISSIONS).flat());
    expect([...named].filter((p) => !(p in PERMISSIONS))).toEqual([]);
  });

  it("every entry point on disk has a hand-written entry, declares exactly that permission, and no entry is stale", () => {
    const onDisk: Record<string, Permission | null> = {
      ...Object.fromEntries(actions.filter((a) => !PUBLIC_ACTIONS[a.name]).map((a) => [actionKey(a), a.permission])),
      ...Object.fromEntries(routes.filter((r) => !PUBLIC_ROUTES[routeKey(r)]).map((r) => [routeKey(r), r.permission])),
    };
    const written = Object.fromEntries(Object.entries(ENTRY_POINTS).map(([k, e]) => [k, e.permission]));
    expect(onDisk).toEqual(written);
    const publicActions = actions.filter((a) => PUBLIC_ACTIONS[a.name]);
    expect(publicActions.map((a) => a.name).sort()).toEqual(Object.keys(PUBLIC_ACTIONS).sort());
    expect(publicActions.filter((a) => a.permission !== null).map(actionKey)).toEqual([]);
    expect(routes.filter((r) => PUBLIC_ROUTES[routeKey(r)]).map(routeKey).sort()).toEqual(Object.keys(PUBLIC_ROUTES).sort());
  });

  it("server actions are found wherever a module starts with \"use server\", and none is declared inline", () => {
    expect(inlineServerActions()).toEqual([]);
    expect(actions.length).toBeGreaterThan(30);
  });
});

describe("server actions × role", () => {
  it("refused roles get forbidden, allowed roles reach the input check (empty input → invalid), signed out → sign in", async () => {
    for (const a of actions.filter((x) => x.permission)) {
      const fn = a.fn as LabActionFn<unknown>;
      const entry = ENTRY_POINTS[actionKey(a)];
      for (const role of ROLES) {
        let code: string;
        try {
          const r = await fn.withIdentity(home.as(role), {});
          code = r.ok ? "ok" : r.code ?? "?";
        } catch (err) {
          if (!isRedirect(err)) throw err;
          code = "redirect";
        }
        const want = expectedRoles(entry.permission!).includes(role) ? entry.empty : "forbidden";
        expect({ action: actionKey(a), role, code }).toEqual({ action: actionKey(a), role, code: want });
      }
      const out = await fn.withIdentity(null, {});
      expect({ action: a.name, code: out.code, message: out.message }).toEqual({ action: a.name, code: "unauthenticated", message: "Please sign in." });
    }
  }, 120_000);
});

function send(c: Client, method: string, url: string, body: unknown = {}) {
  return c.fetch(url, method === "GET" || method === "HEAD" || method === "OPTIONS" ? { method } : { method, headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
}

describe("route handlers × role", () => {
  it("401 signed out, 403 to refused roles, and the documented status to allowed roles (real ids of the caller's lab)", async () => {
    for (const r of routes.filter((x) => x.permission)) {
      const entry = ENTRY_POINTS[routeKey(r)];
      // An id parameter without a value in the fixture fails here (fillRoute throws) rather than being guessed.
      const url = fillRoute(r.route, ids as unknown as Record<string, string>);
      expect({ route: routeKey(r), status: (await send(anonymous, r.method, url)).status }).toEqual({ route: routeKey(r), status: 401 });
      for (const role of ROLES) {
        const status = (await send(clients[role], r.method, url)).status;
        const want = expectedRoles(entry.permission!).includes(role) ? entry.empty : 403;
        expect({ route: routeKey(r), role, status }).toEqual({ route: routeKey(r), role, status: want });
      }
    }
  }, 300_000);

  it("HEAD answers like GET without a body; OPTIONS runs no handler and names exactly the methods served", async () => {
    const byRoute = new Map<string, RouteEntry[]>();
    for (const r of routes) byRoute.set(r.route, [...(byRoute.get(r.route) ?? []), r]);
    for (const [route, list] of byRoute) {
      if (route.includes("[...")) continue; // next-auth's own endpoints
      const url = fillRoute(route, ids as unknown as Record<string, string>);
      const get = list.find((r) => r.method === "GET");
      if (get?.permission) {
        const entry = ENTRY_POINTS[routeKey(get)];
        const out = await send(anonymous, "HEAD", url);
        expect({ route, head: out.status, body: await out.text() }).toEqual({ route, head: 401, body: "" });
        for (const role of ROLES) {
          const res = await send(clients[role], "HEAD", url);
          const want = expectedRoles(entry.permission!).includes(role) ? entry.empty : 403;
          expect({ route, role, head: res.status, body: await res.text() }).toEqual({ route, role, head: want, body: "" });
        }
      }
      const served = [...new Set([...list.map((r) => r.method), ...(get ? ["HEAD"] : []), "OPTIONS"])].sort();
      for (const c of [anonymous, clients.observer]) {
        const res = await send(c, "OPTIONS", url);
        const allow = (res.headers.get("allow") ?? "").split(",").map((m) => m.trim()).filter(Boolean).sort();
        expect({ route, options: res.status, allow, body: await res.text() }).toEqual({ route, options: 204, allow: served, body: "" });
      }
      // A method the route does not serve is refused before any handler runs.
      for (const m of METHODS.filter((x) => !served.includes(x))) {
        const res = await send(clients.lead, m, url);
        expect({ route, method: m, status: res.status }).toEqual({ route, method: m, status: 405 });
      }
    }
  }, 300_000);
});

describe("another lab's ids", () => {
  it("reads of another lab's rows answer 404, never their data", async () => {
    let checked = 0;
    for (const r of routes.filter((x) => x.permission && x.method === "GET" && x.route.includes("["))) {
      const res = await clients.lead.fetch(fillRoute(r.route, foreignIds as unknown as Record<string, string>));
      const body = await res.text();
      expect({ route: r.route, status: res.status }).toEqual({ route: r.route, status: 404 });
      expect(body).not.toContain("FOREIGN");
      checked++;
    }
    expect(checked).toBeGreaterThan(10);
  }, 120_000);

  it("writes naming another lab's rows (actions and routes, as the lead who holds every permission) answer 404 and change nothing there", async () => {
    const before = await labSnapshot(foreign.labId);
    const tried: string[] = [];
    for (const a of actions.filter((x) => x.permission)) {
      const entry = ENTRY_POINTS[actionKey(a)];
      if (!entry.foreign) continue;
      const r = await (a.fn as LabActionFn<unknown>).withIdentity(home.as("lead"), entry.foreign(foreignIds));
      const want = entry.foreignAnswer ?? "not-found";
      expect({ action: actionKey(a), code: r.code, ok: r.ok }).toEqual({ action: actionKey(a), code: want, ok: false });
      expect(JSON.stringify(r)).not.toContain("FOREIGN");
      tried.push(actionKey(a));
    }
    for (const r of routes.filter((x) => x.permission && x.method !== "GET")) {
      const entry = ENTRY_POINTS[routeKey(r)];
      if (!entry.foreign) continue;
      const url = fillRoute(r.route, foreignIds as unknown as Record<string, string>);
      const res = await send(clients.lead, r.method, url, entry.foreign(foreignIds));
      const body = await res.text();
      expect({ route: routeKey(r), status: res.status }).toEqual({ route: routeKey(r), status: entry.foreignAnswer === "invalid" ? 422 : 404 });
      expect(body).not.toContain("FOREIGN");
      tried.push(routeKey(r));
    }
    expect(await labSnapshot(foreign.labId)).toEqual(before);
    // Every write that names an existing row by id is tried (the entry table says why the others are not).
    expect(tried.length).toBeGreaterThan(40);
  }, 300_000);
});

describe("documentation", () => {
  it("DEVELOPERS.md prints the current matrix", () => {
    const table = matrixMarkdown(actions, routes, { ...PUBLIC_ROUTES }, expectedRoles);
    const file = path.join(repoRoot, "DEVELOPERS.md");
    const doc = fs.readFileSync(file, "utf8");
    const start = "<!-- matrix:start -->";
    const end = "<!-- matrix:end -->";
    const current = doc.slice(doc.indexOf(start) + start.length, doc.indexOf(end)).trim();
    if (process.env.UPDATE_MATRIX === "1") {
      fs.writeFileSync(file, doc.slice(0, doc.indexOf(start) + start.length) + "\n" + table + "\n" + doc.slice(doc.indexOf(end)));
      return;
    }
    expect(current).toBe(table);
  });
});
