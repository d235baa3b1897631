import "server-only";
import { and, eq, inArray, isNull, sql } from "drizzle-orm";
import { isStorageKind } from "@/lib/collection/locations";
import { locationNeeds, needRank, storedCountStands, type LocationNeed } from "@/lib/collection/rule-status";
import type { Excursion } from "@/lib/climate/band-stats";
import { db } from "../client";
import { chambers, locationStatus, memberships, objectLocations, readings } from "../schema";
import {
  countStatuses, fromStored, heldObjects, refreshLocationStatuses, STATUS_MAX_AGE_MS, type Counted, type ObjectAtRisk, type RhTracePoint, type StoredRow, type WindowSummary,
} from "./location-counts";
import { locationPaths } from "./locations";
import { hiddenObjectIds } from "./object-locations";
import { listStorageRules, type StorageRuleView } from "./storage-rules";

export { refreshLocationStatuses, refreshStaleLocationStatuses, rulesOfLocations, STATUS_MAX_AGE_MS, storedTraces } from "./location-counts";
export type { ObjectAtRisk, RhTracePoint, WindowSummary } from "./location-counts";


/** The overview flags a location out of rule for more than this share of the last 30 days (default). */
export const DEFAULT_OUT_OF_RULE_SHARE = 0.05;

/** How one storage location keeps its rule, for the overview, the CSV and the report. */
export type LocationSummary = {
  location: { id: string; name: string };
  /** The keeper's name; FORMER_KEEPER when they are no longer a member; null when the location has none. */
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

/** A keeper who has left the lab: named nowhere, and no alert goes to them (db/jobs/location-alerts.ts). */
export const FORMER_KEEPER = "a former member (no e-mail)";

type Live = {
  id: string; name: string; locationKind: string; keeperName: string | null; lastAt: Date | null; lastRh: number | null; sinceMaxRh: number | null;
  stored: StoredRow | null;
};

/** The locations with their stored status and what was logged since it was counted. */
async function loadLive({ labId, locationIds, withDetail, withTrace }: { labId: string; locationIds: readonly string[] | null; withDetail: boolean; withTrace: boolean }): Promise<Live[]> {
  const ids = locationIds ? sql`and c.id = any(${sql.param([...locationIds])}::uuid[])` : sql`and c.archived_at is null`;
  const res = await db.execute<{
    id: string; name: string; location_kind: string; keeper_id: string | null; keeper_name: string | null; keeper_member: boolean; computed_at: string | null; rule_id: string | null;
    threshold_rh_percent: number | null; rule_ids: string[] | null; summary: unknown; detail: unknown; last_at: string | null; last_rh: number | null; since_max_rh: number | null;
  }>(sql`
    select c.id, c.name, c.location_kind, c.keeper_id, u.name as keeper_name, km.user_id is not null as keeper_member, s.computed_at, s.rule_id, s.threshold_rh_percent, s.rule_ids, ${withTrace ? sql`s.summary` : sql`s.summary - 'trace'`} as summary,
           ${withDetail ? sql`s.detail` : sql`null::jsonb`} as detail, l.taken_at as last_at, l.rh_percent as last_rh, n.max_rh as since_max_rh
    from ${chambers} c
    left join users u on u.id = c.keeper_id
    left join ${memberships} km on km.user_id = c.keeper_id and km.lab_id = c.lab_id
    left join ${locationStatus} s on s.location_id = c.id
    left join lateral (select taken_at, rh_percent from ${readings} r where r.lab_id = c.lab_id and r.chamber_id = c.id order by taken_at desc limit 1) l on true
    left join lateral (select max(rh_percent) as max_rh from ${readings} r where r.lab_id = c.lab_id and r.chamber_id = c.id and r.taken_at > s.computed_at) n on s.computed_at is not null
    where c.lab_id = ${labId} ${ids}`);
  return res.rows.filter((r) => isStorageKind(r.location_kind)).map((r) => ({
    id: r.id, name: r.name, locationKind: r.location_kind, keeperName: r.keeper_id === null ? null : r.keeper_member ? r.keeper_name : FORMER_KEEPER,
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
async function readStatuses({ labId, userId, locationIds, now, outOfRuleShare, withDetail, withTrace = true }: {
  labId: string; userId: string; locationIds: readonly string[] | null; now: Date; outOfRuleShare: number; withDetail: boolean; withTrace?: boolean;
}) {
  const [live, rules, hidden] = await Promise.all([
    loadLive({ labId, locationIds, withDetail, withTrace }),
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
  // A full-view count (stored or just made) that gives an object a rule the viewer may not see is not theirs.
  const hidesRule = (c: Counted) => c.ruleIds.some((id) => !ruleById.has(id));
  const counted = new Map<string, Counted>();
  const stale: string[] = [];
  for (const l of live) {
    const stored = l.stored ? fromStored(l.stored) : null;
    if (stored && hidesRule(stored)) affected.add(l.id);
    if (affected.has(l.id)) continue;
    if (stored && (!withDetail || stored.detail) && storedCountStands({ ...stored, lastAtCountRh: stored.lastAtCount?.rhPercent ?? null }, l.sinceMaxRh, now, STATUS_MAX_AGE_MS)) counted.set(l.id, stored);
    else stale.push(l.id);
  }
  if (stale.length) {
    for (const [id, c] of await refreshLocationStatuses({ labId, locationIds: stale, now })) {
      if (hidesRule(c)) affected.add(id);
      else counted.set(id, c);
    }
  }
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

type ListArgs = { labId: string; userId: string; now?: Date; outOfRuleShare?: number; trace?: boolean };

/**
 * Every storage location of the lab (archived left out) with its rule status, most in need first.
 * trace: false leaves the stored traces out (empty; read the shown rows' with storedTraces).
 */
export async function listLocationStatuses(args: ListArgs & { detail?: false }): Promise<(LocationSummary & { path: string; rank: number })[]>;
export async function listLocationStatuses(args: ListArgs & { detail: true }): Promise<(LocationRuleStatus & { path: string; rank: number })[]>;
export async function listLocationStatuses({ labId, userId, now = new Date(), outOfRuleShare = DEFAULT_OUT_OF_RULE_SHARE, detail = false, trace = true }: ListArgs & { detail?: boolean }) {
  const [rows, paths] = await Promise.all([
    readStatuses({ labId, userId, locationIds: null, now, outOfRuleShare, withDetail: detail, withTrace: trace }),
    locationPaths({ labId }),
  ]);
  return rows
    .map(({ summary, detail: d }) => ({ ...(detail ? withDetail(summary, d!) : summary), path: paths.get(summary.location.id)?.path ?? summary.location.name, rank: needRank(summary.needs) }))
    .sort((a, b) => a.rank - b.rank || a.path.localeCompare(b.path));
}
