// Collection alerts: an e-mail to a storage location's keeper (or, when it has none, the keeper of the
// nearest location above it in the tree) when the location stays out of rule longer than its alert
// delay (6 h unless set). Like the desiccant reminders, the scan first claims (exceedance, recipient)
// in location_alerts; sending marks the claim. A scan after a worker restart finds the claims and
// sends nothing twice; a failed mail stays unsent, the scan throws and pg-boss retries it. Keepers
// who chose the digest get one e-mail a day listing their new exceedances instead. A claim whose
// location was archived, or whose recipient left the lab, before it went out is withdrawn, not sent.
import { and, asc, eq, inArray, isNull, lt, type SQL, sql } from "drizzle-orm";
import { exceedancesToAlert, ruleBand } from "@/lib/collection/rule-status";
import { isStorageKind } from "@/lib/collection/locations";
import { formatDateTime } from "@/lib/format";
import { appUrl, sendMail } from "@/lib/mail/send";
import { db } from "../client";
import { getBandWindowStats } from "../queries/readings-series";
import { rulesOfLocations } from "../queries/location-status";
import { blindTrialIds } from "../queries/trial-access";
import { chambers, locationAlerts, memberships, storageRules, users } from "../schema";

export const MAX_SEND_ATTEMPTS = 25;
const DAY_MS = 86_400_000;
/** The scan looks this far back; an exceedance that began in its first day is older and was claimed by earlier scans. */
export const SCAN_DAYS = 14;

type Loc = { id: string; labId: string; name: string; parentId: string | null; keeperId: string | null; alertAfterHours: number; locationKind: string; archivedAt: Date | null };

/** The location's keeper, or the nearest keeper above it in the tree. */
export function keeperOf(id: string, byId: ReadonlyMap<string, Pick<Loc, "parentId" | "keeperId">>): string | null {
  const seen = new Set<string>();
  for (let at: string | null = id; at && !seen.has(at); at = byId.get(at)?.parentId ?? null) {
    seen.add(at);
    const keeper = byId.get(at)?.keeperId;
    if (keeper) return keeper;
  }
  return null;
}

/** Claim an alert for every exceedance that has lasted the location's alert delay. */
export async function claimLocationAlerts(now = new Date(), labId?: string) {
  const all = await db.select({
    id: chambers.id, labId: chambers.labId, name: chambers.name, parentId: chambers.parentId, keeperId: chambers.keeperId,
    alertAfterHours: chambers.alertAfterHours, locationKind: chambers.locationKind, archivedAt: chambers.archivedAt,
  }).from(chambers).where(labId ? eq(chambers.labId, labId) : undefined);
  const byLab = new Map<string, Loc[]>();
  for (const l of all) byLab.set(l.labId, [...(byLab.get(l.labId) ?? []), l]);
  let claimed = 0;
  for (const [lab, locs] of byLab) {
    const byId = new Map(locs.map((l) => [l.id, l]));
    const watched = locs.filter((l) => isStorageKind(l.locationKind));
    const keepers = [...new Set(watched.map((l) => keeperOf(l.id, byId)).filter((k): k is string => k !== null))];
    if (keepers.length === 0) continue;
    // Members of the lab among the keepers: only they get mail about its store (alertBarred).
    const recipients = await db.select({ id: users.id, digest: users.collectionDigest }).from(users)
      .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.labId, lab))).where(inArray(users.id, keepers));
    const digest = new Map(recipients.map((r) => [r.id, r.digest]));
    // Each keeper's locations are judged by the rules that keeper may see: not those resting on a trial they score blind.
    const current = await db.select().from(storageRules).where(and(eq(storageRules.labId, lab), isNull(storageRules.supersededAt)));
    const rules = new Map<string, (typeof current)[number]>();
    for (const keeper of digest.keys()) {
      const blind = await blindTrialIds({ labId: lab, userId: keeper });
      const theirs = watched.filter((l) => keeperOf(l.id, byId) === keeper).map((l) => l.id);
      const seen = current.filter((r) => !r.sourceTrialIds.some((id) => blind.has(id)));
      for (const [id, rule] of await rulesOfLocations({ labId: lab, locationIds: theirs, rules: seen })) rules.set(id, rule);
    }
    for (const l of watched) {
      const rule = rules.get(l.id);
      const keeper = keeperOf(l.id, byId);
      if (!rule || !keeper || alertBarred({ archivedAt: l.archivedAt, recipientIsMember: digest.has(keeper) })) continue;
      const from = new Date(now.getTime() - SCAN_DAYS * DAY_MS);
      const stats = await getBandWindowStats({ labId: lab, chamberId: l.id, band: ruleBand(rule.thresholdRhPercent), from, to: now });
      const due = exceedancesToAlert(stats.excursions, l.alertAfterHours).filter((e) => e.start.getTime() >= from.getTime() + DAY_MS);
      for (const e of due) {
        const rows = await db.insert(locationAlerts).values({
          labId: lab, locationId: l.id, recipientId: keeper, startedAt: e.start, thresholdRhPercent: rule.thresholdRhPercent,
          peakRhPercent: e.worstRhPercent, durationMinutes: e.durationMinutes, delivery: digest.get(keeper) ? "digest" : "each",
        }).onConflictDoNothing().returning({ id: locationAlerts.id });
        claimed += rows.length;
      }
    }
  }
  return claimed;
}

