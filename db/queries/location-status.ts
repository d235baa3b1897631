import "server-only";
import { and, asc, eq, gte, inArray, isNull, sql } from "drizzle-orm";
import { isStorageKind } from "@/lib/collection/locations";
import {
  locationNeeds, locationRule, storedCountStands, needRank, ruleBand, TIME_IN_RULE_DAYS, timeInRuleOf, type LocationNeed, type TimeInRule,
} from "@/lib/collection/rule-status";
import type { Excursion } from "@/lib/climate/band-stats";
import { desiccantStatus } from "@/lib/humidity/desiccant-status";
import { db } from "../client";
import { chambers, desiccantEvents, locationStatus, objectLocations, readingBlocks, readings, specimens, storageRules } from "../schema";
import type { Chamber } from "./chambers";
import { locationPaths } from "./locations";
import { hiddenObjectIds } from "./object-locations";
import { getBandWindowStats } from "./readings-series";
import { listStorageRules, type StorageRuleView } from "./storage-rules";

const DAY_MS = 86_400_000;
/** The overview flags a location out of rule for more than this share of the last 30 days (default). */
export const DEFAULT_OUT_OF_RULE_SHARE = 0.05;
/**
 * A stored status older than this is counted again when read. The alert scan stores every location's
 * status every 10 minutes, so pages seldom count; readings appended since are looked at on read.
 */
export const STATUS_MAX_AGE_MS = 15 * 60_000;

export type ObjectAtRisk = { id: string; label: string; accessionNumber: string | null; thresholdRhPercent: number; ruleStatement: string };
/** Time in rule over one window, as the overview shows it (the exceedances themselves are in the detail). */
export type WindowSummary = Omit<TimeInRule, "exceedances"> & { exceedanceCount: number };
/** A day (its start, ms since 1970 UTC) and its highest logged RH. */
export type RhTracePoint = { dayMs: number; maxRhPercent: number };

/** How one storage location keeps its rule, for the overview, the CSV and the report. */
export type LocationSummary = {
  location: { id: string; name: string };
  keeperName: string | null;
  objectCount: number;
  /** The strictest rule of the objects held now; null when none of them has one. */
  rule: StorageRuleView | null;
  windows: WindowSummary[];
  /** The longest exceedance of the last 365 days. */
  longestExceedance: Excursion | null;
  /** Highest RH of the last 30 days (as counted for time in rule). */
  max30dRhPercent: number | null;
  atRiskCount: number;
  /** The latest reading as logged, read on every request. */
  lastReading: { takenAt: Date; rhPercent: number } | null;
  /** The desiccant's projected exhaustion with the rule's threshold as the RH it must hold (desiccant locations only). */
  desiccantDueAt: Date | null;
  needs: LocationNeed[];
  /** Highest logged RH per day of the last 30 days. */
  trace: RhTracePoint[];
  /** When time in rule, the exceedances and the objects at risk were counted. */
  computedAt: Date;
};
/** A location's page adds every exceedance and the objects at risk. */
export type LocationRuleStatus = Omit<LocationSummary, "windows"> & {
  windows: (WindowSummary & { exceedances: Excursion[] })[];
  /** Exceedances of the last 365 days, latest first. */
  exceedances: Excursion[];
  /** Objects whose own rule the last 30 days exceeded. */
  atRisk: ObjectAtRisk[];
};

type Held = { id: string; label: string; accessionNumber: string | null; materialClass: string; treatmentsApplied: string };

/** What a computation finds, before the viewer's rules and the live last reading are put to it. */
type Counted = {
  computedAt: Date;
  ruleId: string | null;
  thresholdRhPercent: number | null;
  /** The rule each object here takes (for telling which viewers' results differ). */
  ruleIds: string[];
  objectCount: number;
  windows: WindowSummary[];
  longestExceedance: Excursion | null;
  max30dRhPercent: number | null;
  atRiskCount: number;
  /** Each window's exceedances and the objects at risk (a location's page and the report). */
  detail: { windowExceedances: Excursion[][]; atRisk: ObjectAtRisk[] } | null;
  lastAtCount: { takenAt: Date; rhPercent: number } | null;
  desiccantDueAt: Date | null;
  trace: RhTracePoint[];
};

