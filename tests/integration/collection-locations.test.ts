// Storage locations and object moves on the real database: the tree refuses cycles (queries and the
// database trigger), moves are audited in the same transaction, stays match a direct recomputation,
// an object in two places is refused by the database itself, and another lab's rows are not found.
import { and, asc, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createLocationAction, moveObjectAction, reparentLocationAction } from "@/app/_actions/collection";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { addDesiccantEvent, addHygrometerCheck, createChamberToken, setChamberArchived } from "@/db/queries/chambers";
import { listLocationTree } from "@/db/queries/locations";
import { listObjectStays } from "@/db/queries/object-locations";
import { postReadingsWithToken } from "@/db/queries/readings";
import { flattenTree } from "@/lib/collection/locations";
import { createTestLab, type TestLab } from "../support/db";

let a: TestLab;
let b: TestLab;
const ids: Record<string, string> = {};
const place = (name: string, locationKind: string, parentId = "", extra: Record<string, string> = {}) =>
  ({ name, locationKind, parentId, kind: "open-shelf", nominalTempC: "18", setpointRhPercent: "45", toleranceRhPercent: "5", ...extra });
const pgCode = (e: unknown) => (e as { code?: string }).code ?? (e as { cause?: { code?: string } }).cause?.code;

beforeAll(async () => {
  a = await createTestLab("Collection A");
  b = await createTestLab("Collection B");
  for (const [key, input] of [
    ["store", place("Store 2", "room")],
    ["cab", () => place("Cabinet B", "cabinet", ids.store)],
    ["drawer", () => place("Drawer 3", "drawer", ids.cab)],
    ["box", () => place("Box 14", "sealed-box", ids.drawer, { kind: "desiccant", desiccantKind: "silica-gel", desiccantMassG: "250", setpointRhPercent: "15" })],
  ] as const) {
    const r = await createLocationAction.withIdentity(a.as("researcher"), typeof input === "function" ? input() : input);
    expect(r.ok, r.message).toBe(true);
    ids[key] = (r.data as { id: string }).id;
  }
  const [other] = await db.insert(s.chambers).values({ labId: b.labId, name: "B room", kind: "open-shelf", locationKind: "room", nominalTempC: 18, setpointRhPercent: 45, toleranceRhPercent: 5 }).returning();
  ids.otherRoom = other.id;
  const [jar] = await db.insert(s.chambers).values({ labId: a.labId, name: "Jar 75", kind: "saturated-salt", saltId: "NaCl", nominalTempC: 20, setpointRhPercent: 75.5, toleranceRhPercent: 2 }).returning();
  ids.jar = jar.id;
  for (const label of ["OBJ-1", "OBJ-2"]) {
    const [sp] = await db.insert(s.specimens).values({ labId: a.labId, label, materialClass: "archaeological-iron", accessionNumber: `TAR.${label}` }).returning();
    ids[label] = sp.id;
  }
  const [bs] = await db.insert(s.specimens).values({ labId: b.labId, label: "B-OBJ", materialClass: "other" }).returning();
  ids.bObj = bs.id;
});
afterAll(() => closeDb());

