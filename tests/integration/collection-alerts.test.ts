// Collection alerts through the real mail fake: a location that stays out of its storage rule longer
// than its alert delay e-mails its keeper (or the keeper of the location it sits in) once per
// exceedance. Scans run again, as after a worker restart (claims live in the database), send nothing
// twice; a keeper who chose the digest gets one daily e-mail instead.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import { alertBarred, claimLocationAlerts, keeperOf, runLocationAlertScan, runLocationDigest } from "@/db/jobs/location-alerts";
import { insertReadings, type NewReading } from "@/db/queries/readings";
import * as s from "@/db/schema";
import { listMessages } from "@/lib/mail-store";
import { createTestLab, type TestLab } from "../support/db";
import { ensureMailFake, type MailFake } from "../support/mail";

const MIN = 60_000;
const HOUR = 3_600_000;
let lab: TestLab;
let mail: MailFake;
const now = new Date(Math.floor(Date.now() / (10 * MIN)) * 10 * MIN);

/** Every 10 minutes over the last 5 days at 15 %RH, with stretches above the rule's 20 %RH. */
function series(stretches: { fromH: number; hours: number; rh: number }[]): NewReading[] {
  const rows: NewReading[] = [];
  for (let t = now.getTime() - 5 * 24 * HOUR; t <= now.getTime(); t += 10 * MIN) {
    const hAgo = (now.getTime() - t) / HOUR;
    const hit = stretches.find((x) => hAgo <= x.fromH && hAgo > x.fromH - x.hours);
    rows.push({ takenAt: new Date(t), rhPercent: hit ? hit.rh : 15, tempC: 18, dewPointC: null, instrument: "" });
  }
  return rows;
}

async function location(name: string, parentId: string | null, keeperId: string | null) {
  const [row] = await db.insert(s.chambers).values({
    labId: lab.labId, name, kind: "desiccant", locationKind: "sealed-box", parentId, keeperId, nominalTempC: 18, setpointRhPercent: 15, toleranceRhPercent: 5,
  }).returning();
  return row;
}

async function keep(locationId: string, label: string) {
  const [o] = await db.insert(s.specimens).values({ labId: lab.labId, label, materialClass: "archaeological-iron", findName: "Test find" }).returning();
  await db.insert(s.objectLocations).values({ labId: lab.labId, specimenId: o.id, locationId, fromAt: new Date(now.getTime() - 10 * 24 * HOUR) });
}

const inbox = async (to: string, pattern: RegExp) => (await listMessages(mail.mailDir, { to })).filter((m) => pattern.test(m.subject));

beforeAll(async () => {
  mail = await ensureMailFake();
  lab = await createTestLab("Collection alerts");
  await db.insert(s.storageRules).values({
    labId: lab.labId, materialClass: "archaeological-iron", treatmentName: "Any treatment", version: 1, thresholdRhPercent: 20, origin: "entered",
    source: "Test rule", sourceDate: "2020-01-01", method: "Entered by hand.", statement: "Keep archaeological iron below 20 %RH.",
  });
});
afterAll(async () => {
  await closeDb();
});