/** Locations counted at once: each count holds a pooled connection for its snapshot. */
const COUNT_CONCURRENCY = 4;

async function eachLimited<T>(items: readonly T[], limit: number, fn: (item: T) => Promise<void>) {
  let next = 0;
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, async () => {
    while (next < items.length) await fn(items[next++]);
  }));
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
  for (const r of rows) {
    const list = out.get(r.locationId);
    if (list) list.push(r);
    else out.set(r.locationId, [r]);
  }
  return out;
}

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

/** Highest RH per day of the last days, from the hourly summaries (a small trace per overview row). */
async function dailyMaxima({ labId, locationIds, from }: { labId: string; locationIds: readonly string[]; from: Date }) {
  const out = new Map<string, RhTracePoint[]>();
  if (locationIds.length === 0) return out;
  const day = sql<Date>`date_bin('1 day', ${readingBlocks.blockStart}, timestamptz '1970-01-01 00:00:00+00')`;
  const rows = await db.select({ chamberId: readingBlocks.chamberId, day, maxRh: sql<number>`max(${readingBlocks.maxRhPercent})` }).from(readingBlocks)
    .where(and(eq(readingBlocks.labId, labId), inArray(readingBlocks.chamberId, [...locationIds]), eq(readingBlocks.widthHours, 1), gte(readingBlocks.blockStart, from)))
    .groupBy(readingBlocks.chamberId, day).orderBy(readingBlocks.chamberId, day);
  for (const r of rows) out.set(r.chamberId, [...(out.get(r.chamberId) ?? []), { dayMs: new Date(r.day).getTime(), maxRhPercent: Number(r.maxRh) }]);
  return out;
}

/** The latest reading of each location, as logged (one index probe each). */
async function lastReadings(labId: string, locationIds: readonly string[]) {
  const out = new Map<string, { takenAt: Date; rhPercent: number }>();
  if (locationIds.length === 0) return out;
  const res = await db.execute<{ id: string; taken_at: string; rh_percent: number }>(sql`
    select c.id, l.taken_at, l.rh_percent from unnest(${sql.param([...locationIds])}::uuid[]) as c(id)
    cross join lateral (select taken_at, rh_percent from ${readings} r where r.lab_id = ${labId} and r.chamber_id = c.id order by taken_at desc limit 1) l`);
  for (const r of res.rows) out.set(r.id, { takenAt: new Date(r.taken_at), rhPercent: Number(r.rh_percent) });
  return out;
}

/**
 * Count how storage locations keep the rules they take: the strictest of the given rules that holds
 * for each object (held, already without the objects the viewer may not see), time in rule over 7, 30
 * and 365 days counted as the chamber page counts time in band (getBandWindowStats), the objects at
 * risk, the desiccant forecast at the rule's threshold and a 30-day trace.
 */
