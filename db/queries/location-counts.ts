import "server-only";
import { and, asc, eq, gte, inArray, isNull, sql } from "drizzle-orm";
import { isStorageKind } from "@/lib/collection/locations";
import { locationRule, ruleBand, TIME_IN_RULE_DAYS, timeInRuleOf, type TimeInRule } from "@/lib/collection/rule-status";
import type { Excursion } from "@/lib/climate/band-stats";
import { desiccantStatus } from "@/lib/humidity/desiccant-status";
import { db } from "../client";
import { chambers, desiccantEvents, locationStatus, objectLocations, readingBlocks, readings, specimens, storageRules } from "../schema";
import type { Chamber } from "./chambers";
import { getBandWindowStats } from "./readings-series";
import { listStorageRules, type StorageRuleView } from "./storage-rules";

// Counting how storage locations keep their rules, and storing the counts (table location_status) for
// the pages to read (db/queries/location-status.ts).
const DAY_MS = 86_400_000;
/** A stored count older than this is counted again when a page reads it. */
export const STATUS_MAX_AGE_MS = 15 * 60_000;
/** The worker's 10-minute scan counts again what is older than this, so pages seldom find a count too old. */
export const SCAN_RECOUNT_AFTER_MS = STATUS_MAX_AGE_MS / 3;

export type ObjectAtRisk = { id: string; label: string; accessionNumber: string | null; thresholdRhPercent: number; ruleStatement: string };
/** Time in rule over one window, as the overview shows it (the exceedances themselves are in the detail). */
export type WindowSummary = Omit<TimeInRule, "exceedances"> & { exceedanceCount: number };
/** A day (its start, ms since 1970 UTC) and its highest logged RH. */
export type RhTracePoint = { dayMs: number; maxRhPercent: number };

type Held = { id: string; label: string; accessionNumber: string | null; materialClass: string; treatmentsApplied: string };

/** What a computation finds, before the viewer's rules and the live last reading are put to it. */
export type Counted = {
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

export async function heldObjects(labId: string, locationIds: readonly string[]) {
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
export async function countStatuses({ labId, locations, held, rules, now }: {
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
export type StoredSummary = {
  objectCount: number; windows: WindowSummary[]; longestExceedance: StoredExcursion | null; max30dRhPercent: number | null; atRiskCount: number;
  lastAtCount: { takenAt: string; rhPercent: number } | null; desiccantDueAt: string | null; /** Left out of overview reads (storedTraces gives the shown rows' traces). */
  trace?: [number, number][];
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

export type StoredRow = { computedAt: Date; ruleId: string | null; thresholdRhPercent: number | null; ruleIds: string[]; summary: unknown; detail: unknown };

/** A stored trace read back (read without it, an empty trace). */
export const traceOf = (stored: [number, number][] | undefined): RhTracePoint[] => (stored ?? []).map(([dayMs, maxRhPercent]) => ({ dayMs, maxRhPercent }));

export function fromStored(row: StoredRow): Counted {
  const s = row.summary as StoredSummary;
  const d = row.detail as StoredDetail | null;
  return {
    computedAt: row.computedAt, ruleId: row.ruleId, thresholdRhPercent: row.thresholdRhPercent, ruleIds: row.ruleIds,
    objectCount: s.objectCount, windows: s.windows, longestExceedance: s.longestExceedance ? readExcursion(s.longestExceedance) : null,
    max30dRhPercent: s.max30dRhPercent, atRiskCount: s.atRiskCount,
    detail: d ? { windowExceedances: d.windowExceedances.map((l) => l.map(readExcursion)), atRisk: d.atRisk } : null,
    lastAtCount: s.lastAtCount ? { takenAt: new Date(s.lastAtCount.takenAt), rhPercent: s.lastAtCount.rhPercent } : null,
    desiccantDueAt: s.desiccantDueAt ? new Date(s.desiccantDueAt) : null, trace: traceOf(s.trace),
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
export async function refreshStaleLocationStatuses({ now = new Date(), labId, maxAgeMs = SCAN_RECOUNT_AFTER_MS }: { now?: Date; labId?: string; maxAgeMs?: number } = {}) {
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


/** The stored 30-day traces of some locations (the overview reads them for the rows it shows). */
export async function storedTraces({ labId, locationIds }: { labId: string; locationIds: readonly string[] }) {
  const out = new Map<string, RhTracePoint[]>();
  if (locationIds.length === 0) return out;
  const rows = await db.select({ id: locationStatus.locationId, trace: sql<[number, number][] | null>`${locationStatus.summary} -> 'trace'` }).from(locationStatus)
    .where(and(eq(locationStatus.labId, labId), inArray(locationStatus.locationId, [...locationIds])));
  for (const r of rows) out.set(r.id, traceOf(r.trace ?? undefined));
  return out;
}