describe("collection alerts", () => {
  it("finds the keeper up the tree", () => {
    const byId = new Map([["room", { parentId: null, keeperId: "k" }], ["case", { parentId: "room", keeperId: null }], ["box", { parentId: "case", keeperId: null }]]);
    expect(keeperOf("box", byId)).toBe("k");
    expect(keeperOf("nowhere", byId)).toBeNull();
  });

  it("mails the keeper once per exceedance of at least 6 h, also when the scan runs again", async () => {
    const room = await location("Alert room", null, lab.users.technician.id);
    const box = await location("Alert box", room.id, null);
    await keep(box.id, "AL-1");
    // 8 h above the rule three days ago (alert), 2 h above yesterday (too short), and 7 h above until now (alert, still going)
    await insertReadings(db, { labId: lab.labId, chamberId: box.id, source: "csv", rows: series([{ fromH: 72, hours: 8, rh: 25 }, { fromH: 30, hours: 2, rh: 26 }, { fromH: 7, hours: 7.5, rh: 24 }]) });

    const first = await runLocationAlertScan(now, lab.labId);
    expect(first).toEqual({ claimed: 2, sent: 2, withdrawn: 0 });
    const again = await runLocationAlertScan(now, lab.labId);
    expect(again).toEqual({ claimed: 0, sent: 0, withdrawn: 0 });
    const later = await runLocationAlertScan(new Date(now.getTime() + 10 * MIN), lab.labId);
    expect(later.sent).toBe(0);
    const mails = await inbox(lab.users.technician.email, /^Out of rule: Alert box$/);
    expect(mails).toHaveLength(2);
    expect(mails.map((m) => m.text).join("\n")).toMatch(/above 20 %RH for 8\.0 h of logged time so far, peak 25\.0 %RH/);
    const claims = await db.select().from(s.locationAlerts).where(eq(s.locationAlerts.locationId, box.id));
    expect(claims.every((c) => c.sentAt !== null && c.recipientId === lab.users.technician.id)).toBe(true);
  });

  it("gathers a digest keeper's alerts into one daily e-mail", async () => {
    await db.update(s.users).set({ collectionDigest: true }).where(eq(s.users.id, lab.users.researcher.id));
    const box = await location("Digest box", null, lab.users.researcher.id);
    await keep(box.id, "AL-2");
    await insertReadings(db, { labId: lab.labId, chamberId: box.id, source: "csv", rows: series([{ fromH: 60, hours: 9, rh: 30 }, { fromH: 40, hours: 6, rh: 22 }]) });

    expect((await runLocationAlertScan(now, lab.labId)).claimed).toBe(2);
    expect(await inbox(lab.users.researcher.email, /Digest box|digest/)).toHaveLength(0);
    expect(await runLocationDigest(lab.labId)).toEqual({ digests: 1, alerts: 2, withdrawn: 0 });
    expect(await runLocationDigest(lab.labId)).toEqual({ digests: 0, alerts: 0, withdrawn: 0 });
    const digest = await inbox(lab.users.researcher.email, /^Collection digest: 2 exceedance/);
    expect(digest).toHaveLength(1);
    expect(digest[0].text).toContain("Digest box");
  });

  it("withdraws a claimed alert whose location is archived, or whose keeper left the lab, before it goes out", async () => {
    const box = await location("Archived box", null, lab.users.observer.id);
    await keep(box.id, "AL-3");
    await insertReadings(db, { labId: lab.labId, chamberId: box.id, source: "csv", rows: series([{ fromH: 50, hours: 8, rh: 27 }]) });
    expect(await claimLocationAlerts(now, lab.labId)).toBe(1);
    // Archived after the claim, before the scan sends it (a scan stopped between the two).
    await db.update(s.chambers).set({ archivedAt: new Date() }).where(eq(s.chambers.id, box.id));
    expect(await runLocationAlertScan(now, lab.labId)).toEqual({ claimed: 0, sent: 0, withdrawn: 1 });
    expect(await inbox(lab.users.observer.email, /Archived box/)).toHaveLength(0);
    const [claim] = await db.select().from(s.locationAlerts).where(eq(s.locationAlerts.locationId, box.id));
    expect(claim.sentAt).toBeNull();
    expect(claim.withdrawnReason).toBe("location archived");
    expect(claim.withdrawnAt).toBeInstanceOf(Date);
    // Withdrawn stays withdrawn: a later scan neither sends nor claims it again.
    expect(await runLocationAlertScan(now, lab.labId)).toEqual({ claimed: 0, sent: 0, withdrawn: 0 });

    // A digest keeper who leaves the lab between the claim and the daily digest gets nothing.
    await db.update(s.users).set({ collectionDigest: true }).where(eq(s.users.id, lab.users.lead.id));
    const leaving = await location("Leaving keeper's box", null, lab.users.lead.id);
    await keep(leaving.id, "AL-4");
    await insertReadings(db, { labId: lab.labId, chamberId: leaving.id, source: "csv", rows: series([{ fromH: 40, hours: 7, rh: 23 }]) });
    expect(await claimLocationAlerts(now, lab.labId)).toBe(1);
    await db.delete(s.memberships).where(and(eq(s.memberships.userId, lab.users.lead.id), eq(s.memberships.labId, lab.labId)));
    expect(await runLocationDigest(lab.labId)).toEqual({ digests: 0, alerts: 0, withdrawn: 1 });
    expect(await inbox(lab.users.lead.email, /digest/i)).toHaveLength(0);
    const [left] = await db.select().from(s.locationAlerts).where(eq(s.locationAlerts.locationId, leaving.id));
    expect(left.withdrawnReason).toBe("recipient no longer a member of the lab");
  });

  it("claims nothing for an archived location, nor for a keeper who is not a member of the lab, by the same rule that withdraws", async () => {
    expect(alertBarred({ archivedAt: new Date(), recipientIsMember: true })).toBe("location archived");
    expect(alertBarred({ archivedAt: null, recipientIsMember: false })).toBe("recipient no longer a member of the lab");
    expect(alertBarred({ archivedAt: null, recipientIsMember: true })).toBeNull();
    const archived = await location("Box archived before its exceedance was seen", null, lab.users.observer.id);
    await keep(archived.id, "AL-5");
    await insertReadings(db, { labId: lab.labId, chamberId: archived.id, source: "csv", rows: series([{ fromH: 30, hours: 8, rh: 26 }]) });
    await db.update(s.chambers).set({ archivedAt: new Date() }).where(eq(s.chambers.id, archived.id));
    const formerKeeper = await location("Box of a former member", null, lab.users.technician.id);
    await keep(formerKeeper.id, "AL-6");
    await insertReadings(db, { labId: lab.labId, chamberId: formerKeeper.id, source: "csv", rows: series([{ fromH: 30, hours: 8, rh: 26 }]) });
    await db.delete(s.memberships).where(and(eq(s.memberships.userId, lab.users.technician.id), eq(s.memberships.labId, lab.labId)));
    expect(await claimLocationAlerts(now, lab.labId)).toBe(0);
    expect(await db.select().from(s.locationAlerts).where(eq(s.locationAlerts.locationId, archived.id))).toHaveLength(0);
    expect(await db.select().from(s.locationAlerts).where(eq(s.locationAlerts.locationId, formerKeeper.id))).toHaveLength(0);
  });
});