describe("location tree", () => {
  it("nests rooms, cabinets, drawers and boxes with their microclimate kind", async () => {
    const flat = flattenTree(await listLocationTree({ labId: a.labId }));
    expect(flat.map((n) => [n.path.join(" / "), n.locationKind, n.kind])).toEqual([
      ["Store 2", "room", "open-shelf"],
      ["Store 2 / Cabinet B", "cabinet", "open-shelf"],
      ["Store 2 / Cabinet B / Drawer 3", "drawer", "open-shelf"],
      ["Store 2 / Cabinet B / Drawer 3 / Box 14", "sealed-box", "desiccant"],
    ]);
    // Trial jars are chambers too but not part of the storage tree.
    expect(flat.some((n) => n.id === ids.jar)).toBe(false);
  });

  it("refuses a cycle with a message at the parent field and changes nothing", async () => {
    const before = await db.select().from(s.chambers).where(eq(s.chambers.id, ids.cab));
    const r = await reparentLocationAction.withIdentity(a.as("lead"), { locationId: ids.cab, parentId: ids.box });
    expect(r).toMatchObject({ ok: false, errors: { parentId: ["Choose a location that is not this one or inside it."] } });
    const self = await reparentLocationAction.withIdentity(a.as("lead"), { locationId: ids.cab, parentId: ids.cab });
    expect(self.ok).toBe(false);
    expect(await db.select().from(s.chambers).where(eq(s.chambers.id, ids.cab))).toEqual(before);
  });

  it("refuses a cycle in the database too (trigger), whatever the writer", async () => {
    const err = await db.update(s.chambers).set({ parentId: ids.box }).where(eq(s.chambers.id, ids.store)).catch((e) => e);
    expect(pgCode(err)).toBe("23514");
    expect(String((err as { cause?: { constraint?: string } }).cause?.constraint ?? (err as { constraint?: string }).constraint)).toBe("chambers_tree_cycle");
    const cross = await db.update(s.chambers).set({ parentId: ids.otherRoom }).where(eq(s.chambers.id, ids.store)).catch((e) => e);
    expect(pgCode(cross)).toBe("23514");
  });

  it("answers not-found for another lab's parent and refuses a trial jar as parent", async () => {
    const foreign = await createLocationAction.withIdentity(a.as("researcher"), place("Intruder", "sealed-box", ids.otherRoom));
    expect(foreign).toMatchObject({ ok: false, code: "not-found" });
    const jar = await createLocationAction.withIdentity(a.as("researcher"), place("In a jar", "sealed-box", ids.jar));
    expect(jar).toMatchObject({ ok: false, errors: { parentId: ["Choose a storage location, not a trial jar."] } });
    const keeper = await createLocationAction.withIdentity(a.as("researcher"), { ...place("Kept", "case", ids.store), keeperId: b.users.lead.id });
    expect(keeper).toMatchObject({ ok: false, errors: { keeperId: ["Choose a member of this lab."] } });
    expect(await db.select().from(s.chambers).where(and(eq(s.chambers.labId, a.labId), sql`${s.chambers.name} in ('Intruder', 'In a jar', 'Kept')`))).toEqual([]);
  });

  it("shares the chamber climate record: a logger posts to a box, not to an archived one", async () => {
    const { token } = await createChamberToken({ labId: a.labId, userId: a.users.researcher.id, chamberId: ids.box, label: "box logger" });
    const res = await postReadingsWithToken({ token, chamberId: ids.box, body: [{ takenAt: "2025-06-01T10:00:00Z", rhPercent: 14.2, tempC: 18.1 }] });
    expect(res).toMatchObject({ received: 1, stored: 1 });
    // Desiccant upkeep and hygrometer checks are the chamber ones too.
    const charge = await addDesiccantEvent({ labId: a.labId, userId: a.users.technician.id, chamberId: ids.box, kind: "charged", at: new Date("2025-06-01T09:00:00Z"), massG: 250, notes: "fresh gel" });
    expect(charge).toMatchObject({ chamberId: ids.box, kind: "charged", massG: 250 });
    await expect(addDesiccantEvent({ labId: a.labId, userId: a.users.technician.id, chamberId: ids.store, kind: "charged", at: new Date("2025-06-01T09:00:00Z"), notes: "" })).rejects.toMatchObject({ message: "This chamber does not use a desiccant." });
    const check = await addHygrometerCheck({ labId: a.labId, userId: a.users.technician.id, chamberId: ids.box, values: { instrument: "logger", saltId: "NaCl", tempC: 20, readingRhPercent: 77, checkedAt: new Date("2025-06-02T09:00:00Z"), apply: false, notes: "" } });
    // Greenspan 1977, "Humidity fixed points of binary saturated aqueous solutions", Table 1: NaCl 75.47 %RH at
    // 20 °C (from memory), so a 77 %RH reading is about 1.5 %RH high.
    expect(check.offsetRhPercent).toBeCloseTo(77 - 75.47, 1);
    const archived = await createLocationAction.withIdentity(a.as("researcher"), place("Old shelf", "case", ids.store));
    const archivedId = (archived.data as { id: string }).id;
    const t2 = await createChamberToken({ labId: a.labId, userId: a.users.researcher.id, chamberId: archivedId, label: "old" });
    await setChamberArchived({ labId: a.labId, userId: a.users.researcher.id, chamberId: archivedId, archived: true });
    await expect(postReadingsWithToken({ token: t2.token, chamberId: archivedId, body: [{ takenAt: "2025-06-01T10:00:00Z", rhPercent: 40 }] })).rejects.toMatchObject({ code: "conflict" });
    ids.archived = archivedId;
  });
});

