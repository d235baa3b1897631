// Agreement between scorers on demo-like data: the page's figures are exactly lib/stats on the same
// paired vectors; one scorer alone gives the empty state.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { ASTM_CATEGORIES, scorerAgreement } from "@/db/queries/scores-agreement";
import { demoAreaPercent, demoCourse } from "@/experiments/demo-lab";
import { createRng, randomNormal } from "@/lib/allocation/prng";
import { astmD610Grade, isoRustDegree } from "@/lib/scoring/grades";
import { blandAltman, cohensKappa } from "@/lib/stats/agreement";
import { createTestLab, type TestLab } from "../support/db";
import { createScoringTrial, type ScoringTrial } from "./scoring-fixtures";

let lab: TestLab;
let t: ScoringTrial;
const primary: { grade: number; area: number }[] = [];
const blind: { grade: number; area: number }[] = [];

beforeAll(async () => {
  lab = await createTestLab("Scoring agreement");
  // Geometric-like schedule and chamber courses as in the demo seed (experiments/demo-lab.ts).
  t = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, primaryScorerId: lab.users.technician.id, specimens: 12, days: [1, 2, 4, 7, 14, 28, 54] });
  const rng = createRng("agreement-test");
  const chambers = ["nacl", "water", "mgcl2"];
  const treatments = ["control", "wax", "lacquer"];
  const rows: (typeof s.scores.$inferInsert)[] = [];
  t.inspectionIds.forEach((inspectionId, k) => {
    t.specimenIds.forEach((specimenId, i) => {
      const area = demoAreaPercent(demoCourse(chambers[i % 3], treatments[Math.floor(i / 4) % 3], i), t.days[k]);
      for (const [scorerId, isBlind] of [[lab.users.technician.id, false], [lab.users.researcher.id, true]] as const) {
        // The same noise model as the seed: the blind second scorer differs more.
        const noisy = area === 0 ? (isBlind && rng() < 0.05 ? 0.01 : 0) : Math.max(0, Math.round(area * (1 + randomNormal(rng) * (isBlind ? 0.2 : 0.05)) * 1000) / 1000);
        const grade = astmD610Grade(noisy);
        (isBlind ? blind : primary).push({ grade, area: noisy });
        rows.push({
          labId: lab.labId, trialId: t.trialId, inspectionId, specimenId, scorerId, blind: isBlind, spotCount: noisy ? 1 : 0, areaPercent: noisy,
          astmGrade: grade, astmLetter: noisy ? "S" : null, isoDegree: isoRustDegree(noisy), isRecord: !isBlind,
        });
      }
    });
  });
  await db.insert(s.scores).values(rows);
});
afterAll(() => closeDb());

describe("scorer agreement", () => {
  it("kappa (unweighted, linear, quadratic; 11 grade categories) and Bland–Altman equal lib/stats on the same vectors", async () => {
    const { scorers, pairs } = await scorerAgreement({ labId: lab.labId, trialId: t.trialId });
    expect(scorers.map((x) => x.n)).toEqual([84, 84]);
    expect(pairs).toHaveLength(1);
    const p = pairs[0];
    // Scorers are ordered by name: "researcher …" (blind) before "technician …" (primary), so a = blind.
    expect(p.a.id).toBe(lab.users.researcher.id);
    const a = blind.map((x) => x.grade);
    const b = primary.map((x) => x.grade);
    expect(p.n).toBe(84);
    expect(ASTM_CATEGORIES).toBe(11);
    expect(p.kappa).toEqual({
      none: cohensKappa(a, b, { categories: 11, weights: "none" }),
      linear: cohensKappa(a, b, { categories: 11, weights: "linear" }),
      quadratic: cohensKappa(a, b, { categories: 11, weights: "quadratic" }),
    });
    expect(p.exactMatches).toBe(a.filter((g, i) => g === b[i]).length);
    const ba = blandAltman(blind.map((x) => x.area), primary.map((x) => x.area));
    expect(p.blandAltman!.n).toBe(ba.n);
    expect(p.blandAltman!.bias).toBeCloseTo(ba.bias, 12);
    expect(p.blandAltman!.lower).toBeCloseTo(ba.lower, 12);
    expect(p.blandAltman!.upper).toBeCloseTo(ba.upper, 12);
    // Demo-like data agree well but not perfectly: weighted kappa above unweighted, both below 1.
    expect(p.kappa!.quadratic).toBeGreaterThan(p.kappa!.none);
    expect(p.kappa!.quadratic).toBeLessThan(1);
  });

  it("with one scorer there is no pair (the page shows its empty state)", async () => {
    const t2 = await createScoringTrial({ labId: lab.labId, createdBy: lab.users.researcher.id, specimens: 1, days: [0, 7] });
    await db.insert(s.scores).values(t2.inspectionIds.map((inspectionId) => ({
      labId: lab.labId, trialId: t2.trialId, inspectionId, specimenId: t2.specimenIds[0], scorerId: lab.users.technician.id, areaPercent: 0, astmGrade: 10, isoDegree: 0,
    })));
    const r = await scorerAgreement({ labId: lab.labId, trialId: t2.trialId });
    expect(r.scorers).toHaveLength(1);
    expect(r.pairs).toEqual([]);
  });
});
