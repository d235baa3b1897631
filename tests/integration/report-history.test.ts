// The trial report's history table on the real database: every placed specimen once, with its
// origin, its findings and treatments before the start day, its first weighing and its mass change
// over the trial, each recomputed by hand from the rows inserted here (direct recomputation).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { loadTrialHistory } from "@/db/queries/specimen-history";
import { getTrial } from "@/db/queries/trial-access";
import { createTestLab, type TestLab } from "../support/db";
import { buildHandTrial, type HandTrial } from "./analysis-fixtures";

let lab: TestLab;
let other: TestLab;
let hand: HandTrial;

beforeAll(async () => {
  lab = await createTestLab("Report history lab");
  other = await createTestLab("Report history other lab");
  hand = await buildHandTrial(lab); // started 2026-01-05 09:00 UTC, still running
  const sp = hand.specimens;
  const own = { labId: lab.labId };
  await db.update(s.specimens).set({ parentPiece: "Esker Holloway end piece", slice: "B2" }).where(eq(s.specimens.id, sp.rustsAt3rd));
  await db.insert(s.chlorideTests).values([
    { ...own, specimenId: sp.rustsAt3rd, testedOn: "2025-12-01", method: "silver-nitrate-spot", result: "present" },
    { ...own, specimenId: sp.neverRusts, testedOn: "2025-12-01", method: "chloride-strip", result: "absent" },
    { ...own, specimenId: sp.neverRusts, testedOn: "2026-02-01", method: "chloride-strip", result: "present" }, // during the trial
  ]);
  await db.insert(s.akaganeiteChecks).values({ ...own, specimenId: sp.rustsAt3rd, checkedOn: "2025-12-02", method: "microscope", seen: true });
  await db.insert(s.priorTreatments).values({ ...own, specimenId: sp.weepsAt2nd, treatedOn: "2025-11-15", treatment: "Rinsed in deionised water" });
  await db.insert(s.massMeasurements).values([
    { ...own, specimenId: sp.rustsAt3rd, measuredOn: "2025-12-20", massG: "10.2000" },
    { ...own, specimenId: sp.rustsAt3rd, measuredOn: "2026-01-05", massG: "10.1990" },
    { ...own, specimenId: sp.rustsAt3rd, measuredOn: "2026-02-04", massG: "10.2015" },
  ]);
});
afterAll(() => closeDb());

describe("the report's specimen history", () => {
  it("gives each placed specimen's origin, history before the start and mass change over the trial", async () => {
    const trial = await getTrial({ labId: lab.labId, trialId: hand.trialId });
    const rows = await loadTrialHistory({ labId: lab.labId, trial });
    const by = new Map(rows.map((r) => [r.id, r]));
    expect(rows.map((r) => r.label)).toEqual(Object.values(hand.labels).sort());
    const rusts = by.get(hand.specimens.rustsAt3rd)!;
    expect(rusts).toMatchObject({ parentPiece: "Esker Holloway end piece", slice: "B2", chlorideState: "present", akaganeiteSeen: true, priorTreatments: [] });
    expect(rusts.firstWeighing).toEqual({ measuredOn: "2025-12-20", massG: "10.2000" });
    // Baseline: the start-day weighing 10.1990 g; last: 10.2015 g on 2026-02-04, 30 days later.
    // +0.0025 g; 0.0025 / 10.1990 × 100 = 0.0245122 %.
    expect(rusts.trialChange!.step.days).toBe(30);
    expect(rusts.trialChange!.step.changeG).toBeCloseTo(0.0025, 10);
    expect(rusts.trialChange!.step.changePercent).toBeCloseTo(0.0245122, 6);
    expect(by.get(hand.specimens.neverRusts)).toMatchObject({ chlorideState: "absent", akaganeiteSeen: null, firstWeighing: null, trialChange: null });
    expect(by.get(hand.specimens.weepsAt2nd)).toMatchObject({ chlorideState: "untested", priorTreatments: ["Rinsed in deionised water"] });
  });

  it("reads nothing of the trial from another lab", async () => {
    const trial = await getTrial({ labId: lab.labId, trialId: hand.trialId });
    expect(await loadTrialHistory({ labId: other.labId, trial })).toEqual([]);
  });
});