async function countStatuses({ labId, locations, held, rules, now }: {
  labId: string; locations: readonly Chamber[]; held: ReadonlyMap<string, Held[]>; rules: readonly StorageRuleView[]; now: Date;
}): Promise<Map<string, Counted>> {
  const ids = locations.map((l) => l.id);
  const desiccantIds = locations.filter((l) => l.kind === "desiccant").map((l) => l.id);
  const [traces, last, events] = await Promise.all([
    dailyMaxima({ labId, locationIds: ids, from: new Date(now.getTime() - 30 * DAY_MS) }),
    lastReadings(labId, ids),
    desiccantIds.length
      ? db.select().from(desiccantEvents).where(and(eq(desiccantEvents.labId, labId), inArray(desiccantEvents.chamberId, desiccantIds)))
      : Promise.resolve([]),
  ]);
  const out = new Map<string, Counted>();
  await eachLimited(locations, COUNT_CONCURRENCY, async (location) => {
    const objects = held.get(location.id) ?? [];
    const { perObject, rule } = locationRule(objects, rules);
    const windows: TimeInRule[] = [];
    let max30: number | null = null;
    if (rule) {
      const band = ruleBand(rule.thresholdRhPercent);
      const stats: Awaited<ReturnType<typeof getBandWindowStats>>[] = [];
      for (const days of TIME_IN_RULE_DAYS) stats.push(await getBandWindowStats({ labId, chamberId: location.id, band, from: new Date(now.getTime() - days * DAY_MS), to: now }));
      // The stand-in readings of the summaries give the same counts as every reading would (tests/integration/chambers-climate-sql).
      TIME_IN_RULE_DAYS.forEach((days, i) => windows.push(timeInRuleOf(stats[i], days)));
      max30 = stats[1].maxRhPercent;
    }
    const atRisk = perObject
      .filter((x) => x.rule && max30 !== null && max30 > x.rule.thresholdRhPercent)
      .map((x) => ({ id: x.object.id, label: x.object.label, accessionNumber: x.object.accessionNumber, thresholdRhPercent: x.rule!.thresholdRhPercent, ruleStatement: x.rule!.statement }));
    let desiccantDueAt: Date | null = null;
    if (location.kind === "desiccant") {
      const holdAt = rule ? rule.thresholdRhPercent : location.setpointRhPercent;
      desiccantDueAt = desiccantStatus({ ...location, setpointRhPercent: holdAt }, events.filter((e) => e.chamberId === location.id)).exhaustionAt;
    }
    out.set(location.id, {
      computedAt: now, ruleId: rule?.id ?? null, thresholdRhPercent: rule?.thresholdRhPercent ?? null,
      ruleIds: [...new Set(perObject.flatMap((x) => (x.rule ? [x.rule.id] : [])))], objectCount: objects.length,
      windows: windows.map(({ exceedances, ...w }) => ({ ...w, exceedanceCount: exceedances.length })),
      longestExceedance: longest(windows[windows.length - 1]?.exceedances ?? []), max30dRhPercent: max30, atRiskCount: atRisk.length,
      detail: { windowExceedances: windows.map((w) => w.exceedances), atRisk }, lastAtCount: last.get(location.id) ?? null, desiccantDueAt, trace: traces.get(location.id) ?? [],
    });
  });
  return out;
}

const longest = (list: readonly Excursion[]) => list.reduce<Excursion | null>((a, e) => (!a || e.durationMinutes > a.durationMinutes ? e : a), null);

// Stored form: JSON with times as ISO strings.
type StoredExcursion = Omit<Excursion, "start" | "end"> & { start: string; end: string };
type StoredSummary = {
  objectCount: number; windows: WindowSummary[]; longestExceedance: StoredExcursion | null; max30dRhPercent: number | null; atRiskCount: number;
  lastAtCount: { takenAt: string; rhPercent: number } | null; desiccantDueAt: string | null; trace: [number, number][];
};
type StoredDetail = { windowExceedances: StoredExcursion[][]; atRisk: ObjectAtRisk[] };

const storeExcursion = (e: Excursion): StoredExcursion => ({ ...e, start: e.start.toISOString(), end: e.end.toISOString() });
const readExcursion = (e: StoredExcursion): Excursion => ({ ...e, start: new Date(e.start), end: new Date(e.end) });

function toStored(c: Counted) {
  const summary: StoredSummary = {
    objectCount: c.objectCount, windows: c.windows, longestExceedance: c.longestExceedance ? storeExcursion(c.longestExceedance) : null,
    max30dRhPercent: c.max30dRhPercent, atRiskCount: c.atRiskCount,
    lastAtCount: c.lastAtCount ? { takenAt: c.lastAtCount.takenAt.toISOString(), rhPercent: c.lastAtCount.rhPercent } : null,
    desiccantDueAt: c.desiccantDueAt?.toISOString() ?? null, trace: c.trace.map((p) => [p.dayMs, p.maxRhPercent]),
  };
  const detail: StoredDetail = { windowExceedances: c.detail!.windowExceedances.map((l) => l.map(storeExcursion)), atRisk: c.detail!.atRisk };
  return { summary, detail };
}

type StoredRow = { computedAt: Date; ruleId: string | null; thresholdRhPercent: number | null; ruleIds: string[]; summary: unknown; detail: unknown };

