// Team fields of a trial (technicians, scorers and their blind flag, score rule, primary scorer), tried
// the way a mistaken user or an attacker would: a researcher PATCHing the lead-only primary scorer,
// people of another lab, made-up ids, observers named for jobs they cannot do. Each refusal is a clear
// 403 or 422 and leaves the trial, its team and the audit trail as they were.
import crypto from "node:crypto";
import { and, asc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { ROLES, type Role } from "@/lib/auth/permissions";
import { teamRights } from "@/lib/trials/team";
import { updateScorersAction, updateTechniciansAction, updateTrialAction } from "@/app/_actions/trials";
import { assignScorerAction, setScoreRuleAction } from "@/app/_actions/scorers";
import { createTestLab, TEST_PASSWORD, type TestLab } from "../support/db";
import { signedInClient, type Client } from "../support/http";

let a: TestLab;
let b: TestLab;
const http = {} as Record<Role, Client>;
const json = (body: unknown, method = "PATCH") => ({ method, headers: { "content-type": "application/json" }, body: JSON.stringify(body) });

async function draftTrial(lab: TestLab) {
  const [trial] = await db.insert(s.trials).values({
    labId: lab.labId, title: "Team trial", question: "Who may change the team of this trial?", schedulePlan: { kind: "custom", days: [0, 7] },
    scoreRule: "primary-scorer", primaryScorerId: lab.users.technician.id,
  }).returning();
  await db.insert(s.trialMembers).values([
    { labId: lab.labId, trialId: trial.id, userId: lab.users.technician.id, role: "scorer", blind: false },
    { labId: lab.labId, trialId: trial.id, userId: lab.users.lead.id, role: "scorer", blind: true },
    { labId: lab.labId, trialId: trial.id, userId: lab.users.technician.id, role: "technician", blind: false },
  ]);
  return trial.id;
}

/** Everything a team change could touch: the trial row, its members and its audit events. */
async function snapshot(trialId: string) {
  const [trial] = await db.select().from(s.trials).where(eq(s.trials.id, trialId));
  const members = await db.select().from(s.trialMembers).where(eq(s.trialMembers.trialId, trialId)).orderBy(asc(s.trialMembers.userId), asc(s.trialMembers.role));
  const audit = await db.select({ id: s.auditEvents.id }).from(s.auditEvents).where(and(eq(s.auditEvents.entity, "trial"), eq(s.auditEvents.entityId, trialId)));
  return { trial, members, audit: audit.length };
}

beforeAll(async () => {
  a = await createTestLab("Team A");
  b = await createTestLab("Team B");
  for (const role of ROLES) http[role] = await signedInClient(a.users[role].email, TEST_PASSWORD);
}, 60_000);
afterAll(() => closeDb());

describe("who may change which team field", () => {
  it("the table: technicians and the protocol for the trial designers, scorers, rule and primary scorer for the lead", () => {
    // From the role descriptions in README: the lead assigns scorers; researchers design trials.
    expect(teamRights("lead")).toEqual({ technicianIds: true, photoProtocol: true, scorers: true, scoreRule: true, primaryScorerId: true });
    expect(teamRights("researcher")).toEqual({ technicianIds: true, photoProtocol: true, scorers: false, scoreRule: false, primaryScorerId: false });
    expect(teamRights("technician")).toEqual({ technicianIds: false, photoProtocol: false, scorers: false, scoreRule: false, primaryScorerId: false });
    expect(teamRights("observer")).toEqual({ technicianIds: false, photoProtocol: false, scorers: false, scoreRule: false, primaryScorerId: false });
  });

  it("a researcher PATCHing only primaryScorerId of a draft gets 403 and nothing changes", async () => {
    const trialId = await draftTrial(a);
    const before = await snapshot(trialId);
    const res = await http.researcher.fetch(`/api/trials/${trialId}`, json({ primaryScorerId: a.users.researcher.id }));
    expect(res.status).toBe(403);
    const body = await res.json();
    expect(body.error.message).toMatch(/Only a lab lead assigns the primary scorer/);
    expect(body.error.fields).toEqual({ primaryScorerId: ["Only a lab lead can change this."] });
    expect(await snapshot(trialId)).toEqual(before);
  });

  it("a researcher cannot slip lead-only fields in beside design fields, by PATCH or by the edit form", async () => {
    const trialId = await draftTrial(a);
    const before = await snapshot(trialId);
    for (const extra of [{ primaryScorerId: null }, { scoreRule: "consensus" }, { scorers: [{ userId: a.users.researcher.id, blind: false }] }]) {
      const res = await http.researcher.fetch(`/api/trials/${trialId}`, json({ hypothesis: "Changed by the researcher.", ...extra }));
      expect({ extra, status: res.status }).toEqual({ extra, status: 403 });
    }
    const viaForm = await updateTrialAction.withIdentity(a.as("researcher"), {
      trialId, title: "Team trial", question: "Who may change the team of this trial?", "chamberIds[]": [], "treatmentIds[]": [], replicatesPerArm: "1",
      planKind: "custom", customDays: "0 7", scorersIncluded: "1", "scorerIds[]": [a.users.researcher.id], scoreRule: "primary-scorer", primaryScorerId: a.users.researcher.id,
    });
    expect(viaForm.ok).toBe(false);
    expect(await snapshot(trialId)).toEqual(before);
  });

  it("a technician or observer PATCHing technicians gets 403; the researcher may, the lead may set the primary scorer", async () => {
    const trialId = await draftTrial(a);
    const before = await snapshot(trialId);
    for (const role of ["technician", "observer"] as const) {
      expect((await http[role].fetch(`/api/trials/${trialId}`, json({ technicianIds: [a.users[role].id] }))).status).toBe(403);
    }
    expect(await snapshot(trialId)).toEqual(before);
    const ok = await http.researcher.fetch(`/api/trials/${trialId}`, json({ technicianIds: [a.users.researcher.id] }));
    expect(ok.status).toBe(200);
    const lead = await http.lead.fetch(`/api/trials/${trialId}`, json({ primaryScorerId: a.users.lead.id }));
    expect(lead.status).toBe(200);
    expect((await snapshot(trialId)).trial.primaryScorerId).toBe(a.users.lead.id);
  });
});

describe("every named person is a current member of the lab who can do the job", () => {
  it("a user of another lab, a made-up id or an observer as technician, scorer or primary scorer: 422, nothing changes", async () => {
    const trialId = await draftTrial(a);
    const before = await snapshot(trialId);
    const outsider = b.users.technician.id;
    const madeUp = crypto.randomUUID();
    const cases: { body: Record<string, unknown>; field: string; says: RegExp }[] = [
      { body: { technicianIds: [a.users.technician.id, outsider] }, field: "technicianIds", says: /Not a member of this lab/ },
      { body: { technicianIds: [madeUp] }, field: "technicianIds", says: /Not a member of this lab/ },
      { body: { technicianIds: [a.users.observer.id] }, field: "technicianIds", says: /Observers cannot record inspections/ },
      { body: { scorers: [{ userId: outsider, blind: true }], scoreRule: "consensus" }, field: "scorers", says: /Not a member of this lab/ },
      { body: { scorers: [{ userId: madeUp, blind: false }], scoreRule: "consensus" }, field: "scorers", says: /Not a member of this lab/ },
      { body: { scorers: [{ userId: a.users.observer.id, blind: false }], scoreRule: "consensus" }, field: "scorers", says: /Observers cannot score/ },
      { body: { primaryScorerId: outsider }, field: "primaryScorerId", says: /Not a member of this lab/ },
      { body: { primaryScorerId: madeUp }, field: "primaryScorerId", says: /Not a member of this lab/ },
      { body: { primaryScorerId: a.users.observer.id }, field: "primaryScorerId", says: /Observers cannot score/ },
      // A member who can score but is not one of this trial's scorers.
      { body: { primaryScorerId: a.users.researcher.id }, field: "primaryScorerId", says: /one of the trial's scorers/ },
      // New scorers that leave out the current primary scorer (the technician), naming no new one.
      { body: { scorers: [{ userId: a.users.lead.id, blind: false }] }, field: "primaryScorerId", says: /Choose one of the new scorers/ },
      // The design PATCH path (a design field beside the team field) checks the same.
      { body: { hypothesis: "Outsiders help.", technicianIds: [outsider] }, field: "technicianIds", says: /Not a member of this lab/ },
      { body: { hypothesis: "Outsiders score.", primaryScorerId: madeUp }, field: "primaryScorerId", says: /Not a member of this lab/ },
    ];
    for (const c of cases) {
      const res = await http.lead.fetch(`/api/trials/${trialId}`, json(c.body));
      const body = await res.json();
      expect({ body: c.body, status: res.status }).toEqual({ body: c.body, status: 422 });
      expect({ body: c.body, field: body.error.fields?.[c.field]?.[0] }).toEqual({ body: c.body, field: expect.stringMatching(c.says) });
      expect(body.error.message).toMatch(/Nothing was saved/);
    }
    expect(await snapshot(trialId)).toEqual(before);
  });

  it("the team forms and the Scoring tab refuse the same people, and change nothing", async () => {
    const trialId = await draftTrial(a);
    const before = await snapshot(trialId);
    const outsider = b.users.lead.id;
    const tech = await updateTechniciansAction.withIdentity(a.as("researcher"), { trialId, "technicianIds[]": [outsider] });
    expect(tech.errors?.technicianIds?.[0]).toMatch(/Not a member of this lab/);
    const scorers = await updateScorersAction.withIdentity(a.as("lead"), { trialId, scorersIncluded: "1", "scorerIds[]": [a.users.observer.id], scoreRule: "consensus" });
    expect(scorers.errors?.scorers?.[0]).toMatch(/Observers cannot score/);
    const assign = await assignScorerAction.withIdentity(a.as("lead"), { trialId, userId: outsider, blind: "on" });
    expect(assign.ok).toBe(false);
    expect(assign.errors?.userId?.[0]).toMatch(/Not a member of this lab/);
    const rule = await setScoreRuleAction.withIdentity(a.as("lead"), { trialId, scoreRule: "primary-scorer", primaryScorerId: a.users.observer.id });
    expect(rule.errors?.primaryScorerId?.[0]).toMatch(/Observers cannot score/);
    const ruleOutsider = await setScoreRuleAction.withIdentity(a.as("lead"), { trialId, scoreRule: "primary-scorer", primaryScorerId: crypto.randomUUID() });
    expect(ruleOutsider.errors?.primaryScorerId?.[0]).toMatch(/Not a member of this lab/);
    // On the Scoring tab too, the primary scorer must be one of the trial's scorers.
    const ruleNotScorer = await setScoreRuleAction.withIdentity(a.as("lead"), { trialId, scoreRule: "primary-scorer", primaryScorerId: a.users.researcher.id });
    expect(ruleNotScorer.errors?.primaryScorerId?.[0]).toMatch(/one of the trial's scorers/);
    expect(await snapshot(trialId)).toEqual(before);
  });

  it("a member removed from the lab can no longer be named", async () => {
    const trialId = await draftTrial(a);
    const leaver = await createTestLab("Team leaver");
    await db.insert(s.memberships).values({ userId: leaver.users.technician.id, labId: a.labId, role: "technician" });
    expect((await http.lead.fetch(`/api/trials/${trialId}`, json({ technicianIds: [leaver.users.technician.id] }))).status).toBe(200);
    await db.delete(s.memberships).where(and(eq(s.memberships.userId, leaver.users.technician.id), eq(s.memberships.labId, a.labId)));
    const before = await snapshot(trialId);
    const res = await http.lead.fetch(`/api/trials/${trialId}`, json({ scorers: [{ userId: leaver.users.technician.id, blind: false }], scoreRule: "consensus" }));
    expect(res.status).toBe(422);
    expect(await snapshot(trialId)).toEqual(before);
  });
});
