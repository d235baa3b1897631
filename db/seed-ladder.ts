// The demo's finished humidity-ladder trial (experiments/demo-lab.ts): five humidity levels, two jars
// each, bare and waxed slices, scored to the end and concluded, so the humidity response has data.
import { allocateByLabel } from "@/lib/allocation/allocate";
import { createRng, randomNormal } from "@/lib/allocation/prng";
import { saltEquilibriumRh, type SaltId } from "@/lib/humidity/salts";
import { astmD610Grade, isoRustDegree } from "@/lib/scoring/grades";
import { demoAreaPercent, demoReading, demoTreatments, ladderChambers, ladderCourse, ladderSpecimens, ladderTreatmentKeys, ladderTrial } from "@/experiments/demo-lab";
import { recordAudit } from "./audit";
import type { Tx } from "./client";
import * as s from "./schema";

const DAY = 86_400_000;
const HOUR = 3_600_000;

export async function seedLadder(tx: Tx, { labId, users, treatments, now }: {
  labId: string; users: Record<string, string>; treatments: Record<string, string>; now: Date;
}) {
  const start = new Date(Math.floor((now.getTime() - ladderTrial.startedDaysAgo * DAY) / HOUR) * HOUR);
  start.setUTCHours(9, 0, 0, 0);
  const end = new Date(start.getTime() + ladderTrial.concludedAfterDays * DAY);
  const jars = ladderChambers((salt) => saltEquilibriumRh(salt as SaltId, 21).rhPercent);

  const chamberIds: Record<string, string> = {};
  for (const c of jars) {
    const [row] = await tx.insert(s.chambers).values({
      labId, name: c.name, kind: c.kind, saltId: c.saltId ?? null, nominalTempC: c.nominalTempC, volumeL: c.volumeL,
      setpointRhPercent: c.setpointRhPercent, toleranceRhPercent: c.toleranceRhPercent, notes: c.notes,
      airExchangePerDay: 0.05, roomRhPercent: 45, createdBy: users.researcher, archivedAt: new Date(end.getTime() + DAY),
    }).returning();
    chamberIds[c.key] = row.id;
  }
  const specimenRows = await tx.insert(s.specimens).values(ladderSpecimens().map((sp) => ({ ...sp, labId, createdBy: users.researcher }))).returning();

  const [trial] = await tx.insert(s.trials).values({
    labId, title: ladderTrial.title, question: ladderTrial.question, hypothesis: ladderTrial.hypothesis,
    status: "concluded", replicatesPerArm: ladderTrial.replicatesPerArm, allocationSeed: ladderTrial.allocationSeed,
    blockByMaterial: true, schedulePlan: { kind: "custom", days: ladderTrial.scheduleDays }, scoreRule: "primary-scorer",
    primaryScorerId: users.technician, photoProtocol: [], startedAt: start, concludedAt: end, createdBy: users.researcher,
  }).returning();
  const treatmentName = new Map(demoTreatments.map((t) => [t.key, t.name]));
  const arms: { id: string; label: string; chamberKey: string; treatmentKey: string; rh: number }[] = [];
  for (const c of jars) {
    for (const t of ladderTreatmentKeys) {
      const label = `${c.name.split(" · ")[0]} / ${treatmentName.get(t)}`;
      const [row] = await tx.insert(s.trialArms).values({ labId, trialId: trial.id, chamberId: chamberIds[c.key], treatmentId: treatments[t], label }).returning();
      arms.push({ id: row.id, label, chamberKey: c.key, treatmentKey: t, rh: c.setpointRhPercent });
    }
  }
  await tx.insert(s.trialMembers).values([
    { trialId: trial.id, userId: users.technician, labId, role: "technician", blind: false },
    { trialId: trial.id, userId: users.technician, labId, role: "scorer", blind: false },
  ]);
  const { assignments } = allocateByLabel({
    specimens: specimenRows,
    arms: arms.map((a) => ({ id: a.id, label: a.label, chamberId: chamberIds[a.chamberKey] })),
    seed: ladderTrial.allocationSeed,
    blockBy: "materialClass",
  });
  const armById = new Map(arms.map((a) => [a.id, a]));
  const placementRows = await tx.insert(s.placements).values(assignments.map((a) => {
    const arm = armById.get(a.armId)!;
    return { labId, trialId: trial.id, specimenId: a.specimenId, armId: a.armId, chamberId: chamberIds[arm.chamberKey], treatmentId: treatments[arm.treatmentKey], fromAt: start, toAt: end, reason: "Random allocation" };
  })).returning();
  const classOf = new Map(specimenRows.map((r) => [r.id, r.materialClass]));
  const labelOf = new Map(specimenRows.map((r) => [r.id, r.label]));
  await tx.insert(s.trialAllocations).values(assignments.map((a) => ({ labId, trialId: trial.id, specimenId: a.specimenId, armId: a.armId, blockKey: classOf.get(a.specimenId) ?? "" })));

  const inspectionRows = await tx.insert(s.inspections).values(ladderTrial.scheduleDays.map((d) => {
    const plannedAt = new Date(start.getTime() + d * DAY);
    return { labId, trialId: trial.id, dayNumber: d, plannedAt, doneAt: new Date(plannedAt.getTime() + HOUR), doneBy: users.technician };
  })).returning();

  const scoreRows: (typeof s.scores.$inferInsert)[] = [];
  for (const insp of inspectionRows) {
    for (const p of placementRows) {
      const arm = armById.get(p.armId!)!;
      const course = ladderCourse(arm.rh, arm.treatmentKey, classOf.get(p.specimenId)!, labelOf.get(p.specimenId)!);
      const area = demoAreaPercent(course, insp.dayNumber);
      const weeping = course.weepingFromDay != null && insp.dayNumber >= course.weepingFromDay;
      scoreRows.push({
        labId, trialId: trial.id, inspectionId: insp.id, specimenId: p.specimenId, scorerId: users.technician, blind: false,
        spotCount: area === 0 ? 0 : Math.max(1, Math.round(Math.sqrt(area) * 6)), areaPercent: area,
        astmGrade: astmD610Grade(area), astmLetter: area === 0 ? null : "S", isoDegree: isoRustDegree(area),
        weeping, silicateChange: "none", isRecord: true,
      });
    }
  }
  for (let i = 0; i < scoreRows.length; i += 1000) await tx.insert(s.scores).values(scoreRows.slice(i, i + 1000));

  // Two-hourly readings while the trial ran, with the opening excursions of every inspection.
  const openingHours = inspectionRows.map((i) => (i.doneAt!.getTime() - start.getTime()) / HOUR);
  const hours = Math.floor((end.getTime() - start.getTime()) / HOUR);
  for (const c of jars) {
    const rng = createRng(`ladder-climate-${c.key}`);
    const offset = randomNormal(rng) * 0.8; // each jar sits a little off its salt's table value
    const rows: (typeof s.readings.$inferInsert)[] = [];
    for (let h = 0; h <= hours; h += 2) {
      const r = demoReading(c, h, openingHours, rng);
      rows.push({ labId, chamberId: chamberIds[c.key], takenAt: new Date(start.getTime() + h * HOUR), rhPercent: Math.max(0.5, Math.min(100, Math.round((r.rhPercent + offset) * 10) / 10)), tempC: r.tempC, source: "csv", instrument: `logger-${c.key}` });
    }
    for (let i = 0; i < rows.length; i += 2000) await tx.insert(s.readings).values(rows.slice(i, i + 2000));
  }
  await recordAudit(tx, { labId, userId: users.lead, entity: "trial", entityId: trial.id, action: "update", summary: "Humidity ladder concluded and locked", after: { status: "concluded", concludedAt: end } });
  return { trialId: trial.id };
}
