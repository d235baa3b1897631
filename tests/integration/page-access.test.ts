// Page permissions, generated from the route tree: every page under app/(lab) names its pattern in
// lib/auth/page-routes (checked against the folders on disk, the page's own source and the hand-written
// page → permission and role tables of tests/support/expected-access), answers 403
// with a page naming the roles it needs to a role without the permission, lets allowed roles in,
// sends signed-out visitors to sign-in, and answers 404 for another lab's ids.
import crypto from "node:crypto";
import { and, eq, isNotNull } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { PAGE_ROUTES, matchPageRoute, type PageRoute } from "@/lib/auth/page-routes";
import { ROLES, type Role } from "@/lib/auth/permissions";
import { expectedRoles, PAGE_PERMISSIONS } from "../support/expected-access";
import { createTestLab, type TestLab } from "../support/db";
import { anonymous, signedInClient, type Client } from "../support/http";
import { fillRoute, listLabPages } from "../support/pages";

const pages = listLabPages();
const clients = {} as Record<Role, Client>;
let demoIds: Record<string, string>;
let foreignIds: Record<string, string>;
let other: TestLab;

beforeAll(async () => {
  for (const role of ROLES) clients[role] = await signedInClient(`${role}@tarrow.example`, "rustline-demo-1");
  const [lab] = await db.select().from(s.labs).where(eq(s.labs.name, "Tarrow Valley Natural History Collection"));
  const [trial] = await db.select().from(s.trials).where(and(eq(s.trials.labId, lab.id), eq(s.trials.status, "running")));
  const [insp] = await db.select().from(s.inspections).where(and(eq(s.inspections.trialId, trial.id), isNotNull(s.inspections.doneAt))).limit(1);
  const [photo] = await db.select().from(s.photos).where(and(eq(s.photos.trialId, trial.id), eq(s.photos.inspectionId, insp.id))).limit(1);
  const [chamber] = await db.select().from(s.chambers).where(eq(s.chambers.labId, lab.id)).limit(1);
  const [treatment] = await db.select().from(s.treatments).where(eq(s.treatments.labId, lab.id)).limit(1);
  demoIds = { trialId: trial.id, inspectionId: insp.id, photoId: photo.id, specimenId: photo.specimenId, chamberId: chamber.id, treatmentId: treatment.id };

  // One row of each kind in a lab the demo users do not belong to.
  other = await createTestLab("Pages elsewhere");
  const [c] = await db.insert(s.chambers).values({ labId: other.labId, name: "Foreign jar", kind: "water", nominalTempC: 20, setpointRhPercent: 95, toleranceRhPercent: 5 }).returning();
  const [t] = await db.insert(s.treatments).values({ labId: other.labId, name: "Foreign treatment", kind: "control" }).returning();
  const [sp] = await db.insert(s.specimens).values({ labId: other.labId, label: "FOREIGN-1", materialClass: "steel-coupon" }).returning();
  const [tr] = await db.insert(s.trials).values({ labId: other.labId, title: "Foreign trial", question: "?", status: "running", schedulePlan: { kind: "custom", days: [0] } }).returning();
  const [i] = await db.insert(s.inspections).values({ labId: other.labId, trialId: tr.id, dayNumber: 0, plannedAt: new Date() }).returning();
  const [ph] = await db.insert(s.photos).values({ labId: other.labId, trialId: tr.id, inspectionId: i.id, specimenId: sp.id, objectKey: `labs/${other.labId}/photos/x/${crypto.randomUUID()}.jpg`, filename: "FOREIGN-1.jpg", contentType: "image/jpeg", sizeBytes: 1, status: "ready" }).returning();
  foreignIds = { trialId: tr.id, inspectionId: i.id, photoId: ph.id, specimenId: sp.id, chamberId: c.id, treatmentId: t.id };
}, 120_000);
afterAll(() => closeDb());

describe("the page map", () => {
  it("lists exactly the pages on disk, and each page checks its own pattern", () => {
    expect(pages.map((p) => p.route).sort()).toEqual(Object.keys(PAGE_ROUTES).sort());
    for (const p of pages) {
      const calls = [...p.source.matchAll(/\b(?:labPage|trialPage|analysisPage)\("([^"]+)"/g)].map((m) => m[1]);
      expect({ page: p.file, calls }).toEqual({ page: p.file, calls: [p.route] });
    }
  });

  it("each page needs the permission written by hand for it, so a changed page permission fails here", () => {
    const inCode = Object.fromEntries(Object.entries(PAGE_ROUTES).map(([route, rule]) => [route, rule.permission]));
    expect(inCode).toEqual(PAGE_PERMISSIONS);
  });

  it("matches concrete paths to their pattern, literal segments first", () => {
    expect(matchPageRoute("/trials/new")).toBe("/trials/new");
    expect(matchPageRoute(`/trials/${crypto.randomUUID()}/compare`)).toBe("/trials/[trialId]/compare");
    expect(matchPageRoute("/")).toBe("/");
    expect(matchPageRoute("/no/such/page")).toBeNull();
  });
});

function allowed(route: PageRoute, role: Role) {
  return expectedRoles(PAGE_PERMISSIONS[route]).includes(role);
}

describe("every page × role", () => {
  it("allowed roles get the page (or a redirect the page decides), others a 403 naming the roles needed", async () => {
    for (const p of pages) {
      const route = p.route as PageRoute;
      const url = fillRoute(route, demoIds);
      for (const role of ROLES) {
        const res = await clients[role].fetch(url);
        const body = await res.text();
        if (allowed(route, role)) {
          expect({ url, role, ok: res.status === 200 || (res.status >= 300 && res.status < 400) }).toEqual({ url, role, ok: true });
        } else {
          expect({ url, role, status: res.status }).toEqual({ url, role, status: 403 });
          const names = expectedRoles(PAGE_PERMISSIONS[route]).join(" or ");
          expect(body).toContain(`This page needs the ${names} role`);
        }
      }
      const out = await anonymous.fetch(url);
      expect({ url, status: out.status, to: out.headers.get("location") ?? "" }).toMatchObject({ url, status: 307, to: expect.stringContaining("/sign-in") });
    }
  }, 600_000);

  it("another lab's ids answer 404 on every page with an id, never its data", async () => {
    let checked = 0;
    for (const p of pages.filter((x) => x.route.includes("["))) {
      const url = fillRoute(p.route, foreignIds);
      const res = await clients.lead.fetch(url);
      const body = await res.text();
      expect({ url, status: res.status }).toEqual({ url, status: 404 });
      expect(body).not.toContain("FOREIGN-1");
      expect(body).not.toContain("Foreign");
      checked++;
    }
    expect(checked).toBeGreaterThan(15);
  }, 300_000);
});
