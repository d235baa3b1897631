// Stored location statuses: the overview and a location's page read counts stored by the last
// computation instead of counting a year of readings per request. Checked here: a stored count equals
// a fresh count; every change of a location's past (readings at or before the count, upkeep, moves,
// register entries, rules, hygrometer checks, the location) forgets it in the database; readings
// appended in rule keep it, a reading above the rule has it counted again; a viewer who scores a
// trial blind gets the locations holding its objects counted for them, and the stored row stays the
// full view. The counts themselves are checked against raw readings in collection-rules.test.ts.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import {
  FORMER_KEEPER, getLocationRuleStatus, listLocationStatuses, refreshLocationStatuses, refreshStaleLocationStatuses, STATUS_MAX_AGE_MS, storedTraces,
} from "@/db/queries/location-status";
import { insertReadings, type NewReading } from "@/db/queries/readings";
import * as s from "@/db/schema";
import { storedCountStands } from "@/lib/collection/rule-status";
import { createTestLab, type TestLab } from "../support/db";

const MIN = 60_000;
const HOUR = 3_600_000;
let lab: TestLab;
let room: typeof s.chambers.$inferSelect;
let box: typeof s.chambers.$inferSelect;
let object: typeof s.specimens.$inferSelect;
const start = new Date(Math.floor(Date.now() / (10 * MIN)) * 10 * MIN - 3 * 24 * HOUR);

/** Every 10 minutes from `from` for `hours` at `rh`. */
function rows(from: Date, hours: number, rh: number): NewReading[] {
  return Array.from({ length: hours * 6 }, (_, i) => ({ takenAt: new Date(from.getTime() + i * 10 * MIN), rhPercent: rh, tempC: 18, dewPointC: null, instrument: "" }));
}
const stored = async (locationId: string) => (await db.select().from(s.locationStatus).where(eq(s.locationStatus.locationId, locationId)))[0] ?? null;

beforeAll(async () => {
  lab = await createTestLab("Stored statuses");
  [room] = await db.insert(s.chambers).values({ labId: lab.labId, name: "Store room", kind: "open-shelf", locationKind: "room", nominalTempC: 18, setpointRhPercent: 40, toleranceRhPercent: 10 }).returning();
  [box] = await db.insert(s.chambers).values({
    labId: lab.labId, name: "Store box", kind: "desiccant", locationKind: "sealed-box", parentId: room.id, keeperId: lab.users.lead.id,
    nominalTempC: 18, setpointRhPercent: 15, toleranceRhPercent: 5,
  }).returning();
  [object] = await db.insert(s.specimens).values({ labId: lab.labId, label: "SS-1", materialClass: "archaeological-iron", findName: "Test find" }).returning();
  await db.insert(s.objectLocations).values({ labId: lab.labId, specimenId: object.id, locationId: box.id, fromAt: new Date(start.getTime() - 24 * HOUR) });
  await db.insert(s.storageRules).values({
    labId: lab.labId, materialClass: "archaeological-iron", treatmentName: "Any treatment", version: 1, thresholdRhPercent: 20, origin: "entered",
    source: "Test rule", sourceDate: "2020-01-01", method: "Entered by hand.", statement: "Keep archaeological iron below 20 %RH.",
  });
  // Two days at 15 %RH with 5 h at 24 %RH between.
  await insertReadings(db, { labId: lab.labId, chamberId: box.id, source: "csv", rows: [...rows(start, 24, 15), ...rows(new Date(start.getTime() + 24 * HOUR), 5, 24), ...rows(new Date(start.getTime() + 29 * HOUR), 19, 15)] });
});
afterAll(async () => {
  await closeDb();
});

describe("whether a stored count still stands", () => {
  const at = new Date("2026-06-01T12:00:00Z");
  const counted = { computedAt: at, thresholdRhPercent: 20, lastAtCountRh: 15 };
  it("stands when nothing was logged since, or only readings in rule, until it is too old", () => {
    expect(storedCountStands(counted, null, new Date(at.getTime() + MIN), STATUS_MAX_AGE_MS)).toBe(true);
    expect(storedCountStands(counted, 19.9, new Date(at.getTime() + MIN), STATUS_MAX_AGE_MS)).toBe(true);
    expect(storedCountStands(counted, null, new Date(at.getTime() + STATUS_MAX_AGE_MS + 1), STATUS_MAX_AGE_MS)).toBe(false);
  });
  it("falls when a reading since is above the rule, when the location was out of rule at the count, or when asked for an earlier time", () => {
    expect(storedCountStands(counted, 20.1, new Date(at.getTime() + MIN), STATUS_MAX_AGE_MS)).toBe(false);
    expect(storedCountStands({ ...counted, lastAtCountRh: 22 }, 15, new Date(at.getTime() + MIN), STATUS_MAX_AGE_MS)).toBe(false);
    expect(storedCountStands({ ...counted, lastAtCountRh: 22 }, null, new Date(at.getTime() + MIN), STATUS_MAX_AGE_MS)).toBe(true);
    expect(storedCountStands(counted, null, new Date(at.getTime() - MIN), STATUS_MAX_AGE_MS)).toBe(false);
  });
});

