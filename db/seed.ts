// Load the demo scenario (experiments/demo-lab.ts). `--if-empty` does nothing when users exist.
import { count } from "drizzle-orm";
import { allocateByLabel } from "@/lib/allocation/allocate";
import { createRng, randomNormal } from "@/lib/allocation/prng";
import { hashPassword } from "@/lib/auth/password";
import { astmD610Grade, isoRustDegree } from "@/lib/scoring/grades";
import { planDays } from "@/lib/schedule/plans";
import {
  DEMO_PASSWORD, demoAreaPercent, demoChambers, demoCourse, demoLab, demoReading, demoSpecimenHistory, demoSpecimens, demoTrial, demoTreatments, demoUsers,
} from "@/experiments/demo-lab";
import { recordAudit } from "./audit";
import { closeDb, db } from "./client";
import { seedLadder } from "./seed-ladder";
import { seedDemoPhotos } from "./seed-photos";
import { seedStore } from "./seed-store";
import * as s from "./schema";

const DAY = 86_400_000;

async function main() {
  if (process.argv.includes("--if-empty")) {
    const [{ n }] = await db.select({ n: count() }).from(s.users);
    if (n > 0) {
      console.log("[seed] database already has users; leaving it as it is");
      return;
    }
  }
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const now = new Date();
  const start = new Date(Math.floor((now.getTime() - demoTrial.startedDaysAgo * DAY) / 3_600_000) * 3_600_000);
  start.setUTCHours(9, 0, 0, 0);

  const ids = await db.transaction(async (tx) => {
    const [lab] = await tx.insert(s.labs).values(demoLab).returning();
    const users: Record<string, string> = {};
    for (const u of demoUsers) {
      const [row] = await tx.insert(s.users).values({ name: u.name, email: u.email, passwordHash }).returning();
      users[u.key] = row.id;
      await tx.insert(s.memberships).values({ userId: row.id, labId: lab.id, role: u.role });
    }
    const chambers: Record<string, string> = {};
    for (const c of demoChambers) {
      const [row] = await tx.insert(s.chambers).values({
        labId: lab.id, name: c.name, kind: c.kind, saltId: c.saltId ?? null, desiccantKind: c.desiccantKind ?? null,
        desiccantMassG: c.desiccantMassG ?? null, nominalTempC: c.nominalTempC, volumeL: c.volumeL,
        setpointRhPercent: c.setpointRhPercent, toleranceRhPercent: c.toleranceRhPercent, notes: c.notes,
        airExchangePerDay: 0.05, roomRhPercent: 45, createdBy: users.researcher,
      }).returning();
      chambers[c.key] = row.id;
    }
    const treatments: Record<string, string> = {};
    for (const t of demoTreatments) {
      const [row] = await tx.insert(s.treatments).values({ labId: lab.id, name: t.name, kind: t.kind, description: t.description, protocol: t.protocol, createdBy: users.researcher }).returning();
      treatments[t.key] = row.id;
    }
    const specimenRows = await tx.insert(s.specimens).values(demoSpecimens().map((sp) => ({ ...sp, labId: lab.id, createdBy: users.researcher }))).returning();
    const dayOf = (daysBefore: number) => new Date(start.getTime() - daysBefore * DAY).toISOString().slice(0, 10);
    const history = demoSpecimens().map((sp, i) => ({ specimenId: specimenRows[i].id, ...demoSpecimenHistory(sp) }));
    await tx.insert(s.chlorideTests).values(history.map((h) => ({ labId: lab.id, specimenId: h.specimenId, testedOn: dayOf(h.chloride.daysBeforeStart), method: h.chloride.method, result: h.chloride.result, createdBy: users.technician })));
    await tx.insert(s.massMeasurements).values(history.map((h) => ({ labId: lab.id, specimenId: h.specimenId, measuredOn: dayOf(h.weighing.daysBeforeStart), massG: h.weighing.massG, createdBy: users.technician })));

    const [trial] = await tx.insert(s.trials).values({
      labId: lab.id, title: demoTrial.title, question: demoTrial.question, hypothesis: demoTrial.hypothesis,
      status: "running", replicatesPerArm: demoTrial.replicatesPerArm, allocationSeed: demoTrial.allocationSeed,
      blockByMaterial: true, schedulePlan: demoTrial.schedulePlan, scoreRule: "primary-scorer", primaryScorerId: users.technician,
      photoProtocol: demoTrial.photoProtocol, startedAt: start, createdBy: users.researcher,
    }).returning();
    const arms: { id: string; label: string; chamberKey: string; treatmentKey: string }[] = [];
    for (const c of demoChambers) {
      for (const t of demoTreatments) {
        const [row] = await tx.insert(s.trialArms).values({ labId: lab.id, trialId: trial.id, chamberId: chambers[c.key], treatmentId: treatments[t.key], label: `${c.name.split(" · ")[1]} / ${t.name}` }).returning();
        arms.push({ id: row.id, label: row.label, chamberKey: c.key, treatmentKey: t.key });
      }
    }
    await tx.insert(s.trialMembers).values([
      { trialId: trial.id, userId: users.technician, labId: lab.id, role: "technician", blind: false },
      { trialId: trial.id, userId: users.technician, labId: lab.id, role: "scorer", blind: false },
      { trialId: trial.id, userId: users.scorer, labId: lab.id, role: "technician", blind: false },
      { trialId: trial.id, userId: users.scorer, labId: lab.id, role: "scorer", blind: true },
    ]);
    // By labels, as the allocation form does: the same seed gives the same allocation on every installation.
    const { assignments: assignment } = allocateByLabel({
      specimens: specimenRows,
      arms: arms.map((a) => ({ id: a.id, label: a.label, chamberId: chambers[a.chamberKey] })),
      seed: demoTrial.allocationSeed,
      blockBy: "materialClass",
    });
    const armById = new Map(arms.map((a) => [a.id, a]));
    const placementRows = await tx.insert(s.placements).values(assignment.map((a) => {
      const arm = armById.get(a.armId)!;
      return { labId: lab.id, trialId: trial.id, specimenId: a.specimenId, armId: a.armId, chamberId: chambers[arm.chamberKey], treatmentId: treatments[arm.treatmentKey], fromAt: start, reason: "Random allocation" };
    })).returning();
    // The allocation table the trial pages show (the draft record the placements came from).
    const classOf = new Map(specimenRows.map((r) => [r.id, r.materialClass]));
    await tx.insert(s.trialAllocations).values(assignment.map((a) => ({ labId: lab.id, trialId: trial.id, specimenId: a.specimenId, armId: a.armId, blockKey: classOf.get(a.specimenId) ?? "" })));

    const days = planDays(demoTrial.schedulePlan);
    const inspectionRows = await tx.insert(s.inspections).values(days.map((d) => {
      const plannedAt = new Date(start.getTime() + d * DAY);
      const done = plannedAt.getTime() + 3_600_000 < now.getTime();
      return { labId: lab.id, trialId: trial.id, dayNumber: d, plannedAt, doneAt: done ? new Date(plannedAt.getTime() + 3_600_000) : null, doneBy: done ? users.technician : null };
    })).returning();

    // Scores: the primary scorer's are the record; the blind second scorer differs a little.
    const scoreRng = createRng("tarrow-scores");
    const specimenIndex = new Map(specimenRows.map((r, i) => [r.id, i]));
    const scoreValues: (typeof s.scores.$inferInsert)[] = [];
    for (const insp of inspectionRows.filter((i) => i.doneAt)) {
      for (const p of placementRows) {
        const arm = armById.get(p.armId!)!;
        const course = demoCourse(arm.chamberKey, arm.treatmentKey, specimenIndex.get(p.specimenId)!);
        const area = demoAreaPercent(course, insp.dayNumber);
        const weeping = course.weepingFromDay != null && insp.dayNumber >= course.weepingFromDay;
        for (const [scorer, blind] of [[users.technician, false], [users.scorer, true]] as const) {
          const noisy = area === 0 ? (blind && scoreRng() < 0.03 ? 0.01 : 0) : Math.max(0, Math.round(area * (1 + randomNormal(scoreRng) * (blind ? 0.2 : 0.05)) * 1000) / 1000);
          scoreValues.push({
            labId: lab.id, trialId: trial.id, inspectionId: insp.id, specimenId: p.specimenId, scorerId: scorer, blind,
            spotCount: noisy === 0 ? 0 : Math.max(1, Math.round(Math.sqrt(noisy) * 6)), areaPercent: noisy,
            astmGrade: astmD610Grade(noisy), astmLetter: noisy === 0 ? null : "S", isoDegree: isoRustDegree(noisy),
            weeping, silicateChange: "none", isRecord: !blind,
          });
        }
      }
    }
    for (let i = 0; i < scoreValues.length; i += 1000) await tx.insert(s.scores).values(scoreValues.slice(i, i + 1000));

    // Hourly readings for every chamber since the start, with an excursion at each inspection.
    const openingHours = inspectionRows.filter((i) => i.doneAt).map((i) => (i.doneAt!.getTime() - start.getTime()) / 3_600_000);
    const hours = Math.floor((now.getTime() - start.getTime()) / 3_600_000);
    for (const c of demoChambers) {
      const rng = createRng(`climate-${c.key}`);
      const rows: (typeof s.readings.$inferInsert)[] = [];
      for (let h = 0; h <= hours; h++) {
        const r = demoReading(c, h, openingHours, rng);
        rows.push({ labId: lab.id, chamberId: chambers[c.key], takenAt: new Date(start.getTime() + h * 3_600_000), rhPercent: r.rhPercent, tempC: r.tempC, source: "csv", instrument: `logger-${c.key}` });
      }
      for (let i = 0; i < rows.length; i += 2000) await tx.insert(s.readings).values(rows.slice(i, i + 2000));
    }
    await tx.insert(s.desiccantEvents).values([
      { labId: lab.id, chamberId: chambers.sieve, kind: "charged", at: new Date(start.getTime() - DAY), massG: 150, notes: "Fresh sieve, regenerated at 250 °C for 4 h and cooled in a sealed tin.", createdBy: users.technician },
      { labId: lab.id, chamberId: chambers.sieve, kind: "checked", at: new Date(start.getTime() + 28 * DAY), massG: 152.4, notes: "Weighed: +2.4 g taken up.", createdBy: users.technician },
    ]);
    await seedLadder(tx, { labId: lab.id, users, treatments, now });
    await seedStore(tx, { labId: lab.id, users, now });
    await recordAudit(tx, { labId: lab.id, userId: users.lead, entity: "lab", entityId: lab.id, action: "create", summary: "Demo scenario loaded", after: { specimens: specimenRows.length, inspections: inspectionRows.length } });
    return { labId: lab.id, trialId: trial.id, technicianId: users.technician, start };
  });
  await seedDemoPhotos(ids);
  console.log(`[seed] demo lab "${demoLab.name}" loaded; sign in as lead@tarrow.example / ${DEMO_PASSWORD}`);
}

main()
  .then(() => closeDb())
  .catch(async (err) => {
    console.error("[seed] failed:", err instanceof Error ? err.stack : err);
    await closeDb();
    process.exit(1);
  });
