// Outcomes derived from scores in the database, and the JSON analysis endpoint's answers and refusals.
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { readSessionIdentity } from "@/lib/auth/session";
import { closeDb } from "@/db/client";
import { getTrialAnalysis, loadSpecimenOutcomes } from "@/db/queries/analysis";
import { getTrial } from "@/db/queries/trial-access";
import { GET as getAnalysis } from "@/app/api/trials/[trialId]/analysis/route";
import { createTestLab, type TestLab } from "../support/db";
import { buildHandTrial, type HandTrial } from "./analysis-fixtures";

vi.mock("@/lib/auth/session", () => ({ readSessionIdentity: vi.fn() }));
const session = vi.mocked(readSessionIdentity);

let lab: TestLab;
let other: TestLab;
let hand: HandTrial;

beforeAll(async () => {
  lab = await createTestLab("Analysis lab");
  other = await createTestLab("Other lab");
  hand = await buildHandTrial(lab);
});
afterAll(async () => {
  await closeDb();
});
beforeEach(() => session.mockReset());

function signInAs(identity: { userId: string; labId: string } | null) {
  session.mockResolvedValue(identity as never);
}
function call(trialId: string, query = "") {
  const req = new Request(`http://localhost/api/trials/${trialId}/analysis${query}`);
  return getAnalysis(req, { params: Promise.resolve({ trialId }) });
}

describe("outcomes from scores of record", () => {
  it("rust first seen at the 3rd inspection gives (day of 2nd, day of 3rd]; never rusted is right-censored at the last clean inspection", async () => {
    const trial = await getTrial({ labId: lab.labId, trialId: hand.trialId });
    const { outcomes, doneInspections } = await loadSpecimenOutcomes({ labId: lab.labId, trial });
    const by = new Map(outcomes.map((o) => [o.specimenId, o]));
    expect(doneInspections).toBe(4);

    const rusted = by.get(hand.specimens.rustsAt3rd)!;
    expect(rusted.interval).toEqual({ lower: 7, upper: 14 });
    expect(rusted.rusted).toBe(true);
    expect(rusted.observations.map((o) => o.day)).toEqual([0, 7, 14, 28]);
    expect(rusted.finalAreaPercent).toBe(1.5);

    // The blind score's spot at day 14 and the rusted score at the undone day-56 inspection are ignored.
    const clean = by.get(hand.specimens.neverRusts)!;
    expect(clean.interval).toEqual({ lower: 28, upper: null });
    expect(clean.rusted).toBe(false);
    expect(clean.observations).toHaveLength(4);

    // Weeping alone is rust (isRusted's rule): (day 0, day 7].
    expect(by.get(hand.specimens.weepsAt2nd)!.interval).toEqual({ lower: 0, upper: 7 });
    // Placed but never scored: no interval, left out of the analysis.
    expect(by.get(hand.specimens.unscored)!.interval).toBeNull();
  });

  it("groups, medians and scorer agreement follow from those outcomes", async () => {
    const a = (await getTrialAnalysis({ labId: lab.labId, trialId: hand.trialId, groupBy: "treatment" }))!;
    const c = a.comparison!;
    expect(c.groups.map((g) => [g.key, g.n, g.events, g.unscored])).toEqual([
      [hand.treatments.control, 2, 1, 0], // the control comes first
      [hand.treatments.wax, 1, 1, 1],
    ]);
    // Turnbull on {(7,14], (28,∞)}: half the mass in (7,14], so the median lies in (7, 14].
    expect(c.groups[0].turnbull.median).toEqual({ time: 14, lower: 7, upper: 14 });
    expect(c.groups[0].km.median).toBe(14);
    expect(c.atRisk.times).toEqual([0, 7, 14, 28]);
    expect(c.atRisk.counts[0]).toEqual([2, 2, 2, 1]);
    // Three blind second scores sit beside a score of record: grades (record, blind) = (10, 8), (10, 10),
    // (7, 7). Observed agreement 2/3, chance (2/3·1/3 + 1/3·1/3) = 1/3, so κ = (2/3 − 1/3)/(1 − 1/3) = 0.5
    // (Cohen 1960, computed by hand).
    expect(c.agreement?.pairs).toBe(3);
    expect(c.agreement?.kappa).toBeCloseTo(0.5, 12);
    // The headline is kappa on the rust / no-rust call of the same three pairs: (clean, rust),
    // (clean, clean), (rust, rust). Observed 2/3; chance 1/3·2/3 + 2/3·1/3 = 4/9; κ = (2/3 − 4/9)/(5/9)
    // = 0.4 (Cohen 1960, by hand).
    expect(c.agreement?.rustCall).toMatchObject({ pairs: 3, agreed: 2, recordRusted: 1, blindRusted: 2 });
    expect(c.agreement?.rustCall.kappa).toBeCloseTo(0.4, 12);
    expect(c.summary[0]).toMatch(/^3 specimens in 2 treatments, 2 of them seen to rust/);
    expect(c.notes.at(-1)).toMatch(/do not replace a conservator's judgement/);
    expect(c.notes.join(" ")).toMatch(/1 of 4 specimens have no scored inspection yet/);
  });

  it("another lab's trial is not found", async () => {
    await expect(getTrial({ labId: other.labId, trialId: hand.trialId })).rejects.toMatchObject({ code: "not-found" });
    await expect(getTrialAnalysis({ labId: other.labId, trialId: hand.trialId, groupBy: "treatment" })).rejects.toMatchObject({ code: "not-found" });
  });
});

describe("GET /api/trials/[trialId]/analysis", () => {
  it("returns the groups for a member of the lab, observers included", async () => {
    for (const role of ["researcher", "observer"] as const) {
      signInAs(lab.as(role));
      const res = await call(hand.trialId, "?groupBy=treatment");
      expect(res.status).toBe(200);
      const body = await res.json();
      expect(body.comparison.groupBy).toBe("treatment");
      expect(body.comparison.groups.map((g: { n: number; events: number }) => [g.n, g.events])).toEqual([[2, 1], [1, 1]]);
      expect(body.outcomes).toHaveLength(4);
      const rusted = body.outcomes.find((o: { specimenId: string }) => o.specimenId === hand.specimens.rustsAt3rd);
      expect([rusted.intervalLowerDay, rusted.intervalUpperDay]).toEqual([7, 14]);
    }
  });

  it("groups by chamber × treatment and by material class on request", async () => {
    signInAs(lab.as("researcher"));
    const arm = await (await call(hand.trialId, "?groupBy=arm&method=km")).json();
    expect(arm.comparison.method).toBe("km");
    expect(arm.comparison.groups).toHaveLength(2);
    const material = await (await call(hand.trialId, "?groupBy=material")).json();
    expect(material.comparison.groups.map((g: { label: string }) => g.label)).toEqual(["Iron meteorite", "Stony-iron meteorite"]);
  });

  it("refuses another lab with 404, a signed-out caller with 401, and a bad grouping with 422", async () => {
    signInAs(other.as("lead"));
    expect((await call(hand.trialId)).status).toBe(404);
    signInAs(lab.as("researcher"));
    expect((await call("not-a-uuid")).status).toBe(404);
    signInAs(null);
    expect((await call(hand.trialId)).status).toBe(401);
    signInAs(lab.as("researcher"));
    const bad = await call(hand.trialId, "?groupBy=colour");
    expect(bad.status).toBe(422);
    expect((await bad.json()).error.fields.groupBy).toBeDefined();
  });
});
