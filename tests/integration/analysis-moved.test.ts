// Moved specimens counted once with delayed entry, the weeping view opened from the trial's primary
// outcome, and the headline kappa on the rust call on the demo trial.
import { and, eq, isNotNull } from "drizzle-orm";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { readSessionIdentity } from "@/lib/auth/session";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { getTrialAnalysis, loadGradePairs, loadSpecimenOutcomes } from "@/db/queries/analysis";
import { scorerAgreement as pairAgreement } from "@/db/queries/scores-agreement";
import { getTrial } from "@/db/queries/trial-access";
import { GET as getAnalysis } from "@/app/api/trials/[trialId]/analysis/route";
import { scorerAgreement } from "@/lib/analysis/compare";
import { pageQuery } from "@/lib/analysis/params";
import { isRusted } from "@/lib/stats/outcomes";
import { kaplanMeier, logRank } from "@/lib/stats/survival";
import { createTestLab, type TestLab } from "../support/db";
import { buildMovedTrial, MOVE_DAY, type MovedTrial } from "./analysis-moved-fixtures";

vi.mock("@/lib/auth/session", () => ({ readSessionIdentity: vi.fn() }));
const session = vi.mocked(readSessionIdentity);

let lab: TestLab;
let moved: MovedTrial;

beforeAll(async () => {
  lab = await createTestLab("Moved specimens lab");
  moved = await buildMovedTrial(lab);
});
afterAll(() => closeDb());
beforeEach(() => session.mockReset());

function call(trialId: string, query = "") {
  session.mockResolvedValue(lab.as("researcher") as never);
  return getAnalysis(new Request(`http://localhost/api/trials/${trialId}/analysis${query}`), { params: Promise.resolve({ trialId }) });
}

