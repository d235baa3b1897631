// The one wrapper: session → membership → permission → zod → handler, for every permission and role.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { z } from "zod";
import { eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { recordAudit } from "@/db/audit";
import { runLabAction } from "@/lib/auth/action";
import { PERMISSIONS, ROLES, type Permission } from "@/lib/auth/permissions";
import { createTestLab, type TestLab } from "../support/db";

let a: TestLab;
let b: TestLab;

beforeAll(async () => {
  a = await createTestLab("Lab A");
  b = await createTestLab("Lab B");
});
afterAll(() => closeDb());

const noInput = z.object({});

describe("permission wrapper", () => {
  it("allows exactly the roles the permission map names, for every permission", async () => {
    for (const permission of Object.keys(PERMISSIONS) as Permission[]) {
      for (const role of ROLES) {
        let called = false;
        const r = await runLabAction(a.as(role), permission, noInput, {}, async () => {
          called = true;
        });
        const allowed = (PERMISSIONS[permission] as readonly string[]).includes(role);
        expect({ permission, role, ok: r.ok, called }).toEqual({ permission, role, ok: allowed, called: allowed });
      }
    }
  });

  it("refuses signed-out callers and members naming a lab they do not belong to", async () => {
    let called = false;
    const handler = async () => {
      called = true;
    };
    const out = await runLabAction(null, "lab.read", noInput, {}, handler);
    expect(out).toMatchObject({ ok: false, message: "Please sign in." });
    const cross = await runLabAction({ userId: a.users.lead.id, labId: b.labId }, "lab.read", noInput, {}, handler);
    expect(cross.ok).toBe(false);
    expect(called).toBe(false);
  });

  it("returns field errors and the typed values without calling the handler on bad input", async () => {
    let called = false;
    const schema = z.object({ massG: z.coerce.number().positive("Mass must be above 0 g.") });
    const r = await runLabAction(a.as("lead"), "specimens.write", schema, { massG: "-3" }, async () => {
      called = true;
    });
    expect(r.errors?.massG).toEqual(["Mass must be above 0 g."]);
    expect(r.values).toEqual({ massG: "-3" });
    expect(called).toBe(false);
  });
});

describe("audit trail", () => {
  it("a change and its audit event commit together, and a failed change writes neither", async () => {
    const name = `Audited ${Date.now()}`;
    await expect(
      db.transaction(async (tx) => {
        const [t] = await tx.insert(s.treatments).values({ labId: a.labId, name, kind: "control" }).returning();
        await recordAudit(tx, { labId: a.labId, userId: a.users.lead.id, entity: "treatment", entityId: t.id, action: "create", after: t });
        // A second treatment with the same name violates the unique index: the whole change must roll back.
        await tx.insert(s.treatments).values({ labId: a.labId, name, kind: "control" });
      }),
    ).rejects.toThrow();
    expect(await db.select().from(s.treatments).where(eq(s.treatments.name, name))).toHaveLength(0);
    const events = await db.select().from(s.auditEvents).where(eq(s.auditEvents.labId, a.labId));
    expect(events.filter((e) => e.entity === "treatment")).toHaveLength(0);
  });
});
