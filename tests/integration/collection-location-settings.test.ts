// A storage location's settings after creation (updateLocationAction) on the real database: each field is
// saved with its audit event in the same transaction, the place in the tree stays, the stored status row is
// forgotten by the database (migration 0025's trigger), and bad input is refused at its field with nothing changed.
import { and, desc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createLocationAction, updateLocationAction } from "@/app/_actions/collection";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { setChamberArchived } from "@/db/queries/chambers";
import { refreshLocationStatuses } from "@/db/queries/location-status";
import { createTestLab, type TestLab } from "../support/db";

let a: TestLab;
let b: TestLab;
const ids: Record<string, string> = {};
const place = (name: string, locationKind: string, parentId = "") =>
  ({ name, locationKind, parentId, kind: "open-shelf", nominalTempC: "18", setpointRhPercent: "45", toleranceRhPercent: "5" });
const row = async (id: string) => (await db.select().from(s.chambers).where(eq(s.chambers.id, id)))[0];
const audits = async () => db.select().from(s.auditEvents).where(eq(s.auditEvents.labId, a.labId));
const stored = async (id: string) => (await db.select().from(s.locationStatus).where(eq(s.locationStatus.locationId, id)))[0] ?? null;

beforeAll(async () => {
  a = await createTestLab("Location settings A");
  b = await createTestLab("Location settings B");
  for (const [key, input] of [["store", () => place("Store 4", "room")], ["cab", () => place("Cabinet F", "cabinet", ids.store)]] as const) {
    const r = await createLocationAction.withIdentity(a.as("researcher"), input());
    expect(r.ok, r.message).toBe(true);
    ids[key] = (r.data as { id: string }).id;
  }
  const [jar] = await db.insert(s.chambers).values({ labId: a.labId, name: "Jar 33", kind: "saturated-salt", saltId: "MgCl2", nominalTempC: 20, setpointRhPercent: 33, toleranceRhPercent: 2 }).returning();
  ids.jar = jar.id;
  const [other] = await db.insert(s.chambers).values({ labId: b.labId, name: "B cabinet", kind: "open-shelf", locationKind: "cabinet", nominalTempC: 18, setpointRhPercent: 45, toleranceRhPercent: 5 }).returning();
  ids.other = other.id;
});
afterAll(() => closeDb());

const edit = (over: Record<string, string> = {}, role: "lead" | "researcher" | "technician" | "observer" = "researcher") =>
  updateLocationAction.withIdentity(a.as(role), { locationId: ids.cab, name: "Cabinet F", locationKind: "cabinet", keeperId: "", alertAfterHours: "6", ...over });