describe("stored location statuses", () => {
  it("stores what a page counts, and reads back the same as a fresh count", async () => {
    const now = new Date(start.getTime() + 48 * HOUR + 5 * MIN);
    const first = await getLocationRuleStatus({ labId: lab.labId, userId: lab.users.lead.id, locationId: box.id, now });
    const row = await stored(box.id);
    expect(row?.computedAt.getTime()).toBe(now.getTime());
    expect(first.exceedances).toHaveLength(1);
    expect(first.exceedances[0].worstRhPercent).toBe(24);
    expect(first.windows[0].fractionInRule).toBeLessThan(1);
    // Read again a minute later: the stored count, not a new one.
    const later = new Date(now.getTime() + MIN);
    const again = await getLocationRuleStatus({ labId: lab.labId, userId: lab.users.lead.id, locationId: box.id, now: later });
    expect(again.computedAt.getTime()).toBe(now.getTime());
    expect({ ...again, needs: undefined }).toEqual({ ...first, needs: undefined });
    // The overview row agrees with the page.
    const list = await listLocationStatuses({ labId: lab.labId, userId: lab.users.lead.id, now: later });
    const mine = list.find((x) => x.location.id === box.id)!;
    expect(mine.windows.map((w) => w.fractionInRule)).toEqual(first.windows.map((w) => w.fractionInRule));
    expect(mine.windows[2].exceedanceCount).toBe(1);
    expect(mine.longestExceedance?.worstRhPercent).toBe(24);
    expect(mine.atRiskCount).toBe(first.atRisk.length);
    expect(mine.trace.length).toBeGreaterThanOrEqual(2); // days with readings
    // Read without the traces (as the overview does), then the shown rows' traces alone: the same.
    const light = (await listLocationStatuses({ labId: lab.labId, userId: lab.users.lead.id, now: later, trace: false })).find((x) => x.location.id === box.id)!;
    expect(light.trace).toEqual([]);
    expect((await storedTraces({ labId: lab.labId, locationIds: [box.id] })).get(box.id)).toEqual(mine.trace);
    // A fresh count at the same time gives the same figures.
    const fresh = (await refreshLocationStatuses({ labId: lab.labId, locationIds: [box.id], now: new Date(now.getTime() + 2 * MIN) })).get(box.id)!;
    expect(fresh.windows.map((w) => w.fractionInRule)).toEqual(first.windows.map((w) => w.fractionInRule));
  });

  it("keeps the count when readings in rule are appended, counts again when one is above the rule", async () => {
    const { computedAt } = (await stored(box.id))!;
    await insertReadings(db, { labId: lab.labId, chamberId: box.id, source: "api", rows: [{ takenAt: new Date(computedAt.getTime() + 10 * MIN), rhPercent: 16, tempC: 18, dewPointC: null, instrument: "" }] });
    expect((await stored(box.id))?.computedAt.getTime()).toBe(computedAt.getTime());
    const now = new Date(computedAt.getTime() + 11 * MIN);
    const kept = await getLocationRuleStatus({ labId: lab.labId, userId: lab.users.lead.id, locationId: box.id, now });
    expect(kept.computedAt.getTime()).toBe(computedAt.getTime());
    expect(kept.lastReading?.rhPercent).toBe(16); // the last reading is read live
    await insertReadings(db, { labId: lab.labId, chamberId: box.id, source: "api", rows: [{ takenAt: new Date(computedAt.getTime() + 20 * MIN), rhPercent: 23, tempC: 18, dewPointC: null, instrument: "" }] });
    const after = new Date(computedAt.getTime() + 21 * MIN);
    const recounted = await getLocationRuleStatus({ labId: lab.labId, userId: lab.users.lead.id, locationId: box.id, now: after });
    expect(recounted.computedAt.getTime()).toBe(after.getTime());
    expect(recounted.needs).toContain("out-of-rule-now");
    expect(recounted.exceedances).toHaveLength(2);
  });

  it("forgets a location's count when its past changes, whatever the writer", async () => {
    const recount = () => refreshLocationStatuses({ labId: lab.labId, locationIds: [box.id], now: new Date(Date.now() + 60 * MIN) });
    const forgotten = async (change: () => Promise<unknown>) => {
      await recount();
      expect(await stored(box.id)).not.toBeNull();
      await change();
      return (await stored(box.id)) === null;
    };
    // A reading before the count (a late import) and a reading deleted.
    expect(await forgotten(() => insertReadings(db, { labId: lab.labId, chamberId: box.id, source: "csv", rows: [{ takenAt: new Date(start.getTime() - HOUR), rhPercent: 15, tempC: 18, dewPointC: null, instrument: "" }] }))).toBe(true);
    expect(await forgotten(() => db.delete(s.readings).where(and(eq(s.readings.chamberId, box.id), eq(s.readings.takenAt, new Date(start.getTime() - HOUR)))))).toBe(true);
    expect(await forgotten(() => db.insert(s.desiccantEvents).values({ labId: lab.labId, chamberId: box.id, kind: "charged", at: start, massG: 500 }))).toBe(true);
    expect(await forgotten(() => db.update(s.specimens).set({ treatmentsApplied: "Wax coat" }).where(eq(s.specimens.id, object.id)))).toBe(true);
    expect(await forgotten(() => db.update(s.chambers).set({ setpointRhPercent: 14 }).where(eq(s.chambers.id, box.id)))).toBe(true);
    expect(await forgotten(() => db.update(s.storageRules).set({ statement: "Keep archaeological iron below 20 %RH, checked." }).where(eq(s.storageRules.labId, lab.labId)))).toBe(true);
    expect(await forgotten(() => db.insert(s.hygrometerChecks).values({
      labId: lab.labId, instrument: "", saltId: "LiCl", tempC: 20, checkedAt: start, readingRhPercent: 12, referenceRhPercent: 11.3, offsetRhPercent: -0.7, applied: false,
    }))).toBe(true);
    // A move: the object leaves the box.
    expect(await forgotten(async () => {
      await db.update(s.objectLocations).set({ toAt: new Date() }).where(and(eq(s.objectLocations.specimenId, object.id)));
      await db.insert(s.objectLocations).values({ labId: lab.labId, specimenId: object.id, locationId: room.id, fromAt: new Date(Date.now() + 1000) });
    })).toBe(true);
    // The room that received the object forgets too; moving back restores the box's rule.
    await refreshLocationStatuses({ labId: lab.labId, locationIds: [room.id], now: new Date() });
    await db.update(s.objectLocations).set({ toAt: new Date(Date.now() + 2000) }).where(and(eq(s.objectLocations.specimenId, object.id), eq(s.objectLocations.locationId, room.id)));
    expect(await stored(room.id)).toBeNull();
    await db.insert(s.objectLocations).values({ labId: lab.labId, specimenId: object.id, locationId: box.id, fromAt: new Date(Date.now() + 3000) });
  });

  it("counts for a blind scorer the locations holding an object of their trial, and leaves the stored full view alone", async () => {
    await db.update(s.specimens).set({ treatmentsApplied: "" }).where(eq(s.specimens.id, object.id));
    const now = new Date(Date.now() + 5000);
    const full = await getLocationRuleStatus({ labId: lab.labId, userId: lab.users.lead.id, locationId: box.id, now });
    expect(full.objectCount).toBe(1);
    expect(full.rule?.thresholdRhPercent).toBe(20);
    const [jar] = await db.insert(s.chambers).values({ labId: lab.labId, name: "Trial jar", kind: "saturated-salt", saltId: "MgCl2", nominalTempC: 20, setpointRhPercent: 33, toleranceRhPercent: 2 }).returning();
    const [tr] = await db.insert(s.treatments).values({ labId: lab.labId, name: "Wax coat", kind: "coating" }).returning();
    const [trial] = await db.insert(s.trials).values({ labId: lab.labId, title: "Blind jar trial", question: "?", status: "running", schedulePlan: { kind: "custom", days: [0] } as never }).returning();
    await db.insert(s.trialMembers).values({ trialId: trial.id, userId: lab.users.technician.id, labId: lab.labId, role: "scorer", blind: true });
    await db.insert(s.placements).values({ labId: lab.labId, trialId: trial.id, specimenId: object.id, chamberId: jar.id, treatmentId: tr.id, fromAt: new Date("2025-02-01T00:00:00Z") });
    const before = await stored(box.id);
    const blind = await getLocationRuleStatus({ labId: lab.labId, userId: lab.users.technician.id, locationId: box.id, now: new Date(now.getTime() + 1000) });
    expect(blind.objectCount).toBe(0);
    expect(blind.rule).toBeNull();
    expect(blind.atRisk).toEqual([]);
    const rows = await listLocationStatuses({ labId: lab.labId, userId: lab.users.technician.id, now: new Date(now.getTime() + 1000) });
    expect(rows.find((r) => r.location.id === box.id)?.objectCount).toBe(0);
    expect(await stored(box.id)).toEqual(before);
    // The lead still reads the stored full view.
    expect((await getLocationRuleStatus({ labId: lab.labId, userId: lab.users.lead.id, locationId: box.id, now: new Date(now.getTime() + 1000) })).objectCount).toBe(1);
  });

  it("counts for a blind scorer a location whose object takes a rule resting on their trial, also when no count was stored", async () => {
    const [trial] = await db.select().from(s.trials).where(and(eq(s.trials.labId, lab.labId), eq(s.trials.title, "Blind jar trial")));
    const [shelf] = await db.insert(s.chambers).values({ labId: lab.labId, name: "Shelf box", kind: "open-shelf", locationKind: "sealed-box", parentId: room.id, nominalTempC: 18, setpointRhPercent: 30, toleranceRhPercent: 5 }).returning();
    const [meteorite] = await db.insert(s.specimens).values({ labId: lab.labId, label: "SS-2", materialClass: "iron-meteorite", findName: "Test find" }).returning();
    await db.insert(s.objectLocations).values({ labId: lab.labId, specimenId: meteorite.id, locationId: shelf.id, fromAt: new Date(start.getTime() - 24 * HOUR) });
    await db.insert(s.storageRules).values([
      { labId: lab.labId, materialClass: "iron-meteorite", treatmentName: "Any treatment", version: 1, thresholdRhPercent: 30, origin: "entered", source: "Test rule", sourceDate: "2020-01-01", method: "Entered by hand.", statement: "Keep iron meteorites below 30 %RH." },
      { labId: lab.labId, materialClass: "iron-meteorite", treatmentName: "Wax coat", version: 1, thresholdRhPercent: 12, origin: "trial", shareRusted: 0.1, horizonDays: 90, method: "From the blind trial.", statement: "Keep waxed iron meteorites below 12 %RH.", sourceTrialIds: [trial.id] },
    ]);
    await db.update(s.specimens).set({ treatmentsApplied: "Wax coat" }).where(eq(s.specimens.id, meteorite.id));
    const at = new Date(Date.now() + 20_000);
    expect(await stored(shelf.id)).toBeNull();
    // The scorer reads first: the full-view count made for them names the trial's rule, so theirs is counted apart.
    const blind = await getLocationRuleStatus({ labId: lab.labId, userId: lab.users.technician.id, locationId: shelf.id, now: at });
    expect(blind.rule?.thresholdRhPercent).toBe(30);
    const listed = (await listLocationStatuses({ labId: lab.labId, userId: lab.users.technician.id, now: at })).find((r) => r.location.id === shelf.id);
    expect(listed?.rule?.thresholdRhPercent).toBe(30);
    expect((await stored(shelf.id))?.thresholdRhPercent).toBe(12);
    expect((await getLocationRuleStatus({ labId: lab.labId, userId: lab.users.lead.id, locationId: shelf.id, now: at })).rule?.thresholdRhPercent).toBe(12);
    await db.update(s.chambers).set({ archivedAt: new Date() }).where(eq(s.chambers.id, shelf.id)); // out of the scan below
  });

  it("the scan's refresh counts every storage location not counted in the last minutes, and nothing when all are recent", async () => {
    const now = new Date(Date.now() + 10_000);
    const n = await refreshStaleLocationStatuses({ labId: lab.labId, now, maxAgeMs: 0 });
    expect(n).toBe(2); // the room and the box; the trial jar is not a storage location
    expect(await refreshStaleLocationStatuses({ labId: lab.labId, now: new Date(now.getTime() + MIN) })).toBe(0);
  });

  it("names a keeper who has left the lab as a former member, as the alerts (which skip them) treat them", async () => {
    const now = new Date(Date.now() + 30_000);
    expect((await getLocationRuleStatus({ labId: lab.labId, userId: lab.users.lead.id, locationId: box.id, now })).keeperName).toBe(`lead ${lab.users.lead.email.split("-")[1].split("@")[0]}`);
    await db.delete(s.memberships).where(and(eq(s.memberships.labId, lab.labId), eq(s.memberships.userId, lab.users.observer.id)));
    await db.update(s.chambers).set({ keeperId: lab.users.observer.id }).where(eq(s.chambers.id, box.id));
    expect((await getLocationRuleStatus({ labId: lab.labId, userId: lab.users.lead.id, locationId: box.id, now })).keeperName).toBe(FORMER_KEEPER);
    expect((await listLocationStatuses({ labId: lab.labId, userId: lab.users.lead.id, now })).find((r) => r.location.id === box.id)?.keeperName).toBe(FORMER_KEEPER);
  });
});
