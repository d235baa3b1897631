// The authorization matrix: every server action and route handler × role (lead, researcher, technician,
// observer, signed out) → allowed or refused, derived from the permission map; plus cross-lab reads → 404.
// The table in DEVELOPERS.md is this test's output: `UPDATE_MATRIX=1 npx vitest run tests/integration/auth-matrix.test.ts`.
import fs from "node:fs";
import path from "node:path";
import crypto from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { ROLES, type Role } from "@/lib/auth/permissions";
import type { LabActionFn } from "@/lib/auth/action";
import { createTestLab, type TestLab } from "../support/db";
import { anonymous, signedInClient, type Client } from "../support/http";
import { allowedRoles, listActions, listRoutes, matrixMarkdown, type ActionEntry, type RouteEntry } from "../support/registry";
import { repoRoot } from "../support/s3";

// Entry points that are not lab-scoped, and what protects them instead.
const PUBLIC_ACTIONS: Record<string, string> = {
  signUp: "public: mails a link that creates a new lab (or a note that the address has an account)",
  confirmSignUp: "public: needs a sealed sign-up link from that mail",
  signInWithPassword: "public: e-mail and password, throttled per account and per client address",
  acceptInvite: "public: needs a valid single-use invitation token",
};
const PUBLIC_ROUTES: Record<string, string> = {
  "GET /api/auth/[...nextauth]": "next-auth (sign-in, session)",
  "POST /api/auth/[...nextauth]": "next-auth (CSRF token checked by next-auth)",
  "POST /api/chambers/[chamberId]/readings": "per-chamber logger token (Bearer)",
};

let actions: ActionEntry[];
let routes: RouteEntry[];
let lab: TestLab;
const clients = {} as Record<Role, Client>;

beforeAll(async () => {
  actions = await listActions();
  routes = await listRoutes();
  lab = await createTestLab("Matrix");
  for (const role of ROLES) clients[role] = await signedInClient(`${role}@tarrow.example`, "rustline-demo-1");
}, 120_000);
afterAll(() => closeDb());

function isRedirect(err: unknown) {
  return !!err && typeof err === "object" && "digest" in err && String((err as { digest: unknown }).digest).startsWith("NEXT_REDIRECT");
}

describe("server actions", () => {
  it("every exported action goes through the permission wrapper (or is a listed public one)", () => {
    const bare = actions.filter((a) => !a.permission && !PUBLIC_ACTIONS[a.name]).map((a) => `${a.file}#${a.name}`);
    expect(bare).toEqual([]);
    expect(actions.length).toBeGreaterThan(5);
  });

  it("refuses exactly the roles the permission map refuses, and signed-out callers", async () => {
    for (const a of actions.filter((x) => x.permission)) {
      const fn = a.fn as LabActionFn<unknown>;
      for (const role of ROLES) {
        let refused: boolean;
        try {
          const r = await fn.withIdentity(lab.as(role), {});
          refused = r.ok === false && /does not allow/.test(r.message ?? "");
        } catch (err) {
          if (!isRedirect(err)) throw err;
          refused = false;
        }
        expect({ action: `${a.file}#${a.name}`, role, refused }).toEqual({ action: `${a.file}#${a.name}`, role, refused: !allowedRoles(a.permission!).includes(role) });
      }
      const out = await fn.withIdentity(null, {});
      expect({ action: a.name, message: out.message }).toEqual({ action: a.name, message: "Please sign in." });
    }
  }, 120_000);
});

function fillParams(route: string, ids: Record<string, string> = {}) {
  return route.replace(/\[\.\.\.[^\]]+\]/g, "x").replace(/\[([^\]]+)\]/g, (_m, name: string) => ids[name] ?? crypto.randomUUID());
}

describe("route handlers", () => {
  it("every route handler declares a permission (or is a listed public one)", () => {
    const bare = routes.filter((r) => !r.permission && !PUBLIC_ROUTES[`${r.method} ${r.route}`]).map((r) => `${r.method} ${r.route}`);
    expect(bare).toEqual([]);
  });

  it("answers 401 signed out, 403 to refused roles, and lets allowed roles through", async () => {
    for (const r of routes.filter((x) => x.permission)) {
      const url = fillParams(r.route);
      const init = (c: Client) => c.fetch(url, r.method === "GET" ? {} : { method: r.method, headers: { "content-type": "application/json" }, body: "{}" });
      expect({ route: `${r.method} ${url}`, status: (await init(anonymous)).status }).toEqual({ route: `${r.method} ${url}`, status: 401 });
      for (const role of ROLES) {
        const status = (await init(clients[role])).status;
        const allowed = allowedRoles(r.permission!).includes(role);
        expect({ route: `${r.method} ${r.route}`, role, refused: status === 403, status: status >= 500 ? "server error" : "ok" })
          .toEqual({ route: `${r.method} ${r.route}`, role, refused: !allowed, status: "ok" });
      }
    }
  }, 300_000);

  it("a row of another lab answers 404, never its data", async () => {
    // One row of each entity in a lab the demo users do not belong to.
    const [chamber] = await db.insert(s.chambers).values({ labId: lab.labId, name: "Foreign jar", kind: "water", nominalTempC: 20, setpointRhPercent: 95, toleranceRhPercent: 5 }).returning();
    const [treatment] = await db.insert(s.treatments).values({ labId: lab.labId, name: "Foreign treatment", kind: "control" }).returning();
    const [specimen] = await db.insert(s.specimens).values({ labId: lab.labId, label: "FOREIGN-1", materialClass: "steel-coupon" }).returning();
    const [trial] = await db.insert(s.trials).values({ labId: lab.labId, title: "Foreign trial", question: "?", schedulePlan: { kind: "custom", days: [0] } }).returning();
    const [inspection] = await db.insert(s.inspections).values({ labId: lab.labId, trialId: trial.id, dayNumber: 0, plannedAt: new Date() }).returning();
    const [photo] = await db.insert(s.photos).values({ labId: lab.labId, specimenId: specimen.id, objectKey: `labs/${lab.labId}/photos/x/${crypto.randomUUID()}.jpg`, filename: "x.jpg", contentType: "image/jpeg", sizeBytes: 1, status: "ready" }).returning();
    const byFolder: Record<string, string> = { chambers: chamber.id, treatments: treatment.id, specimens: specimen.id, trials: trial.id, inspections: inspection.id, photos: photo.id };
    const ids: Record<string, string> = { chamberId: chamber.id, treatmentId: treatment.id, specimenId: specimen.id, trialId: trial.id, inspectionId: inspection.id, photoId: photo.id };
    const checked: string[] = [];
    for (const r of routes.filter((x) => x.permission && x.method === "GET" && /\[/.test(x.route))) {
      // "[id]" takes the entity of the folder it sits in (api/specimens/[id] → a specimen).
      const url = r.route.replace(/\/(\w+)\/\[id\]/g, (_m, folder: string) => `/${folder}/${byFolder[folder] ?? crypto.randomUUID()}`);
      const res = await clients.lead.fetch(fillParams(url, ids));
      const body = await res.text();
      expect({ route: r.route, status: res.status }).toEqual({ route: r.route, status: 404 });
      expect(body).not.toContain("Foreign");
      checked.push(r.route);
    }
    expect(checked.length).toBeGreaterThan(0);
  }, 120_000);
});

describe("documentation", () => {
  it("DEVELOPERS.md prints the current matrix", () => {
    const table = matrixMarkdown(actions, routes, { ...PUBLIC_ROUTES });
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