describe("a moved specimen", () => {
  it("is censored in the old jar at its last clean look, enters the new jar at the move, and stays rusted once rusted", async () => {
    const trial = await getTrial({ labId: lab.labId, trialId: moved.trialId });
    const { outcomes } = await loadSpecimenOutcomes({ labId: lab.labId, trial });
    expect(outcomes).toHaveLength(7);
    const of = (specimenId: string, chamberId: string) => outcomes.find((o) => o.specimenId === specimenId && o.chamberId === chamberId)!;

    const cleanOld = of(moved.specimens.movedClean, moved.chambers.dry);
    expect(cleanOld).toMatchObject({ entry: 0, interval: { lower: 7, upper: null }, rustedEarlier: false });
    expect(cleanOld.observations.map((o) => o.day)).toEqual([0, 7]);
    const cleanNew = of(moved.specimens.movedClean, moved.chambers.wet);
    // Enters at the move (day 10), first look in the new jar (day 14) shows rust and weeping: (10, 14].
    expect(cleanNew).toMatchObject({ entry: MOVE_DAY, interval: { lower: MOVE_DAY, upper: 14 }, weepingInterval: { lower: MOVE_DAY, upper: 14 }, rustedEarlier: false });
    expect(cleanNew.observations.map((o) => o.day)).toEqual([14, 28]);

    expect(of(moved.specimens.movedRusted, moved.chambers.dry)).toMatchObject({ entry: 0, interval: { lower: 0, upper: 7 }, rustedEarlier: false });
    const rustedNew = of(moved.specimens.movedRusted, moved.chambers.wet);
    expect(rustedNew).toMatchObject({ entry: MOVE_DAY, rustedEarlier: true, weptEarlier: false, weepingInterval: { lower: 14, upper: 28 } });
  });

  it("counts once in the comparison: its later placement after rusting is left out, and entry shapes the risk set", async () => {
    const c = (await getTrialAnalysis({ labId: lab.labId, trialId: moved.trialId, groupBy: "chamber", method: "km" })).comparison!;
    // Dry jar: the two moved specimens up to the move, one that rusts at 14, one clean. Wet jar: the
    // clean mover from day 10 and one clean throughout; the already-rusted mover is not at risk there.
    expect(c.groups.map((g) => [g.key, g.n, g.events])).toEqual([[moved.chambers.dry, 4, 2], [moved.chambers.wet, 2, 1]]);
    expect(c.totals).toMatchObject({ placements: 7, scored: 6, rusted: 3, moved: 2, notAtRisk: 1 });
    // The wet-jar mover is not at risk before day 10: 1 at risk at days 0 and 7, 2 at day 14.
    expect(c.atRisk).toEqual({ times: [0, 7, 14, 28], counts: [[4, 4, 2, 1], [1, 1, 2, 1]] });
    // R 4.2.2, survival 3.5-3: survfit(Surv(entry, time, status) ~ ch) on these right-endpoint rows,
    // dry (0,7,1) (0,7,0) (0,14,1) (0,28,0), wet (10,14,1) (0,28,0): dry S(7) = 0.75, S(14) = 0.375,
    // median 14 (7, NA); wet S(14) = 0.5 then flat to the end: print.survfit median 14 (14, NA).
    const [dry, wet] = c.groups;
    expect(dry.km.points.map((p) => [p.time, p.survival])).toEqual([[0, 1], [7, 0.75], [14, 0.375], [28, 0.375]]);
    expect([dry.km.median, dry.km.medianLower, dry.km.medianUpper]).toEqual([14, 7, null]);
    expect([wet.km.median, wet.km.medianLower, wet.km.medianUpper]).toEqual([14, 14, null]);
    // R 4.2.2, survival 3.5-3: coxph(Surv(entry, time, status) ~ ch, ties = "exact")$score = 0.0810810810810811
    // (the log-rank score test with delayed entry); ignoring the entry, survdiff gives 0.2.
    expect(c.logRank!.chiSquare).toBeCloseTo(0.0810810810810811, 12);
    expect(c.logRank!.stratifiedBy).toBeNull();
    expect(logRank([[{ time: 7, event: true }, { time: 7, event: false }, { time: 14, event: true }, { time: 28, event: false }], [{ time: 14, event: true }, { time: 28, event: false }]]).chiSquare).toBeCloseTo(0.2, 12);
    // Turnbull in the wet jar: (10, 14] entered at 10 and (28, ∞): half the mass in each.
    expect(wet.turnbull.median).toEqual({ time: 14, lower: 10, upper: 14 });
    // Final state per specimen, in the group of its last placement at risk: 5 specimens, not 6 placements.
    // Dry: the rusted mover (rusted at 7, not at risk in the wet jar), the one rusted at 14, the clean
    // one; wet: the clean mover (rusted at 14 after the move) and the one clean throughout.
    expect(c.groups.map((g) => [g.final.rusted, g.final.notRusted])).toEqual([[2, 1], [1, 1]]);
    expect(c.notes.join(" ")).toMatch(/2 placements are of specimens moved to another jar during the trial\. A specimen moved to another jar counts in the group of each jar/);
    expect(c.notes.join(" ")).toMatch(/1 later placement was left out because the specimen had already rusted before the move/);
    // Direct check of the wet-jar curve with the entry passed to Kaplan–Meier.
    expect(kaplanMeier([{ time: 14, event: true, entry: MOVE_DAY }, { time: 28, event: false }]).steps[0]).toMatchObject({ atRisk: 2, survival: 0.5 });
  });

  it("is listed in the per-specimen rows, marked as not at risk", async () => {
    const body = await (await call(moved.trialId, "?groupBy=chamber&outcome=first-rust")).json();
    const rows = body.outcomes.filter((o: { specimenId: string }) => o.specimenId === moved.specimens.movedRusted);
    expect(rows.map((r: { entryDay: number; rustedEarlier: boolean }) => [r.entryDay, r.rustedEarlier]).sort()).toEqual([[0, false], [MOVE_DAY, true]]);
  });
});

describe("the trial's primary outcome picks the default view", () => {
  it("a time-to-weeping trial opens on the weeping view, on the page and in the JSON API", async () => {
    const trial = await getTrial({ labId: lab.labId, trialId: moved.trialId });
    expect(trial.primaryOutcome).toBe("time-to-weeping");
    expect(pageQuery({}, trial.primaryOutcome).outcome).toBe("weeping");
    // The URL still decides when it names an outcome; a bad value falls back to the trial's default.
    expect(pageQuery({ outcome: "area" }, trial.primaryOutcome).outcome).toBe("area");
    expect(pageQuery({ outcome: "nonsense" }, trial.primaryOutcome).outcome).toBe("weeping");
    expect(pageQuery({}, "rusted-area-growth").outcome).toBe("area");
    expect(pageQuery({}, "final-rust-grade").outcome).toBe("final");
    expect(pageQuery({}, "time-to-first-rust").outcome).toBe("first-rust");

    const res = await call(moved.trialId, "?groupBy=chamber");
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.outcome).toBe("weeping");
    expect(body.trial.primaryOutcome).toBe("time-to-weeping");
    const c = body.comparison;
    expect(c.endpoint).toBe("weeping");
    // Weeping: dry jar none of 4; wet jar the clean mover (10, 14] and the rusted mover, which had not
    // wept before the move and is at risk of weeping from day 10: (14, 28]; plus one never weeping.
    expect(c.groups.map((g: { n: number; events: number }) => [g.n, g.events])).toEqual([[4, 0], [3, 2]]);
    expect(c.summary.join(" ")).toMatch(/Median time to first weeping/);
    expect(c.summary.join(" ")).toMatch(/Log-rank test of time to first weeping across the 2 chambers/);

    const rust = await (await call(moved.trialId, "?groupBy=chamber&outcome=first-rust")).json();
    expect(rust.outcome).toBe("first-rust");
    expect(rust.comparison.endpoint).toBe("rust");
    expect((await call(moved.trialId, "?outcome=sideways")).status).toBe(422);
  });
});

