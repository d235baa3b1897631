// Fixtures for the trial tests: chambers, treatments and specimens in a fresh test lab.
import crypto from "node:crypto";
import { db } from "@/db/client";
import * as s from "@/db/schema";
import type { TestLab } from "../support/db";

export async function addChambers(lab: TestLab, n: number) {
  const rows = await db.insert(s.chambers).values(Array.from({ length: n }, (_, i) => ({
    labId: lab.labId, name: `Jar ${String.fromCharCode(65 + i)} ${crypto.randomBytes(2).toString("hex")}`, kind: "saturated-salt" as const,
    nominalTempC: 21, setpointRhPercent: 33 + i * 20, toleranceRhPercent: 2,
  }))).returning();
  return rows.map((r) => r.id);
}

export async function addTreatments(lab: TestLab, names: string[]) {
  const rows = await db.insert(s.treatments).values(names.map((name) => ({ labId: lab.labId, name, kind: name.includes("control") ? "control" as const : "coating" as const }))).returning();
  return rows.map((r) => r.id);
}

export async function addSpecimens(lab: TestLab, byClass: Partial<Record<(typeof s.materialClassEnum.enumValues)[number], number>>) {
  const values = Object.entries(byClass).flatMap(([cls, n]) => Array.from({ length: n ?? 0 }, (_, i) => ({
    labId: lab.labId, label: `${cls.slice(0, 3).toUpperCase()}-${i + 1}-${crypto.randomBytes(3).toString("hex")}`,
    materialClass: cls as (typeof s.materialClassEnum.enumValues)[number],
  })));
  const rows = await db.insert(s.specimens).values(values).returning();
  return rows;
}

/** The form input of a trial design, as the browser would send it. */
export function designInput(over: { chamberIds: string[]; treatmentIds: string[]; technicianIds?: string[]; replicatesPerArm?: number } & Record<string, unknown>) {
  return {
    title: `Trial ${crypto.randomBytes(3).toString("hex")}`,
    question: "Does wax delay first rust at 75 %RH compared with bare slices?",
    hypothesis: "",
    primaryOutcome: "time-to-first-rust",
    replicatesPerArm: String(over.replicatesPerArm ?? 2),
    planKind: "fixed",
    intervalDays: "7",
    fixedCount: "4",
    "photoProtocol[]": ["Lighting: diffuse.", "Scale bar in frame."],
    ...over,
    "chamberIds[]": over.chamberIds,
    "treatmentIds[]": over.treatmentIds,
    "technicianIds[]": over.technicianIds ?? [],
  };
}