const hours = (minutes: number) => `${(minutes / 60).toFixed(1)} h`;

/** An alert with what decides whether it may still go out: its location's archiving and the recipient's membership. */
const alertRows = (where: SQL | undefined) =>
  db.select({ alert: locationAlerts, email: users.email, name: users.name, location: chambers.name, archivedAt: chambers.archivedAt, member: memberships.userId })
    .from(locationAlerts).innerJoin(users, eq(users.id, locationAlerts.recipientId)).innerJoin(chambers, eq(chambers.id, locationAlerts.locationId))
    .leftJoin(memberships, and(eq(memberships.userId, locationAlerts.recipientId), eq(memberships.labId, locationAlerts.labId)))
    .where(where);

type AlertRow = Awaited<ReturnType<typeof alertRows>>[number];

/**
 * Why an alert about a location may not go to a recipient, or null when it may: the one rule, applied
 * when an exceedance is claimed and again when its claim is sent (a claim barred by then is withdrawn).
 */
export function alertBarred({ archivedAt, recipientIsMember }: { archivedAt: Date | null; recipientIsMember: boolean }): string | null {
  if (archivedAt) return "location archived";
  if (!recipientIsMember) return "recipient no longer a member of the lab";
  return null;
}

const withdrawalReason = (a: Pick<AlertRow, "archivedAt" | "member">) => alertBarred({ archivedAt: a.archivedAt, recipientIsMember: a.member !== null });

/** Mark unsent claims withdrawn (each with its reason); returns how many. */
async function withdraw(rows: readonly AlertRow[]) {
  let n = 0;
  for (const r of rows) {
    const reason = withdrawalReason(r);
    if (!reason) continue;
    const done = await db.update(locationAlerts).set({ withdrawnAt: new Date(), withdrawnReason: reason })
      .where(and(eq(locationAlerts.id, r.alert.id), isNull(locationAlerts.sentAt), isNull(locationAlerts.withdrawnAt))).returning({ id: locationAlerts.id });
    n += done.length;
  }
  return n;
}

