import "server-only";
import { and, asc, desc, eq, gte, inArray, isNull, sql } from "drizzle-orm";
import { isStorageKind } from "@/lib/collection/locations";
import {
  locationNeeds, locationRule, needRank, ruleBand, TIME_IN_RULE_DAYS, timeInRuleOf, type LocationNeed, type TimeInRule,
} from "@/lib/collection/rule-status";
import type { Excursion } from "@/lib/climate/band-stats";
import { desiccantStatus } from "@/lib/humidity/desiccant-status";
import { db } from "../client";
import { chambers, desiccantEvents, objectLocations, readingBlocks, readings, specimens, storageRules, users } from "../schema";
import { getChamber, type Chamber } from "./chambers";
import { locationPaths } from "./locations";
import { hiddenObjectIds } from "./object-locations";
import { getBandWindowStats } from "./readings-series";
import { listStorageRules, type StorageRuleView } from "./storage-rules";

const DAY_MS = 86_400_000;
/** The overview flags a location out of rule for more than this share of the last 30 days (default). */
export const DEFAULT_OUT_OF_RULE_SHARE = 0.05;

export type ObjectAtRisk = { id: string; label: string; accessionNumber: string | null; thresholdRhPercent: number; ruleStatement: string };
export type LocationRuleStatus = {
  location: Chamber;
  keeperName: string | null;
  objectCount: number;
  /** The strictest rule of the objects held now; null when none of them has one. */
  rule: StorageRuleView | null;
  windows: TimeInRule[];
  /** Exceedances of the last 365 days, latest first. */
  exceedances: Excursion[];
  /** Highest RH of the last 30 days (as counted for time in rule). */
  max30dRhPercent: number | null;
  /** Objects whose own rule the last 30 days exceeded. */
  atRisk: ObjectAtRisk[];
  lastReading: { takenAt: Date; rhPercent: number } | null;
  /** The desiccant's projected exhaustion with the rule's threshold as the RH it must hold (desiccant locations only). */
  desiccantDueAt: Date | null;
  needs: LocationNeed[];
};

type Held = { id: string; label: string; accessionNumber: string | null; materialClass: string; treatmentsApplied: string };

/**
 * The rule each storage location takes now: the strictest current rule of the objects it holds
 * (rules read without a viewer, for the alert scan; pages pass the viewer's rules).
 */
export async function rulesOfLocations<R extends typeof storageRules.$inferSelect>({ labId, locationIds, rules }: { labId: string; locationIds: readonly string[]; rules?: readonly R[] }) {
  const [current, held] = await Promise.all([
    rules ?? db.select().from(storageRules).where(and(eq(storageRules.labId, labId), isNull(storageRules.supersededAt))),
    heldObjects(labId, locationIds),
  ]);
  const out = new Map<string, (typeof current)[number]>();
  for (const id of locationIds) {
    const { rule } = locationRule(held.get(id) ?? [], current);
    if (rule) out.set(id, rule);
  }
  return out;
}

async function heldObjects(labId: string, locationIds: readonly string[]) {
  if (locationIds.length === 0) return new Map<string, Held[]>();
  const rows = await db.select({
    locationId: objectLocations.locationId, id: specimens.id, label: specimens.label, accessionNumber: specimens.accessionNumber,
    materialClass: specimens.materialClass, treatmentsApplied: specimens.treatmentsApplied,
  }).from(objectLocations).innerJoin(specimens, eq(specimens.id, objectLocations.specimenId))
    .where(and(eq(objectLocations.labId, labId), isNull(objectLocations.toAt), inArray(objectLocations.locationId, [...locationIds])))
    .orderBy(asc(specimens.label));
  const out = new Map<string, Held[]>();
  for (const r of rows) out.set(r.locationId, [...(out.get(r.locationId) ?? []), r]);
  return out;
}

/**
 * How one storage location keeps the lab's storage rules: its rule (the strictest of its objects'),
 * time in rule over 7, 30 and 365 days, exceedances, objects at risk and the desiccant forecast.
 * Time in rule is counted as the chamber page counts time in band (getBandWindowStats).
 */
