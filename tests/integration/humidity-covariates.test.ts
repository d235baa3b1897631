// History covariates on the seeded humidity ladder: the humidity response reads chloride tests and
// weighings dated before the trial's first day (later ones are ignored), leaves out specimens
// without a weighing and says so, and its coefficients for RH and the covariates equal a direct
// Weibull fit of the same intervals on a design built here with other reference levels (the choice
// of reference level for material and treatment moves only their own terms and the intercept).
import { and, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import { loadHumidityResponse } from "@/db/queries/humidity-response";
import { getTrial, type Trial } from "@/db/queries/trial-access";
import { chlorideTests, labs, massMeasurements, placements, specimens, trials } from "@/db/schema";
import { weibullIntervalRegression } from "@/lib/stats/interval-regression";

let labId: string;
let trial: Trial;
let ids: string[];
const dayBefore = (d: Date, n: number) => new Date(d.getTime() - n * 86_400_000).toISOString().slice(0, 10);

beforeAll(async () => {
  const [lab] = await db.select().from(labs).where(eq(labs.name, "Tarrow Valley Natural History Collection"));
  labId = lab.id;
  const [t] = await db.select().from(trials).where(and(eq(trials.labId, labId), eq(trials.title, "Humidity ladder, bare and waxed slices, 2026")));
  trial = await getTrial({ labId, trialId: t.id });
  const placed = await db.selectDistinct({ id: placements.specimenId, label: specimens.label }).from(placements)
    .innerJoin(specimens, eq(specimens.id, placements.specimenId)).where(eq(placements.trialId, trial.id));
  ids = placed.sort((a, b) => (a.label < b.label ? -1 : 1)).map((p) => p.id);
  const start = trial.startedAt!;
  // Invented history: chloride found on every third specimen before the start, and on every fifth
  // only after it (ignored); a weighing of 10.0000 + 0.1234·i g before the start for all but the first two.
  await db.insert(chlorideTests).values(ids.flatMap((specimenId, i) => [
    ...(i % 3 === 0 ? [{ labId, specimenId, testedOn: dayBefore(start, 10), method: "chloride-strip", result: "present" }] : []),
    ...(i % 5 === 1 ? [{ labId, specimenId, testedOn: dayBefore(start, -3), method: "chloride-strip", result: "present" }] : []),
  ]));
  await db.insert(massMeasurements).values(ids.slice(2).map((specimenId, k) => ({ labId, specimenId, measuredOn: dayBefore(start, 5), massG: (10 + 0.1234 * (k + 2)).toFixed(4) })));
});
afterAll(async () => {
  await db.delete(chlorideTests).where(inArray(chlorideTests.specimenId, ids));
  await db.delete(massMeasurements).where(inArray(massMeasurements.specimenId, ids));
  await closeDb();
});

describe("history covariates on the seeded humidity ladder", () => {
  it("uses history dated before the start, and fits the covariates as a direct Weibull fit does", async () => {
    const { response, rows } = await loadHumidityResponse({ labId, trial, options: { p: 0.1, horizonDays: 3652.5, covariates: ["chloride", "initialMass"] } });
    const index = new Map(ids.map((id, i) => [id, i]));
    const labelToIndex = new Map((await db.select({ id: specimens.id, label: specimens.label }).from(specimens).where(inArray(specimens.id, ids))).map((s) => [s.label, index.get(s.id)!]));
    expect(rows.length).toBeGreaterThan(20);
    expect(rows.filter((r) => r.chloridePresent).length).toBeGreaterThan(3);
    for (const r of rows) {
      const i = labelToIndex.get(r.specimenLabel)!;
      expect(r.chloridePresent, r.specimenLabel).toBe(i % 3 === 0);
      expect(r.initialMassG, r.specimenLabel).toBe(i < 2 ? null : Number((10 + 0.1234 * i).toFixed(4)));
    }
    expect(response.warnings[0]).toMatch(/^2 specimens have no weighing before the trial/);
    const kept = rows.filter((r) => r.initialMassG != null);
    expect(response.fit!.n).toBe(kept.length);

    // Direct fit: the last material and the last treatment (by name) as references, mass not centred.
    const materials = [...new Set(kept.map((r) => r.materialClass))].sort().reverse();
    const treatmentNames = [...new Set(kept.map((r) => r.treatmentName))].sort().reverse();
    const direct = weibullIntervalRegression(kept.map((r) => ({
      lower: r.lower, upper: r.upper,
      x: [r.measuredRhPercent, ...materials.slice(1).map((m) => (m === r.materialClass ? 1 : 0)), ...treatmentNames.slice(1).map((t) => (t === r.treatmentName ? 1 : 0)), r.chloridePresent ? 1 : 0, r.initialMassG!],
    })));
    const byName = new Map(response.fit!.coefficients.map((c) => [c.name, c]));
    const k = direct.coefficients.length;
    expect(byName.get("RH (%RH)")!.estimate).toBeCloseTo(direct.coefficients[0], 5);
    expect(byName.get("Chloride found before the trial (vs not found or not tested)")!.estimate).toBeCloseTo(direct.coefficients[k - 2], 5);
    expect(byName.get("Chloride found before the trial (vs not found or not tested)")!.standardError).toBeCloseTo(direct.standardErrors[k - 1], 5);
    expect(byName.get("Initial mass (per g, centred on the mean)")!.estimate).toBeCloseTo(direct.coefficients[k - 1], 5);
    expect(response.fit!.scale).toBeCloseTo(direct.scale, 5);
    expect(response.fit!.logLik).toBeCloseTo(direct.logLik, 6);
  });
});