describe("object moves", () => {
  const moves = [
    { to: "store", at: "2025-01-01T00:00" },
    { to: "box", at: "2025-01-03T06:00" },
    { to: "drawer", at: "2025-01-05T12:30" },
  ];

  it("records each move with its audit event; stays and time per place equal a direct computation", async () => {
    for (const m of moves) {
      const r = await moveObjectAction.withIdentity(a.as("technician"), { specimenId: ids["OBJ-1"], locationId: ids[m.to], at: m.at, timeZone: "UTC", reason: "rehousing" });
      expect(r.ok, r.message).toBe(true);
    }
    const stays = await db.select().from(s.objectLocations).where(eq(s.objectLocations.specimenId, ids["OBJ-1"])).orderBy(asc(s.objectLocations.fromAt));
    // Direct: each stay runs from its move to the next move; the last is open.
    expect(stays.map((x) => [x.locationId, x.fromAt.toISOString(), x.toAt?.toISOString() ?? null])).toEqual(
      moves.map((m, i) => [ids[m.to], new Date(`${m.at}:00Z`).toISOString(), moves[i + 1] ? new Date(`${moves[i + 1].at}:00Z`).toISOString() : null]),
    );
    const audits = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, a.labId), eq(s.auditEvents.entity, "object-location")));
    expect(audits.map((e) => e.entityId).sort()).toEqual(stays.map((x) => x.id).sort());
    const listed = await listObjectStays({ labId: a.labId, userId: a.users.observer.id, specimenId: ids["OBJ-1"] });
    expect(listed.stays[0].path).toBe("Store 2 / Cabinet B / Drawer 3");
  });

  it("refuses bad moves with a message at the field and writes nothing", async () => {
    const count = async () => (await db.select().from(s.objectLocations).where(eq(s.objectLocations.labId, a.labId))).length;
    const before = await count();
    const audits = (await db.select().from(s.auditEvents).where(eq(s.auditEvents.labId, a.labId))).length;
    const move = (over: Record<string, string>) => moveObjectAction.withIdentity(a.as("technician"), { specimenId: ids["OBJ-1"], locationId: ids.store, at: "2025-02-01T00:00", timeZone: "UTC", ...over });
    expect(await move({ at: "2025-01-04T00:00" })).toMatchObject({ ok: false, errors: { at: [expect.stringMatching(/after the object arrived/)] } });
    expect(await move({ locationId: ids.drawer })).toMatchObject({ ok: false, errors: { locationId: ["The object is already there."] } });
    expect(await move({ locationId: ids.archived })).toMatchObject({ ok: false, errors: { locationId: ["This location is archived."] } });
    expect(await move({ locationId: ids.jar })).toMatchObject({ ok: false, errors: { locationId: ["Choose a storage location, not a trial jar."] } });
    expect(await move({ locationId: ids.otherRoom })).toMatchObject({ ok: false, code: "not-found" });
    expect(await move({ specimenId: ids.bObj })).toMatchObject({ ok: false, code: "not-found" });
    expect(await move({ at: "not a time" })).toMatchObject({ ok: false, errors: { at: [expect.any(String)] } });
    expect(await moveObjectAction.withIdentity(a.as("observer"), { specimenId: ids["OBJ-1"], locationId: ids.store, at: "2025-02-01T00:00" })).toMatchObject({ ok: false, code: "forbidden" });
    expect(await count()).toBe(before);
    expect((await db.select().from(s.auditEvents).where(eq(s.auditEvents.labId, a.labId))).length).toBe(audits);
  });

  it("the database refuses an object in two places at once, and a stay in another lab's location", async () => {
    const base = { labId: a.labId, specimenId: ids["OBJ-2"] };
    await db.insert(s.objectLocations).values({ ...base, locationId: ids.store, fromAt: new Date("2025-01-01T00:00:00Z"), toAt: new Date("2025-01-10T00:00:00Z") });
    const overlap = await db.insert(s.objectLocations).values({ ...base, locationId: ids.box, fromAt: new Date("2025-01-09T00:00:00Z"), toAt: new Date("2025-01-12T00:00:00Z") }).catch((e) => e);
    expect(pgCode(overlap)).toBe("23P01"); // exclusion_violation (btree_gist)
    await db.insert(s.objectLocations).values({ ...base, locationId: ids.box, fromAt: new Date("2025-01-10T00:00:00Z") });
    const secondOpen = await db.insert(s.objectLocations).values({ ...base, locationId: ids.cab, fromAt: new Date("2025-03-01T00:00:00Z") }).catch((e) => e);
    expect(["23P01", "23505"]).toContain(pgCode(secondOpen));
    const foreign = await db.insert(s.objectLocations).values({ ...base, locationId: ids.otherRoom, fromAt: new Date("2024-01-01T00:00:00Z"), toAt: new Date("2024-02-01T00:00:00Z") }).catch((e) => e);
    expect(pgCode(foreign)).toBe("23514");
    const stays = await db.select().from(s.objectLocations).where(eq(s.objectLocations.specimenId, ids["OBJ-2"]));
    expect(stays).toHaveLength(2);
  });

  it("serialises concurrent moves of one object: never two open stays, never an overlap", async () => {
    const [sp] = await db.insert(s.specimens).values({ labId: a.labId, label: "RACE-1", materialClass: "other" }).returning();
    const results = await Promise.all([ids.store, ids.box, ids.cab].map((locationId, i) =>
      moveObjectAction.withIdentity(a.as("technician"), { specimenId: sp.id, locationId, at: `2025-04-0${i + 1}T10:00`, timeZone: "UTC" })));
    expect(results.some((r) => r.ok)).toBe(true);
    const stays = await db.select().from(s.objectLocations).where(eq(s.objectLocations.specimenId, sp.id)).orderBy(asc(s.objectLocations.fromAt));
    expect(stays.filter((x) => x.toAt === null)).toHaveLength(1);
    for (let i = 1; i < stays.length; i++) expect(stays[i - 1].toAt?.getTime()).toBe(stays[i].fromAt.getTime());
    expect(stays).toHaveLength(results.filter((r) => r.ok).length);
  });

  it("serialises concurrent tree changes: two swaps that together would close a loop cannot both pass", async () => {
    const mk = async (name: string) => ((await createLocationAction.withIdentity(a.as("lead"), place(name, "case", ids.store))).data as { id: string }).id;
    const [x, y] = [await mk("Case X"), await mk("Case Y")];
    const r = await Promise.all([
      reparentLocationAction.withIdentity(a.as("lead"), { locationId: x, parentId: y }),
      reparentLocationAction.withIdentity(a.as("lead"), { locationId: y, parentId: x }),
    ]);
    expect(r.filter((q) => q.ok)).toHaveLength(1);
    const rows = await db.select({ id: s.chambers.id, parentId: s.chambers.parentId }).from(s.chambers).where(sql`${s.chambers.id} in (${x}, ${y})`);
    expect(rows.filter((q) => q.parentId === x || q.parentId === y)).toHaveLength(1);
  });

  it("refuses archiving a location that still holds objects or open locations", async () => {
    await expect(setChamberArchived({ labId: a.labId, userId: a.users.lead.id, chamberId: ids.drawer, archived: true })).rejects.toMatchObject({ code: "conflict", message: '"Drawer 3" still holds 1 object(s) and 1 location(s); move them out before archiving it.' });
    expect((await db.select().from(s.chambers).where(eq(s.chambers.id, ids.drawer)))[0].archivedAt).toBeNull();
  });

  it("counts objects per location in the tree", async () => {
    const flat = flattenTree(await listLocationTree({ labId: a.labId }));
    expect(Object.fromEntries(flat.map((n) => [n.name, n.objectCount]))).toMatchObject({ "Drawer 3": 1, "Box 14": 1, "Store 2": 0 });
  });
});