function fromStored(row: StoredRow): Counted {
  const s = row.summary as StoredSummary;
  const d = row.detail as StoredDetail | null;
  return {
    computedAt: row.computedAt, ruleId: row.ruleId, thresholdRhPercent: row.thresholdRhPercent, ruleIds: row.ruleIds,
    objectCount: s.objectCount, windows: s.windows, longestExceedance: s.longestExceedance ? readExcursion(s.longestExceedance) : null,
    max30dRhPercent: s.max30dRhPercent, atRiskCount: s.atRiskCount,
    detail: d ? { windowExceedances: d.windowExceedances.map((l) => l.map(readExcursion)), atRisk: d.atRisk } : null,
    lastAtCount: s.lastAtCount ? { takenAt: new Date(s.lastAtCount.takenAt), rhPercent: s.lastAtCount.rhPercent } : null,
    desiccantDueAt: s.desiccantDueAt ? new Date(s.desiccantDueAt) : null, trace: s.trace.map(([dayMs, maxRhPercent]) => ({ dayMs, maxRhPercent })),
  };
}

/** Counts in progress in this process, so that concurrent requests count a location once. */
const inFlight = new Map<string, Promise<Counted>>();

/**
 * Count the given storage locations for a viewer who sees every object and rule, and store the
 * result (a newer stored count is kept). Returns the counts.
 */
export async function refreshLocationStatuses({ labId, locationIds, now = new Date() }: { labId: string; locationIds: readonly string[]; now?: Date }) {
  const out = new Map<string, Counted>();
  const todo = locationIds.filter((id) => !inFlight.has(id));
  const waiting = locationIds.filter((id) => !todo.includes(id)).map(async (id) => out.set(id, await inFlight.get(id)!));
  if (todo.length) {
    const work = (async () => {
      const [locations, rules, held] = await Promise.all([
        db.select().from(chambers).where(and(eq(chambers.labId, labId), inArray(chambers.id, todo))),
        listStorageRules({ labId, userId: null }).then((r) => r.filter((x) => x.current)),
        heldObjects(labId, todo),
      ]);
      const counted = await countStatuses({ labId, locations, held, rules, now });
      const values = [...counted].map(([locationId, c]) => ({
        locationId, labId, computedAt: c.computedAt, ruleId: c.ruleId, thresholdRhPercent: c.thresholdRhPercent, ruleIds: c.ruleIds, ...toStored(c),
      }));
      if (values.length) {
        await db.insert(locationStatus).values(values).onConflictDoUpdate({
          target: locationStatus.locationId,
          set: {
            computedAt: sql`excluded.computed_at`, ruleId: sql`excluded.rule_id`, thresholdRhPercent: sql`excluded.threshold_rh_percent`,
            ruleIds: sql`excluded.rule_ids`, summary: sql`excluded.summary`, detail: sql`excluded.detail`,
          },
          setWhere: sql`${locationStatus.computedAt} < excluded.computed_at`,
        });
      }
      return counted;
    })();
    for (const id of todo) {
      const one = work.then((m) => m.get(id)!);
      inFlight.set(id, one);
      void one.catch(() => undefined).finally(() => inFlight.delete(id));
    }
    for (const [id, c] of await work) out.set(id, c);
  }
  await Promise.all(waiting);
  return out;
}

/** Storage locations (not archived) whose stored status is missing or older than maxAgeMs, in every lab or one. */
export async function refreshStaleLocationStatuses({ now = new Date(), labId, maxAgeMs = 5 * 60_000 }: { now?: Date; labId?: string; maxAgeMs?: number } = {}) {
  const rows = await db.select({ id: chambers.id, labId: chambers.labId, locationKind: chambers.locationKind, computedAt: locationStatus.computedAt })
    .from(chambers).leftJoin(locationStatus, eq(locationStatus.locationId, chambers.id))
    .where(and(isNull(chambers.archivedAt), labId ? eq(chambers.labId, labId) : undefined));
  const byLab = new Map<string, string[]>();
  for (const r of rows) {
    if (!isStorageKind(r.locationKind)) continue;
    if (r.computedAt && r.computedAt.getTime() <= now.getTime() && now.getTime() - r.computedAt.getTime() < maxAgeMs) continue;
    byLab.set(r.labId, [...(byLab.get(r.labId) ?? []), r.id]);
  }
  let counted = 0;
  for (const [lab, ids] of byLab) counted += (await refreshLocationStatuses({ labId: lab, locationIds: ids, now })).size;
  return counted;
}

type Live = {
  id: string; name: string; locationKind: string; keeperName: string | null; lastAt: Date | null; lastRh: number | null; sinceMaxRh: number | null;
  stored: StoredRow | null;
};