describe("updateLocationAction", () => {
  it("starts from the values given at creation: no keeper, the default 6 h", async () => {
    expect(await row(ids.cab)).toMatchObject({ name: "Cabinet F", locationKind: "cabinet", keeperId: null, alertAfterHours: 6, parentId: ids.store });
  });

  it("saves name, kind, keeper and alert delay with one audit event; the parent stays; the stored status is forgotten", async () => {
    await refreshLocationStatuses({ labId: a.labId, locationIds: [ids.cab] });
    expect(await stored(ids.cab)).not.toBeNull();
    const before = await row(ids.cab);
    const r = await edit({ name: "  Cabinet F (north wall) ", locationKind: "case", keeperId: a.users.technician.id, alertAfterHours: "12.5" });
    expect(r).toMatchObject({ ok: true, message: 'Location "Cabinet F (north wall)" saved.' });
    const after = await row(ids.cab);
    expect(after).toMatchObject({ name: "Cabinet F (north wall)", locationKind: "case", keeperId: a.users.technician.id, alertAfterHours: 12.5, parentId: ids.store });
    // Everything else of the chamber row is as it was.
    expect({ ...after, name: before.name, locationKind: before.locationKind, keeperId: before.keeperId, alertAfterHours: before.alertAfterHours, updatedAt: before.updatedAt }).toEqual(before);
    const [event] = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, a.labId), eq(s.auditEvents.entityId, ids.cab))).orderBy(desc(s.auditEvents.id)).limit(1);
    expect(event).toMatchObject({ entity: "chamber", action: "update", userId: a.users.researcher.id, summary: 'Storage location "Cabinet F (north wall)" edited' });
    expect(event.before).toMatchObject({ name: "Cabinet F", locationKind: "cabinet", keeperId: null, alertAfterHours: 6 });
    expect(event.after).toMatchObject({ name: "Cabinet F (north wall)", locationKind: "case", keeperId: a.users.technician.id, alertAfterHours: 12.5 });
    expect(await stored(ids.cab)).toBeNull();
  });

  it("changes the keeper, and clears it when none is chosen", async () => {
    expect((await edit({ name: "Cabinet F (north wall)", locationKind: "case", keeperId: a.users.lead.id, alertAfterHours: "12.5" }, "lead")).ok).toBe(true);
    expect((await row(ids.cab)).keeperId).toBe(a.users.lead.id);
    expect((await edit({ name: "Cabinet F (north wall)", locationKind: "case", keeperId: "", alertAfterHours: "12.5" })).ok).toBe(true);
    expect(await row(ids.cab)).toMatchObject({ keeperId: null, alertAfterHours: 12.5, locationKind: "case", parentId: ids.store });
  });

  it("refuses bad input with the field's message and changes nothing", async () => {
    const before = await row(ids.cab);
    const count = (await audits()).length;
    await refreshLocationStatuses({ labId: a.labId, locationIds: [ids.cab] });
    const cases: [Record<string, string>, Record<string, unknown>][] = [
      [{ alertAfterHours: "0" }, { errors: { alertAfterHours: ["The alert delay must be at least 0.5 h."] } }],
      [{ alertAfterHours: "-4" }, { errors: { alertAfterHours: ["The alert delay must be at least 0.5 h."] } }],
      [{ alertAfterHours: "six" }, { errors: { alertAfterHours: ["Enter the alert delay in hours."] } }],
      [{ alertAfterHours: "" }, { errors: { alertAfterHours: ["Enter the alert delay in hours."] } }],
      [{ alertAfterHours: "721" }, { errors: { alertAfterHours: ["The alert delay must be at most 720 h (30 days)."] } }],
      [{ name: "   " }, { errors: { name: ["Name the chamber."] } }],
      [{ locationKind: "trial-jar" }, { errors: { locationKind: ["Choose what kind of place this is."] } }],
      [{ keeperId: "not-an-id" }, { errors: { keeperId: ["Choose the keeper from the lab's members."] } }],
      // A member of another lab only.
      [{ keeperId: b.users.lead.id }, { code: "invalid", errors: { keeperId: ["Choose a member of this lab."] } }],
      [{ locationId: ids.jar }, { code: "invalid", errors: { locationId: ["Choose a storage location, not a trial jar."] } }],
      [{ locationId: ids.other }, { code: "not-found" }],
    ];
    for (const [over, answer] of cases) {
      const r = await edit({ name: "Renamed", alertAfterHours: "3", ...over });
      expect(r, JSON.stringify(over)).toMatchObject({ ok: false, ...answer });
    }
    expect(await row(ids.cab)).toEqual(before);
    expect((await row(ids.jar)).name).toBe("Jar 33");
    expect((await row(ids.other)).name).toBe("B cabinet");
    expect((await audits()).length).toBe(count);
    // Nothing was written, so the stored count still stands.
    expect(await stored(ids.cab)).not.toBeNull();
  });

  it("is refused to roles without chambers.write", async () => {
    const before = await row(ids.cab);
    for (const role of ["technician", "observer"] as const) {
      expect(await edit({ name: "Taken over" }, role)).toMatchObject({ ok: false, code: "forbidden" });
    }
    expect(await row(ids.cab)).toEqual(before);
  });

  it("edits an archived location like the chamber edit does (archiving hides, it does not freeze settings)", async () => {
    const made = await createLocationAction.withIdentity(a.as("lead"), place("Old case", "case", ids.store));
    const id = (made.data as { id: string }).id;
    await setChamberArchived({ labId: a.labId, userId: a.users.lead.id, chamberId: id, archived: true });
    const r = await updateLocationAction.withIdentity(a.as("lead"), { locationId: id, name: "Old case (emptied)", locationKind: "case", keeperId: "", alertAfterHours: "24" });
    expect(r.ok, r.message).toBe(true);
    expect(await row(id)).toMatchObject({ name: "Old case (emptied)", alertAfterHours: 24 });
    expect((await row(id)).archivedAt).not.toBeNull();
  });
});
