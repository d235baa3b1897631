// A hand-built trial with moved specimens, for the delayed-entry tests: two chambers (33 %RH and
// 75 %RH), one treatment, inspections done at days 0, 7, 14 and 28; two specimens move from the dry
// jar to the wet one at day 10, one of them already rusted. Its primary outcome is time to weeping.
import crypto from "node:crypto";
import { db } from "@/db/client";
import * as s from "@/db/schema";
import type { TestLab } from "../support/db";

const DAY = 86_400_000;

export const MOVE_DAY = 10;

export interface MovedTrial {
  trialId: string;
  chambers: { dry: string; wet: string };
  specimens: { movedClean: string; movedRusted: string; dryRusts: string; dryClean: string; wetClean: string };
}

export async function buildMovedTrial(lab: TestLab): Promise<MovedTrial> {
  const tag = crypto.randomBytes(3).toString("hex");
  const start = new Date(Date.UTC(2026, 1, 2, 9, 0, 0));
  const at = (day: number) => new Date(start.getTime() + day * DAY);
  const [dry, wet] = await db.insert(s.chambers).values([
    { labId: lab.labId, name: `Jar MgCl2 ${tag}`, kind: "saturated-salt", saltId: "MgCl2", nominalTempC: 21, setpointRhPercent: 33, toleranceRhPercent: 2, volumeL: 2 },
    { labId: lab.labId, name: `Jar NaCl ${tag}`, kind: "saturated-salt", saltId: "NaCl", nominalTempC: 21, setpointRhPercent: 75.4, toleranceRhPercent: 2, volumeL: 2 },
  ]).returning();
  const [control] = await db.insert(s.treatments).values({ labId: lab.labId, name: `Bare ${tag}`, kind: "control" }).returning();
  const keys = ["movedClean", "movedRusted", "dryRusts", "dryClean", "wetClean"] as const;
  const rows = await db.insert(s.specimens).values(keys.map((k, i) => ({
    labId: lab.labId, label: `MV-${i + 1}-${k}-${tag}`, materialClass: "iron-meteorite" as const, massG: 10 + i,
  }))).returning();
  const spec = Object.fromEntries(keys.map((k, i) => [k, rows[i].id])) as MovedTrial["specimens"];
  const [trial] = await db.insert(s.trials).values({
    labId: lab.labId, title: `Moved specimens ${tag}`, question: "Does moving to a wetter jar bring weeping on sooner?",
    status: "running", schedulePlan: { kind: "custom", days: [0, 7, 14, 28] }, startedAt: start, createdBy: lab.users.researcher.id,
    primaryOutcome: "time-to-weeping",
  }).returning();
  const place = (specimenId: string, chamberId: string, from: number, to: number | null) => ({
    labId: lab.labId, trialId: trial.id, specimenId, chamberId, treatmentId: control.id, fromAt: at(from), toAt: to === null ? null : at(to),
  });
  await db.insert(s.placements).values([
    place(spec.movedClean, dry.id, 0, MOVE_DAY), place(spec.movedClean, wet.id, MOVE_DAY, null),
    place(spec.movedRusted, dry.id, 0, MOVE_DAY), place(spec.movedRusted, wet.id, MOVE_DAY, null),
    place(spec.dryRusts, dry.id, 0, null), place(spec.dryClean, dry.id, 0, null), place(spec.wetClean, wet.id, 0, null),
  ]);
  const days = [0, 7, 14, 28];
  const inspectionRows = await db.insert(s.inspections).values(days.map((d) => ({
    labId: lab.labId, trialId: trial.id, dayNumber: d, plannedAt: at(d), doneAt: at(d), doneBy: lab.users.technician.id,
  }))).returning();
  const byDay = new Map(inspectionRows.map((r) => [r.dayNumber, r.id]));
  const score = (day: number, specimenId: string, v: { area?: number; weeping?: boolean } = {}) => ({
    labId: lab.labId, trialId: trial.id, inspectionId: byDay.get(day)!, specimenId, scorerId: lab.users.technician.id,
    blind: false, isRecord: true, spotCount: (v.area ?? 0) > 0 ? 1 : 0, areaPercent: v.area ?? 0, weeping: v.weeping ?? false,
    astmGrade: (v.area ?? 0) > 0 ? 8 : 10,
  });
  await db.insert(s.scores).values([
    // Clean in the dry jar at days 0 and 7, moved at day 10, rust and weeping at day 14 in the wet jar.
    score(0, spec.movedClean), score(7, spec.movedClean), score(14, spec.movedClean, { area: 0.3, weeping: true }), score(28, spec.movedClean, { area: 1 }),
    // Rusted in the dry jar by day 7, then moved: still rusted in the wet jar.
    score(0, spec.movedRusted), score(7, spec.movedRusted, { area: 0.2 }), score(14, spec.movedRusted, { area: 0.6 }), score(28, spec.movedRusted, { area: 2, weeping: true }),
    score(0, spec.dryRusts), score(7, spec.dryRusts), score(14, spec.dryRusts, { area: 0.1 }), score(28, spec.dryRusts, { area: 0.4 }),
    score(0, spec.dryClean), score(7, spec.dryClean), score(14, spec.dryClean), score(28, spec.dryClean),
    score(0, spec.wetClean), score(7, spec.wetClean), score(14, spec.wetClean), score(28, spec.wetClean),
  ]);
  return { trialId: trial.id, chambers: { dry: dry.id, wet: wet.id }, specimens: spec };
}