export async function getLocationRuleStatus({ labId, userId, locationId, now = new Date(), outOfRuleShare = DEFAULT_OUT_OF_RULE_SHARE, shared }: {
  labId: string; userId: string; locationId: string; now?: Date; outOfRuleShare?: number;
  /** What every location of a list shares, loaded once by listLocationStatuses. */
  shared?: { rules: StorageRuleView[]; hidden: Set<string>; held: Map<string, Held[]> };
}): Promise<LocationRuleStatus> {
  const location = await getChamber({ labId, chamberId: locationId });
  const [rules, allHeld, hidden, keeper, last, events] = await Promise.all([
    shared?.rules ?? listStorageRules({ labId, userId }).then((r) => r.filter((x) => x.current)),
    shared ? shared.held.get(locationId) ?? [] : heldObjects(labId, [locationId]).then((m) => m.get(locationId) ?? []),
    shared?.hidden ?? hiddenObjectIds({ labId, userId }),
    location.keeperId ? db.select({ name: users.name }).from(users).where(eq(users.id, location.keeperId)) : Promise.resolve([]),
    db.select({ takenAt: readings.takenAt, rhPercent: readings.rhPercent }).from(readings)
      .where(and(eq(readings.labId, labId), eq(readings.chamberId, locationId))).orderBy(desc(readings.takenAt)).limit(1),
    location.kind === "desiccant" ? db.select().from(desiccantEvents).where(and(eq(desiccantEvents.labId, labId), eq(desiccantEvents.chamberId, locationId))) : Promise.resolve([]),
  ]);
  // Objects whose place the viewer may not see (a trial scored blind) count for nothing on this page.
  const held = allHeld.filter((o) => !hidden.has(o.id));
  const { perObject: objectRules, rule } = locationRule(held, rules);
  const windows: TimeInRule[] = [];
  let exceedances: Excursion[] = [];
  let max30: number | null = null;
  if (rule) {
    const band = ruleBand(rule.thresholdRhPercent);
    const stats = await Promise.all(TIME_IN_RULE_DAYS.map((days) =>
      getBandWindowStats({ labId, chamberId: locationId, band, from: new Date(now.getTime() - days * DAY_MS), to: now })));
    TIME_IN_RULE_DAYS.forEach((days, i) => {
      // The stand-in readings of the summaries give the same counts as every reading would (tests/integration/chambers-climate-sql).
      windows.push(timeInRuleOf(stats[i], days));
    });
    exceedances = [...stats[TIME_IN_RULE_DAYS.length - 1].excursions].reverse();
    max30 = stats[1].maxRhPercent;
  }
  const atRisk = objectRules
    .filter((x) => x.rule && max30 !== null && max30 > x.rule.thresholdRhPercent)
    .map((x) => ({ id: x.object.id, label: x.object.label, accessionNumber: x.object.accessionNumber, thresholdRhPercent: x.rule!.thresholdRhPercent, ruleStatement: x.rule!.statement }));
  let desiccantDueAt: Date | null = null;
  if (location.kind === "desiccant") {
    const holdAt = rule ? rule.thresholdRhPercent : location.setpointRhPercent;
    desiccantDueAt = desiccantStatus({ ...location, setpointRhPercent: holdAt }, events).exhaustionAt;
  }
  const lastReading = last[0] ?? null;
  const needs = locationNeeds({
    now, thresholdRhPercent: rule?.thresholdRhPercent ?? null, lastReading, fractionInRule30d: windows[1]?.fractionInRule ?? null,
    outOfRuleShareLimit: outOfRuleShare, desiccantDueAt,
  });
  return {
    location, keeperName: keeper[0]?.name ?? null, objectCount: held.length, rule, windows, exceedances,
    max30dRhPercent: max30, atRisk, lastReading, desiccantDueAt, needs: held.length === 0 ? needs.filter((n) => n !== "no-rule") : needs,
  };
}

/** Every storage location of the lab (archived left out) with its rule status, most in need first. */
export async function listLocationStatuses({ labId, userId, now = new Date(), outOfRuleShare = DEFAULT_OUT_OF_RULE_SHARE }: {
  labId: string; userId: string; now?: Date; outOfRuleShare?: number;
}) {
  const rows = await db.select({ id: chambers.id, locationKind: chambers.locationKind }).from(chambers)
    .where(and(eq(chambers.labId, labId), isNull(chambers.archivedAt)));
  const ids = rows.filter((r) => isStorageKind(r.locationKind)).map((r) => r.id);
  const [rules, hidden, held] = await Promise.all([
    listStorageRules({ labId, userId }).then((r) => r.filter((x) => x.current)), hiddenObjectIds({ labId, userId }), heldObjects(labId, ids),
  ]);
  const [statuses, traces, paths] = await Promise.all([
    Promise.all(ids.map((locationId) => getLocationRuleStatus({ labId, userId, locationId, now, outOfRuleShare, shared: { rules, hidden, held } }))),
    dailyMaxima({ labId, locationIds: ids, from: new Date(now.getTime() - 30 * DAY_MS) }),
    locationPaths({ labId }),
  ]);
  return statuses
    .map((s) => ({ ...s, path: paths.get(s.location.id)?.path ?? s.location.name, rank: needRank(s.needs), trace: traces.get(s.location.id) ?? [] }))
    .sort((a, b) => a.rank - b.rank || a.path.localeCompare(b.path));
}

/** Highest RH per day of the last days, from the hourly summaries (a small trace per overview row). */
async function dailyMaxima({ labId, locationIds, from }: { labId: string; locationIds: readonly string[]; from: Date }) {
  const out = new Map<string, { day: Date; maxRhPercent: number }[]>();
  if (locationIds.length === 0) return out;
  const day = sql<Date>`date_bin('1 day', ${readingBlocks.blockStart}, timestamptz '1970-01-01 00:00:00+00')`;
  const rows = await db.select({ chamberId: readingBlocks.chamberId, day, maxRh: sql<number>`max(${readingBlocks.maxRhPercent})` }).from(readingBlocks)
    .where(and(eq(readingBlocks.labId, labId), inArray(readingBlocks.chamberId, [...locationIds]), eq(readingBlocks.widthHours, 1), gte(readingBlocks.blockStart, from)))
    .groupBy(readingBlocks.chamberId, day).orderBy(readingBlocks.chamberId, day);
  for (const r of rows) out.set(r.chamberId, [...(out.get(r.chamberId) ?? []), { day: new Date(r.day), maxRhPercent: Number(r.maxRh) }]);
  return out;
}