/** The locations with their stored status and what was logged since it was counted. */
async function loadLive({ labId, locationIds, withDetail }: { labId: string; locationIds: readonly string[] | null; withDetail: boolean }): Promise<Live[]> {
  const ids = locationIds ? sql`and c.id = any(${sql.param([...locationIds])}::uuid[])` : sql`and c.archived_at is null`;
  const res = await db.execute<{
    id: string; name: string; location_kind: string; keeper_name: string | null; computed_at: string | null; rule_id: string | null;
    threshold_rh_percent: number | null; rule_ids: string[] | null; summary: unknown; detail: unknown; last_at: string | null; last_rh: number | null; since_max_rh: number | null;
  }>(sql`
    select c.id, c.name, c.location_kind, u.name as keeper_name, s.computed_at, s.rule_id, s.threshold_rh_percent, s.rule_ids, s.summary,
           ${withDetail ? sql`s.detail` : sql`null::jsonb`} as detail, l.taken_at as last_at, l.rh_percent as last_rh, n.max_rh as since_max_rh
    from ${chambers} c
    left join users u on u.id = c.keeper_id
    left join ${locationStatus} s on s.location_id = c.id
    left join lateral (select taken_at, rh_percent from ${readings} r where r.lab_id = c.lab_id and r.chamber_id = c.id order by taken_at desc limit 1) l on true
    left join lateral (select max(rh_percent) as max_rh from ${readings} r where r.lab_id = c.lab_id and r.chamber_id = c.id and r.taken_at > s.computed_at) n on s.computed_at is not null
    where c.lab_id = ${labId} ${ids}`);
  return res.rows.filter((r) => isStorageKind(r.location_kind)).map((r) => ({
    id: r.id, name: r.name, locationKind: r.location_kind, keeperName: r.keeper_name,
    lastAt: r.last_at ? new Date(r.last_at) : null, lastRh: r.last_rh === null ? null : Number(r.last_rh), sinceMaxRh: r.since_max_rh === null ? null : Number(r.since_max_rh),
    stored: r.computed_at ? {
      computedAt: new Date(r.computed_at), ruleId: r.rule_id, thresholdRhPercent: r.threshold_rh_percent === null ? null : Number(r.threshold_rh_percent),
      ruleIds: r.rule_ids ?? [], summary: r.summary, detail: r.detail,
    } : null,
  }));
}

/**
 * Storage locations of the lab with how they keep their rules, as the viewer may see them: objects in a
 * trial the viewer scores blind count for nothing, nor do rules resting on such a trial. Reads the
 * stored counts where they stand, counts (and stores) the rest; locations whose result the viewer's
 * blinding changes are counted for the viewer and not stored.
 */