describe("kappa on the rust call on the demo trial", () => {
  it("equals Cohen's formula on the record / blind-second rust calls read straight from the scores", async () => {
    const [demoLab] = await db.select().from(s.labs).where(eq(s.labs.name, "Tarrow Valley Natural History Collection"));
    const [trial] = await db.select().from(s.trials).where(and(eq(s.trials.labId, demoLab.id), eq(s.trials.status, "running")));
    const a = scorerAgreement(await loadGradePairs({ labId: demoLab.id, trialId: trial.id }))!;
    expect(a).not.toBeNull();

    // Independent tally: every blind second score at a done inspection beside a score of record by someone else.
    const rows = await db.select({ sc: s.scores }).from(s.scores).innerJoin(s.inspections, eq(s.inspections.id, s.scores.inspectionId))
      .where(and(eq(s.scores.trialId, trial.id), isNotNull(s.inspections.doneAt)));
    const record = new Map(rows.filter((r) => r.sc.isRecord).map((r) => [`${r.sc.inspectionId}|${r.sc.specimenId}`, r.sc]));
    const blind = rows.filter((r) => !r.sc.isRecord && r.sc.blind && r.sc.scorerId && record.has(`${r.sc.inspectionId}|${r.sc.specimenId}`)
      && record.get(`${r.sc.inspectionId}|${r.sc.specimenId}`)!.scorerId !== r.sc.scorerId);
    const blindScorers = new Set(blind.map((r) => r.sc.scorerId));
    expect(blindScorers.size).toBe(1); // one blind scorer in the demo, so no choice between scorers
    const table = [[0, 0], [0, 0]]; // [record rusted?][blind rusted?]
    for (const r of blind) {
      const rec = record.get(`${r.sc.inspectionId}|${r.sc.specimenId}`)!;
      table[isRusted(rec) ? 1 : 0][isRusted(r.sc) ? 1 : 0]++;
    }
    const n = table.flat().reduce((x, y) => x + y, 0);
    // Cohen 1960: κ = (p_o − p_e)/(1 − p_e), p_o the diagonal share, p_e from the margins.
    const po = (table[0][0] + table[1][1]) / n;
    const pe = ((table[0][0] + table[0][1]) * (table[0][0] + table[1][0]) + (table[1][0] + table[1][1]) * (table[0][1] + table[1][1])) / (n * n);
    expect(n).toBeGreaterThan(10);
    expect(table[1][1]).toBeGreaterThan(0); // the demo has rusted calls, so the kappa is defined
    expect(a.rustCall.pairs).toBe(n);
    expect(a.rustCall.kappa).toBeCloseTo((po - pe) / (1 - pe), 12);
    expect(a.rustCall.agreed).toBe(table[0][0] + table[1][1]);

    const c = (await getTrialAnalysis({ labId: demoLab.id, trialId: trial.id, groupBy: "treatment" })).comparison!;
    expect(c.agreement?.rustCall.kappa).toBeCloseTo((po - pe) / (1 - pe), 12);
    expect(c.summary.join(" ")).toMatch(/rust \/ no-rust call: κ = /);
    expect(c.notes.join(" ")).toMatch(/Kappa on ASTM D610 grades over \d+ photos/);
    // The agreement tab's pair table carries the same rust-call kappa for the record and blind scorers.
    const recordScorer = [...record.values()][0].scorerId;
    const tab = await pairAgreement({ labId: demoLab.id, trialId: trial.id });
    const pair = tab.pairs.find((p) => [p.a.id, p.b.id].includes(recordScorer!) && [p.a.id, p.b.id].includes([...blindScorers][0]!));
    expect(pair?.rustCall.kappa).not.toBeNull();
  });
});
