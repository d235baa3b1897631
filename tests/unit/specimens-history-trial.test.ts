// What a specimen's history says at a trial (the report's history table). Raw data invented for the
// test; every expected value is recomputed by hand from it beside the assertion (direct recomputation).
import { describe, expect, it } from "vitest";
import { historyBeforeTrial } from "@/lib/specimens/history";

const raw = {
  chlorideTests: [
    { testedOn: "2025-10-01", result: "absent" },
    { testedOn: "2026-01-05", result: "present" }, // on the start day: during the trial, not before
    { testedOn: "2025-12-01", result: "present" },
  ],
  akaganeiteChecks: [{ checkedOn: "2025-12-01", seen: false }, { checkedOn: "2026-02-01", seen: true }],
  priorTreatments: [
    { treatedOn: "2025-11-10", treatment: "Dried at 40 °C" },
    { treatedOn: "2025-09-01", treatment: "Rinsed in deionised water" },
    { treatedOn: "2026-01-20", treatment: "Wax film (the arm)" },
  ],
  weighings: [
    { measuredOn: "2026-03-06", massG: "10.0131" },
    { measuredOn: "2025-09-01", massG: "10.0456" },
    { measuredOn: "2026-01-05", massG: "10.0123" },
    { measuredOn: "2026-05-01", massG: "10.0500" }, // after the trial's end
  ],
};

describe("history before a trial", () => {
  it("takes findings and treatments dated before the start day, and the mass change from day 0 to the last weighing by the end", () => {
    const h = historyBeforeTrial(raw, "2026-01-05", "2026-04-01");
    expect(h.chlorideState).toBe("present"); // latest test before 2026-01-05 is 2025-12-01: present
    expect(h.akaganeiteSeen).toBe(false); // the only check before the start did not see it
    expect(h.priorTreatments).toEqual(["Rinsed in deionised water", "Dried at 40 °C"]); // oldest first; the arm's coating is not "before"
    expect(h.firstWeighing).toEqual({ measuredOn: "2025-09-01", massG: "10.0456" });
    // Baseline 10.0123 g on 2026-01-05 (the start day), last by 2026-04-01 is 10.0131 g on 2026-03-06:
    // +0.0008 g = +0.8 mg; 0.0008 / 10.0123 × 100 = 0.0079902 %; 2026-01-05 → 2026-03-06 = 26 + 28 + 6 = 60 days.
    expect(h.trialChange!.from).toEqual({ measuredOn: "2026-01-05", massG: "10.0123" });
    expect(h.trialChange!.to).toEqual({ measuredOn: "2026-03-06", massG: "10.0131" });
    expect(h.trialChange!.step.changeG).toBeCloseTo(0.0008, 10);
    expect(h.trialChange!.step.changePercent).toBeCloseTo(0.0079902, 6);
    expect(h.trialChange!.step.days).toBe(60);
  });

  it("has no mass change without a weighing by day 0 or one after it, and nothing checked reads as unknown", () => {
    const noBaseline = historyBeforeTrial({ ...raw, weighings: [{ measuredOn: "2026-02-01", massG: "5.0000" }, { measuredOn: "2026-03-01", massG: "4.9000" }] }, "2026-01-05", "2026-04-01");
    expect(noBaseline.trialChange).toBeNull();
    expect(noBaseline.firstWeighing).toEqual({ measuredOn: "2026-02-01", massG: "5.0000" });
    const onlyBaseline = historyBeforeTrial({ ...raw, weighings: [{ measuredOn: "2026-01-01", massG: "5.0000" }] }, "2026-01-05", "2026-04-01");
    expect(onlyBaseline.trialChange).toBeNull();
    const empty = historyBeforeTrial({ chlorideTests: [], akaganeiteChecks: [], priorTreatments: [], weighings: [] }, "2026-01-05", "2026-04-01");
    expect(empty).toEqual({ chlorideState: "untested", akaganeiteSeen: null, priorTreatments: [], firstWeighing: null, trialChange: null });
  });

  it("before the trial starts, every entry counts and there is no change over the trial", () => {
    const h = historyBeforeTrial(raw, null, "2026-04-01");
    expect(h.chlorideState).toBe("present"); // latest test overall: 2026-01-05 present
    expect(h.akaganeiteSeen).toBe(true);
    expect(h.priorTreatments).toHaveLength(3);
    expect(h.trialChange).toBeNull();
  });
});