async function readStatuses({ labId, userId, locationIds, now, outOfRuleShare, withDetail }: {
  labId: string; userId: string; locationIds: readonly string[] | null; now: Date; outOfRuleShare: number; withDetail: boolean;
}) {
  const [live, rules, hidden] = await Promise.all([
    loadLive({ labId, locationIds, withDetail }),
    listStorageRules({ labId, userId }).then((r) => r.filter((x) => x.current)),
    hiddenObjectIds({ labId, userId }),
  ]);
  const ruleById = new Map(rules.map((r) => [r.id, r]));
  // Locations whose result differs for this viewer: they hold a hidden object, or one of their objects takes a hidden rule.
  const affected = new Set<string>();
  if (hidden.size) {
    const rows = await db.selectDistinct({ locationId: objectLocations.locationId }).from(objectLocations)
      .where(and(eq(objectLocations.labId, labId), isNull(objectLocations.toAt), inArray(objectLocations.specimenId, [...hidden])));
    for (const r of rows) affected.add(r.locationId);
  }
  const counted = new Map<string, Counted>();
  const stale: string[] = [];
  for (const l of live) {
    const stored = l.stored ? fromStored(l.stored) : null;
    if (stored && stored.ruleIds.some((id) => !ruleById.has(id))) affected.add(l.id);
    if (affected.has(l.id)) continue;
    if (stored && (!withDetail || stored.detail) && storedCountStands({ ...stored, lastAtCountRh: stored.lastAtCount?.rhPercent ?? null }, l.sinceMaxRh, now, STATUS_MAX_AGE_MS)) counted.set(l.id, stored);
    else stale.push(l.id);
  }
  if (stale.length) for (const [id, c] of await refreshLocationStatuses({ labId, locationIds: stale, now })) counted.set(id, c);
  const mine = live.filter((l) => affected.has(l.id)).map((l) => l.id);
  if (mine.length) {
    const [locations, held] = await Promise.all([
      db.select().from(chambers).where(and(eq(chambers.labId, labId), inArray(chambers.id, mine))),
      heldObjects(labId, mine),
    ]);
    const visible = new Map([...held].map(([id, list]) => [id, list.filter((o) => !hidden.has(o.id))]));
    for (const [id, c] of await countStatuses({ labId, locations, held: visible, rules, now })) counted.set(id, c);
  }
  return live.flatMap((l) => {
    const c = counted.get(l.id);
    if (!c) return [];
    const rule = c.ruleId ? ruleById.get(c.ruleId) ?? null : null;
    const lastReading = l.lastAt && l.lastRh !== null ? { takenAt: l.lastAt, rhPercent: l.lastRh } : null;
    const needs = locationNeeds({
      now, thresholdRhPercent: rule?.thresholdRhPercent ?? null, lastReading, fractionInRule30d: c.windows[1]?.fractionInRule ?? null,
      outOfRuleShareLimit: outOfRuleShare, desiccantDueAt: c.desiccantDueAt,
    });
    const summary: LocationSummary = {
      location: { id: l.id, name: l.name }, keeperName: l.keeperName, objectCount: c.objectCount, rule, windows: c.windows,
      longestExceedance: c.longestExceedance, max30dRhPercent: c.max30dRhPercent, atRiskCount: c.atRiskCount, lastReading,
      desiccantDueAt: c.desiccantDueAt, needs: c.objectCount === 0 ? needs.filter((n) => n !== "no-rule") : needs, trace: c.trace, computedAt: c.computedAt,
    };
    return [{ summary, detail: c.detail }];
  });
}

/**
 * How one storage location keeps the lab's storage rules: its rule (the strictest of its objects'),
 * time in rule over 7, 30 and 365 days, exceedances, objects at risk and the desiccant forecast.
 */
export async function getLocationRuleStatus({ labId, userId, locationId, now = new Date(), outOfRuleShare = DEFAULT_OUT_OF_RULE_SHARE }: {
  labId: string; userId: string; locationId: string; now?: Date; outOfRuleShare?: number;
}): Promise<LocationRuleStatus> {
  const [row] = await readStatuses({ labId, userId, locationIds: [locationId], now, outOfRuleShare, withDetail: true });
  if (!row) throw new Error(`${locationId} is not a storage location of this lab.`);
  return withDetail(row.summary, row.detail!);
}

function withDetail(s: LocationSummary, d: NonNullable<Counted["detail"]>): LocationRuleStatus {
  return {
    ...s, windows: s.windows.map((w, i) => ({ ...w, exceedances: d.windowExceedances[i] ?? [] })),
    exceedances: [...(d.windowExceedances[d.windowExceedances.length - 1] ?? [])].reverse(), atRisk: d.atRisk,
  };
}

/** Every storage location of the lab (archived left out) with its rule status, most in need first. */
export async function listLocationStatuses(args: { labId: string; userId: string; now?: Date; outOfRuleShare?: number; detail?: false }): Promise<(LocationSummary & { path: string; rank: number })[]>;
export async function listLocationStatuses(args: { labId: string; userId: string; now?: Date; outOfRuleShare?: number; detail: true }): Promise<(LocationRuleStatus & { path: string; rank: number })[]>;
export async function listLocationStatuses({ labId, userId, now = new Date(), outOfRuleShare = DEFAULT_OUT_OF_RULE_SHARE, detail = false }: {
  labId: string; userId: string; now?: Date; outOfRuleShare?: number; detail?: boolean;
}) {
  const [rows, paths] = await Promise.all([
    readStatuses({ labId, userId, locationIds: null, now, outOfRuleShare, withDetail: detail }),
    locationPaths({ labId }),
  ]);
  return rows
    .map(({ summary, detail: d }) => ({ ...(detail ? withDetail(summary, d!) : summary), path: paths.get(summary.location.id)?.path ?? summary.location.name, rank: needRank(summary.needs) }))
    .sort((a, b) => a.rank - b.rank || a.path.localeCompare(b.path));
}
