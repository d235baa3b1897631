// A hand-built trial for the analysis tests: one chamber, two treatments, four specimens, inspections
// done at exact whole days after the start, and scores written so each outcome is known in advance.
import crypto from "node:crypto";
import { db } from "@/db/client";
import * as s from "@/db/schema";
import type { TestLab } from "../support/db";

const DAY = 86_400_000;

export interface HandTrial {
  trialId: string;
  start: Date;
  /** Done inspection days in order; day 56 is planned but not done. */
  doneDays: number[];
  specimens: { rustsAt3rd: string; neverRusts: string; weepsAt2nd: string; unscored: string };
  labels: Record<"rustsAt3rd" | "neverRusts" | "weepsAt2nd" | "unscored", string>;
  treatments: { control: string; wax: string };
  chamberId: string;
}

export async function buildHandTrial(lab: TestLab): Promise<HandTrial> {
  const tag = crypto.randomBytes(3).toString("hex");
  const start = new Date(Date.UTC(2026, 0, 5, 9, 0, 0));
  const [chamber] = await db.insert(s.chambers).values({
    labId: lab.labId, name: `Jar NaCl ${tag}`, kind: "saturated-salt", saltId: "NaCl", nominalTempC: 21,
    setpointRhPercent: 75.4, toleranceRhPercent: 2, volumeL: 2,
  }).returning();
  const [control, wax] = await db.insert(s.treatments).values([
    { labId: lab.labId, name: `Bare control ${tag}`, kind: "control" },
    { labId: lab.labId, name: `Wax film ${tag}`, kind: "coating" },
  ]).returning();
  const keys = ["rustsAt3rd", "neverRusts", "weepsAt2nd", "unscored"] as const;
  const specimenRows = await db.insert(s.specimens).values(keys.map((k, i) => ({
    labId: lab.labId, label: `HT-${i + 1}-${k}-${tag}`, materialClass: i === 2 ? "stony-iron" as const : "iron-meteorite" as const, massG: 10 + i,
  }))).returning();
  const spec = Object.fromEntries(keys.map((k, i) => [k, specimenRows[i].id])) as HandTrial["specimens"];
  const labels = Object.fromEntries(keys.map((k, i) => [k, specimenRows[i].label])) as HandTrial["labels"];

  const [trial] = await db.insert(s.trials).values({
    labId: lab.labId, title: `Hand-built trial ${tag}`, question: "Does a wax film delay first rust at 75 %RH?",
    status: "running", schedulePlan: { kind: "custom", days: [0, 7, 14, 28, 56] }, startedAt: start, createdBy: lab.users.researcher.id,
  }).returning();
  const treatmentOf = { rustsAt3rd: control.id, neverRusts: control.id, weepsAt2nd: wax.id, unscored: wax.id };
  await db.insert(s.placements).values(keys.map((k) => ({
    labId: lab.labId, trialId: trial.id, specimenId: spec[k], chamberId: chamber.id, treatmentId: treatmentOf[k], fromAt: start,
  })));
  const doneDays = [0, 7, 14, 28];
  const inspectionRows = await db.insert(s.inspections).values([...doneDays, 56].map((d) => ({
    labId: lab.labId, trialId: trial.id, dayNumber: d, plannedAt: new Date(start.getTime() + d * DAY),
    doneAt: d === 56 ? null : new Date(start.getTime() + d * DAY), doneBy: d === 56 ? null : lab.users.technician.id,
  }))).returning();
  const byDay = new Map(inspectionRows.map((r) => [r.dayNumber, r.id]));

  const recordScorer = lab.users.technician.id;
  const blindScorer = lab.users.researcher.id;
  const score = (day: number, specimen: string, v: { area?: number; weeping?: boolean; grade?: number; record?: boolean; scorer?: string }) => ({
    labId: lab.labId, trialId: trial.id, inspectionId: byDay.get(day)!, specimenId: specimen,
    scorerId: v.scorer ?? recordScorer, blind: v.record === false, isRecord: v.record ?? true,
    spotCount: (v.area ?? 0) > 0 ? 2 : 0, areaPercent: v.area ?? 0, weeping: v.weeping ?? false, astmGrade: v.grade ?? 10,
  });
  await db.insert(s.scores).values([
    // Clean at days 0 and 7, rust first seen at the 3rd inspection (day 14), growing by day 28.
    score(0, spec.rustsAt3rd, {}), score(7, spec.rustsAt3rd, {}), score(14, spec.rustsAt3rd, { area: 0.2, grade: 7 }), score(28, spec.rustsAt3rd, { area: 1.5, grade: 5 }),
    // Never rusted in the record, although a blind second scorer saw a spot at day 14 and an
    // undone inspection carries a stray rusted score: neither may count.
    score(0, spec.neverRusts, {}), score(7, spec.neverRusts, {}), score(14, spec.neverRusts, {}), score(28, spec.neverRusts, {}),
    score(14, spec.neverRusts, { area: 0.05, grade: 8, record: false, scorer: blindScorer }),
    score(56, spec.neverRusts, { area: 3 }),
    // Weeping alone at the 2nd inspection counts as rust.
    score(0, spec.weepsAt2nd, {}), score(7, spec.weepsAt2nd, { weeping: true }),
    // Blind second scores that agree with the record.
    score(0, spec.rustsAt3rd, { record: false, scorer: blindScorer }), score(14, spec.rustsAt3rd, { area: 0.25, grade: 7, record: false, scorer: blindScorer }),
  ]);
  await db.insert(s.readings).values([
    { labId: lab.labId, chamberId: chamber.id, takenAt: new Date(start.getTime() - DAY), rhPercent: 45, tempC: 21, source: "manual", instrument: `h-${tag}` },
    { labId: lab.labId, chamberId: chamber.id, takenAt: new Date(start.getTime() + DAY), rhPercent: 75.1, tempC: 21, source: "manual", instrument: `h-${tag}` },
    { labId: lab.labId, chamberId: chamber.id, takenAt: new Date(start.getTime() + 2 * DAY), rhPercent: 75.6, tempC: 21.2, source: "manual", instrument: `h-${tag}` },
  ]);
  await db.insert(s.photos).values({
    labId: lab.labId, trialId: trial.id, inspectionId: byDay.get(14)!, specimenId: spec.rustsAt3rd, objectKey: `labs/${lab.labId}/photos/${tag}.jpg`,
    filename: "face, day 14.jpg", status: "ready", contentType: "image/jpeg", sizeBytes: 123_456, sha256: "ab".repeat(32),
    capturedAt: new Date(start.getTime() + 14 * DAY + 600_000), uploadedBy: recordScorer,
  });
  return { trialId: trial.id, start, doneDays, specimens: spec, labels, treatments: { control: control.id, wax: wax.id }, chamberId: chamber.id };
}