/** Send one claimed alert; throws when the mail server refuses, leaving the claim unsent. */
export async function sendLocationAlert(alertId: string): Promise<"sent" | "already-sent" | "withdrawn"> {
  const [a] = await alertRows(eq(locationAlerts.id, alertId));
  if (!a || a.alert.sentAt || a.alert.withdrawnAt) return "already-sent";
  if (await withdraw([a])) return "withdrawn";
  await db.update(locationAlerts).set({ attempts: sql`${locationAlerts.attempts} + 1` }).where(eq(locationAlerts.id, alertId));
  await sendMail({
    to: a.email,
    labId: a.alert.labId,
    subject: `Out of rule: ${a.location}`,
    text:
      `Hello ${a.name},\n\n"${a.location}" has been out of its storage rule since ${formatDateTime(a.alert.startedAt)}: ` +
      `above ${a.alert.thresholdRhPercent} %RH for ${hours(a.alert.durationMinutes)} of logged time so far, peak ${a.alert.peakRhPercent.toFixed(1)} %RH.\n\n` +
      `Check the seal, the desiccant or salt, and the objects kept there. Open the location: ${appUrl(`/chambers/${a.alert.locationId}`)}\n\n` +
      `You get this because you keep this location (or the one it sits in). Choose a daily digest instead in Lab settings.`,
  });
  await db.update(locationAlerts).set({ sentAt: new Date() }).where(and(eq(locationAlerts.id, alertId), isNull(locationAlerts.sentAt)));
  return "sent";
}

/** The scheduled scan: claim what is due, then send every unsent immediate alert; throw if any mail failed. */
export async function runLocationAlertScan(now = new Date(), labId?: string) {
  const claimed = await claimLocationAlerts(now, labId);
  const where = [isNull(locationAlerts.sentAt), isNull(locationAlerts.withdrawnAt), eq(locationAlerts.delivery, "each"), lt(locationAlerts.attempts, MAX_SEND_ATTEMPTS)];
  if (labId) where.push(eq(locationAlerts.labId, labId));
  const unsent = await db.select({ id: locationAlerts.id }).from(locationAlerts).where(and(...where)).orderBy(asc(locationAlerts.queuedAt));
  let sent = 0;
  let withdrawn = 0;
  const failed: string[] = [];
  for (const u of unsent) {
    try {
      const outcome = await sendLocationAlert(u.id);
      if (outcome === "sent") sent++;
      if (outcome === "withdrawn") withdrawn++;
    } catch (err) {
      failed.push(`${u.id}: ${(err as Error).message}`);
    }
  }
  if (failed.length) throw new Error(`${failed.length} collection alert(s) not sent, will retry: ${failed[0]}`);
  return { claimed, sent, withdrawn };
}

/** The daily digest: one e-mail per keeper listing the unsent digest alerts, all marked sent together. */
export async function runLocationDigest(labId?: string) {
  const where = [isNull(locationAlerts.sentAt), isNull(locationAlerts.withdrawnAt), eq(locationAlerts.delivery, "digest")];
  if (labId) where.push(eq(locationAlerts.labId, labId));
  const claims = await alertRows(and(...where)).orderBy(asc(locationAlerts.startedAt));
  const withdrawn = await withdraw(claims);
  const rows = claims.filter((r) => withdrawalReason(r) === null);
  const byRecipient = new Map<string, typeof rows>();
  for (const r of rows) byRecipient.set(`${r.alert.labId}|${r.alert.recipientId}`, [...(byRecipient.get(`${r.alert.labId}|${r.alert.recipientId}`) ?? []), r]);
  let sent = 0;
  for (const list of byRecipient.values()) {
    const first = list[0];
    await sendMail({
      to: first.email,
      labId: first.alert.labId,
      subject: `Collection digest: ${list.length} exceedance(s) of storage rules`,
      text:
        `Hello ${first.name},\n\nLocations you keep went out of their storage rule:\n\n` +
        list.map((r) => `- ${r.location}: since ${formatDateTime(r.alert.startedAt)}, above ${r.alert.thresholdRhPercent} %RH for ${hours(r.alert.durationMinutes)}, peak ${r.alert.peakRhPercent.toFixed(1)} %RH — ${appUrl(`/chambers/${r.alert.locationId}`)}`).join("\n") +
        `\n\nThe collection overview lists every location by need: ${appUrl("/collection/overview")}\n`,
    });
    await db.update(locationAlerts).set({ sentAt: new Date() }).where(and(inArray(locationAlerts.id, list.map((r) => r.alert.id)), isNull(locationAlerts.sentAt)));
    sent++;
  }
  return { digests: sent, alerts: rows.length, withdrawn };
}
